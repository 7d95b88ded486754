/**
 * Part returns of approved claims. The agency records how each required part travels back
 * (carrier and tracking number); the manufacturer's reviewer records it received, with the
 * condition it arrived in, or waives the return with a reason. A claim is ready to pay when
 * every required return is settled (see part-returns.queries.ts).
 *
 * Who: the CASL rule `update Claim` on an approved claim, which agency admins hold for their
 * own agency (shipment) and reviewers hold for every agency (receipt, waiver); the side is
 * told apart by the user's organisation kind, so neither can do the other's step.
 */
import { and, eq } from 'drizzle-orm';
import { tx } from '../../db/client';
import { claimEvents, claimPartLines, claims, type Claim } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { organisationTimeZone } from '../../lib/business-day';
import { businessDay } from '@shared/calculations/business-day';
import { newId } from '../../lib/ids';
import { writeAudit } from '../../lib/audit';
import { AppError, ConflictError, ForbiddenError, NotFoundError } from '../../lib/errors';
import { daysBetween } from '@shared/calculations/dates';
import type { PartReturnAction, PartReturnLine, PartReturnsResponse, ReceiptInput, ShipmentInput, WaiverInput } from '@shared/schemas/payment';
import { receivedConditionLabels } from '@shared/schemas/payment';
import { claimSubject, findReadableClaim } from '../claims/claims.queries';
import { isLineSettled, loadPartLines, returnDueDate, type PartLineRow } from './part-returns.queries';

export interface Actor {
  ctx: RequestContext;
  ip?: string | null;
}

const sideOf: Record<PartReturnAction, 'agency' | 'manufacturer'> = { ship: 'agency', receive: 'manufacturer', waive: 'manufacturer' };
/** The claim event each step writes (the timeline shows "Part shipped" and so on). */
const eventType: Record<PartReturnAction, string> = { ship: 'part_shipped', receive: 'part_received', waive: 'part_return_waived' };

/**
 * A return still open: awaiting, shipped, or received without the part. Every step may follow
 * any of these: the agency may correct the tracking or ship again; the reviewer may receive a
 * late part or waive. A settled return (received, waived) takes no further step.
 */
function isOpenReturn(l: Pick<PartLineRow, 'returnStatus' | 'receivedCondition'>): boolean {
  return l.returnStatus !== 'not_required' && !isLineSettled(l);
}

