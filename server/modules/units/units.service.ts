import { eq } from 'drizzle-orm';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { todayFor } from '../../lib/business-day';
import { ForbiddenError, NotFoundError } from '../../lib/errors';
import { claims } from '../../db/schema/index';
import { computeCoverage } from '@shared/calculations/coverage';
import type { UnitLookup } from '@shared/schemas/unit';
import { listClaimsWhere } from '../claims/claims.queries';
import { findSite, findUnitBySerial, visibleSiteId } from './units.queries';
import { unitTermsOf } from '../admin/catalog.queries';

export function createUnitsService(deps: AppDeps) {
  function lookup(ctx: RequestContext, serial: string, on: string | undefined): UnitLookup {
    if (!ctx.ability.can('read', 'Unit')) throw new ForbiddenError('You may not look up units.');
    const found = serial.trim() === '' || serial.length > 60 ? undefined : findUnitBySerial(deps.db, serial);
    if (!found) throw new NotFoundError(`No unit has the serial number "${serial.trim().slice(0, 60)}". Check the serial plate and try again.`);
    const date = on ?? todayFor(deps.db, deps.clock, ctx.user.organisationId);
    // the unit's own terms: the model's terms in force on its ship (or registration) date
    const terms = unitTermsOf(deps.db, { modelId: found.model.id, shipDate: found.unit.shipDate, registeredOn: found.unit.registeredOn });
    const coverage = computeCoverage({
      failureDate: date,
      shipDate: found.unit.shipDate,
      installDate: found.unit.installDate,
      terms,
      componentTerms: terms.componentTerms,
    });
    const siteId = visibleSiteId(deps.db, { id: found.unit.id, siteId: found.siteId }, ctx.user);
    const priorClaims = listClaimsWhere(deps.db, ctx.ability, eq(claims.unitId, found.unit.id), { order: 'newest_repair', limit: 50 });
    return {
      unit: { id: found.unit.id, serial: found.unit.serial, revision: found.unit.revision, shipDate: found.unit.shipDate, installDate: found.unit.installDate },
      model: { ...found.model, partsMonths: terms.partsMonths, laborMonths: terms.laborMonths, capMonthsFromShip: terms.capMonthsFromShip, installGraceDays: terms.installGraceDays },
      terms,
      family: found.family,
      site: siteId ? findSite(deps.db, siteId) : null,
      on: date,
      coverage,
      priorClaims,
    };
  }
  return { lookup };
}
