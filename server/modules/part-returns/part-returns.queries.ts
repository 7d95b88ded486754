/**
 * SQL conditions over `claims` about part returns, shared by the ready-to-pay list, payment
 * runs and the home cards, so "ready to pay" and "overdue" mean one thing everywhere.
 *
 * A required return is settled when the part was received in a condition other than
 * "not in the shipment", or the reviewer waived it. Lines that need no return are settled.
 */
import { asc, eq, or, sql, type SQL } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { claimPartLines, claims, organisations, parts } from '../../db/schema/index';
import { addDays } from '@shared/calculations/dates';
import { businessDay, startOfBusinessDay } from '@shared/calculations/business-day';
import { PART_RETURN_OVERDUE_DAYS } from '@shared/schemas/payment';

/** The line-level test, on a `claim_part_lines` row aliased as the table itself. */
const unsettledLine = sql`(${claimPartLines.returnStatus} in ('awaiting', 'shipped') or (${claimPartLines.returnStatus} = 'received' and ${claimPartLines.receivedCondition} = 'not_returned'))`;

/** The claim has at least one required return that is not settled. */
export const hasUnsettledReturn: SQL = sql`exists (select 1 from ${claimPartLines} where ${claimPartLines.claimId} = ${claims.id} and ${unsettledLine})`;

/** Every required return of the claim is settled (true for claims without such parts). */
export const returnsSettled: SQL = sql`not ${hasUnsettledReturn}`;

/**
 * The last day an unsettled return of a claim approved at the instant `decidedAt` is on time:
 * the approval's business day in the agency's time zone + PART_RETURN_OVERDUE_DAYS.
 */
export function returnDueDate(decidedAt: string | null, timeZone: string): string | null {
  return decidedAt ? addDays(businessDay(decidedAt, timeZone), PART_RETURN_OVERDUE_DAYS) : null;
}

/**
 * Approved claims with an unsettled required return, approved more than the window ago:
 * approval day + PART_RETURN_OVERDUE_DAYS < today, both days in the claim's agency's time
 * zone. Per zone in use by agencies (a handful), that is `decided_at` before the first instant
 * of the local day (today - window), so the test stays a range on the stored UTC instant.
 */
export function overdueReturns(db: Db, now: Date): SQL {
  const zones = db.selectDistinct({ tz: organisations.timeZone }).from(organisations).where(eq(organisations.kind, 'agency')).all().map((r) => r.tz);
  const byZone = zones.map((tz) => {
    const cutoff = startOfBusinessDay(addDays(businessDay(now, tz), -PART_RETURN_OVERDUE_DAYS), tz);
    return sql`(${claims.agencyId} in (select ${organisations.id} from ${organisations} where ${organisations.timeZone} = ${tz}) and ${claims.decidedAt} < ${cutoff})`;
  });
  const inTime = byZone.length > 0 ? (or(...byZone) as SQL) : sql`0`;
  return sql`(${claims.state} = 'approved' and ${claims.decidedAt} is not null and ${inTime} and ${hasUnsettledReturn})`;
}

export type PartLineRow = {
  id: string;
  position: number;
  partNumber: string;
  description: string;
  quantity: number;
  returnRequired: boolean;
  returnStatus: (typeof claimPartLines.$inferSelect)['returnStatus'];
  carrier: string | null;
  trackingNumber: string | null;
  shippedAt: string | null;
  receivedAt: string | null;
  receivedCondition: (typeof claimPartLines.$inferSelect)['receivedCondition'];
  waiveReason: string | null;
};

export function loadPartLines(db: Db, claimId: string): PartLineRow[] {
  return db
    .select({
      id: claimPartLines.id,
      position: claimPartLines.position,
      partNumber: parts.partNumber,
      description: parts.description,
      quantity: claimPartLines.quantity,
      returnRequired: parts.returnRequired,
      returnStatus: claimPartLines.returnStatus,
      carrier: claimPartLines.carrier,
      trackingNumber: claimPartLines.trackingNumber,
      shippedAt: claimPartLines.shippedAt,
      receivedAt: claimPartLines.receivedAt,
      receivedCondition: claimPartLines.receivedCondition,
      waiveReason: claimPartLines.waiveReason,
    })
    .from(claimPartLines)
    .innerJoin(parts, eq(parts.id, claimPartLines.partId))
    .where(eq(claimPartLines.claimId, claimId))
    .orderBy(asc(claimPartLines.position))
    .all();
}

/** The JS twin of the SQL test, for one line. */
export function isLineSettled(l: Pick<PartLineRow, 'returnStatus' | 'receivedCondition'>): boolean {
  if (l.returnStatus === 'awaiting' || l.returnStatus === 'shipped') return false;
  if (l.returnStatus === 'received' && l.receivedCondition === 'not_returned') return false;
  return true;
}
