import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { claimEvents, claims } from '../../server/db/schema/index';
import { tx } from '../../server/db/client';
import { payClaimFromRun } from '../../server/modules/claims/claims.service';
import { ConflictError } from '../../server/lib/errors';
import { attachEvidence, claimFootprint, claimIn, completeDraftBody, countRows, createCompleteDraft, grillFixture, makeClaimsApp, move, userId, type Agent } from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let techA: Agent;
let adminA: Agent;
let colleague: Agent;
let reviewer: Agent;
let reviewer2: Agent;
let accountant: Agent;
let techB: Agent;
const pair = () => ({ tech: techA, reviewer });

beforeAll(async () => {
  t = await makeClaimsApp();
  techA = await t.signIn('techA');
  adminA = await t.signIn('adminA');
  colleague = await t.signIn('priya.halvorsen@harborview.test');
  reviewer = await t.signIn('reviewer');
  reviewer2 = await t.signIn('marisol.oyelaran@larkfield.test');
  accountant = await t.signIn('accountant');
  techB = await t.signIn('techB');
});
afterAll(async () => {
  await t.close();
});

const events = (id: string) => t.db.select().from(claimEvents).where(eq(claimEvents.claimId, id)).all();
const row = (id: string) => t.db.select().from(claims).where(eq(claims.id, id)).get()!;

describe('the happy path: file, review, adjust, approve', () => {
  it('moves through every step with the allowed actions each side sees, and freezes the approved amounts', async () => {
    const draft = await createCompleteDraft(t, techA, 'tech@harborview.test');
    const seen = await techA.get(`/api/claims/${draft.id}`);
    expect(seen.body.allowedActions.sort()).toEqual(['submit', 'withdraw']);

    const submitted = await move(techA, draft.id, 'submit', 1);
    expect(submitted.status).toBe(200);
    expect(submitted.body.state).toBe('submitted');
    expect(submitted.body.version).toBe(2);
    expect(submitted.body.allowedActions).toEqual([]);
    const r1 = row(draft.id);
    expect(r1.submittedAt).toBe(t.clock.now().toISOString());
    expect(r1.firstSubmittedAt).toBe(r1.submittedAt);
    expect(r1.claimedTotalCents).toBeGreaterThan(0);
    expect(Array.isArray(r1.flags)).toBe(true);

    const queue = await reviewer.get(`/api/claims/${draft.id}`);
    expect(queue.body.allowedActions).toEqual(['start_review']);
    const started = await move(reviewer, draft.id, 'start_review', 2);
    expect(started.status).toBe(200);
    expect(row(draft.id).reviewerId).toBe(userId(t, 'reviewer@larkfield.test'));
    expect(started.body.reviewerName).toBeTruthy();
    expect(started.body.allowedActions.sort()).toEqual(['approve', 'deny', 'return']);

    const line = started.body.laborLines[0];
    const adjusted = await reviewer.post(`/api/claims/${draft.id}/adjustments`).send({ version: 3, laborLines: [{ id: line.id, approvedHours: 0.3, reason: 'Only the front foot needed leveling.' }] });
    expect(adjusted.status).toBe(200);
    expect(adjusted.body.version).toBe(4);
    const missingReason = await reviewer.post(`/api/claims/${draft.id}/adjustments`).send({ version: 4, laborLines: [{ id: line.id, approvedHours: 0.4, reason: null }] });
    expect(missingReason.status).toBe(400);
    expect(missingReason.body.error.fields['laborLines.0.reason']).toBeTruthy();

    const valuation = await reviewer.get(`/api/claims/${draft.id}/valuation`);
    expect(valuation.status).toBe(200);
    const approvedLabor = valuation.body.lines.find((l: { id: string }) => l.id === line.id);
    expect(approvedLabor.adjustment.hours).toBe(0.3);
    expect(approvedLabor.approvedCents).toBeLessThan(approvedLabor.claimedCents);

    const approved = await move(reviewer, draft.id, 'approve', 4);
    expect(approved.status).toBe(200);
    expect(approved.body.state).toBe('approved');
    const r2 = row(draft.id);
    expect(r2.decidedBy).toBe(userId(t, 'reviewer@larkfield.test'));
    expect(r2.decidedAt).toBe(t.clock.now().toISOString());
    expect(r2.approvedTotalCents).toBe(valuation.body.totals.approved.totalCents);
    expect(r2.approvedLaborCents! + r2.approvedTravelCents! + r2.approvedPartsCents!).toBe(r2.approvedTotalCents);
    const frozenLabor = approved.body.laborLines[0].approvedAmountCents;
    expect(frozenLabor).toBe(approvedLabor.approvedCents);
    expect(approved.body.travel.approvedAmountCents).toBe(r2.approvedTravelCents);

    const timeline = (await techA.get(`/api/claims/${draft.id}`)).body;
    expect(timeline.approvedTotalCents).toBe(r2.approvedTotalCents);
    expect(timeline.events.map((e: { type: string; fromState: string | null; toState: string }) => `${e.type}:${e.fromState}->${e.toState}`)).toEqual([
      'created:null->draft',
      'submit:draft->submitted',
      'start_review:submitted->in_review',
      'adjusted:in_review->in_review',
      'approve:in_review->approved',
    ]);
    for (const e of timeline.events) expect(e.actorName).toBeTruthy();
    expect(countRows(t, 'audit_log', "record_id = ? and outcome = 'success' and action in ('claim.submit','claim.start_review','claim.approve','claim.adjust')", draft.id)).toBe(4);
  });
});

