import { eq, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { componentTerms, models, productFamilies, sites, units } from '../../db/schema/index';

/** A unit by serial (exact, then ignoring case) with its model, family and site. Units are catalogue data, not tenant-owned. */
export function findUnitBySerial(db: Db, serial: string) {
  const base = () =>
    db
      .select({
        unit: { id: units.id, serial: units.serial, revision: units.revision, shipDate: units.shipDate, installDate: units.installDate },
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
