/**
 * Payment runs: the accountant batches ready claims of one agency into a run, marks the run
 * paid with the payment date and the bank or check reference, or voids it while it is open.
 *
 * - A claim is in at most one open or paid run: the partial unique index on
 *   payment_run_items(claim_id) WHERE active = 1 refuses a second active item whatever the
 *   checks before it said; a void sets its items' active to NULL and frees the claims.
 * - Marking paid is one synchronous transaction: the run moves open -> paid only if it is still
 *   open (UPDATE ... WHERE state = 'open', exactly one row), every claim moves approved -> paid
 *   through the workflow machine with its version check and event, the remittance mail goes
 *   into the outbox. Any refusal rolls all of it back. Mail is sent after the commit.
 * - Nobody approves and pays the same claim: the payer may not be the claim's decider.
 */
import { and, desc, eq, inArray, like } from 'drizzle-orm';
import { tx, type Db } from '../../db/client';
import { claims, organisations, paymentRunItems, paymentRuns, type Claim, type PaymentRun } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { newId } from '../../lib/ids';
import { writeAudit } from '../../lib/audit';
import { AppError, ConflictError, ForbiddenError, NotFoundError, ValidationError } from '../../lib/errors';
import { paymentDateBounds, paymentDateProblem, type CreatePaymentRunInput, type MarkPaidInput, type PaymentRunAction, type PaymentRunDetail, type PaymentRunListQuery, type PaymentRunPage, type ReadyToPayResponse } from '@shared/schemas/payment';
import { organisationTimeZone } from '../../lib/business-day';
import { claimSubject } from '../claims/claims.queries';
import { payClaimFromRun } from '../claims/claims.service';
import { isLineSettled, loadPartLines } from '../part-returns/part-returns.queries';
import { claimsInActiveRuns, findReadableRun, listPaymentRuns, listReadyToPay, loadRunClaims, loadRunSummary } from './payments.queries';
import { queueRemittanceMail } from './payments.mail';

export interface Actor {
  ctx: RequestContext;
  ip?: string | null;
}

/** True when the error is SQLite refusing a unique index (directly or wrapped by Drizzle). */
function isUniqueViolation(e: unknown, index: string): boolean {
  for (let cur: unknown = e; cur && typeof cur === 'object'; cur = (cur as { cause?: unknown }).cause) {
    const { code, message } = cur as { code?: string; message?: string };
    if (code === 'SQLITE_CONSTRAINT_UNIQUE' && (message ?? '').includes(index)) return true;
    if ((cur as { cause?: unknown }).cause === cur) break;
  }
  return false;
}

