import { and, eq, inArray } from 'drizzle-orm';
import { tx, type Db } from '../../db/client';
import { claimReadings, componentTerms, modelTerms, models, partPrices, parts, productFamilies, readingSpecs, repairCodeAllowances, repairCodes } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { writeAudit } from '../../lib/audit';
import { AppError, ConflictError, ForbiddenError, NotFoundError, ValidationError } from '../../lib/errors';
import { newId } from '../../lib/ids';
import { todayFor } from '../../lib/business-day';
import type {
  CreateFamilyBody,
  FamilyItem,
  ModelItem,
  PartItem,
  ReadingSpecItem,
  RepairCodeItem,
  UpdateFamilyBody,
  UpdatePartBody,
  UpdateReadingSpecBody,
  UpdateRepairCodeBody,
} from '@shared/schemas/admin';
import { createModelSchema, createPartSchema, createReadingSpecSchema, createRepairCodeSchema, updateModelSchema } from '@shared/schemas/admin';
import type { z } from 'zod';
import { allowanceOn, claimsAffectedByAllowance, claimsAffectedByModelTerms, claimsAffectedByPrice, HISTORY_START, listFamilies, listModels, listParts, listRepairCodes, modelTermsOn, priceOn } from './catalog.queries';
import type { AffectedClaims } from '@shared/schemas/admin';

type CreateModel = z.infer<typeof createModelSchema>;
type UpdateModel = z.infer<typeof updateModelSchema>;
type CreatePart = z.infer<typeof createPartSchema>;
type CreateRepairCode = z.infer<typeof createRepairCodeSchema>;
type CreateReadingSpec = z.infer<typeof createReadingSpecSchema>;

const duplicate = (field: string, message: string) => new AppError(409, 'duplicate', message, { [field]: message });
const fieldError = (field: string, message: string) => new ValidationError('Some fields need attention.', { [field]: message });

/** The fields that differ, as { field: { from, to } } for the audit row. */
function diff<T extends Record<string, unknown>>(before: T, after: Partial<T>): Record<string, { from: unknown; to: unknown }> {
  const out: Record<string, { from: unknown; to: unknown }> = {};
  for (const [k, v] of Object.entries(after)) {
    if (v === undefined) continue;
    if (JSON.stringify(before[k]) !== JSON.stringify(v)) out[k] = { from: before[k], to: v };
  }
  return out;
}

function requireFamily(t: Db, familyId: string, field = 'familyId'): void {
  if (!t.select({ id: productFamilies.id }).from(productFamilies).where(eq(productFamilies.id, familyId)).get()) throw fieldError(field, 'Choose a product family from the list.');
}

function checkComponentParts(t: Db, terms: { partId: string }[]): void {
  const ids = [...new Set(terms.map((c) => c.partId))];
  if (ids.length !== terms.length) throw fieldError('componentTerms', 'Each part can carry only one longer term per model.');
  if (ids.length === 0) return;
  const found = t.select({ id: parts.id }).from(parts).where(inArray(parts.id, ids)).all();
  if (found.length !== ids.length) throw fieldError('componentTerms', 'Choose the components from the parts list.');
}

/** A change that takes effect before today needs a reason: it changes what filed claims are worth. */
function requireBackdateReason(from: string, day: string, reason: string | null | undefined, what: string): string | null {
  if (from >= day) return null;
  if (!reason || reason.trim() === '') {
    throw fieldError('reason', `The ${what} takes effect in the past (${from}): give a reason, because it changes filed claims.`);
  }
  return reason.trim();
}

function checkRepairCodes(t: Db, codes: string[] | undefined): void {
  if (!codes || codes.length === 0) return;
  const unique = [...new Set(codes)];
  const found = t.select({ code: repairCodes.code }).from(repairCodes).where(inArray(repairCodes.code, unique)).all();
  const missing = unique.filter((c) => !found.some((f) => f.code === c));
  if (missing.length) throw fieldError('requiredForCodes', `Unknown repair code: ${missing.join(', ')}.`);
}

/**
 * The catalogue as the manufacturer admin keeps it. Nothing is deleted that a claim can point
 * at: families, models, parts and repair codes are retired (active = false). A price or
 * allowance change is a dated history row, so claims repaired before it keep the old value.
 */
