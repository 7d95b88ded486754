/**
 * The reviewer who decides, a take-over between reviewers, approvals above what the agency
 * entered, and second approvals above a reviewer's approval limit.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { claims } from '../../server/db/schema/index';
import { flushMail } from '../factories/test-app';
import { claimIn, countRows, makeClaimsApp, move, userId, type Agent } from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let techA: Agent;
let reviewer: Agent;
let reviewer2: Agent;
let mfrAdmin: Agent;
const R1 = 'reviewer@larkfield.test';
const R2 = 'marisol.oyelaran@larkfield.test';

beforeAll(async () => {
  t = await makeClaimsApp();
  techA = await t.signIn('techA');
  reviewer = await t.signIn('reviewer');
  reviewer2 = await t.signIn(R2);
  mfrAdmin = await t.signIn('mfrAdmin');
});
afterAll(async () => {
  await t.close();
});

const row = (id: string) => t.db.select().from(claims).where(eq(claims.id, id)).get()!;
const inReview = () => claimIn(t, { tech: techA, reviewer }, 'in_review');
const outboxTo = (email: string, subject: string) => countRows(t, 'outbox', 'instr("to", ?) > 0 and instr(subject, ?) > 0', email, subject);

describe('a claim in review with another reviewer', () => {
  it('cannot be approved, returned, denied or adjusted by a second reviewer without a take-over', async () => {
    const c = await inReview();
    const approve = await move(reviewer2, c.id, 'approve', c.version);
    expect(approve.status).toBe(409);
    expect(approve.body.error.code).toBe('held_by_another_reviewer');
    expect((await move(reviewer2, c.id, 'return', c.version, { reason: 'other', comment: 'Please add the invoice.' })).body.error.code).toBe('held_by_another_reviewer');
    const line = row(c.id);
    expect(line.state).toBe('in_review');
    const detail = (await reviewer2.get(`/api/claims/${c.id}`)).body;
    expect(detail.allowedActions).toEqual([]);
    expect(detail.canTakeOver).toBe(true);
    const adj = await reviewer2.post(`/api/claims/${c.id}/adjustments`).send({ version: c.version, laborLines: [{ id: detail.laborLines[0].id, approvedHours: 0.5, reason: 'Allowed time.' }] });
    expect(adj.status).toBe(409);
    expect(countRows(t, 'audit_log', "record_id = ? and action = 'claim.approve' and outcome = 'denied'", c.id)).toBe(1);
  });

  it('a take-over needs a reason, moves the review, writes an event and an audit row, and mails the first reviewer', async () => {
    const c = await inReview();
    const none = await reviewer2.post(`/api/claims/${c.id}/take-over`).send({ version: c.version, reason: '' });
    expect(none.status).toBe(400);
    expect(none.body.error.fields.reason).toBeTruthy();
    const mine = await reviewer.post(`/api/claims/${c.id}/take-over`).send({ version: c.version, reason: 'Mine already.' });
    expect(mine.status).toBe(409);

    const taken = await reviewer2.post(`/api/claims/${c.id}/take-over`).send({ version: c.version, reason: 'Dana is on leave this week.' });
    expect(taken.status).toBe(200);
    expect(row(c.id).reviewerId).toBe(userId(t, R2));
    expect(taken.body.heldByYou).toBe(true);
    expect(taken.body.events.at(-1).type).toBe('take_over');
    expect(taken.body.events.at(-1).comment).toContain('Dana is on leave this week.');
    expect(countRows(t, 'audit_log', "record_id = ? and action = 'claim.take_over' and outcome = 'success'", c.id)).toBe(1);
    expect(outboxTo(R1, 'was taken over')).toBeGreaterThanOrEqual(1);
    await flushMail(t);

    // the first reviewer now needs a take-over in turn; the second decides
    expect((await move(reviewer, c.id, 'approve', taken.body.version)).body.error.code).toBe('held_by_another_reviewer');
    const approved = await move(reviewer2, c.id, 'approve', taken.body.version);
    expect(approved.status).toBe(200);
    expect(approved.body.decidedByName).toBe('Marisol Oyelaran');
    expect(row(c.id).decidedBy).toBe(userId(t, R2));
  });

  it('"decided by" names the reviewer who decided, not the one who took the claim', async () => {
    const c = await inReview();
    const taken = await reviewer2.post(`/api/claims/${c.id}/take-over`).send({ version: c.version, reason: 'Taking the grill claims today.' });
    // the first reviewer takes it back and denies: the holder and the decider are both Dana, but
    // after a later take-over by Marisol the decision still names Dana
    const back = await reviewer.post(`/api/claims/${c.id}/take-over`).send({ version: taken.body.version, reason: 'Back from leave.' });
    const denied = await move(reviewer, c.id, 'deny', back.body.version, { reason: 'not_a_warranty_failure', comment: 'Worn feet are normal wear.' });
    expect(denied.status).toBe(200);
    const seen = (await techA.get(`/api/claims/${c.id}`)).body;
    expect(seen.decidedByName).toBe('Dana Whitcombe');
  });
});

describe('approving above what the agency entered', () => {
  it('needs a reason code from the list; "ok" alone is refused', async () => {
    const c = await inReview();
    const d = (await reviewer.get(`/api/claims/${c.id}`)).body;
    const line = d.laborLines[0];
    expect(line.hoursWorked).toBe(0.75);
    const ok = await reviewer.post(`/api/claims/${c.id}/adjustments`).send({ version: c.version, laborLines: [{ id: line.id, approvedHours: 3, reason: 'ok' }] });
    expect(ok.status).toBe(400);
    expect(ok.body.error.fields['laborLines.0.reasonCode']).toMatch(/above what the agency entered/);
    const wrongList = await reviewer.post(`/api/claims/${c.id}/adjustments`).send({ version: c.version, laborLines: [{ id: line.id, approvedHours: 3, reason: 'ok', reasonCode: 'missing_evidence' }] });
    expect(wrongList.status).toBe(400);
    const travelUp = await reviewer.post(`/api/claims/${c.id}/adjustments`).send({ version: c.version, travel: { approvedAmountCents: 9_999_999, reason: 'ok' } });
    expect(travelUp.status).toBe(400);
    expect(travelUp.body.error.fields['travel.reasonCode']).toBeTruthy();

    const coded = await reviewer.post(`/api/claims/${c.id}/adjustments`).send({ version: c.version, laborLines: [{ id: line.id, approvedHours: 1.5, reason: 'The photos show both feet replaced.', reasonCode: 'work_shown_in_evidence' }] });
    expect(coded.status).toBe(200);
    expect(coded.body.laborLines[0].adjustmentReason).toBe('More work shown in the evidence: The photos show both feet replaced.');
    // below the entry needs no code
    const down = await reviewer.post(`/api/claims/${c.id}/adjustments`).send({ version: coded.body.version, laborLines: [{ id: line.id, approvedHours: 0.5, reason: 'Only one foot.' }] });
    expect(down.status).toBe(200);
  });
});

describe('approval limits per reviewer', () => {
  it('only the manufacturer admin sets them, in cents, for reviewers of the organisation', async () => {
    const list = await mfrAdmin.get('/api/admin/approval-limits');
    expect(list.status).toBe(200);
    expect(list.body.items.map((i: { email: string }) => i.email)).toEqual(expect.arrayContaining([R1, R2]));
    expect((await reviewer.patch(`/api/admin/approval-limits/${userId(t, R1)}`).send({ limitCents: 1 })).status).toBe(403);
    expect((await mfrAdmin.patch(`/api/admin/approval-limits/${userId(t, 'tech@harborview.test')}`).send({ limitCents: 1 })).status).toBe(404);
    expect((await mfrAdmin.patch(`/api/admin/approval-limits/${userId(t, R1)}`).send({ limitCents: -5 })).status).toBe(400);
  });

  it('an approval above the limit is a first approval; a second reviewer confirms it', async () => {
    const c = await inReview();
    const set = await mfrAdmin.patch(`/api/admin/approval-limits/${userId(t, R1)}`).send({ limitCents: 100 });
    expect(set.status).toBe(200);
    try {
      const first = await move(reviewer, c.id, 'approve', c.version);
      expect(first.status).toBe(200);
      expect(first.body.state).toBe('in_review');
      expect(first.body.firstApproval.byYou).toBe(true);
      expect(first.body.allowedActions).not.toContain('approve');
      expect(row(c.id).firstApprovedBy).toBe(userId(t, R1));
      expect(countRows(t, 'audit_log', "record_id = ? and action = 'claim.first_approval'", c.id)).toBe(1);
      expect(outboxTo(R2, 'needs a second approval')).toBeGreaterThanOrEqual(1);

      const again = await move(reviewer, c.id, 'approve', first.body.version);
      expect(again.status).toBe(409);
      expect(again.body.error.code).toBe('second_reviewer_needed');

      const seen = (await reviewer2.get(`/api/claims/${c.id}`)).body;
      expect(seen.allowedActions).toEqual(['approve']);
      const confirmed = await move(reviewer2, c.id, 'approve', first.body.version);
      expect(confirmed.status).toBe(200);
      expect(confirmed.body.state).toBe('approved');
      expect(confirmed.body.decidedByName).toBe('Marisol Oyelaran');
      expect(row(c.id).firstApprovedBy).toBeNull();
    } finally {
      await mfrAdmin.patch(`/api/admin/approval-limits/${userId(t, R1)}`).send({ limitCents: null });
    }
  });

  it('an adjustment after a first approval drops it; at or below the limit one reviewer approves', async () => {
    const c = await inReview();
    await mfrAdmin.patch(`/api/admin/approval-limits/${userId(t, R1)}`).send({ limitCents: 100 });
    try {
      const first = await move(reviewer, c.id, 'approve', c.version);
      expect(first.body.firstApproval).toBeTruthy();
      const adj = await reviewer.post(`/api/claims/${c.id}/adjustments`).send({ version: first.body.version, travel: { approvedAmountCents: 0, reason: 'No travel on a site visit already paid.' } });
      expect(adj.status).toBe(200);
      expect(adj.body.firstApproval).toBeNull();
      await mfrAdmin.patch(`/api/admin/approval-limits/${userId(t, R1)}`).send({ limitCents: 10_000_000 });
      const alone = await move(reviewer, c.id, 'approve', adj.body.version);
      expect(alone.body.state).toBe('approved');
    } finally {
      await mfrAdmin.patch(`/api/admin/approval-limits/${userId(t, R1)}`).send({ limitCents: null });
    }
  });
});