describe('submit', () => {
  it('answers 400 with the problems as field errors while the claim is incomplete, and changes nothing', async () => {
    const bare = await techA.post('/api/claims').send({ serial: grillFixture(t).unit.serial });
    expect(bare.status).toBe(201);
    expect(bare.body.allowedActions).toEqual(['withdraw']);
    const before = claimFootprint(t, bare.body.id);
    const res = await move(techA, bare.body.id, 'submit', 1);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['cause', 'complaint', 'correction', 'failureDate', 'laborLines', 'repairDate']);
    expect(claimFootprint(t, bare.body.id)).toEqual(before);
    expect(countRows(t, 'audit_log', "record_id = ? and action = 'claim.submit' and outcome = 'failure'", bare.body.id)).toBe(1);
  });

  it('needs the evidence the repair code requires', async () => {
    const res = await techA.post('/api/claims').send(completeDraftBody(t));
    const id = res.body.id;
    const refused = await move(techA, id, 'submit', 1);
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields['attachments.unit_overall']).toBeTruthy();
    attachEvidence(t, id, 'unit_overall', 'tech@harborview.test');
    expect((await techA.get(`/api/claims/${id}`)).body.allowedActions).toContain('submit');
    expect((await move(techA, id, 'submit', 1)).status).toBe(200);
  });
});