export function createCatalogService(deps: AppDeps) {
  const { db, clock } = deps;
  const now = () => clock.now().toISOString();

  function guard(ctx: RequestContext, action: 'read' | 'create' | 'update' | 'delete'): void {
    if (ctx.user.organisationKind !== 'manufacturer' || !ctx.ability.can(action, 'Catalog') || !ctx.ability.can('update', 'Catalog')) {
      throw new ForbiddenError('Only a manufacturer admin maintains the catalogue.');
    }
  }
  function audit(t: Db, ctx: RequestContext, action: string, recordType: string, recordId: string, ip: string, detail: Record<string, unknown>): void {
    writeAudit(t, clock, { actorId: ctx.user.id, organisationId: ctx.user.organisationId, action, recordType, recordId, outcome: 'success', ip, detail });
  }

  /** Records a dated price; the first change also records the price the part had until then. */
  function recordPrice(t: Db, ctx: RequestContext, part: { id: string; listPriceCents: number }, cents: number, effectiveFrom: string): void {
    const hasHistory = t.select({ id: partPrices.id }).from(partPrices).where(eq(partPrices.partId, part.id)).get();
    if (!hasHistory && effectiveFrom > HISTORY_START) {
      t.insert(partPrices).values({ id: newId(), partId: part.id, effectiveFrom: HISTORY_START, listPriceCents: part.listPriceCents, createdBy: ctx.user.id, createdAt: now() }).run();
    }
    t.insert(partPrices)
      .values({ id: newId(), partId: part.id, effectiveFrom, listPriceCents: cents, createdBy: ctx.user.id, createdAt: now() })
      .onConflictDoUpdate({ target: [partPrices.partId, partPrices.effectiveFrom], set: { listPriceCents: cents, createdBy: ctx.user.id, createdAt: now() } })
      .run();
  }

  function recordAllowance(t: Db, ctx: RequestContext, code: { id: string; allowedHours: number }, hours: number, effectiveFrom: string): void {
    const hasHistory = t.select({ id: repairCodeAllowances.id }).from(repairCodeAllowances).where(eq(repairCodeAllowances.repairCodeId, code.id)).get();
    if (!hasHistory && effectiveFrom > HISTORY_START) {
      t.insert(repairCodeAllowances).values({ id: newId(), repairCodeId: code.id, effectiveFrom: HISTORY_START, allowedHours: code.allowedHours, createdBy: ctx.user.id, createdAt: now() }).run();
    }
    t.insert(repairCodeAllowances)
      .values({ id: newId(), repairCodeId: code.id, effectiveFrom, allowedHours: hours, createdBy: ctx.user.id, createdAt: now() })
      .onConflictDoUpdate({ target: [repairCodeAllowances.repairCodeId, repairCodeAllowances.effectiveFrom], set: { allowedHours: hours, createdBy: ctx.user.id, createdAt: now() } })
      .run();
  }

  return {
    // ------------------------------------------------------------------ families
    listFamilies(ctx: RequestContext): FamilyItem[] {
      guard(ctx, 'read');
      return listFamilies(db);
    },
    createFamily(ctx: RequestContext, body: CreateFamilyBody, ip: string): FamilyItem {
      guard(ctx, 'create');
      const id = newId();
      tx(db, (t) => {
        if (t.select({ id: productFamilies.id }).from(productFamilies).where(eq(productFamilies.code, body.code)).get()) throw duplicate('code', `A product family with code ${body.code} already exists.`);
        t.insert(productFamilies).values({ id, code: body.code, name: body.name, fuel: body.fuel, active: true, createdAt: now() }).run();
        audit(t, ctx, 'catalog.family.create', 'ProductFamily', id, ip, { ...body });
      });
      return listFamilies(db).find((f) => f.id === id) as FamilyItem;
    },
    updateFamily(ctx: RequestContext, id: string, body: UpdateFamilyBody, ip: string): FamilyItem {
      guard(ctx, 'update');
      tx(db, (t) => {
        const row = t.select().from(productFamilies).where(eq(productFamilies.id, id)).get();
        if (!row) throw new NotFoundError('No such product family.');
        const changes = diff(row, body);
        if (Object.keys(changes).length === 0) return;
        t.update(productFamilies).set(body).where(eq(productFamilies.id, id)).run();
        audit(t, ctx, body.active === false ? 'catalog.family.retire' : 'catalog.family.update', 'ProductFamily', id, ip, changes);
      });
      return listFamilies(db).find((f) => f.id === id) as FamilyItem;
    },

    // ------------------------------------------------------------------ models, component terms, reading specs
    listModels(ctx: RequestContext): ModelItem[] {
      guard(ctx, 'read');
      return listModels(db);
    },
    createModel(ctx: RequestContext, body: CreateModel, ip: string): ModelItem {
      guard(ctx, 'create');
      const id = newId();
      tx(db, (t) => {
        requireFamily(t, body.familyId);
        if (t.select({ id: models.id }).from(models).where(eq(models.modelNumber, body.modelNumber)).get()) throw duplicate('modelNumber', `Model ${body.modelNumber} already exists.`);
        checkComponentParts(t, body.componentTerms);
        const { componentTerms: comps, ...fields } = body;
        t.insert(models).values({ id, ...fields, active: true, createdAt: now(), updatedAt: now() }).run();
        for (const c of comps) t.insert(componentTerms).values({ id: newId(), modelId: id, ...c }).run();
        audit(t, ctx, 'catalog.model.create', 'Model', id, ip, { ...body });
      });
      return listModels(db, { id })[0];
    },
    /**
     * Warranty terms are effective-dated: a change applies to units shipped (or registered) on or
     * after its effective date (default today); units already shipped keep theirs. A change in
     * the past needs a reason, and the answer names the filed claims it touches.
     */
    updateModel(ctx: RequestContext, id: string, body: UpdateModel, ip: string): ModelItem {
      guard(ctx, 'update');
      const day = todayFor(db, clock, ctx.user.organisationId);
      let affectedClaims: AffectedClaims | undefined;
      tx(db, (t) => {
        const row = t.select().from(models).where(eq(models.id, id)).get();
        if (!row) throw new NotFoundError('No such model.');
        const { componentTerms: comps, termsEffectiveFrom, reason, partsMonths, laborMonths, capMonthsFromShip, installGraceDays, ...fields } = body;
        if (fields.familyId) requireFamily(t, fields.familyId);
        const changes: Record<string, unknown> = diff(row, fields);
        const termsGiven = partsMonths !== undefined || laborMonths !== undefined || capMonthsFromShip !== undefined || installGraceDays !== undefined || comps !== undefined;
        if (termsGiven) {
          const from = termsEffectiveFrom ?? day;
          const before = modelTermsOn(t, id, from)!;
          const next = {
            partsMonths: partsMonths ?? before.partsMonths,
            laborMonths: laborMonths ?? before.laborMonths,
            capMonthsFromShip: capMonthsFromShip ?? before.capMonthsFromShip,
            installGraceDays: installGraceDays ?? before.installGraceDays,
            componentTerms: comps ?? before.componentTerms,
          };
          if (next.partsMonths > next.capMonthsFromShip || next.laborMonths > next.capMonthsFromShip) throw fieldError('capMonthsFromShip', 'The cap from the ship date must be at least the parts and labor terms.');
          if (comps) checkComponentParts(t, comps);
          const { effectiveFrom: _f, ...was } = before;
          if (JSON.stringify(was) !== JSON.stringify(next) || termsEffectiveFrom !== undefined) {
            const why = requireBackdateReason(from, day, reason, 'change of warranty terms');
            const hasHistory = t.select({ id: modelTerms.id }).from(modelTerms).where(eq(modelTerms.modelId, id)).get();
            if (!hasHistory && from > HISTORY_START) {
              t.insert(modelTerms).values({ id: newId(), modelId: id, effectiveFrom: HISTORY_START, ...was, reason: null, createdBy: ctx.user.id, createdAt: now() }).run();
            }
            t.insert(modelTerms)
              .values({ id: newId(), modelId: id, effectiveFrom: from, ...next, reason: why, createdBy: ctx.user.id, createdAt: now() })
              .onConflictDoUpdate({ target: [modelTerms.modelId, modelTerms.effectiveFrom], set: { ...next, reason: why, createdBy: ctx.user.id, createdAt: now() } })
              .run();
            changes.terms = { from: was, to: next, effectiveFrom: from, ...(why ? { reason: why } : {}) };
            if (why) {
              affectedClaims = claimsAffectedByModelTerms(t, id, from);
              changes.affectedClaims = affectedClaims;
            }
          }
        }
        if (Object.keys(changes).length === 0) return;
        // the model's columns and component rows mirror the terms in force today (lists only)
        const current = modelTermsOn(t, id, day)!;
        t.update(models)
          .set({ ...fields, partsMonths: current.partsMonths, laborMonths: current.laborMonths, capMonthsFromShip: current.capMonthsFromShip, installGraceDays: current.installGraceDays, updatedAt: now() })
          .where(eq(models.id, id))
          .run();
        t.delete(componentTerms).where(eq(componentTerms.modelId, id)).run();
        for (const c of current.componentTerms) t.insert(componentTerms).values({ id: newId(), modelId: id, ...c }).run();
        audit(t, ctx, body.active === false ? 'catalog.model.retire' : 'catalog.model.update', 'Model', id, ip, changes);
      });
      const item = listModels(db, { id })[0];
      return affectedClaims ? { ...item, affectedClaims } : item;
    },
    createReadingSpec(ctx: RequestContext, modelId: string, body: CreateReadingSpec, ip: string): ReadingSpecItem {
      guard(ctx, 'create');
      const id = newId();
      tx(db, (t) => {
        if (!t.select({ id: models.id }).from(models).where(eq(models.id, modelId)).get()) throw new NotFoundError('No such model.');
        if (t.select({ id: readingSpecs.id }).from(readingSpecs).where(and(eq(readingSpecs.modelId, modelId), eq(readingSpecs.key, body.key))).get()) {
          throw duplicate('key', `This model already has a reading "${body.key}".`);
        }
        checkRepairCodes(t, body.requiredForCodes);
        t.insert(readingSpecs).values({ id, modelId, ...body }).run();
        audit(t, ctx, 'catalog.reading_spec.create', 'ReadingSpec', id, ip, { modelId, ...body });
      });
      return db.select().from(readingSpecs).where(eq(readingSpecs.id, id)).get() as ReadingSpecItem;
    },
    updateReadingSpec(ctx: RequestContext, modelId: string, specId: string, body: UpdateReadingSpecBody, ip: string): ReadingSpecItem {
      guard(ctx, 'update');
      tx(db, (t) => {
        const row = t.select().from(readingSpecs).where(and(eq(readingSpecs.id, specId), eq(readingSpecs.modelId, modelId))).get();
        if (!row) throw new NotFoundError('No such reading spec.');
        checkRepairCodes(t, body.requiredForCodes);
        const changes = diff(row, body);
        if (Object.keys(changes).length === 0) return;
        t.update(readingSpecs).set(body).where(eq(readingSpecs.id, specId)).run();
        audit(t, ctx, 'catalog.reading_spec.update', 'ReadingSpec', specId, ip, changes);
      });
      return db.select().from(readingSpecs).where(eq(readingSpecs.id, specId)).get() as ReadingSpecItem;
    },
    /** Only a reading that no claim recorded can be removed; otherwise stop requiring it. */
    deleteReadingSpec(ctx: RequestContext, modelId: string, specId: string, ip: string): void {
      guard(ctx, 'delete');
      tx(db, (t) => {
        const row = t.select().from(readingSpecs).where(and(eq(readingSpecs.id, specId), eq(readingSpecs.modelId, modelId))).get();
        if (!row) throw new NotFoundError('No such reading spec.');
        if (t.select({ id: claimReadings.id }).from(claimReadings).where(eq(claimReadings.specId, specId)).get()) {
          throw new ConflictError('Claims have recorded this reading, so it stays. Clear its repair codes to stop requiring it.', 'in_use');
        }
        t.delete(readingSpecs).where(eq(readingSpecs.id, specId)).run();
        audit(t, ctx, 'catalog.reading_spec.delete', 'ReadingSpec', specId, ip, { modelId, key: row.key });
      });
    },

    // ------------------------------------------------------------------ parts
    listParts(ctx: RequestContext): PartItem[] {
      guard(ctx, 'read');
      return listParts(db, todayFor(db, clock, ctx.user.organisationId));
    },
    createPart(ctx: RequestContext, body: CreatePart, ip: string): PartItem {
      guard(ctx, 'create');
      const id = newId();
      tx(db, (t) => {
        if (body.familyId) requireFamily(t, body.familyId);
        if (t.select({ id: parts.id }).from(parts).where(eq(parts.partNumber, body.partNumber)).get()) throw duplicate('partNumber', `Part ${body.partNumber} already exists.`);
        t.insert(parts).values({ id, ...body, active: true, createdAt: now(), updatedAt: now() }).run();
        audit(t, ctx, 'catalog.part.create', 'Part', id, ip, { ...body });
      });
      return listParts(db, todayFor(db, clock, ctx.user.organisationId), { id })[0];
    },
    /** A new list price applies to claims repaired on or after its effective date (default today). */
    updatePart(ctx: RequestContext, id: string, body: UpdatePartBody, ip: string): PartItem {
      guard(ctx, 'update');
      const day = todayFor(db, clock, ctx.user.organisationId);
      let affectedClaims: AffectedClaims | undefined;
      tx(db, (t) => {
        const row = t.select().from(parts).where(eq(parts.id, id)).get();
        if (!row) throw new NotFoundError('No such part.');
        const { listPriceCents, priceEffectiveFrom, reason, ...fields } = body;
        if (fields.familyId) requireFamily(t, fields.familyId);
        const changes: Record<string, unknown> = diff(row, fields);
        if (listPriceCents !== undefined) {
          const from = priceEffectiveFrom ?? day;
          const before = priceOn(t, id, from) as number;
          if (before !== listPriceCents || priceEffectiveFrom !== undefined) {
            const why = requireBackdateReason(from, day, reason, 'new price');
            recordPrice(t, ctx, row, listPriceCents, from);
            changes.listPriceCents = { from: before, to: listPriceCents, effectiveFrom: from, ...(why ? { reason: why } : {}) };
            if (why) changes.affectedClaims = affectedClaims = claimsAffectedByPrice(t, id, from);
          }
        }
        if (Object.keys(changes).length === 0) return;
        t.update(parts)
          .set({ ...fields, listPriceCents: priceOn(t, id, day) as number, updatedAt: now() })
          .where(eq(parts.id, id))
          .run();
        audit(t, ctx, fields.active === false ? 'catalog.part.retire' : 'catalog.part.update', 'Part', id, ip, changes);
      });
      const item = listParts(db, day, { id })[0];
      return affectedClaims ? { ...item, affectedClaims } : item;
    },

    // ------------------------------------------------------------------ repair codes
    listRepairCodes(ctx: RequestContext): RepairCodeItem[] {
      guard(ctx, 'read');
      return listRepairCodes(db, todayFor(db, clock, ctx.user.organisationId));
    },
    createRepairCode(ctx: RequestContext, body: CreateRepairCode, ip: string): RepairCodeItem {
      guard(ctx, 'create');
      const id = newId();
      tx(db, (t) => {
        requireFamily(t, body.familyId);
        if (t.select({ id: repairCodes.id }).from(repairCodes).where(eq(repairCodes.code, body.code)).get()) throw duplicate('code', `Repair code ${body.code} already exists.`);
        t.insert(repairCodes).values({ id, ...body, requiredEvidence: [...new Set(body.requiredEvidence)], active: true, createdAt: now(), updatedAt: now() }).run();
        audit(t, ctx, 'catalog.repair_code.create', 'RepairCode', id, ip, { ...body });
      });
      return listRepairCodes(db, todayFor(db, clock, ctx.user.organisationId), { id })[0];
    },
    /** A new allowance applies to claims repaired on or after its effective date (default today). */
    updateRepairCode(ctx: RequestContext, id: string, body: UpdateRepairCodeBody, ip: string): RepairCodeItem {
      guard(ctx, 'update');
      const day = todayFor(db, clock, ctx.user.organisationId);
      let affectedClaims: AffectedClaims | undefined;
      tx(db, (t) => {
        const row = t.select().from(repairCodes).where(eq(repairCodes.id, id)).get();
        if (!row) throw new NotFoundError('No such repair code.');
        const { allowedHours, allowanceEffectiveFrom, reason, ...rest } = body;
        const fields = { ...rest, ...(rest.requiredEvidence ? { requiredEvidence: [...new Set(rest.requiredEvidence)] } : {}) };
        if (fields.familyId) requireFamily(t, fields.familyId);
        const changes: Record<string, unknown> = diff(row, fields);
        if (allowedHours !== undefined) {
          const from = allowanceEffectiveFrom ?? day;
          const before = allowanceOn(t, id, from) as number;
          if (before !== allowedHours || allowanceEffectiveFrom !== undefined) {
            const why = requireBackdateReason(from, day, reason, 'new allowance');
            recordAllowance(t, ctx, row, allowedHours, from);
            changes.allowedHours = { from: before, to: allowedHours, effectiveFrom: from, ...(why ? { reason: why } : {}) };
            if (why) changes.affectedClaims = affectedClaims = claimsAffectedByAllowance(t, id, from);
          }
        }
        if (Object.keys(changes).length === 0) return;
        t.update(repairCodes)
          .set({ ...fields, allowedHours: allowanceOn(t, id, day) as number, updatedAt: now() })
          .where(eq(repairCodes.id, id))
          .run();
        audit(t, ctx, fields.active === false ? 'catalog.repair_code.retire' : 'catalog.repair_code.update', 'RepairCode', id, ip, changes);
      });
      const item = listRepairCodes(db, day, { id })[0];
      return affectedClaims ? { ...item, affectedClaims } : item;
    },
  };
}

export type CatalogService = ReturnType<typeof createCatalogService>;
