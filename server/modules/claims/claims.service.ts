/**
 * The rules of claims: who may create, edit, move, adjust and comment, and what each write
 * stores. Every write is one synchronous transaction with its event row, audit row and outbox
 * mail; mail is sent after the commit.
 */
import { and, desc, eq, like, ne, sql } from 'drizzle-orm';
import { tx, type Db } from '../../db/client';
import {
  approvalLimits,
  claimCounters,
  claimEvents,
  claimLaborLines,
  claimPartLines,
  claimReadings,
  claimTravel,
  claims,
  comments,
  models,
  organisations,
  parts,
  readingSpecs,
  repairCodes,
  units,
  users,
  type Claim,
  type NewClaim,
} from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { newId } from '../../lib/ids';
import { writeAudit } from '../../lib/audit';
import { AppError, ConflictError, ForbiddenError, NotFoundError, ValidationError } from '../../lib/errors';
import type { Action, ClaimAction } from '@shared/permissions/ability';
import type { ClaimDetail, ClaimDraftInput, ClaimListQuery, ClaimValuationBasis } from '@shared/schemas/claim';
import { FLAG_INFO, isFlagCode } from '@shared/calculations/flags';
import { areCompatible } from '@shared/calculations/units';
import { actionToEvent, allowedEvents, editableStates, eventsFromState, isEditable, nextState, statesAllowing, type ClaimEvent } from '@shared/workflow/claim-machine';
import { isReasonFor, reasonCodesFor, reasonLabel } from '@shared/workflow/reason-codes';
import { problemsAsFields } from '@shared/workflow/submit-validation';
import type { AdjustmentsInput, CommentInput, TakeOverInput, TransitionInput } from '@shared/workflow/workflow-schemas';
import { claimSubject, findReadableClaim, listClaims, listClaimsWhere, loadClaimDetail, type ClaimListPage } from './claims.queries';
import { diffSnapshots, submissionSnapshot, type SubmissionSnapshot } from '@shared/workflow/submission-diff';
import type { ClaimListItem } from '@shared/schemas/claim';
import type { SubmissionChanges } from '@shared/schemas/claim-history';
import { evaluateClaim, loadClaimInputs, valuationInputOf, valueFromInputs, type ClaimInputs } from './valuation.builder';
import type { Valuation } from '@shared/calculations/valuation';
import { claimLink, queueMoveMail, queueReviewHandMail } from './claims.mail';
import { formatCents } from '@shared/calculations/money';
import { enqueueMail } from '../../lib/mail/outbox';
import { flagsForViewer } from '../attachments/attachments.flags';
import { visibleSiteId } from '../units/units.queries';

export interface Actor {
  ctx: RequestContext;
  ip?: string | null;
}

const notFound = () => new NotFoundError('No claim with that id.');

