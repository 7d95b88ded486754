import { and, asc, desc, eq, inArray, lt, or, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import type { Db } from '../../db/client';
import { claims, models, organisations, paymentRunItems, paymentRuns, units, users, type PaymentRun } from '../../db/schema/index';
import { abilityToSql } from '../../lib/casl-to-sql';
import { ValidationError } from '../../lib/errors';
import type { AppAbility } from '@shared/permissions/ability';
import type { PaymentRunClaim, PaymentRunListQuery, PaymentRunPage, PaymentRunSummary, ReadyAgencyGroup, ReadyClaim } from '@shared/schemas/payment';
import { claimScope } from '../claims/claims.queries';
import { hasUnsettledReturn, returnsSettled } from '../part-returns/part-returns.queries';

/** The only payment-run fields a CASL rule may constrain. */
export const paymentRunScopeColumns = { agencyId: paymentRuns.agencyId, id: paymentRuns.id, state: paymentRuns.state };

export function paymentRunScope(ability: AppAbility, action: 'read' | 'update' = 'read'): SQL {
  return abilityToSql(ability, action, 'PaymentRun', paymentRunScopeColumns);
}

/** The claim is in no open or paid run (an active item). */
export const notInActiveRun: SQL = sql`not exists (select 1 from ${paymentRunItems} where ${paymentRunItems.claimId} = ${claims.id} and ${paymentRunItems.active} = 1)`;

/** Approved claims that may go into a run now: returns settled, in no open or paid run. */
export const readyToPay: SQL = and(eq(claims.state, 'approved'), returnsSettled, notInActiveRun) as SQL;

const technician = alias(users, 'technician');
const creator = alias(users, 'creator');
const payer = alias(users, 'payer');

/** Ready claims the user may pay, grouped by agency (name order), oldest approval first. */
export function listReadyToPay(db: Db, ability: AppAbility, userId: string): ReadyAgencyGroup[] {
  const rows = db
    .select({
      id: claims.id,
      number: claims.number,
      agencyId: claims.agencyId,
      agencyName: organisations.name,
      technicianName: technician.name,
      unitSerial: units.serial,
      modelNumber: models.modelNumber,
      repairDate: claims.repairDate,
      decidedAt: claims.decidedAt,
      decidedBy: claims.decidedBy,
      approvedLaborCents: sql<number>`coalesce(${claims.approvedLaborCents}, 0)`,
      approvedTravelCents: sql<number>`coalesce(${claims.approvedTravelCents}, 0)`,
      approvedPartsCents: sql<number>`coalesce(${claims.approvedPartsCents}, 0)`,
      approvedTotalCents: sql<number>`coalesce(${claims.approvedTotalCents}, 0)`,
      currency: claims.currency,
    })
    .from(claims)
    .innerJoin(organisations, eq(organisations.id, claims.agencyId))
    .innerJoin(technician, eq(technician.id, claims.technicianId))
    .leftJoin(units, eq(units.id, claims.unitId))
    .leftJoin(models, eq(models.id, units.modelId))
    .where(and(claimScope(ability, 'pay'), readyToPay))
    .orderBy(asc(organisations.name), asc(claims.currency), asc(sql`coalesce(${claims.decidedAt}, '')`), asc(claims.number))
    .all();

  const held = db
    .select({ agencyId: claims.agencyId, n: sql<number>`count(*)` })
    .from(claims)
    .where(and(claimScope(ability, 'pay'), eq(claims.state, 'approved'), notInActiveRun, hasUnsettledReturn))
    .groupBy(claims.agencyId)
    .all();
  const heldBy = new Map(held.map((h) => [h.agencyId, h.n]));

  const groups = new Map<string, ReadyAgencyGroup>();
  for (const r of rows) {
    const key = `${r.agencyId}:${r.currency}`;
    let g = groups.get(key);
    if (!g) {
      g = { agencyId: r.agencyId, agencyName: r.agencyName, currency: r.currency, claimCount: 0, totalCents: 0, heldForReturns: heldBy.get(r.agencyId) ?? 0, claims: [] };
      groups.set(key, g);
    }
    const { agencyId: _a, agencyName: _n, decidedBy, ...claim } = r;
    const item: ReadyClaim = { ...claim, decidedByYou: decidedBy === userId };
    g.claims.push(item);
    g.claimCount += 1;
    g.totalCents += item.approvedTotalCents;
  }
  // Agencies with claims held only for part returns still show, with nothing to select.
  for (const h of held) {
    if ([...groups.values()].some((g) => g.agencyId === h.agencyId)) continue;
    const org = db.select({ name: organisations.name, currency: organisations.currency }).from(organisations).where(eq(organisations.id, h.agencyId)).get();
    groups.set(`${h.agencyId}:held`, { agencyId: h.agencyId, agencyName: org?.name ?? '', currency: org?.currency ?? 'USD', claimCount: 0, totalCents: 0, heldForReturns: h.n, claims: [] });
  }
  return [...groups.values()].sort((a, b) => a.agencyName.localeCompare(b.agencyName));
}

const summaryColumns = {
  id: paymentRuns.id,
  number: paymentRuns.number,
  agencyId: paymentRuns.agencyId,
  // the payee as named when the run was made, not the agency's current name
  agencyName: paymentRuns.payeeName,
  state: paymentRuns.state,
  totalCents: paymentRuns.totalCents,
  currency: paymentRuns.currency,
  claimCount: sql<number>`(select count(*) from ${paymentRunItems} where ${paymentRunItems.runId} = ${paymentRuns.id})`,
  createdAt: paymentRuns.createdAt,
  createdByName: creator.name,
  paymentDate: paymentRuns.paymentDate,
  reference: paymentRuns.reference,
  paidAt: paymentRuns.paidAt,
  paidByName: payer.name,
  voidedAt: paymentRuns.voidedAt,
};

function summaries(db: Db, where: SQL | undefined) {
  return db
    .select(summaryColumns)
    .from(paymentRuns)
    .leftJoin(creator, eq(creator.id, paymentRuns.createdBy))
    .leftJoin(payer, eq(payer.id, paymentRuns.paidBy))
    .where(where);
}

/** Opaque cursor: base64url of JSON [createdAt, id] of the last run on the page. */
function decodeCursor(raw: string): [string, string] {
  try {
    const v = JSON.parse(Buffer.from(raw, 'base64url').toString('utf8')) as unknown;
    if (Array.isArray(v) && v.length === 2 && typeof v[0] === 'string' && typeof v[1] === 'string') return [v[0], v[1]];
  } catch {
    // falls through
  }
  throw new ValidationError('Some filters are not valid.', { cursor: 'This page link is no longer valid; start from the first page.' });
}

/** Runs the user may read, newest first, keyset-paged. */
export function listPaymentRuns(db: Db, ability: AppAbility, q: PaymentRunListQuery): PaymentRunPage {
  const where: SQL[] = [paymentRunScope(ability)];
  if (q.state) where.push(eq(paymentRuns.state, q.state));
  if (q.cursor) {
    const [at, id] = decodeCursor(q.cursor);
    where.push(or(lt(paymentRuns.createdAt, at), and(eq(paymentRuns.createdAt, at), lt(paymentRuns.id, id))) as SQL);
  }
  const rows = summaries(db, and(...where))
    .orderBy(desc(paymentRuns.createdAt), desc(paymentRuns.id))
    .limit(q.limit + 1)
    .all() as PaymentRunSummary[];
  const more = rows.length > q.limit;
  const items = more ? rows.slice(0, q.limit) : rows;
  const last = items[items.length - 1];
  return { items, nextCursor: more && last ? Buffer.from(JSON.stringify([last.createdAt, last.id])).toString('base64url') : null };
}

/** One run the user may read, or undefined (404). */
export function findReadableRun(db: Db, ability: AppAbility, id: string): PaymentRun | undefined {
  return db
    .select()
    .from(paymentRuns)
    .where(and(eq(paymentRuns.id, id), paymentRunScope(ability)))
    .get();
}

export function loadRunSummary(db: Db, id: string): PaymentRunSummary {
  return summaries(db, eq(paymentRuns.id, id)).get() as PaymentRunSummary;
}

/** The claims of a run (its items, active or freed by a void), in claim-number order. */
export function loadRunClaims(db: Db, runId: string): PaymentRunClaim[] {
  return db
    .select({
      id: claims.id,
      number: claims.number,
      state: claims.state,
      technicianName: technician.name,
      unitSerial: units.serial,
      modelNumber: models.modelNumber,
      repairDate: claims.repairDate,
      approvedLaborCents: sql<number>`coalesce(${claims.approvedLaborCents}, 0)`,
      approvedTravelCents: sql<number>`coalesce(${claims.approvedTravelCents}, 0)`,
      approvedPartsCents: sql<number>`coalesce(${claims.approvedPartsCents}, 0)`,
      amountCents: paymentRunItems.amountCents,
      paidAt: claims.paidAt,
    })
    .from(paymentRunItems)
    .innerJoin(claims, eq(claims.id, paymentRunItems.claimId))
    .innerJoin(technician, eq(technician.id, claims.technicianId))
    .leftJoin(units, eq(units.id, claims.unitId))
    .leftJoin(models, eq(models.id, units.modelId))
    .where(eq(paymentRunItems.runId, runId))
    .orderBy(asc(claims.number))
    .all();
}

/** Claim numbers, among the given ids, already held by an open or paid run. */
export function claimsInActiveRuns(db: Db, claimIds: string[]): { number: string; runNumber: string }[] {
  if (claimIds.length === 0) return [];
  return db
    .select({ number: claims.number, runNumber: paymentRuns.number })
    .from(paymentRunItems)
    .innerJoin(claims, eq(claims.id, paymentRunItems.claimId))
    .innerJoin(paymentRuns, eq(paymentRuns.id, paymentRunItems.runId))
    .where(and(inArray(paymentRunItems.claimId, claimIds), eq(paymentRunItems.active, 1)))
    .all();
}