export function createPaymentsService(deps: AppDeps) {
  const { db, clock } = deps;

  function audit(a: Actor, action: string, runId: string | null, outcome: 'success' | 'denied' | 'failure', detail: Record<string, unknown>) {
    writeAudit(db, clock, { actorId: a.ctx.user.id, organisationId: a.ctx.user.organisationId, action, recordType: 'payment_run', recordId: runId, outcome, ip: a.ip ?? null, detail });
  }
  function refuse(a: Actor, action: string, runId: string | null, e: AppError, detail: Record<string, unknown> = {}): AppError {
    audit(a, action, runId, 'denied', { status: e.status, code: e.code, ...detail });
    return e;
  }

  function requireRead(a: Actor) {
    if (!a.ctx.ability.can('read', 'PaymentRun')) throw new ForbiddenError('Payment runs are for the manufacturer’s accountant and agency admins.');
  }

  function readableRun(a: Actor, id: string): PaymentRun {
    requireRead(a);
    const run = findReadableRun(db, a.ctx.ability, id);
    if (!run) throw new NotFoundError('No payment run with that id.');
    return run;
  }

  function detail(a: Actor, run: PaymentRun): PaymentRunDetail {
    const allowedActions: PaymentRunAction[] = [];
    if (run.state === 'open' && a.ctx.ability.can('update', 'PaymentRun')) allowedActions.push('mark_paid', 'void');
    return { ...loadRunSummary(db, run.id), claims: loadRunClaims(db, run.id), allowedActions };
  }

  // ---- reads -------------------------------------------------------------------------------

  function ready(a: Actor): ReadyToPayResponse {
    if (!a.ctx.ability.can('create', 'PaymentRun') || !a.ctx.ability.can('pay', 'Claim')) throw new ForbiddenError('Only the manufacturer’s accountant pays claims.');
    const agencies = listReadyToPay(db, a.ctx.ability, a.ctx.user.id);
    return { agencies, claimCount: agencies.reduce((s, g) => s + g.claimCount, 0) };
  }

  function list(a: Actor, q: PaymentRunListQuery): PaymentRunPage {
    requireRead(a);
    return listPaymentRuns(db, a.ctx.ability, q);
  }

  function get(a: Actor, id: string): PaymentRunDetail {
    return detail(a, readableRun(a, id));
  }

  // ---- create ------------------------------------------------------------------------------

  /** PR-YYYY-NNNN, the next number of the year, read inside the creating transaction. */
  function nextRunNumber(t: Db): string {
    const year = clock.now().getUTCFullYear();
    const last = t
      .select({ number: paymentRuns.number })
      .from(paymentRuns)
      .where(like(paymentRuns.number, `PR-${year}-%`))
      .orderBy(desc(paymentRuns.number))
      .limit(1)
      .get();
    const n = (last ? Number(last.number.slice(8)) || 0 : 0) + 1;
    return `PR-${year}-${String(n).padStart(4, '0')}`;
  }

  /** Why a claim cannot be paid now, or null. Used when creating a run and again when paying it. */
  function payBlocker(t: Db, c: Claim, payerId: string): ConflictError | null {
    if (c.state !== 'approved') return new ConflictError(`Claim ${c.number} is ${c.state.replace('_', ' ')}, not approved; only approved claims are paid.`, 'not_payable');
    if (c.decidedBy && c.decidedBy === payerId) return new ConflictError(`Claim ${c.number} was approved by you; someone else must pay it.`, 'same_approver_and_payer');
    if (c.approvedTotalCents === null) return new ConflictError(`Claim ${c.number} has no approved total.`, 'not_payable');
    const open = loadPartLines(t, c.id).filter((l) => l.returnStatus !== 'not_required' && !isLineSettled(l));
    if (open.length > 0) {
      return new ConflictError(`Claim ${c.number} waits for the return of ${open.map((l) => l.partNumber).join(', ')}; record the part received or waive the return first.`, 'returns_outstanding');
    }
    return null;
  }

  function create(a: Actor, body: CreatePaymentRunInput): PaymentRunDetail {
    const action = 'payment_run.create';
    const { ability, user } = a.ctx;
    if (!ability.can('create', 'PaymentRun')) throw refuse(a, action, null, new ForbiddenError('Only the manufacturer’s accountant creates payment runs.'));
    const agency = db.select({ id: organisations.id, name: organisations.name }).from(organisations).where(and(eq(organisations.id, body.agencyId), eq(organisations.kind, 'agency'))).get();
    if (!agency) throw new ValidationError('Some fields need attention.', { agencyId: 'No service agency with that id.' });

    const id = newId();
    let number = '';
    try {
      tx(db, (t) => {
        const rows = t.select().from(claims).where(inArray(claims.id, body.claimIds)).all();
        const byId = new Map(rows.map((r) => [r.id, r]));
        const fields: Record<string, string> = {};
        body.claimIds.forEach((cid, i) => {
          const c = byId.get(cid);
          if (!c || !ability.can('read', claimSubject(c))) fields[`claimIds.${i}`] = 'No approved claim with this id.';
          else if (c.agencyId !== agency.id) fields[`claimIds.${i}`] = `Claim ${c.number} belongs to another agency; a run pays one agency.`;
        });
        if (Object.keys(fields).length > 0) throw new ValidationError('Some claims cannot go into this run.', fields);
        const chosen = body.claimIds.map((cid) => byId.get(cid)!);
        for (const c of chosen) {
          const blocker = payBlocker(t, c, user.id);
          if (blocker) throw blocker;
          if (!ability.can('pay', claimSubject(c))) throw new ForbiddenError('You may not pay this claim.');
        }
        const currencies = new Set(chosen.map((c) => c.currency));
        if (currencies.size > 1) throw new ConflictError('The claims are in different currencies; put each currency in its own run.', 'mixed_currency');
        const now = clock.now().toISOString();
        number = nextRunNumber(t);
        const total = chosen.reduce((s, c) => s + (c.approvedTotalCents ?? 0), 0);
        t.insert(paymentRuns)
          .values({ id, number, agencyId: agency.id, payeeName: agency.name, state: 'open', totalCents: total, currency: chosen[0].currency, createdBy: user.id, createdAt: now })
          .run();
        // The partial unique index is the guard: a claim already in an open or paid run fails here.
        for (const c of chosen) t.insert(paymentRunItems).values({ id: newId(), runId: id, claimId: c.id, amountCents: c.approvedTotalCents!, active: 1 }).run();
        writeAudit(t, clock, { actorId: user.id, organisationId: user.organisationId, action, recordType: 'payment_run', recordId: id, outcome: 'success', ip: a.ip ?? null, detail: { number, agencyId: agency.id, claims: chosen.length, totalCents: total } });
      });
    } catch (e) {
      if (isUniqueViolation(e, 'payment_run_items')) {
        const held = claimsInActiveRuns(db, body.claimIds);
        const which = held.map((h) => `${h.number} (${h.runNumber})`).join(', ');
        throw refuse(a, action, null, new ConflictError(`Already in an open or paid payment run: ${which || 'one of the claims'}.`, 'already_in_run'), { claims: body.claimIds.length });
      }
      if (e instanceof ConflictError || e instanceof ForbiddenError) throw refuse(a, action, null, e, { claims: body.claimIds.length });
      throw e;
    }
    return get(a, id);
  }

  // ---- mark paid, void ---------------------------------------------------------------------

  function requireUpdate(a: Actor, action: string, run: PaymentRun) {
    if (!a.ctx.ability.can('update', 'PaymentRun')) throw refuse(a, action, run.id, new ForbiddenError('Only the manufacturer’s accountant marks payment runs paid or voids them.'));
  }

  function stateConflict(run: Pick<PaymentRun, 'number' | 'state'>): ConflictError {
    return new ConflictError(`Payment run ${run.number} is ${run.state === 'void' ? 'voided' : 'already paid'}; only an open run can change.`, 'run_not_open');
  }

  function markPaid(a: Actor, runId: string, body: MarkPaidInput): PaymentRunDetail {
    const action = 'payment_run.paid';
    const run = readableRun(a, runId);
    requireUpdate(a, action, run);
    if (run.state !== 'open') throw refuse(a, action, run.id, stateConflict(run));
    const { user } = a.ctx;
    // not before the run was made, not later than tomorrow, in the paying organisation's days
    const dateProblem = paymentDateProblem(body.paymentDate, paymentDateBounds(run.createdAt, clock.now(), organisationTimeZone(db, user.organisationId)));
    if (dateProblem) throw new ValidationError(dateProblem, { paymentDate: dateProblem });
    let recipients: string[] = [];
    try {
      tx(db, (t) => {
        const now = clock.now().toISOString();
        const moved = t
          .update(paymentRuns)
          .set({ state: 'paid', paymentDate: body.paymentDate, reference: body.reference, paidBy: user.id, paidAt: now })
          .where(and(eq(paymentRuns.id, run.id), eq(paymentRuns.state, 'open')))
          .run();
        if (moved.changes !== 1) throw stateConflict(t.select().from(paymentRuns).where(eq(paymentRuns.id, run.id)).get() ?? run);
        const items = t.select().from(paymentRunItems).where(and(eq(paymentRunItems.runId, run.id), eq(paymentRunItems.active, 1))).all();
        if (items.length === 0) throw new ConflictError(`Payment run ${run.number} holds no claims.`, 'run_empty');
        let sum = 0;
        for (const item of items) {
          const c = t.select().from(claims).where(eq(claims.id, item.claimId)).get();
          if (!c) throw new ConflictError('A claim of this run no longer exists.', 'not_payable');
          const blocker = payBlocker(t, c, user.id);
          if (blocker) throw blocker;
          if (c.approvedTotalCents !== item.amountCents) throw new ConflictError(`Claim ${c.number}: the run's amount differs from the approved total; void the run and create it again.`, 'amount_mismatch');
          payClaimFromRun(t, deps, { id: user.id, organisationId: user.organisationId }, c.id, run.number);
          sum += item.amountCents;
        }
        if (sum !== run.totalCents) throw new ConflictError(`Payment run ${run.number}: its total differs from the sum of its claims.`, 'amount_mismatch');
        recipients = queueRemittanceMail(t, clock, {
          run: { ...run, state: 'paid', paymentDate: body.paymentDate, reference: body.reference, paidBy: user.id, paidAt: now },
          publicUrl: deps.env.PUBLIC_URL,
        }).to;
        writeAudit(t, clock, {
          actorId: user.id,
          organisationId: user.organisationId,
          action,
          recordType: 'payment_run',
          recordId: run.id,
          outcome: 'success',
          ip: a.ip ?? null,
          detail: { number: run.number, claims: items.length, totalCents: sum, paymentDate: body.paymentDate, remittanceTo: recipients.length },
        });
      });
    } catch (e) {
      if (e instanceof ConflictError) throw refuse(a, action, run.id, e);
      throw e;
    }
    deps.outbox.kick();
    return get(a, run.id);
  }

  function voidRun(a: Actor, runId: string): PaymentRunDetail {
    const action = 'payment_run.void';
    const run = readableRun(a, runId);
    requireUpdate(a, action, run);
    if (run.state !== 'open') throw refuse(a, action, run.id, stateConflict(run));
    const { user } = a.ctx;
    try {
      tx(db, (t) => {
        const now = clock.now().toISOString();
        const moved = t
          .update(paymentRuns)
          .set({ state: 'void', voidedAt: now })
          .where(and(eq(paymentRuns.id, run.id), eq(paymentRuns.state, 'open')))
          .run();
        if (moved.changes !== 1) throw stateConflict(t.select().from(paymentRuns).where(eq(paymentRuns.id, run.id)).get() ?? run);
        const freed = t.update(paymentRunItems).set({ active: null }).where(eq(paymentRunItems.runId, run.id)).run();
        writeAudit(t, clock, { actorId: user.id, organisationId: user.organisationId, action, recordType: 'payment_run', recordId: run.id, outcome: 'success', ip: a.ip ?? null, detail: { number: run.number, freed: freed.changes } });
      });
    } catch (e) {
      if (e instanceof ConflictError) throw refuse(a, action, run.id, e);
      throw e;
    }
    return get(a, run.id);
  }

  return { ready, list, get, create, markPaid, void: voidRun };
}