export function createClaimsService(deps: AppDeps) {
  const { db, clock } = deps;
  /** Now, as an instant: the computation reads it as the day it is in the claim's agency's time zone. */
  const today = () => clock.now();

  function audit(a: Actor, action: string, recordId: string | null, outcome: 'success' | 'failure' | 'denied', detail?: Record<string, unknown>) {
    writeAudit(db, clock, {
      actorId: a.ctx.user.id,
      organisationId: a.ctx.user.organisationId,
      action,
      recordType: 'claim',
      recordId,
      outcome,
      ip: a.ip ?? null,
      detail: detail ?? null,
    });
  }

  /** Writes the audit row of a refused write, then returns the error to throw. */
  function refuse(a: Actor, action: string, claimId: string | null, error: AppError, detail: Record<string, unknown> = {}): AppError {
    audit(a, action, claimId, 'denied', { status: error.status, code: error.code, ...detail });
    return error;
  }

  const can = (a: Actor, action: Action, row: Claim) => a.ctx.ability.can(action, claimSubject(row));
  /**
   * Whether the user could take this action on this claim in some state where it is possible:
   * false means the user is never allowed (403); true with the claim in another state means
   * the move is refused now (409), e.g. a replayed approval.
   */
  const couldAct = (a: Actor, action: Action, row: Claim, states: readonly Claim['state'][]) => states.some((state) => a.ctx.ability.can(action, claimSubject({ ...row, state })));

  function readable(a: Actor, id: string): Claim {
    const row = findReadableClaim(db, a.ctx.ability, id);
    if (!row) throw notFound();
    return row;
  }

  /** The claim a write aims at: one the user may not read answers 404 and leaves a denied audit row. */
  function writable(a: Actor, action: string, id: string): Claim {
    const row = findReadableClaim(db, a.ctx.ability, id);
    if (!row) throw refuse(a, action, id.slice(0, 64), notFound());
    return row;
  }

  // ---- reads -------------------------------------------------------------------------------

  function list(a: Actor, q: ClaimListQuery): ClaimListPage {
    return listClaims(db, a.ctx.ability, q);
  }

  function detailOf(a: Actor, row: Claim): ClaimDetail {
    const data = loadClaimDetail(db, row);
    const { facts } = evaluateClaim(db, row, today());
    const { user } = a.ctx;
    const held = heldByAnother(a, row) !== null;
    const confirmable = !!row.firstApprovedBy && row.firstApprovedBy !== user.id;
    // a review held by another reviewer offers only the take-over (and a confirmation of a first approval)
    const allowedActions = allowedEvents(row.state, facts)
      .filter((action) => can(a, action, row))
      .filter((action) => !held || (action === 'approve' && confirmable))
      .filter((action) => !(action === 'approve' && row.firstApprovedBy === user.id));
    const firstApproval = data.firstApproval ? { ...data.firstApproval, byYou: row.firstApprovedBy === user.id } : null;
    return {
      ...data,
      flags: flagsForViewer(a.ctx.ability, data.flags),
      firstApproval,
      heldByYou: row.state === 'in_review' && row.reviewerId === user.id,
      canTakeOver: held && can(a, 'adjust', row),
      allowedActions,
    };
  }

  function get(a: Actor, id: string): ClaimDetail {
    return detailOf(a, readable(a, id));
  }

  /**
   * The other claims on this claim's unit that the user may read (every agency for the
   * manufacturer's reviewers), newest repair first: scoped by the CASL rules in SQL and served
   * by the (unit_id, repair_date) index.
   */
  function unitClaims(a: Actor, id: string): { items: ClaimListItem[] } {
    const row = readable(a, id);
    if (!row.unitId) return { items: [] };
    return { items: listClaimsWhere(db, a.ctx.ability, and(eq(claims.unitId, row.unitId), ne(claims.id, row.id)), { order: 'newest_repair', limit: 50 }) };
  }

  /** What changed between the last two submissions of the claim (field, before, after); empty before a resubmission. */
  function submissionChanges(a: Actor, id: string): SubmissionChanges {
    const row = readable(a, id);
    const last = db
      .select({ at: claimEvents.at, snapshot: claimEvents.snapshot })
      .from(claimEvents)
      .where(and(eq(claimEvents.claimId, row.id), eq(claimEvents.type, 'submit')))
      .orderBy(desc(claimEvents.at), desc(sql`${claimEvents}.rowid`))
      .limit(2)
      .all();
    const [latest, previous] = last;
    if (!latest || !previous) return { submissions: last.length, previousAt: null, latestAt: latest?.at ?? null, changes: [] };
    if (!latest.snapshot || !previous.snapshot) return { submissions: last.length, previousAt: previous.at, latestAt: latest.at, changes: [], unrecorded: true };
    return { submissions: last.length, previousAt: previous.at, latestAt: latest.at, changes: diffSnapshots(previous.snapshot as SubmissionSnapshot, latest.snapshot as SubmissionSnapshot) };
  }

  /**
   * The valuation with the claim's id, version and state beside it. A claim that cannot be
   * valued yet (no unit, no dates, no contract terms on the repair date) answers 409 with the
   * missing inputs as field errors.
   */
  function valuation(a: Actor, id: string): Valuation & { claimId: string; version: number; state: Claim['state'] } {
    const row = readable(a, id);
    const result = valueFromInputs(loadClaimInputs(db, row), today());
    if (!result.valuation) {
      const fields: Record<string, string> = {};
      for (const p of result.problems) if (!fields[p.path]) fields[p.path] = p.message;
      throw new AppError(409, 'valuation_unavailable', `The claim cannot be valued yet. ${result.problems.map((p) => p.message).join(' ')}`.trim(), fields);
    }
    return { claimId: row.id, version: row.version, state: row.state, ...result.valuation };
  }

  /**
   * The valuation input of the claim as stored (contract terms in force on the repair date,
   * warranty terms, coordinates, certifications, prior repairs), so the form's live preview
   * runs the same computation in the browser over the lines being typed. Null with the
   * missing inputs as problems while the claim cannot be valued yet.
   */
  function valuationBasis(a: Actor, id: string): ClaimValuationBasis {
    const row = readable(a, id);
    const { input, problems } = valuationInputOf(loadClaimInputs(db, row), today());
    return { claimId: row.id, version: row.version, input, problems };
  }

  // ---- drafts ------------------------------------------------------------------------------

  function findUnit(t: Db, serial: string) {
    const s = serial.trim();
    const cols = { id: units.id, siteId: units.siteId, modelId: units.modelId, familyId: models.familyId };
    return (
      t.select(cols).from(units).innerJoin(models, eq(models.id, units.modelId)).where(eq(units.serial, s)).get() ??
      t.select(cols).from(units).innerJoin(models, eq(models.id, units.modelId)).where(sql`lower(${units.serial}) = lower(${s})`).get()
    );
  }

  type UnitRef = NonNullable<ReturnType<typeof findUnit>>;

  /** Checks every id the body refers to, so a bad reference is a 400 on its field, never a 500. */
  function checkReferences(t: Db, body: ClaimDraftInput, unit: UnitRef | null) {
    const fields: Record<string, string> = {};
    (body.laborLines ?? []).forEach((l, i) => {
      const rc = t.select({ familyId: repairCodes.familyId, active: repairCodes.active }).from(repairCodes).where(eq(repairCodes.id, l.repairCodeId)).get();
      if (!rc || !rc.active) fields[`laborLines.${i}.repairCodeId`] = 'Choose a repair code from the list.';
      else if (unit && rc.familyId !== unit.familyId) fields[`laborLines.${i}.repairCodeId`] = 'This repair code is for another product family than the unit.';
    });
    (body.partLines ?? []).forEach((p, i) => {
      const part = t.select({ familyId: parts.familyId, active: parts.active }).from(parts).where(eq(parts.id, p.partId)).get();
      if (!part || !part.active) fields[`partLines.${i}.partId`] = 'Choose a part from the catalogue.';
      else if (unit && part.familyId !== null && part.familyId !== unit.familyId) fields[`partLines.${i}.partId`] = 'This part is for another product family than the unit.';
    });
    const seen = new Set<string>();
    (body.readings ?? []).forEach((r, i) => {
      const k = `${r.key}:${r.phase}`;
      if (seen.has(k)) fields[`readings.${i}.key`] = 'This reading is entered twice for the same phase.';
      seen.add(k);
      const spec = unit ? t.select({ unit: readingSpecs.unit, label: readingSpecs.label }).from(readingSpecs).where(and(eq(readingSpecs.modelId, unit.modelId), eq(readingSpecs.key, r.key))).get() : undefined;
      if (spec && !areCompatible(r.unit, spec.unit)) fields[`readings.${i}.unit`] = `${spec.label} is measured in ${spec.unit}; enter it in a unit that converts to ${spec.unit}.`;
    });
    if (Object.keys(fields).length > 0) throw new ValidationError('Some fields need attention.', fields);
  }

  /** Replaces the lines the body carries (each list only when present), all in the caller's transaction. */
  function writeLines(t: Db, claimId: string, body: ClaimDraftInput, modelId: string | null) {
    const now = clock.now().toISOString();
    if (body.laborLines !== undefined) {
      t.delete(claimLaborLines).where(eq(claimLaborLines.claimId, claimId)).run();
      body.laborLines.forEach((l, i) =>
        t.insert(claimLaborLines).values({ id: newId(), claimId, position: i + 1, repairCodeId: l.repairCodeId, hoursWorked: l.hoursWorked, overtime: l.overtime ?? false, note: l.note ?? '' }).run(),
      );
    }
    if (body.travel !== undefined) {
      t.delete(claimTravel).where(eq(claimTravel.claimId, claimId)).run();
      if (body.travel) t.insert(claimTravel).values({ id: newId(), claimId, roundTripMiles: body.travel.roundTripMiles, travelHours: body.travel.travelHours }).run();
    }
    if (body.partLines !== undefined) {
      t.delete(claimPartLines).where(eq(claimPartLines.claimId, claimId)).run();
      body.partLines.forEach((p, i) => {
        const part = t.select({ returnRequired: parts.returnRequired }).from(parts).where(eq(parts.id, p.partId)).get();
        t.insert(claimPartLines)
          .values({ id: newId(), claimId, position: i + 1, partId: p.partId, quantity: p.quantity, returnStatus: part?.returnRequired ? 'awaiting' : 'not_required' })
          .run();
      });
    }
    if (body.readings !== undefined) {
      t.delete(claimReadings).where(eq(claimReadings.claimId, claimId)).run();
      for (const r of body.readings) {
        const spec = modelId ? t.select({ id: readingSpecs.id }).from(readingSpecs).where(and(eq(readingSpecs.modelId, modelId), eq(readingSpecs.key, r.key))).get() : undefined;
        t.insert(claimReadings).values({ id: newId(), claimId, specId: spec?.id ?? null, key: r.key, phase: r.phase, value: r.value, unit: r.unit, createdAt: now }).run();
      }
    }
  }

  /** The scalar fields of the body, allow-listed one by one. */
  function scalarFields(body: ClaimDraftInput): Partial<NewClaim> {
    const set: Partial<NewClaim> = {};
    if (body.complaint !== undefined) set.complaint = body.complaint;
    if (body.cause !== undefined) set.cause = body.cause;
    if (body.correction !== undefined) set.correction = body.correction;
    if (body.failureDate !== undefined) set.failureDate = body.failureDate;
    if (body.repairDate !== undefined) set.repairDate = body.repairDate;
    if (body.preAuthorization !== undefined) set.preAuthorization = body.preAuthorization && body.preAuthorization !== '' ? body.preAuthorization : null;
    return set;
  }

  /** FP-YYYY-NNNNNN from the year's counter, never behind a number already used. */
  function nextNumber(t: Db): string {
    const year = clock.now().getUTCFullYear();
    const counter = t.select({ next: claimCounters.next }).from(claimCounters).where(eq(claimCounters.year, year)).get();
    const last = t
      .select({ number: claims.number })
      .from(claims)
      .where(like(claims.number, `FP-${year}-%`))
      .orderBy(desc(claims.number))
      .limit(1)
      .get();
    const used = last ? Number(last.number.slice(8)) || 0 : 0;
    const n = Math.max(counter?.next ?? 1, used + 1);
    t.insert(claimCounters)
      .values({ year, next: n + 1 })
      .onConflictDoUpdate({ target: claimCounters.year, set: { next: n + 1 } })
      .run();
    return `FP-${year}-${String(n).padStart(6, '0')}`;
  }

  function create(a: Actor, body: ClaimDraftInput & { serial: string }): ClaimDetail {
    const { user, ability } = a.ctx;
    const agencyId = user.organisationId;
    if (user.organisationKind !== 'agency' || !ability.can('create', claimSubject({ agencyId, technicianId: user.id, state: 'draft' }))) {
      throw refuse(a, 'claim.create', null, new ForbiddenError('Only service agency users file claims.'));
    }
    const unit = findUnit(db, body.serial);
    if (!unit) throw new ValidationError('Some fields need attention.', { serial: 'No unit has this serial number. Check the serial plate.' });
    checkReferences(db, body, unit);
    const id = newId();
    const row = tx(db, (t) => {
      const now = clock.now().toISOString();
      const number = nextNumber(t);
      t.insert(claims)
        .values({
          ...scalarFields(body),
          id,
          number,
          agencyId,
          technicianId: user.id,
          unitId: unit.id,
          // only a site this agency may know: its own claims' or the manufacturer's registration
          siteId: visibleSiteId(t, unit, { organisationKind: 'agency', organisationId: agencyId }),
          state: 'draft',
          version: 1,
          currency: t.select({ currency: organisations.currency }).from(organisations).where(eq(organisations.id, agencyId)).get()?.currency ?? 'USD',
          createdAt: now,
          updatedAt: now,
        })
        .run();
      writeLines(t, id, body, unit.modelId);
      t.insert(claimEvents).values({ id: newId(), claimId: id, actorId: user.id, organisationId: agencyId, type: 'created', fromState: null, toState: 'draft', at: now }).run();
      writeAudit(t, clock, { actorId: user.id, organisationId: agencyId, action: 'claim.create', recordType: 'claim', recordId: id, outcome: 'success', ip: a.ip ?? null, detail: { number } });
      return t.select().from(claims).where(eq(claims.id, id)).get()!;
    });
    return detailOf(a, row);
  }

  function update(a: Actor, id: string, body: ClaimDraftInput & { version: number }): ClaimDetail {
    const row = writable(a, 'claim.update', id);
    if (!couldAct(a, 'update', row, editableStates)) throw refuse(a, 'claim.update', id, new ForbiddenError('You may not edit this claim.'));
    if (!isEditable(row.state)) throw refuse(a, 'claim.update', id, new ConflictError('Only a draft or a returned claim can be edited.', 'not_editable'));
    if (row.version !== body.version) throw refuse(a, 'claim.update', id, staleError());
    if (!can(a, 'update', row)) throw refuse(a, 'claim.update', id, new ForbiddenError('You may not edit this claim.'));
    let unit: UnitRef | null = null;
    if (body.serial !== undefined && body.serial.trim() !== '') {
      unit = findUnit(db, body.serial) ?? null;
      if (!unit) throw new ValidationError('Some fields need attention.', { serial: 'No unit has this serial number. Check the serial plate.' });
    } else if (row.unitId) {
      unit = db.select({ id: units.id, siteId: units.siteId, modelId: units.modelId, familyId: models.familyId }).from(units).innerJoin(models, eq(models.id, units.modelId)).where(eq(units.id, row.unitId)).get() ?? null;
    }
    checkReferences(db, body, unit);
    const updated = tx(db, (t) => {
      const now = clock.now().toISOString();
      const set: Partial<NewClaim> = { ...scalarFields(body), version: row.version + 1, updatedAt: now };
      if (body.serial !== undefined) {
        set.unitId = unit && body.serial.trim() !== '' ? unit.id : null;
        set.siteId = unit && body.serial.trim() !== '' ? visibleSiteId(t, unit, { organisationKind: 'agency', organisationId: row.agencyId }) : null;
      }
      const r = t
        .update(claims)
        .set(set)
        .where(and(eq(claims.id, id), eq(claims.version, body.version), eq(claims.state, row.state)))
        .run();
      if (r.changes !== 1) throw staleError();
      writeLines(t, id, body, set.unitId === null ? null : (unit?.modelId ?? null));
      return t.select().from(claims).where(eq(claims.id, id)).get()!;
    });
    return detailOf(a, updated);
  }

  // ---- workflow ----------------------------------------------------------------------------

  function staleError() {
    return new ConflictError('Someone changed this claim since you opened it. Reload it and try again.', 'stale_version');
  }

  function transition(a: Actor, id: string, body: TransitionInput): ClaimDetail {
    const action = body.type as ClaimAction;
    const type = actionToEvent[action];
    const auditAction = `claim.${action}`;
    const row = writable(a, auditAction, id);
    const detail = { from: row.state, version: body.version };
    const forbidden = () => new ForbiddenError('You may not make this move on this claim.');
    if (!couldAct(a, action, row, statesAllowing(type))) throw refuse(a, auditAction, id, forbidden(), detail);
    if (row.version !== body.version) throw refuse(a, auditAction, id, staleError(), detail);
    if (!eventsFromState(row.state).includes(type)) {
      throw refuse(a, auditAction, id, new ConflictError(`A claim that is ${row.state.replace('_', ' ')} cannot take this move.`, 'transition_refused'), detail);
    }
    if (!can(a, action, row)) throw refuse(a, auditAction, id, forbidden(), detail);
    const held = heldByAnother(a, row, type === 'APPROVE' && !!row.firstApprovedBy && row.firstApprovedBy !== a.ctx.user.id);
    if (held) throw refuse(a, auditAction, id, held, detail);

    const reason = body.reason ?? null;
    const comment = body.comment && body.comment !== '' ? body.comment : null;
    let event: ClaimEvent;
    if (type === 'RETURN' || type === 'DENY') {
      const move = type === 'RETURN' ? 'return' : 'deny';
      const fields: Record<string, string> = {};
      if (!isReasonFor(move, reason)) fields.reason = `Choose a reason: ${reasonCodesFor(move).join(', ')}.`;
      if (!comment) fields.comment = 'Write a comment the agency can act on.';
      if (Object.keys(fields).length > 0) throw new ValidationError('A reason and a comment are needed.', fields);
      event = { type, reason, comment };
    } else if (type === 'PAY') {
      throw refuse(a, auditAction, id, new ConflictError('Claims are paid through a payment run.', 'pay_through_payment_run'), detail);
    } else {
      event = { type } as ClaimEvent;
    }

    const evaluation = evaluateClaim(db, row, today());
    // what the claim says at this submission, kept with the submit event for the next one's diff
    const snapshot = type === 'SUBMIT' ? submissionSnapshot(loadClaimDetail(db, row)) : null;
    if (type === 'SUBMIT' && !evaluation.validation.ok) {
      audit(a, auditAction, id, 'failure', { ...detail, problems: evaluation.validation.problems.map((p) => p.path) });
      throw new ValidationError('The claim is not ready to submit.', problemsAsFields(evaluation.validation.problems));
    }
    if (type === 'APPROVE' && evaluation.facts.undecidedLines.length > 0) {
      const why = evaluation.valuation.problems.map((p) => p.message).join(' ');
      throw refuse(a, auditAction, id, new ConflictError(`Every line needs a decided amount before approval.${why ? ` ${why}` : ''}`, 'lines_undecided'), { ...detail, lines: evaluation.facts.undecidedLines });
    }
    const to = nextState(row.state, event, evaluation.facts);
    if (!to) throw refuse(a, auditAction, id, new ConflictError('The workflow does not allow this move now.', 'transition_refused'), detail);

    const { user } = a.ctx;
    let confirming: string | null = null;
    if (type === 'APPROVE') {
      const total = evaluation.valuation.valuation?.totals.approved.totalCents ?? 0;
      if (row.firstApprovedBy === user.id) {
        throw refuse(a, auditAction, id, new ConflictError('You gave the first approval; a second reviewer must confirm it.', 'second_reviewer_needed'), detail);
      }
      if (row.firstApprovedBy) {
        if (row.firstApprovedCents !== total) {
          throw refuse(a, auditAction, id, new ConflictError('The approved amount changed since the first approval; the first approval has to be given again.', 'first_approval_outdated'), detail);
        }
        confirming = nameOf(row.firstApprovedBy);
      } else {
        const limit = approvalLimitOf(user.id);
        if (limit !== null && total > limit) return recordFirstApproval(a, row, body.version, total, limit);
      }
    }
    let updated: Claim;
    try {
      updated = tx(db, (t) => {
        const now = clock.now().toISOString();
        const set: Partial<NewClaim> = { state: to, version: row.version + 1, updatedAt: now };
        const v = evaluation.valuation.valuation;
        if (type === 'SUBMIT') {
          set.submittedAt = now;
          if (!row.firstSubmittedAt) set.firstSubmittedAt = now;
          if (row.state === 'returned') set.resubmissionCount = row.resubmissionCount + 1;
          // the filing window counts from the first filing: value again with that date
          const filed = valueFromInputs({ ...evaluation.inputs, claim: { ...row, firstSubmittedAt: row.firstSubmittedAt ?? now } }, today()).valuation ?? v;
          set.claimedTotalCents = filed ? filed.totals.claimed.totalCents : 0;
          const photoFlags = row.flags.filter((f) => (isFlagCode(f) && FLAG_INFO[f].raisedBy === 'attachments') || f.startsWith('photo_'));
          set.flags = [...new Set([...(filed ? filed.flags.map((f) => f.code) : []), ...photoFlags])];
        }
        if (type === 'START_REVIEW') set.reviewerId = user.id;
        if (type === 'APPROVE' || type === 'DENY') {
          set.decidedAt = now;
          set.decidedBy = user.id;
        }
        if (row.state === 'in_review') {
          set.firstApprovedBy = null;
          set.firstApprovedAt = null;
          set.firstApprovedCents = null;
        }
        if (type === 'APPROVE' && v) {
          set.approvedLaborCents = v.totals.approved.laborCents;
          set.approvedTravelCents = v.totals.approved.travelCents;
          set.approvedPartsCents = v.totals.approved.partsCents;
          set.approvedTotalCents = v.totals.approved.totalCents;
          const byId = new Map(v.lines.map((l) => [l.id, l]));
          for (const l of evaluation.inputs.labor) {
            t.update(claimLaborLines).set({ approvedAmountCents: byId.get(l.id)?.approvedCents ?? 0 }).where(eq(claimLaborLines.id, l.id)).run();
          }
          for (const p of evaluation.inputs.parts) {
            t.update(claimPartLines).set({ approvedAmountCents: byId.get(p.id)?.approvedCents ?? 0 }).where(eq(claimPartLines.id, p.id)).run();
          }
          const tr = evaluation.inputs.travel;
          if (tr) {
            const cents = (byId.get(`${tr.id}-distance`)?.approvedCents ?? 0) + (byId.get(`${tr.id}-time`)?.approvedCents ?? 0);
            t.update(claimTravel).set({ approvedAmountCents: cents }).where(eq(claimTravel.id, tr.id)).run();
          }
        }
        const r = t
          .update(claims)
          .set(set)
          .where(and(eq(claims.id, id), eq(claims.version, body.version), eq(claims.state, row.state)))
          .run();
        if (r.changes !== 1) throw staleError();
        t.insert(claimEvents)
          .values({
            id: newId(),
            claimId: id,
            actorId: user.id,
            organisationId: user.organisationId,
            type: action,
            fromState: row.state,
            toState: to,
            reason,
            comment: confirming ? `Confirms the first approval by ${confirming}.` : comment,
            snapshot,
            at: now,
          })
          .run();
        const agencyName = t.select({ name: organisations.name }).from(organisations).where(eq(organisations.id, row.agencyId)).get()?.name ?? '';
        queueMoveMail(t, clock, {
          claim: row,
          action,
          agencyName,
          actorName: user.name,
          reason,
          comment,
          approvedTotalCents: set.approvedTotalCents ?? null,
          publicUrl: deps.env.PUBLIC_URL,
        });
        writeAudit(t, clock, { actorId: user.id, organisationId: user.organisationId, action: auditAction, recordType: 'claim', recordId: id, outcome: 'success', ip: a.ip ?? null, detail: { from: row.state, to, reason } });
        return t.select().from(claims).where(eq(claims.id, id)).get()!;
      });
    } catch (e) {
      if (e instanceof ConflictError) throw refuse(a, auditAction, id, e, detail);
      throw e;
    }
    deps.outbox.kick();
    return detailOf(a, updated);
  }

  // ---- who holds a review, take-over, second approval ---------------------------------------

  const nameOf = (userId: string | null): string => (userId ? (db.select({ name: users.name }).from(users).where(eq(users.id, userId)).get()?.name ?? 'another reviewer') : 'another reviewer');

  /**
   * A claim in review is held by the reviewer who started (or last took over) the review: any
   * other reviewer must take it over first. `confirming` lets a second reviewer confirm a first
   * approval without taking the claim over.
   */
  function heldByAnother(a: Actor, row: Claim, confirming = false): AppError | null {
    const { user } = a.ctx;
    if (row.state !== 'in_review' || user.role !== 'reviewer' || !row.reviewerId || row.reviewerId === user.id || confirming) return null;
    return new ConflictError(`This claim is in review with ${nameOf(row.reviewerId)}. Take it over, with a reason, before you act on it.`, 'held_by_another_reviewer');
  }

  /** What the agency entered, priced, per valuation line id (before allowances, caps and coverage). */
  function enteredCentsOf(inputs: ClaimInputs): Map<string, number> {
    const v = valueFromInputs(inputs, today()).valuation;
    return new Map((v?.lines ?? []).map((l) => [l.id, l.requestedCents]));
  }

  /** The reviewer's approval limit in cents, or null when none is set. */
  function approvalLimitOf(userId: string): number | null {
    return db.select({ limitCents: approvalLimits.limitCents }).from(approvalLimits).where(eq(approvalLimits.userId, userId)).get()?.limitCents ?? null;
  }

  /** An approval above the reviewer's limit: recorded as the first of two, the claim stays in review. */
  function recordFirstApproval(a: Actor, row: Claim, version: number, totalCents: number, limitCents: number): ClaimDetail {
    const { user } = a.ctx;
    const updated = tx(db, (t) => {
      const now = clock.now().toISOString();
      const r = t
        .update(claims)
        .set({ firstApprovedBy: user.id, firstApprovedAt: now, firstApprovedCents: totalCents, version: row.version + 1, updatedAt: now })
        .where(and(eq(claims.id, row.id), eq(claims.version, version), eq(claims.state, 'in_review')))
        .run();
      if (r.changes !== 1) throw staleError();
      const amount = formatCents(totalCents, row.currency);
      t.insert(claimEvents)
        .values({ id: newId(), claimId: row.id, actorId: user.id, organisationId: user.organisationId, type: 'first_approval', fromState: 'in_review', toState: 'in_review', comment: `Approved ${amount}, above the approval limit of ${formatCents(limitCents, row.currency)}; a second reviewer confirms.`, at: now })
        .run();
      const others = t
        .select({ email: users.email })
        .from(users)
        .where(and(eq(users.organisationId, user.organisationId), eq(users.role, 'reviewer'), eq(users.active, true), ne(users.id, user.id)))
        .all()
        .map((u) => u.email);
      if (others.length > 0) {
        enqueueMail(t, clock, {
          to: others,
          subject: `Claim ${row.number} needs a second approval`,
          text: `${user.name} approved claim ${row.number} for ${amount}, above their approval limit. A second reviewer confirms the approval.\n\nOpen the claim: ${claimLink(deps.env.PUBLIC_URL, row.id)}\n`,
        });
      }
      writeAudit(t, clock, { actorId: user.id, organisationId: user.organisationId, action: 'claim.first_approval', recordType: 'claim', recordId: row.id, outcome: 'success', ip: a.ip ?? null, detail: { totalCents, limitCents } });
      return t.select().from(claims).where(eq(claims.id, row.id)).get()!;
    });
    deps.outbox.kick();
    return detailOf(a, updated);
  }

  /** A reviewer takes a claim in review over from the reviewer who holds it, with a reason the other reviewer is mailed. */
  function takeOver(a: Actor, id: string, body: TakeOverInput): ClaimDetail {
    const row = writable(a, 'claim.take_over', id);
    const forbidden = new ForbiddenError('Only a warranty reviewer takes over a review.');
    if (!couldAct(a, 'adjust', row, ['in_review'])) throw refuse(a, 'claim.take_over', id, forbidden);
    if (row.version !== body.version) throw refuse(a, 'claim.take_over', id, staleError());
    if (row.state !== 'in_review') throw refuse(a, 'claim.take_over', id, new ConflictError('Only a claim in review can be taken over.', 'not_in_review'));
    if (!can(a, 'adjust', row)) throw refuse(a, 'claim.take_over', id, forbidden);
    const { user } = a.ctx;
    if (!row.reviewerId || row.reviewerId === user.id) throw refuse(a, 'claim.take_over', id, new ConflictError('This review is already yours.', 'already_yours'));
    const previous = db.select({ id: users.id, name: users.name, email: users.email, active: users.active }).from(users).where(eq(users.id, row.reviewerId)).get();
    const reason = body.reason.trim();
    const updated = tx(db, (t) => {
      const now = clock.now().toISOString();
      const r = t
        .update(claims)
        .set({ reviewerId: user.id, version: row.version + 1, updatedAt: now })
        .where(and(eq(claims.id, id), eq(claims.version, body.version), eq(claims.state, 'in_review'), eq(claims.reviewerId, row.reviewerId!)))
        .run();
      if (r.changes !== 1) throw staleError();
      t.insert(claimEvents)
        .values({ id: newId(), claimId: id, actorId: user.id, organisationId: user.organisationId, type: 'take_over', fromState: 'in_review', toState: 'in_review', comment: `Taken over from ${previous?.name ?? 'another reviewer'}: ${reason}`.slice(0, 4000), at: now })
        .run();
      if (previous?.active) queueReviewHandMail(t, clock, { to: previous.email, claim: row, takerName: user.name, reason, publicUrl: deps.env.PUBLIC_URL });
      writeAudit(t, clock, { actorId: user.id, organisationId: user.organisationId, action: 'claim.take_over', recordType: 'claim', recordId: id, outcome: 'success', ip: a.ip ?? null, detail: { from: row.reviewerId, reason } });
      return t.select().from(claims).where(eq(claims.id, id)).get()!;
    });
    deps.outbox.kick();
    return detailOf(a, updated);
  }

  // ---- review adjustments ------------------------------------------------------------------

  function adjust(a: Actor, id: string, body: AdjustmentsInput): ClaimDetail {
    const row = writable(a, 'claim.adjust', id);
    const forbidden = new ForbiddenError('Only a warranty reviewer adjusts the lines of a claim in review.');
    if (!couldAct(a, 'adjust', row, ['in_review'])) throw refuse(a, 'claim.adjust', id, forbidden);
    if (row.version !== body.version) throw refuse(a, 'claim.adjust', id, staleError());
    if (row.state !== 'in_review') throw refuse(a, 'claim.adjust', id, new ConflictError('Lines are adjusted only while the claim is in review.', 'not_in_review'));
    if (!can(a, 'adjust', row)) throw refuse(a, 'claim.adjust', id, forbidden);
    const held = heldByAnother(a, row);
    if (held) throw refuse(a, 'claim.adjust', id, held);
    const inputs = loadClaimInputs(db, row);
    const entered = enteredCentsOf(inputs);
    const fields: Record<string, string> = {};
    const laborIds = new Set(inputs.labor.map((l) => l.id));
    const partIds = new Set(inputs.parts.map((p) => p.id));
    const hasReason = (r: string | null) => typeof r === 'string' && r.trim() !== '';
    const summary: string[] = [];

    (body.laborLines ?? []).forEach((l, i) => {
      const hours = l.approvedHours ?? null;
      const amount = l.approvedAmountCents ?? null;
      if (!laborIds.has(l.id)) fields[`laborLines.${i}.id`] = 'No such labor line on this claim.';
      else if (hours !== null && amount !== null) fields[`laborLines.${i}.approvedHours`] = 'Adjust hours or the amount, not both.';
      else if ((hours !== null || amount !== null) && !hasReason(l.reason)) fields[`laborLines.${i}.reason`] = 'Give a reason for the adjustment.';
      else if (hours === null && amount === null && hasReason(l.reason)) fields[`laborLines.${i}.approvedHours`] = 'Enter the approved hours or amount.';
    });
    (body.partLines ?? []).forEach((p, i) => {
      const qty = p.approvedQuantity ?? null;
      const amount = p.approvedAmountCents ?? null;
      if (!partIds.has(p.id)) fields[`partLines.${i}.id`] = 'No such part line on this claim.';
      else if (qty !== null && amount !== null) fields[`partLines.${i}.approvedQuantity`] = 'Adjust the quantity or the amount, not both.';
      else if ((qty !== null || amount !== null) && !hasReason(p.reason)) fields[`partLines.${i}.reason`] = 'Give a reason for the adjustment.';
      else if (qty === null && amount === null && hasReason(p.reason)) fields[`partLines.${i}.approvedQuantity`] = 'Enter the approved quantity or amount.';
    });
    if (body.travel) {
      if (!inputs.travel) fields['travel'] = 'This claim has no travel to adjust.';
      else if (body.travel.approvedAmountCents !== null && !hasReason(body.travel.reason)) fields['travel.reason'] = 'Give a reason for the adjustment.';
      else if (body.travel.approvedAmountCents === null && hasReason(body.travel.reason)) fields['travel.approvedAmountCents'] = 'Enter the approved travel amount.';
    }
    // approving above what the agency entered needs a code from the reason list
    const raiseCodes = reasonCodesFor('raise').join(', ');
    const needsCode = (path: string, above: boolean, code: string | null | undefined) => {
      if (above && !fields[path.replace(/reasonCode$/, 'reason')] && !isReasonFor('raise', code)) fields[path] = `This is above what the agency entered: choose a reason code (${raiseCodes}).`;
    };
    (body.laborLines ?? []).forEach((l, i) => {
      const line = inputs.labor.find((x) => x.id === l.id);
      if (!line) return;
      const above = (l.approvedHours != null && l.approvedHours > line.hoursWorked) || (l.approvedAmountCents != null && l.approvedAmountCents > (entered.get(l.id) ?? 0));
      needsCode(`laborLines.${i}.reasonCode`, above, l.reasonCode);
    });
    (body.partLines ?? []).forEach((p, i) => {
      const line = inputs.parts.find((x) => x.id === p.id);
      if (!line) return;
      const above = (p.approvedQuantity != null && p.approvedQuantity > line.quantity) || (p.approvedAmountCents != null && p.approvedAmountCents > (entered.get(p.id) ?? 0));
      needsCode(`partLines.${i}.reasonCode`, above, p.reasonCode);
    });
    if (body.travel && inputs.travel && body.travel.approvedAmountCents != null) {
      const tr = inputs.travel;
      const enteredTravel = (entered.get(`${tr.id}-distance`) ?? 0) + (entered.get(`${tr.id}-time`) ?? 0);
      needsCode('travel.reasonCode', body.travel.approvedAmountCents > enteredTravel, body.travel.reasonCode);
    }
    if (Object.keys(fields).length > 0) throw new ValidationError('Some adjustments need attention.', fields);
    const withCode = (text: string, code: string | null | undefined) => (isReasonFor('raise', code) ? `${reasonLabel(code)}: ${text}` : text);

    const updated = tx(db, (t) => {
      const now = clock.now().toISOString();
      for (const l of body.laborLines ?? []) {
        const hours = l.approvedHours ?? null;
        const amount = l.approvedAmountCents ?? null;
        const cleared = hours === null && amount === null;
        t.update(claimLaborLines)
          .set({ approvedHours: hours, approvedAmountCents: amount, adjustmentReason: cleared ? null : withCode(l.reason!.trim(), l.reasonCode) })
          .where(and(eq(claimLaborLines.id, l.id), eq(claimLaborLines.claimId, id)))
          .run();
        summary.push(cleared ? `labor line cleared` : `labor line ${hours !== null ? `${hours} h` : `${amount} cents`}: ${l.reason!.trim()}`);
      }
      for (const p of body.partLines ?? []) {
        const qty = p.approvedQuantity ?? null;
        const amount = p.approvedAmountCents ?? null;
        const cleared = qty === null && amount === null;
        t.update(claimPartLines)
          .set({ approvedQuantity: qty, approvedAmountCents: amount, adjustmentReason: cleared ? null : withCode(p.reason!.trim(), p.reasonCode) })
          .where(and(eq(claimPartLines.id, p.id), eq(claimPartLines.claimId, id)))
          .run();
        summary.push(cleared ? `part line cleared` : `part line ${qty !== null ? `quantity ${qty}` : `${amount} cents`}: ${p.reason!.trim()}`);
      }
      if (body.travel && inputs.travel) {
        const cleared = body.travel.approvedAmountCents === null;
        t.update(claimTravel)
          .set({ approvedAmountCents: body.travel.approvedAmountCents, adjustmentReason: cleared ? null : withCode(body.travel.reason!.trim(), body.travel.reasonCode) })
          .where(eq(claimTravel.id, inputs.travel.id))
          .run();
        summary.push(cleared ? 'travel cleared' : `travel ${body.travel.approvedAmountCents} cents: ${body.travel.reason!.trim()}`);
      }
      // an adjustment changes the amount: a first approval waiting for confirmation no longer holds
      const r = t
        .update(claims)
        .set({ version: row.version + 1, updatedAt: now, firstApprovedBy: null, firstApprovedAt: null, firstApprovedCents: null })
        .where(and(eq(claims.id, id), eq(claims.version, body.version), eq(claims.state, row.state)))
        .run();
      if (r.changes !== 1) throw staleError();
      t.insert(claimEvents)
        .values({ id: newId(), claimId: id, actorId: a.ctx.user.id, organisationId: a.ctx.user.organisationId, type: 'adjusted', fromState: row.state, toState: row.state, comment: summary.join('; ').slice(0, 4000), at: now })
        .run();
      writeAudit(t, clock, { actorId: a.ctx.user.id, organisationId: a.ctx.user.organisationId, action: 'claim.adjust', recordType: 'claim', recordId: id, outcome: 'success', ip: a.ip ?? null, detail: { lines: summary.length } });
      return t.select().from(claims).where(eq(claims.id, id)).get()!;
    });
    return detailOf(a, updated);
  }

  // ---- comments ----------------------------------------------------------------------------

  function comment(a: Actor, id: string, body: CommentInput): ClaimDetail['comments'][number] {
    const row = writable(a, 'claim.comment', id);
    if (!can(a, 'comment', row)) throw refuse(a, 'claim.comment', id, new ForbiddenError('You may not comment on this claim.'));
    const { user } = a.ctx;
    const commentId = newId();
    const now = clock.now().toISOString();
    tx(db, (t) => {
      t.insert(comments).values({ id: commentId, claimId: id, authorId: user.id, body: body.body, createdAt: now }).run();
      writeAudit(t, clock, { actorId: user.id, organisationId: user.organisationId, action: 'claim.comment', recordType: 'claim', recordId: id, outcome: 'success', ip: a.ip ?? null });
    });
    const org = db.select({ name: organisations.name }).from(organisations).innerJoin(users, eq(users.organisationId, organisations.id)).where(eq(users.id, user.id)).get();
    return { id: commentId, body: body.body, createdAt: now, authorName: user.name, authorOrganisation: org?.name ?? '' };
  }

  return { list, get, unitClaims, submissionChanges, create, update, transition, adjust, comment, valuation, valuationBasis, takeOver };
}

