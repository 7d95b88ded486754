import { and, asc, eq, isNull, or, type SQL } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { componentTerms, models, parts, productFamilies, readingSpecs, repairCodes } from '../../db/schema/index';
import type { CatalogModel, CatalogPart, CatalogRepairCode } from '@shared/schemas/catalog';

export interface CatalogFilter {
  /** Family id or code. */
  family?: string;
  includeInactive: boolean;
}

function familyIdOf(db: Db, family: string | undefined): string | null | undefined {
  if (!family) return undefined;
  const row = db
    .select({ id: productFamilies.id })
    .from(productFamilies)
    .where(or(eq(productFamilies.id, family), eq(productFamilies.code, family.toUpperCase())))
    .get();
  return row ? row.id : null;
}

export function listModels(db: Db, f: CatalogFilter): CatalogModel[] {
  const familyId = familyIdOf(db, f.family);
  if (familyId === null) return [];
  const where: SQL[] = [];
  if (familyId) where.push(eq(models.familyId, familyId));
  if (!f.includeInactive) where.push(eq(models.active, true));
  const rows = db
    .select({ m: models, fam: productFamilies })
    .from(models)
    .innerJoin(productFamilies, eq(productFamilies.id, models.familyId))
    .where(where.length ? and(...where) : undefined)
    .orderBy(asc(productFamilies.code), asc(models.modelNumber))
    .all();
  const specs = db.select().from(readingSpecs).orderBy(asc(readingSpecs.key)).all();
  const comps = db.select().from(componentTerms).all();
  return rows.map(({ m, fam }) => ({
    id: m.id,
    modelNumber: m.modelNumber,
    name: m.name,
    family: { id: fam.id, code: fam.code, name: fam.name, fuel: fam.fuel },
    partsMonths: m.partsMonths,
    laborMonths: m.laborMonths,
    capMonthsFromShip: m.capMonthsFromShip,
    installGraceDays: m.installGraceDays,
    active: m.active,
    readingSpecs: specs
      .filter((s) => s.modelId === m.id)
      .map((s) => ({ id: s.id, key: s.key, label: s.label, unit: s.unit, nominal: s.nominal, tolerance: s.tolerance, phase: s.phase, requiredForCodes: s.requiredForCodes })),
    componentTerms: comps.filter((c) => c.modelId === m.id).map((c) => ({ partId: c.partId, label: c.label, partsMonths: c.partsMonths })),
  }));
}

export function listParts(db: Db, f: CatalogFilter): CatalogPart[] {
  const familyId = familyIdOf(db, f.family);
  if (familyId === null) return [];
  const where: SQL[] = [];
  // parts without a family fit every family (fasteners, cords)
  if (familyId) where.push(or(eq(parts.familyId, familyId), isNull(parts.familyId)) as SQL);
  if (!f.includeInactive) where.push(eq(parts.active, true));
  return db
    .select({
      id: parts.id,
      partNumber: parts.partNumber,
      description: parts.description,
      familyId: parts.familyId,
      familyCode: productFamilies.code,
      listPriceCents: parts.listPriceCents,
      returnRequired: parts.returnRequired,
      active: parts.active,
    })
    .from(parts)
    .leftJoin(productFamilies, eq(productFamilies.id, parts.familyId))
    .where(where.length ? and(...where) : undefined)
    .orderBy(asc(parts.partNumber))
    .all();
}

export function listRepairCodes(db: Db, f: CatalogFilter): CatalogRepairCode[] {
  const familyId = familyIdOf(db, f.family);
  if (familyId === null) return [];
  const where: SQL[] = [];
  if (familyId) where.push(eq(repairCodes.familyId, familyId));
  if (!f.includeInactive) where.push(eq(repairCodes.active, true));
  return db
    .select({
      id: repairCodes.id,
      code: repairCodes.code,
      description: repairCodes.description,
      familyId: repairCodes.familyId,
      familyCode: productFamilies.code,
      allowedHours: repairCodes.allowedHours,
      requiredEvidence: repairCodes.requiredEvidence,
      active: repairCodes.active,
    })
    .from(repairCodes)
    .innerJoin(productFamilies, eq(productFamilies.id, repairCodes.familyId))
    .where(where.length ? and(...where) : undefined)
    .orderBy(asc(repairCodes.code))
    .all();
}