describe('return and resubmit', () => {
  it('return needs a return reason and a comment; the resubmitted claim keeps its number and counts the resubmission', async () => {
    const c = await claimIn(t, pair(), 'in_review');
    const before = claimFootprint(t, c.id);
    const none = await move(reviewer, c.id, 'return', c.version);
    expect(none.status).toBe(400);
    expect(Object.keys(none.body.error.fields).sort()).toEqual(['comment', 'reason']);
    const denialReason = await move(reviewer, c.id, 'return', c.version, { reason: 'outside_coverage', comment: 'x' });
    expect(denialReason.status).toBe(400);
    expect(denialReason.body.error.fields.reason).toBeTruthy();
    const blank = await move(reviewer, c.id, 'return', c.version, { reason: 'missing_evidence', comment: '   ' });
    expect(blank.status).toBe(400);
    expect(claimFootprint(t, c.id)).toEqual(before);

    const returned = await move(reviewer, c.id, 'return', c.version, { reason: 'missing_evidence', comment: 'Add a photo of the serial plate.' });
    expect(returned.status).toBe(200);
    expect(returned.body.state).toBe('returned');
    const ev = events(c.id).at(-1)!;
    expect([ev.type, ev.reason, ev.comment, ev.actorId]).toEqual(['return', 'missing_evidence', 'Add a photo of the serial plate.', userId(t, 'reviewer@larkfield.test')]);

    const first = row(c.id);
    const seen = await techA.get(`/api/claims/${c.id}`);
    expect(seen.body.allowedActions.sort()).toEqual(['submit', 'withdraw']);
    t.clock.advance(10 * 60_000);
    const again = await move(techA, c.id, 'submit', returned.body.version);
    expect(again.status).toBe(200);
    const r = row(c.id);
    expect(r.number).toBe(first.number);
    expect(r.resubmissionCount).toBe(1);
    expect(r.firstSubmittedAt).toBe(first.firstSubmittedAt);
    expect(r.submittedAt).not.toBe(first.submittedAt);
    expect(again.body.resubmissionCount).toBe(1);
  });

  it('deny needs a denial reason and a comment, and records the decision', async () => {
    const c = await claimIn(t, pair(), 'in_review');
    expect((await move(reviewer, c.id, 'deny', c.version, { reason: 'missing_evidence', comment: 'x' })).status).toBe(400);
    const denied = await move(reviewer, c.id, 'deny', c.version, { reason: 'not_a_warranty_failure', comment: 'Worn feet are wear, not a defect.' });
    expect(denied.status).toBe(200);
    expect(denied.body.state).toBe('denied');
    expect(denied.body.allowedActions).toEqual([]);
    expect(row(c.id).decidedBy).toBe(userId(t, 'reviewer@larkfield.test'));
  });
});

describe('illegal, replayed and stale moves change nothing', () => {
  it('a role that never makes a move gets 403; a move the state refuses gets 409; both leave an audit row', async () => {
    const c = await claimIn(t, pair(), 'submitted');
    const before = claimFootprint(t, c.id);
    const deniedBefore = countRows(t, 'audit_log', "record_id = ? and outcome = 'denied'", c.id);
    const cases: Array<[Agent, string, number]> = [
      [techA, 'approve', 403],
      [techA, 'start_review', 403],
      [adminA, 'deny', 403],
      [reviewer, 'submit', 403],
      [reviewer, 'withdraw', 403],
      [accountant, 'start_review', 404], // accountants see approved and paid claims only
      [techA, 'withdraw', 409], // possible for a draft, not once filed
      [techA, 'submit', 409],
      [reviewer, 'approve', 409], // not in review yet
      [reviewer, 'return', 409],
    ];
    for (const [agent, type, status] of cases) {
      const res = await move(agent, c.id, type, c.version, { reason: 'other', comment: 'x' });
      expect(res.status, type).toBe(status);
    }
    expect(claimFootprint(t, c.id)).toEqual(before);
    expect(countRows(t, 'audit_log', "record_id = ? and outcome = 'denied'", c.id)).toBe(deniedBefore + cases.length);
  });

  it('a replayed move gets 409 and adds no event', async () => {
    const c = await claimIn(t, pair(), 'in_review');
    const ok = await move(reviewer, c.id, 'approve', c.version);
    expect(ok.status).toBe(200);
    const before = claimFootprint(t, c.id);
    const replayOld = await move(reviewer, c.id, 'approve', c.version);
    const replayNew = await move(reviewer, c.id, 'approve', ok.body.version);
    expect(replayOld.status).toBe(409);
    expect(replayNew.status).toBe(409);
    expect(replayNew.body.error.code).toBe('transition_refused');
    expect(claimFootprint(t, c.id)).toEqual(before);
  });

  it('a stale version gets 409 stale_version: two reviewers cannot both act', async () => {
    const c = await claimIn(t, pair(), 'submitted');
    const taken = await move(reviewer, c.id, 'start_review', c.version);
    expect(taken.status).toBe(200);
    const before = claimFootprint(t, c.id);
    const late = await move(reviewer2, c.id, 'start_review', c.version);
    expect(late.status).toBe(409);
    const lateReturn = await move(reviewer2, c.id, 'return', c.version, { reason: 'other', comment: 'x' });
    expect(lateReturn.status).toBe(409);
    expect(lateReturn.body.error.code).toBe('stale_version');
    expect(claimFootprint(t, c.id)).toEqual(before);
  });

  it('50 parallel approvals of one claim: exactly one succeeds and one event is written', async () => {
    const c = await claimIn(t, pair(), 'in_review');
    const eventsBefore = events(c.id).length;
    const results = await Promise.all(Array.from({ length: 50 }, (_, i) => move(i % 2 ? reviewer : reviewer2, c.id, 'approve', c.version)));
    const statuses = results.map((r) => r.status);
    expect(statuses.filter((s) => s === 200)).toHaveLength(1);
    expect(statuses.filter((s) => s === 409)).toHaveLength(49);
    expect(events(c.id).filter((e) => e.type === 'approve')).toHaveLength(1);
    expect(events(c.id).length).toBe(eventsBefore + 1);
    expect(row(c.id).version).toBe(c.version + 1);
  });

  it('a withdrawn claim takes no further move or edit', async () => {
    const c = await claimIn(t, pair(), 'withdrawn');
    expect(row(c.id).state).toBe('withdrawn');
    expect((await move(techA, c.id, 'submit', c.version)).status).toBe(409);
    expect((await techA.patch(`/api/claims/${c.id}`).send({ version: c.version, complaint: 'x' })).status).toBe(409);
  });
});

