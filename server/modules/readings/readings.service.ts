import { and, eq, sql } from 'drizzle-orm';
import { tx, type Db } from '../../db/client';
import { writeAudit } from '../../lib/audit';
import { claimLaborLines, claimReadings, claims, models, productFamilies, readingSpecs, repairCodes, units, type Claim } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { newId } from '../../lib/ids';
import { AppError, ValidationError } from '../../lib/errors';
import { checkStrictCsv } from '../../lib/photo/file-check';
import type { ClaimReadingsReport, CsvImportError, JudgedReadingView } from '@shared/schemas/evidence';
import type { AttachmentsService } from '../attachments/attachments.service';
import { FOOD_CORE_TEMP_KEYS, judgeReadings, specView } from './readings.judge';
import { parseReadingsCsv } from './readings.csv';

export class CsvImportRefused extends AppError {
  constructor(public readonly errors: CsvImportError[]) {
    const fields: Record<string, string> = {};
    for (const e of errors.slice(0, 50)) fields[`line.${e.line}`] = e.message;
    super(400, 'csv_invalid', `The readings sheet has ${errors.length} problem${errors.length === 1 ? '' : 's'}; nothing was imported. Fix ${errors.length === 1 ? 'it' : 'them'} and import the file again.`, fields);
  }
}

function modelOf(db: Db, claim: Pick<Claim, 'unitId'>) {
  if (!claim.unitId) return null;
  return (
    db
      .select({ id: models.id, modelNumber: models.modelNumber, fuel: productFamilies.fuel })
      .from(units)
      .innerJoin(models, eq(models.id, units.modelId))
      .innerJoin(productFamilies, eq(productFamilies.id, models.familyId))
      .where(eq(units.id, claim.unitId))
      .get() ?? null
  );
}

/** The claim's readings judged against its model's specs, the specs, and which the claim's repair codes require. */
export function claimReadingsReport(db: Db, claim: Pick<Claim, 'id' | 'unitId'>): ClaimReadingsReport {
  const model = modelOf(db, claim);
  const specs = model ? db.select().from(readingSpecs).where(eq(readingSpecs.modelId, model.id)).orderBy(readingSpecs.key).all() : [];
  const codes = new Set(
    db
      .select({ code: repairCodes.code })
      .from(claimLaborLines)
      .innerJoin(repairCodes, eq(repairCodes.id, claimLaborLines.repairCodeId))
      .where(eq(claimLaborLines.claimId, claim.id))
      .all()
      .map((r) => r.code),
  );
  const rows = db.select().from(claimReadings).where(eq(claimReadings.claimId, claim.id)).orderBy(claimReadings.key, sql`${claimReadings.phase} desc`).all();
  const readings: JudgedReadingView[] = judgeReadings(specs, rows).map(({ food: _f, ...j }) => j);
  return {
    modelNumber: model?.modelNumber ?? null,
    fuel: model?.fuel ?? null,
    specs: specs.map((s) => ({ ...specView(s), required: s.requiredForCodes.some((c) => codes.has(c)) })),
    readings,
    foodKeys: Object.entries(FOOD_CORE_TEMP_KEYS).map(([key, v]) => ({ key, label: v.label })),
  };
}

export function createReadingsService(deps: AppDeps, attachments: AttachmentsService) {
  const { db, clock } = deps;

  /**
   * Imports a readings sheet: parsed and checked against the model's specs; with any bad row
   * nothing is imported and every bad row comes back with its line number and reason. A clean
   * sheet's readings replace those of the same key and phase, and the sheet itself is kept as
   * the claim's "readings sheet" evidence, in one transaction.
   */
  async function importCsv(ctx: RequestContext, claimId: string, file: { originalName: string; buffer: Buffer }, ip: string | null, keepSheet = true) {
    const claim = attachments.uploadableClaim(ctx, claimId, 'update');
    let text: string;
    try {
      text = checkStrictCsv(file.buffer);
    } catch (e) {
      throw new CsvImportRefused([{ line: 1, message: (e as Error).message }]);
    }
    const model = modelOf(db, claim);
    if (!model) throw new ValidationError('Find the unit by its serial number first: readings are judged against its model.', { serial: 'No unit on this claim.' });
    const specs = db.select().from(readingSpecs).where(eq(readingSpecs.modelId, model.id)).all();
    const parsed = parseReadingsCsv(text, specs, model.modelNumber);
    if (parsed.errors.length > 0) throw new CsvImportRefused(parsed.errors);
    const specId = new Map(specs.map((s) => [s.key, s.id]));

    const write = (t: Db) => {
      const now = clock.now().toISOString();
      for (const r of parsed.rows) {
        t.delete(claimReadings).where(and(eq(claimReadings.claimId, claim.id), eq(claimReadings.key, r.key), eq(claimReadings.phase, r.phase))).run();
        t.insert(claimReadings).values({ id: newId(), claimId: claim.id, specId: specId.get(r.key) ?? null, key: r.key, phase: r.phase, value: r.value, unit: r.unit, createdAt: now }).run();
      }
      const changed = t
        .update(claims)
        .set({ version: sql`${claims.version} + 1`, updatedAt: now })
        .where(and(eq(claims.id, claim.id), sql`${claims.state} in ('draft', 'returned')`))
        .run();
      if (changed.changes !== 1) throw new AppError(409, 'not_editable', 'The claim is no longer a draft or returned.');
    };

    let sheetIds: string[] = [];
    if (keepSheet) {
      const views = await attachments.upload(ctx, claim.id, [{ originalName: file.originalName, buffer: file.buffer, role: 'readings_sheet' }], ip, {
        action: 'readings.import',
        inTransaction: (t) => write(t),
      });
      sheetIds = views.map((v) => v.id);
    } else {
      tx(db, (t) => {
        write(t);
        writeAudit(t, clock, { actorId: ctx.user.id, organisationId: ctx.user.organisationId, action: 'readings.import', recordType: 'claim', recordId: claim.id, outcome: 'success', ip, detail: { rows: parsed.rows.length } });
      });
    }
    const version = db.select({ version: claims.version }).from(claims).where(eq(claims.id, claim.id)).get()?.version ?? null;
    return { imported: parsed.rows.length, attachmentIds: sheetIds, version, report: claimReadingsReport(db, claim) };
  }

  return { importCsv };
}
