import { eq } from 'drizzle-orm';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { todayFor } from '../../lib/business-day';
import { ForbiddenError, NotFoundError } from '../../lib/errors';
import { claims } from '../../db/schema/index';
import { computeCoverage } from '@shared/calculations/coverage';
import type { UnitLookup } from '@shared/schemas/unit';
import { listClaimsWhere } from '../claims/claims.queries';
import { componentTermsOf, findSite, findUnitBySerial, visibleSiteId } from './units.queries';

export function createUnitsService(deps: AppDeps) {
  function lookup(ctx: RequestContext, serial: string, on: string | undefined): UnitLookup {
    if (!ctx.ability.can('read', 'Unit')) throw new ForbiddenError('You may not look up units.');
    const found = serial.trim() === '' || serial.length > 60 ? undefined : findUnitBySerial(deps.db, serial);
    if (!found) throw new NotFoundError(`No unit has the serial number "${serial.trim().slice(0, 60)}". Check the serial plate and try again.`);
    const date = on ?? todayFor(deps.db, deps.clock, ctx.user.organisationId);
    const coverage = computeCoverage({
      failureDate: date,
      shipDate: found.unit.shipDate,
      installDate: found.unit.installDate,
      terms: found.model,
      componentTerms: componentTermsOf(deps.db, found.model.id),
    });
    const siteId = visibleSiteId(deps.db, { id: found.unit.id, siteId: found.siteId }, ctx.user);
    const priorClaims = listClaimsWhere(deps.db, ctx.ability, eq(claims.unitId, found.unit.id), { order: 'newest_repair', limit: 50 });
    return {
      unit: found.unit,
      model: found.model,
      family: found.family,
      site: siteId ? findSite(deps.db, siteId) : null,
      on: date,
      coverage,
      priorClaims,
    };
  }
  return { lookup };
}