describe('who acts on whose claim', () => {
  it('a technician cannot see or act on a colleague’s claim; the agency admin can', async () => {
    const draft = await createCompleteDraft(t, techA, 'tech@harborview.test');
    const before = claimFootprint(t, draft.id);
    expect((await colleague.get(`/api/claims/${draft.id}`)).status).toBe(404);
    expect((await move(colleague, draft.id, 'submit', 1)).status).toBe(404);
    expect((await move(colleague, draft.id, 'withdraw', 1)).status).toBe(404);
    expect((await move(techB, draft.id, 'submit', 1)).status).toBe(404);
    expect(claimFootprint(t, draft.id)).toEqual(before);
    const byAdmin = await move(adminA, draft.id, 'submit', 1);
    expect(byAdmin.status).toBe(200);
    expect(events(draft.id).at(-1)!.actorId).toBe(userId(t, 'admin@harborview.test'));
  });
});

describe('payment', () => {
  it('is never made through the transitions endpoint: 409 for the accountant, 403 for others', async () => {
    const c = await claimIn(t, pair(), 'approved');
    const before = claimFootprint(t, c.id);
    const viaApi = await move(accountant, c.id, 'pay', c.version);
    expect(viaApi.status).toBe(409);
    expect(viaApi.body.error.code).toBe('pay_through_payment_run');
    expect((await move(reviewer, c.id, 'pay', c.version)).status).toBe(403);
    expect((await move(adminA, c.id, 'pay', c.version)).status).toBe(403);
    expect(claimFootprint(t, c.id)).toEqual(before);
    const seen = await accountant.get(`/api/claims/${c.id}`);
    expect(seen.body.allowedActions).toEqual([]);
  });

  it('a payment run pays an approved claim, but never by the person who approved it', async () => {
    const c = await claimIn(t, pair(), 'approved');
    const approver = userId(t, 'reviewer@larkfield.test');
    expect(row(c.id).decidedBy).toBe(approver);
    const org = (t.db.$client.prepare('select organisation_id as o from users where id = ?').get(approver) as { o: string }).o;
    expect(() => tx(t.db, (x) => payClaimFromRun(x, t.deps, { id: approver, organisationId: org }, c.id, 'PR-TEST-1'))).toThrow(ConflictError);
    expect(row(c.id).state).toBe('approved');
    const payer = { id: userId(t, 'accounts@larkfield.test'), organisationId: org };
    const paid = tx(t.db, (x) => payClaimFromRun(x, t.deps, payer, c.id, 'PR-TEST-1'));
    expect(paid.state).toBe('paid');
    expect(row(c.id).paidAt).toBe(t.clock.now().toISOString());
    expect(events(c.id).at(-1)!.type).toBe('pay');
    expect(() => tx(t.db, (x) => payClaimFromRun(x, t.deps, payer, c.id, 'PR-TEST-2'))).toThrow(ConflictError);
  });
});
