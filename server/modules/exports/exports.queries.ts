import { and, asc, eq, gte, lte, sql, type SQL } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { claims, models, paymentRunItems, paymentRuns, units, users } from '../../db/schema/index';
import { abilityToSql } from '../../lib/casl-to-sql';
import type { AppAbility } from '@shared/permissions/ability';

/** The only fields a PaidClaimsExport rule may constrain. */
export const exportScopeColumns = { agencyId: claims.agencyId };

export function exportScope(ability: AppAbility): SQL {
  return abilityToSql(ability, 'export', 'PaidClaimsExport', exportScopeColumns);
}

export interface ExportFilters {
  from?: string;
  to?: string;
  agencyId?: string;
  /** Only the claims of one payment run (the remittance attachment). */
  runId?: string;
}

/**
 * The export query, built with the query builder so the CASL scope is the same condition the
 * rest of the app uses; the export runs its SQL text on its own connection with
 * `.raw().iterate()`. One row per paid claim: the claim is in exactly one
 * active item of a paid run (the partial unique index). Dates filter the run's payment date,
 * both ends inclusive. Ordered by payment date, run and claim number.
 */
export function paidClaimsQuery(db: Db, scope: SQL, f: ExportFilters) {
  const where: SQL[] = [eq(claims.state, 'paid'), eq(paymentRuns.state, 'paid'), scope];
  if (f.agencyId) where.push(eq(claims.agencyId, f.agencyId));
  if (f.runId) where.push(eq(paymentRuns.id, f.runId));
  if (f.from) where.push(gte(paymentRuns.paymentDate, f.from));
  if (f.to) where.push(lte(paymentRuns.paymentDate, f.to));
  return db
    .select({
      number: claims.number,
      // the payee as named on the run that paid the claim
      agency: paymentRuns.payeeName,
      technician: users.name,
      serial: units.serial,
      model: models.modelNumber,
      repairDate: claims.repairDate,
      run: paymentRuns.number,
      paymentDate: paymentRuns.paymentDate,
      reference: paymentRuns.reference,
      labor: sql<number>`coalesce(${claims.approvedLaborCents}, 0)`,
      travel: sql<number>`coalesce(${claims.approvedTravelCents}, 0)`,
      parts: sql<number>`coalesce(${claims.approvedPartsCents}, 0)`,
      total: sql<number>`coalesce(${claims.approvedTotalCents}, 0)`,
      currency: claims.currency,
    })
    .from(claims)
    .innerJoin(paymentRunItems, and(eq(paymentRunItems.claimId, claims.id), eq(paymentRunItems.active, 1)))
    .innerJoin(paymentRuns, eq(paymentRuns.id, paymentRunItems.runId))
    .innerJoin(users, eq(users.id, claims.technicianId))
    .leftJoin(units, eq(units.id, claims.unitId))
    .leftJoin(models, eq(models.id, units.modelId))
    .where(and(...where))
    .orderBy(asc(paymentRuns.paymentDate), asc(paymentRuns.number), asc(claims.number));
}

/** The same statement as SQL text and parameters, for a connection of its own. */
export function paidClaimsStatement(db: Db, scope: SQL, f: ExportFilters): { sql: string; params: unknown[] } {
  const built = paidClaimsQuery(db, scope, f).toSQL();
  return { sql: built.sql, params: built.params };
}
