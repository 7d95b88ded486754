import { and, desc, eq, isNotNull, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { claims, componentTerms, models, productFamilies, sites, units } from '../../db/schema/index';

/** A unit by serial (exact, then ignoring case) with its model, family and site. Units are catalogue data, not tenant-owned. */
export function findUnitBySerial(db: Db, serial: string) {
  const base = () =>
    db
      .select({
        unit: { id: units.id, serial: units.serial, revision: units.revision, shipDate: units.shipDate, installDate: units.installDate, registeredOn: units.registeredOn },
        model: {
          id: models.id,
          modelNumber: models.modelNumber,
          name: models.name,
          partsMonths: models.partsMonths,
          laborMonths: models.laborMonths,
          capMonthsFromShip: models.capMonthsFromShip,
          installGraceDays: models.installGraceDays,
        },
        family: { id: productFamilies.id, code: productFamilies.code, name: productFamilies.name, fuel: productFamilies.fuel },
        siteId: units.siteId,
      })
      .from(units)
      .innerJoin(models, eq(models.id, units.modelId))
      .innerJoin(productFamilies, eq(productFamilies.id, models.familyId));
  const s = serial.trim();
  return base().where(eq(units.serial, s)).get() ?? base().where(sql`lower(${units.serial}) = lower(${s})`).get();
}

export function findSite(db: Db, siteId: string) {
  return (
    db
      .select({
        id: sites.id,
        name: sites.name,
        addressLine: sites.addressLine,
        city: sites.city,
        region: sites.region,
        postalCode: sites.postalCode,
        latitude: sites.latitude,
        longitude: sites.longitude,
      })
      .from(sites)
      .where(eq(sites.id, siteId))
      .get() ?? null
  );
}

export function componentTermsOf(db: Db, modelId: string) {
  return db.select({ partId: componentTerms.partId, partsMonths: componentTerms.partsMonths, label: componentTerms.label }).from(componentTerms).where(eq(componentTerms.modelId, modelId)).all();
}

export interface SiteViewer {
  organisationKind: 'manufacturer' | 'agency';
  organisationId: string;
}

/**
 * The site a user may learn for a unit. An agency learns it from its own claims on the unit (the
 * latest repair that carries a site) or from the manufacturer's registration (units.site_id, which
 * only the manufacturer's data writes); never from another agency's claims, which would tell it
 * where that agency works. The manufacturer sees the registration, else the latest claim's site.
 * Walks claims_unit_idx (unit_id, repair_date): a handful of rows per unit.
 */
export function visibleSiteId(db: Db, unit: { id: string; siteId: string | null }, viewer: SiteViewer): string | null {
  const own = viewer.organisationKind === 'agency';
  if (!own && unit.siteId) return unit.siteId;
  const fromClaims = db
    .select({ siteId: claims.siteId })
    .from(claims)
    .where(and(eq(claims.unitId, unit.id), isNotNull(claims.siteId), own ? eq(claims.agencyId, viewer.organisationId) : undefined))
    .orderBy(desc(claims.repairDate), desc(claims.createdAt))
    .limit(1)
    .get();
  return fromClaims?.siteId ?? unit.siteId ?? null;
}
