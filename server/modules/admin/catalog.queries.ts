import { and, asc, desc, eq, gt, inArray, lte, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { componentTerms, modelTerms, models, partPrices, parts, productFamilies, readingSpecs, repairCodeAllowances, repairCodes } from '../../db/schema/index';
import type { AffectedClaims, AllowanceHistoryItem, FamilyItem, ModelItem, PartItem, PriceHistoryItem, ReadingSpecItem, RepairCodeItem } from '@shared/schemas/admin';
import type { AttachmentRole } from '@shared/schemas/claim';
import type { UnitTerms } from '@shared/schemas/unit';

/**
 * The first effective date of a history: the price or allowance a part or repair code had before
 * its first recorded change. A repair date is never earlier than this.
 */
export const HISTORY_START = '0001-01-01';

// ---------------------------------------------------------------------------- effective-dated look-ups

/**
 * The list price of a part, in cents, for a claim repaired on `date` (YYYY-MM-DD): the price
 * whose effective date is the latest on or before the repair date. A part whose price never
 * changed has no history and answers its catalogue price. Undefined for an unknown part.
 */
export function priceOn(db: Db, partId: string, date: string): number | undefined {
  const row = db
    .select({ cents: partPrices.listPriceCents })
    .from(partPrices)
    .where(and(eq(partPrices.partId, partId), lte(partPrices.effectiveFrom, date)))
    .orderBy(desc(partPrices.effectiveFrom))
    .get();
  if (row) return row.cents;
  return db.select({ cents: parts.listPriceCents }).from(parts).where(eq(parts.id, partId)).get()?.cents;
}

/** priceOn for many parts at once (one query each way): partId -> cents. */
export function pricesOn(db: Db, partIds: string[], date: string): Map<string, number> {
  const out = new Map<string, number>();
  if (partIds.length === 0) return out;
  const history = db
    .select({ partId: partPrices.partId, cents: partPrices.listPriceCents, from: partPrices.effectiveFrom })
    .from(partPrices)
    .where(and(inArray(partPrices.partId, partIds), lte(partPrices.effectiveFrom, date)))
    .orderBy(asc(partPrices.effectiveFrom))
    .all();
  for (const h of history) out.set(h.partId, h.cents);
  const missing = partIds.filter((id) => !out.has(id));
  if (missing.length) for (const p of db.select({ id: parts.id, cents: parts.listPriceCents }).from(parts).where(inArray(parts.id, missing)).all()) out.set(p.id, p.cents);
  return out;
}

/**
 * The labor-time allowance of a repair code, in hours, for a claim repaired on `date`: the
 * allowance whose effective date is the latest on or before the repair date; the catalogue
 * value when it never changed. Undefined for an unknown repair code.
 */
export function allowanceOn(db: Db, repairCodeId: string, date: string): number | undefined {
  const row = db
    .select({ hours: repairCodeAllowances.allowedHours })
    .from(repairCodeAllowances)
    .where(and(eq(repairCodeAllowances.repairCodeId, repairCodeId), lte(repairCodeAllowances.effectiveFrom, date)))
    .orderBy(desc(repairCodeAllowances.effectiveFrom))
    .get();
  if (row) return row.hours;
  return db.select({ hours: repairCodes.allowedHours }).from(repairCodes).where(eq(repairCodes.id, repairCodeId)).get()?.hours;
}

/** allowanceOn for many repair codes at once: repairCodeId -> hours. */
export function allowancesOn(db: Db, repairCodeIds: string[], date: string): Map<string, number> {
  const out = new Map<string, number>();
  if (repairCodeIds.length === 0) return out;
  const history = db
    .select({ id: repairCodeAllowances.repairCodeId, hours: repairCodeAllowances.allowedHours })
    .from(repairCodeAllowances)
    .where(and(inArray(repairCodeAllowances.repairCodeId, repairCodeIds), lte(repairCodeAllowances.effectiveFrom, date)))
    .orderBy(asc(repairCodeAllowances.effectiveFrom))
    .all();
  for (const h of history) out.set(h.id, h.hours);
  const missing = repairCodeIds.filter((id) => !out.has(id));
  if (missing.length) for (const c of db.select({ id: repairCodes.id, hours: repairCodes.allowedHours }).from(repairCodes).where(inArray(repairCodes.id, missing)).all()) out.set(c.id, c.hours);
  return out;
}

/**
 * The model's warranty terms in force on `date`: the row with the latest effective date on or
 * before it; the model's own columns and component terms when the model never changed.
 */
export function modelTermsOn(db: Db, modelId: string, date: string): Omit<UnitTerms, 'basis' | 'basisDate'> | undefined {
  const row = db
    .select()
    .from(modelTerms)
    .where(and(eq(modelTerms.modelId, modelId), lte(modelTerms.effectiveFrom, date)))
    .orderBy(desc(modelTerms.effectiveFrom))
    .get();
  if (row) {
    const { partsMonths, laborMonths, capMonthsFromShip, installGraceDays, effectiveFrom } = row;
    return { effectiveFrom, partsMonths, laborMonths, capMonthsFromShip, installGraceDays, componentTerms: row.componentTerms ?? [] };
  }
  const m = db.select().from(models).where(eq(models.id, modelId)).get();
  if (!m) return undefined;
  const comps = db.select({ partId: componentTerms.partId, label: componentTerms.label, partsMonths: componentTerms.partsMonths }).from(componentTerms).where(eq(componentTerms.modelId, modelId)).all();
  return { effectiveFrom: HISTORY_START, partsMonths: m.partsMonths, laborMonths: m.laborMonths, capMonthsFromShip: m.capMonthsFromShip, installGraceDays: m.installGraceDays, componentTerms: comps };
}

/** A unit's terms: the model's terms in force on its registration date, else its ship date. */
export function unitTermsOf(db: Db, unit: { modelId: string; shipDate: string; registeredOn: string | null }): UnitTerms {
  const basis = unit.registeredOn ? 'registration' : 'ship';
  const basisDate = unit.registeredOn ?? unit.shipDate;
  const t = modelTermsOn(db, unit.modelId, basisDate);
  if (!t) throw new Error(`model ${unit.modelId} of a unit is missing`);
  return { basis, basisDate, ...t };
}

export function priceHistory(db: Db, partId: string): PriceHistoryItem[] {
  return db
    .select({ effectiveFrom: partPrices.effectiveFrom, listPriceCents: partPrices.listPriceCents, createdAt: partPrices.createdAt })
    .from(partPrices)
    .where(eq(partPrices.partId, partId))
    .orderBy(asc(partPrices.effectiveFrom))
    .all();
}

export function allowanceHistory(db: Db, repairCodeId: string): AllowanceHistoryItem[] {
  return db
    .select({ effectiveFrom: repairCodeAllowances.effectiveFrom, allowedHours: repairCodeAllowances.allowedHours, createdAt: repairCodeAllowances.createdAt })
    .from(repairCodeAllowances)
    .where(eq(repairCodeAllowances.repairCodeId, repairCodeId))
    .orderBy(asc(repairCodeAllowances.effectiveFrom))
    .all();
}

// ---------------------------------------------------------------------------- catalogue lists (manufacturer admin)

export function listFamilies(db: Db): FamilyItem[] {
  return db.select().from(productFamilies).orderBy(asc(productFamilies.code)).all();
}

export function listModels(db: Db, filter: { id?: string } = {}): ModelItem[] {
  const rows = db
    .select({
      id: models.id,
      familyId: models.familyId,
      familyCode: productFamilies.code,
      modelNumber: models.modelNumber,
      name: models.name,
      partsMonths: models.partsMonths,
      laborMonths: models.laborMonths,
      capMonthsFromShip: models.capMonthsFromShip,
      installGraceDays: models.installGraceDays,
      active: models.active,
      updatedAt: models.updatedAt,
    })
    .from(models)
    .innerJoin(productFamilies, eq(productFamilies.id, models.familyId))
    .where(filter.id ? eq(models.id, filter.id) : undefined)
    .orderBy(asc(models.modelNumber))
    .all();
  if (rows.length === 0) return [];
  const ids = rows.map((r) => r.id);
  const specs: ReadingSpecItem[] = db.select().from(readingSpecs).where(inArray(readingSpecs.modelId, ids)).orderBy(asc(readingSpecs.key)).all();
  const comps = db
    .select({ id: componentTerms.id, modelId: componentTerms.modelId, partId: componentTerms.partId, partNumber: parts.partNumber, label: componentTerms.label, partsMonths: componentTerms.partsMonths })
    .from(componentTerms)
    .innerJoin(parts, eq(parts.id, componentTerms.partId))
    .where(inArray(componentTerms.modelId, ids))
    .orderBy(asc(parts.partNumber))
    .all();
  return rows.map((m) => ({
    ...m,
    readingSpecs: specs.filter((s) => s.modelId === m.id),
    componentTerms: comps.filter((c) => c.modelId === m.id).map(({ modelId: _m, ...c }) => c),
  }));
}

export function listParts(db: Db, today: string, filter: { id?: string } = {}): PartItem[] {
  const rows = db
    .select({
      id: parts.id,
      partNumber: parts.partNumber,
      description: parts.description,
      familyId: parts.familyId,
      familyCode: productFamilies.code,
      listPriceCents: parts.listPriceCents,
      returnRequired: parts.returnRequired,
      active: parts.active,
      updatedAt: parts.updatedAt,
    })
    .from(parts)
    .leftJoin(productFamilies, eq(productFamilies.id, parts.familyId))
    .where(filter.id ? eq(parts.id, filter.id) : undefined)
    .orderBy(asc(parts.partNumber))
    .all();
  if (rows.length === 0) return [];
  const ids = rows.map((r) => r.id);
  const current = pricesOn(db, ids, today);
  const future = db
    .select({ partId: partPrices.partId, effectiveFrom: partPrices.effectiveFrom, listPriceCents: partPrices.listPriceCents, createdAt: partPrices.createdAt })
    .from(partPrices)
    .where(and(inArray(partPrices.partId, ids), gt(partPrices.effectiveFrom, today)))
    .orderBy(asc(partPrices.effectiveFrom))
    .all();
  return rows.map((p) => ({
    ...p,
    listPriceCents: current.get(p.id) ?? p.listPriceCents,
    scheduled: future.filter((f) => f.partId === p.id).map(({ partId: _p, ...f }) => f),
  }));
}

export function listRepairCodes(db: Db, today: string, filter: { id?: string } = {}): RepairCodeItem[] {
  const rows = db
    .select({
      id: repairCodes.id,
      code: repairCodes.code,
      familyId: repairCodes.familyId,
      familyCode: productFamilies.code,
      description: repairCodes.description,
      allowedHours: repairCodes.allowedHours,
      requiredEvidence: repairCodes.requiredEvidence,
      active: repairCodes.active,
      updatedAt: repairCodes.updatedAt,
    })
    .from(repairCodes)
    .innerJoin(productFamilies, eq(productFamilies.id, repairCodes.familyId))
    .where(filter.id ? eq(repairCodes.id, filter.id) : undefined)
    .orderBy(asc(repairCodes.code))
    .all();
  if (rows.length === 0) return [];
  const ids = rows.map((r) => r.id);
  const current = allowancesOn(db, ids, today);
  const future = db
    .select({ id: repairCodeAllowances.repairCodeId, effectiveFrom: repairCodeAllowances.effectiveFrom, allowedHours: repairCodeAllowances.allowedHours, createdAt: repairCodeAllowances.createdAt })
    .from(repairCodeAllowances)
    .where(and(inArray(repairCodeAllowances.repairCodeId, ids), gt(repairCodeAllowances.effectiveFrom, today)))
    .orderBy(asc(repairCodeAllowances.effectiveFrom))
    .all();
  return rows.map((c) => ({
    ...c,
    requiredEvidence: c.requiredEvidence as AttachmentRole[],
    allowedHours: current.get(c.id) ?? c.allowedHours,
    scheduled: future.filter((f) => f.id === c.id).map(({ id: _i, ...f }) => f),
  }));
}

// ---------------------------------------------------------------------------- filed claims a back-dated change touches

const FILED = sql`('draft', 'withdrawn')`;

function affected(db: Db, effectiveFrom: string, query: (select: ReturnType<typeof sql>) => ReturnType<typeof sql>): AffectedClaims {
  const count = (db.get(query(sql`count(distinct c.id) as n`)) as { n: number }).n;
  const numbers = (db.all(sql`${query(sql`distinct c.number as number`)} order by 1 limit 20`) as { number: string }[]).map((r) => r.number);
  return { effectiveFrom, count, numbers };
}

/**
 * Filed claims whose unit takes the model terms that start on `from` (units of the model shipped,
 * or registered, on or after `from` and before the next change). Read through units(model_id,
 * ship_date) and claims(unit_id, repair_date).
 */
export function claimsAffectedByModelTerms(db: Db, modelId: string, from: string): AffectedClaims {
  const next = db.select({ d: modelTerms.effectiveFrom }).from(modelTerms).where(and(eq(modelTerms.modelId, modelId), gt(modelTerms.effectiveFrom, from))).orderBy(asc(modelTerms.effectiveFrom)).get()?.d ?? '9999-12-31';
  return affected(db, from, (select) =>
    sql`select ${select} from units u join claims c on c.unit_id = u.id where u.model_id = ${modelId} and coalesce(u.registered_on, u.ship_date) >= ${from} and coalesce(u.registered_on, u.ship_date) < ${next} and c.state not in ${FILED}`,
  );
}

/** Filed claims with a line of the part repaired on or after `from`, before the next price (index on claim_part_lines(part_id)). */
export function claimsAffectedByPrice(db: Db, partId: string, from: string): AffectedClaims {
  const next = db.select({ d: partPrices.effectiveFrom }).from(partPrices).where(and(eq(partPrices.partId, partId), gt(partPrices.effectiveFrom, from))).orderBy(asc(partPrices.effectiveFrom)).get()?.d ?? '9999-12-31';
  return affected(db, from, (select) =>
    sql`select ${select} from claim_part_lines p join claims c on c.id = p.claim_id where p.part_id = ${partId} and c.repair_date >= ${from} and c.repair_date < ${next} and c.state not in ${FILED}`,
  );
}

/** Filed claims with a labor line of the repair code repaired on or after `from`, before the next allowance. */
export function claimsAffectedByAllowance(db: Db, repairCodeId: string, from: string): AffectedClaims {
  const next =
    db.select({ d: repairCodeAllowances.effectiveFrom }).from(repairCodeAllowances).where(and(eq(repairCodeAllowances.repairCodeId, repairCodeId), gt(repairCodeAllowances.effectiveFrom, from))).orderBy(asc(repairCodeAllowances.effectiveFrom)).get()?.d ??
    '9999-12-31';
  return affected(db, from, (select) =>
    sql`select ${select} from claim_labor_lines l join claims c on c.id = l.claim_id where l.repair_code_id = ${repairCodeId} and c.repair_date >= ${from} and c.repair_date < ${next} and c.state not in ${FILED}`,
  );
}