export type ClaimsService = ReturnType<typeof createClaimsService>;

/**
 * Pays one approved claim from a payment run, inside the run's own transaction. The machine
 * guard needs `fromPaymentRun`; the payer must not be the person who approved the claim.
 * Throws ConflictError (the run's transaction rolls back) when the claim cannot be paid.
 */
export function payClaimFromRun(t: Db, deps: Pick<AppDeps, 'clock'>, payer: { id: string; organisationId: string }, claimId: string, runNumber: string): Claim {
  const row = t.select().from(claims).where(eq(claims.id, claimId)).get();
  if (!row) throw new ConflictError(`Claim ${claimId} does not exist.`, 'not_payable');
  if (row.decidedBy && row.decidedBy === payer.id) throw new ConflictError(`Claim ${row.number} was approved by you; someone else must pay it.`, 'same_approver_and_payer');
  const to = nextState(row.state, { type: 'PAY', fromPaymentRun: true });
  if (to !== 'paid') throw new ConflictError(`Claim ${row.number} is ${row.state.replace('_', ' ')}, not approved.`, 'not_payable');
  const now = deps.clock.now().toISOString();
  const r = t
    .update(claims)
    .set({ state: 'paid', version: row.version + 1, paidAt: now, updatedAt: now })
    .where(and(eq(claims.id, claimId), eq(claims.version, row.version), eq(claims.state, 'approved')))
    .run();
  if (r.changes !== 1) throw new ConflictError(`Claim ${row.number} changed while paying.`, 'stale_version');
  t.insert(claimEvents)
    .values({ id: newId(), claimId, actorId: payer.id, organisationId: payer.organisationId, type: 'pay', fromState: 'approved', toState: 'paid', comment: `Paid in payment run ${runNumber}`, at: now })
    .run();
  return { ...row, state: 'paid', version: row.version + 1, paidAt: now, updatedAt: now };
}