export function createPartReturnsService(deps: AppDeps) {
  const { db, clock } = deps;

  function audit(a: Actor, action: string, claimId: string, outcome: 'success' | 'denied' | 'failure', detail: Record<string, unknown>) {
    writeAudit(db, clock, { actorId: a.ctx.user.id, organisationId: a.ctx.user.organisationId, action, recordType: 'claim', recordId: claimId, outcome, ip: a.ip ?? null, detail });
  }

  function refuse(a: Actor, action: string, claimId: string, e: AppError, detail: Record<string, unknown> = {}): AppError {
    audit(a, action, claimId, 'denied', { status: e.status, code: e.code, ...detail });
    return e;
  }

  function readable(a: Actor, id: string): Claim {
    const row = findReadableClaim(db, a.ctx.ability, id);
    if (!row) throw new NotFoundError('No claim with that id.');
    return row;
  }

  /** Whether the user holds the step's rule on this claim as if it were approved (the only state with returns to work). */
  function mayTakeStep(a: Actor, action: PartReturnAction, row: Claim): boolean {
    return a.ctx.user.organisationKind === sideOf[action] && a.ctx.ability.can('update', claimSubject({ ...row, state: 'approved' }));
  }

  function view(a: Actor, row: Claim): PartReturnsResponse {
    // both days in the agency's time zone: the approval's day and today
    const timeZone = organisationTimeZone(db, row.agencyId);
    const today = businessDay(clock.now(), timeZone);
    const due = row.state === 'approved' ? returnDueDate(row.decidedAt, timeZone) : null;
    const lines: PartReturnLine[] = loadPartLines(db, row.id).map((l) => {
      const settled = isLineSettled(l);
      const allowedActions =
        row.state === 'approved' ? (['ship', 'receive', 'waive'] as const).filter((s) => mayTakeStep(a, s, row) && isOpenReturn(l)) : [];
      return {
        id: l.id,
        position: l.position,
        partNumber: l.partNumber,
        description: l.description,
        quantity: l.quantity,
        returnRequired: l.returnStatus !== 'not_required',
        status: l.returnStatus,
        carrier: l.carrier,
        trackingNumber: l.trackingNumber,
        shippedAt: l.shippedAt,
        receivedAt: l.receivedAt,
        receivedCondition: l.receivedCondition,
        waiveReason: l.waiveReason,
        settled,
        overdue: !settled && due !== null && today > due,
        allowedActions: [...allowedActions],
      };
    });
    return {
      claimId: row.id,
      claimState: row.state,
      version: row.version,
      decidedAt: row.decidedAt,
      returnsSettled: row.state === 'approved' && lines.every((l) => l.settled),
      dueDate: due,
      overdueDays: due && today > due ? daysBetween(due, today) : 0,
      lines,
    };
  }

  function get(a: Actor, claimId: string): PartReturnsResponse {
    return view(a, readable(a, claimId));
  }

  /**
   * One step on one line, in one transaction: the line changes only from the status it was
   * read in, the claim's version moves on only while it is still approved, and the claim's
   * event and the audit row are written with it.
   */
  function step(a: Actor, action: PartReturnAction, claimId: string, lineId: string, apply: (line: PartLineRow) => { set: Partial<typeof claimPartLines.$inferInsert>; comment: string }) {
    const auditAction = `claim.part_return.${action}`;
    const row = readable(a, claimId);
    const forbidden =
      action === 'ship'
        ? new ForbiddenError('Only the service agency records the shipment of its returned parts.')
        : new ForbiddenError('Only a warranty reviewer records a returned part or waives a return.');
    if (!mayTakeStep(a, action, row)) throw refuse(a, auditAction, claimId, forbidden, { lineId });
    if (row.state !== 'approved') {
      throw refuse(a, auditAction, claimId, new ConflictError('Part returns are recorded only while the claim is approved and not yet paid.', 'not_approved'), { lineId, state: row.state });
    }
    const line = loadPartLines(db, claimId).find((l) => l.id === lineId);
    if (!line) throw new NotFoundError('No such part line on this claim.');
    if (line.returnStatus === 'not_required') throw refuse(a, auditAction, claimId, new ConflictError('This part does not need to be returned.', 'return_not_required'), { lineId });
    if (!isOpenReturn(line)) {
      const what = line.returnStatus === 'waived' ? 'was waived' : 'was already received';
      throw refuse(a, auditAction, claimId, new ConflictError(`The return of this part ${what}; nothing more can be recorded.`, 'return_settled'), { lineId, status: line.returnStatus });
    }
    const { set, comment } = apply(line);
    const { user } = a.ctx;
    try {
      tx(db, (t) => {
        const now = clock.now().toISOString();
        const changed = t
          .update(claimPartLines)
          .set(set)
          .where(and(eq(claimPartLines.id, lineId), eq(claimPartLines.claimId, claimId), eq(claimPartLines.returnStatus, line.returnStatus)))
          .run();
        if (changed.changes !== 1) throw new ConflictError('Someone recorded this return meanwhile. Reload the claim.', 'stale_version');
        const bumped = t
          .update(claims)
          .set({ version: row.version + 1, updatedAt: now })
          .where(and(eq(claims.id, claimId), eq(claims.version, row.version), eq(claims.state, 'approved')))
          .run();
        if (bumped.changes !== 1) throw new ConflictError('Someone changed this claim since you opened it. Reload it and try again.', 'stale_version');
        t.insert(claimEvents)
          .values({ id: newId(), claimId, actorId: user.id, organisationId: user.organisationId, type: eventType[action], fromState: 'approved', toState: 'approved', comment, at: now })
          .run();
        writeAudit(t, clock, { actorId: user.id, organisationId: user.organisationId, action: auditAction, recordType: 'claim', recordId: claimId, outcome: 'success', ip: a.ip ?? null, detail: { lineId, from: line.returnStatus, to: set.returnStatus } });
      });
    } catch (e) {
      if (e instanceof ConflictError) throw refuse(a, auditAction, claimId, e, { lineId });
      throw e;
    }
    return view(a, readable(a, claimId));
  }

  function ship(a: Actor, claimId: string, lineId: string, body: ShipmentInput) {
    return step(a, 'ship', claimId, lineId, (l) => ({
      set: { returnStatus: 'shipped', carrier: body.carrier, trackingNumber: body.trackingNumber, shippedAt: clock.now().toISOString(), receivedAt: null, receivedCondition: null },
      comment: `${l.partNumber} shipped by ${body.carrier}, tracking ${body.trackingNumber}`,
    }));
  }

  function receive(a: Actor, claimId: string, lineId: string, body: ReceiptInput) {
    return step(a, 'receive', claimId, lineId, (l) => ({
      set: { returnStatus: 'received', receivedAt: clock.now().toISOString(), receivedCondition: body.condition },
      comment: `${l.partNumber} received: ${receivedConditionLabels[body.condition]}`,
    }));
  }

  function waive(a: Actor, claimId: string, lineId: string, body: WaiverInput) {
    return step(a, 'waive', claimId, lineId, (l) => ({
      set: { returnStatus: 'waived', waiveReason: body.reason },
      comment: `${l.partNumber} return waived: ${body.reason}`,
    }));
  }

  return { get, ship, receive, waive };
}
