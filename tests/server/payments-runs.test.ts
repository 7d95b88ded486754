import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, inArray } from 'drizzle-orm';
import { claimEvents, claims, paymentRunItems, paymentRuns } from '../../server/db/schema/index';
import { newId } from '../../server/lib/ids';
import { type DemoKey } from '../factories/test-app';
import { agencyId, claimRow, countRows, HARBORVIEW, insertApprovedClaim, makePaymentsApp, payEvents, PRAIRIE, userId, type Agent, type PaymentsApp } from './payments-fixtures';

let t: PaymentsApp;
const agents = {} as Record<DemoKey, Agent>;
let harborview: string;
let prairie: string;

beforeAll(async () => {
  t = await makePaymentsApp();
  for (const k of ['techA', 'adminA', 'adminB', 'reviewer', 'accountant', 'mfrAdmin'] as DemoKey[]) agents[k] = await t.signIn(k);
  harborview = agencyId(t, HARBORVIEW);
  prairie = agencyId(t, PRAIRIE);
});
afterAll(async () => {
  await t.close();
});

const createRun = (body: object) => agents.accountant.post('/api/payment-runs').send(body);
const markPaid = (runId: string, body: object = { paymentDate: '2026-06-15', reference: 'ACH 000123' }) => agents.accountant.post(`/api/payment-runs/${runId}/paid`).send(body);

describe('ready to pay', () => {
  it('lists approved claims with settled returns, grouped by agency with totals, and leaves out the rest', async () => {
    const ready1 = insertApprovedClaim(t, { agency: PRAIRIE, laborCents: 10_000, travelCents: 2_500, parts: [{ cents: 4_000, status: 'received' }] });
    const ready2 = insertApprovedClaim(t, { agency: PRAIRIE, laborCents: 7_000, parts: [{ cents: 1_000, status: 'waived' }, { cents: 500 }] });
    const awaiting = insertApprovedClaim(t, { agency: PRAIRIE, parts: [{ cents: 3_000, status: 'awaiting' }] });
    const shipped = insertApprovedClaim(t, { agency: PRAIRIE, parts: [{ cents: 3_000, status: 'shipped' }] });
    const emptyBox = insertApprovedClaim(t, { agency: PRAIRIE, parts: [{ cents: 3_000, status: 'received', condition: 'not_returned' }] });

    const res = await agents.accountant.get('/api/payment-runs/ready');
    expect(res.status).toBe(200);
    const group = res.body.agencies.find((g: { agencyId: string }) => g.agencyId === prairie);
    const ids = group.claims.map((c: { id: string }) => c.id);
    expect(ids).toEqual(expect.arrayContaining([ready1.id, ready2.id]));
    for (const held of [awaiting, shipped, emptyBox]) expect(ids).not.toContain(held.id);
    expect(group.heldForReturns).toBeGreaterThanOrEqual(3);
    // The group total is the sum of its claims' approved totals, as the database holds them.
    const dbTotal = t.db
      .select({ c: claims.approvedTotalCents })
      .from(claims)
      .where(inArray(claims.id, ids))
      .all()
      .reduce((s, r) => s + (r.c ?? 0), 0);
    expect(group.totalCents).toBe(dbTotal);
    expect(group.claimCount).toBe(ids.length);
    const one = group.claims.find((c: { id: string }) => c.id === ready1.id);
    expect([one.approvedLaborCents, one.approvedTravelCents, one.approvedPartsCents, one.approvedTotalCents]).toEqual([10_000, 2_500, 4_000, 16_500]);
    // Every agency group holds only its own agency's claims.
    for (const g of res.body.agencies) {
      const rows = t.db.select({ agencyId: claims.agencyId }).from(claims).where(inArray(claims.id, g.claims.map((c: { id: string }) => c.id).concat(['-']))).all();
      expect(rows.every((r) => r.agencyId === g.agencyId)).toBe(true);
    }
  });

  it('is for the accountant only', async () => {
    for (const k of ['techA', 'adminA', 'reviewer', 'mfrAdmin'] as DemoKey[]) {
      expect((await agents[k].get('/api/payment-runs/ready')).status, k).toBe(403);
    }
  });
});

describe('creating a run', () => {
  it('creates a numbered run for one agency with its total and claims, and takes them off the ready list', async () => {
    const a = insertApprovedClaim(t, { laborCents: 15_050, travelCents: 3_125 });
    const b = insertApprovedClaim(t, { laborCents: 9_999, parts: [{ cents: 2_001, status: 'received' }] });
    const res = await createRun({ agencyId: harborview, claimIds: [a.id, b.id] });
    expect(res.status).toBe(201);
    expect(res.body.number).toMatch(/^PR-2026-\d{4}$/);
    expect(res.body.state).toBe('open');
    expect(res.body.agencyId).toBe(harborview);
    expect(res.body.totalCents).toBe(15_050 + 3_125 + 9_999 + 2_001);
    expect(res.body.claims.map((c: { id: string }) => c.id).sort()).toEqual([a.id, b.id].sort());
    expect(res.body.allowedActions).toEqual(['mark_paid', 'void']);
    const items = t.db.select().from(paymentRunItems).where(eq(paymentRunItems.runId, res.body.id)).all();
    expect(items.map((i) => i.active)).toEqual([1, 1]);
    expect(items.reduce((s, i) => s + i.amountCents, 0)).toBe(res.body.totalCents);
    // Claims stay approved until the run is paid.
    expect(claimRow(t, a.id).state).toBe('approved');
    const ready = await agents.accountant.get('/api/payment-runs/ready');
    const allReady = ready.body.agencies.flatMap((g: { claims: { id: string }[] }) => g.claims.map((c) => c.id));
    expect(allReady).not.toContain(a.id);

    const second = await createRun({ agencyId: harborview, claimIds: [insertApprovedClaim(t).id] });
    expect(second.status).toBe(201);
    expect(Number(second.body.number.slice(8))).toBe(Number(res.body.number.slice(8)) + 1);
  });

  it('refuses a claim already in an open run with 409, naming it', async () => {
    const c = insertApprovedClaim(t);
    expect((await createRun({ agencyId: harborview, claimIds: [c.id] })).status).toBe(201);
    const again = await createRun({ agencyId: harborview, claimIds: [c.id] });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('already_in_run');
    expect(again.body.error.message).toContain(c.number);
  });

  it('lets exactly one of 50 parallel attempts put one claim into a run', async () => {
    const c = insertApprovedClaim(t, { laborCents: 33_333 });
    const runsBefore = countRows(t, 'payment_runs');
    const results = await Promise.all(Array.from({ length: 50 }, () => createRun({ agencyId: harborview, claimIds: [c.id] })));
    const statuses = results.map((r) => r.status);
    expect(statuses.filter((s) => s === 201)).toHaveLength(1);
    expect(statuses.filter((s) => s === 409)).toHaveLength(49);
    expect(countRows(t, 'payment_run_items', 'claim_id = ? and active = 1', c.id)).toBe(1);
    expect(countRows(t, 'payment_runs')).toBe(runsBefore + 1);
  });

  it('has a unique index, not only a check: a second active item for a claim is refused by the database', async () => {
    const c = insertApprovedClaim(t);
    const run = await createRun({ agencyId: harborview, claimIds: [c.id] });
    expect(run.status).toBe(201);
    const other = newId();
    t.db.$client
      .prepare(`insert into payment_runs (id, number, agency_id, state, total_cents, currency, created_by, created_at) values (?, ?, ?, 'open', 1, 'USD', ?, ?)`)
      .run(other, `PR-TEST-${other.slice(0, 8)}`, harborview, userId(t, 'accounts@larkfield.test'), new Date().toISOString());
    expect(() => t.db.$client.prepare(`insert into payment_run_items (id, run_id, claim_id, amount_cents, active) values (?, ?, ?, 1, 1)`).run(newId(), other, c.id)).toThrow(/UNIQUE/);
    // A voided (inactive) item does not count.
    expect(() => t.db.$client.prepare(`insert into payment_run_items (id, run_id, claim_id, amount_cents, active) values (?, ?, ?, 1, null)`).run(newId(), other, c.id)).not.toThrow();
  });

  it('refuses claims of another agency, unknown ids, claims not approved and claims waiting for a return', async () => {
    const mine = insertApprovedClaim(t);
    const theirs = insertApprovedClaim(t, { agency: PRAIRIE });
    const wrongAgency = await createRun({ agencyId: harborview, claimIds: [mine.id, theirs.id] });
    expect(wrongAgency.status).toBe(400);
    expect(wrongAgency.body.error.fields['claimIds.1']).toMatch(/another agency/);

    const unknown = await createRun({ agencyId: harborview, claimIds: ['no-such-claim'] });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fields['claimIds.0']).toBeDefined();

    const submitted = t.db.select().from(claims).where(and(eq(claims.agencyId, harborview), eq(claims.state, 'submitted'))).get()!;
    // The accountant may not even read a submitted claim: it reads as unknown.
    expect((await createRun({ agencyId: harborview, claimIds: [submitted.id] })).status).toBe(400);

    const paid = t.db.select().from(claims).where(and(eq(claims.agencyId, harborview), eq(claims.state, 'paid'))).get()!;
    const paidAgain = await createRun({ agencyId: harborview, claimIds: [paid.id] });
    expect(paidAgain.status).toBe(409);
    expect(paidAgain.body.error.code).toBe('not_payable');

    const waiting = insertApprovedClaim(t, { parts: [{ cents: 1_000, status: 'shipped' }] });
    const held = await createRun({ agencyId: harborview, claimIds: [waiting.id] });
    expect(held.status).toBe(409);
    expect(held.body.error.code).toBe('returns_outstanding');

    expect((await createRun({ agencyId: 'nope', claimIds: [mine.id] })).status).toBe(400);
    expect((await createRun({ agencyId: harborview, claimIds: [] })).status).toBe(400);
    expect((await createRun({ agencyId: harborview, claimIds: [mine.id, mine.id] })).status).toBe(400);
    expect((await createRun({ agencyId: harborview, claimIds: [mine.id], state: 'paid' })).status).toBe(400);
    expect(countRows(t, 'payment_run_items', 'claim_id = ?', mine.id)).toBe(0);
  });

  it('is refused to everyone but the accountant', async () => {
    const c = insertApprovedClaim(t);
    for (const k of ['techA', 'adminA', 'reviewer', 'mfrAdmin'] as DemoKey[]) {
      expect((await agents[k].post('/api/payment-runs').send({ agencyId: harborview, claimIds: [c.id] })).status, k).toBe(403);
    }
    expect(countRows(t, 'payment_run_items', 'claim_id = ?', c.id)).toBe(0);
  });
});

describe('marking a run paid', () => {
  it('pays every claim through the workflow in one transaction: run paid, claims paid with one pay event each', async () => {
    const a = insertApprovedClaim(t, { laborCents: 20_000, travelCents: 1_500 });
    const b = insertApprovedClaim(t, { laborCents: 8_000, parts: [{ cents: 6_000, status: 'waived' }] });
    const run = (await createRun({ agencyId: harborview, claimIds: [a.id, b.id] })).body;
    const before = [claimRow(t, a.id).version, claimRow(t, b.id).version];
    const res = await markPaid(run.id, { paymentDate: '2026-06-16', reference: 'CHK 4411' }); // tomorrow: within the one-day margin
    expect(res.status).toBe(200);
    expect(res.body.state).toBe('paid');
    expect(res.body.paymentDate).toBe('2026-06-16');
    expect(res.body.reference).toBe('CHK 4411');
    expect(res.body.allowedActions).toEqual([]);
    for (const [i, c] of [a, b].entries()) {
      const row = claimRow(t, c.id);
      expect(row.state).toBe('paid');
      expect(row.version).toBe(before[i] + 1);
      expect(row.paidAt).toBe('2026-06-15T12:00:00.000Z');
      const events = payEvents(t, c.id);
      expect(events).toHaveLength(1);
      expect([events[0].fromState, events[0].toState, events[0].actorId]).toEqual(['approved', 'paid', userId(t, 'accounts@larkfield.test')]);
    }
    expect(countRows(t, 'audit_log', "action = 'payment_run.paid' and record_id = ? and outcome = 'success'", run.id)).toBe(1);
  });

  it('answers exactly one of 50 parallel mark-paid requests with 200; one set of events; payments equal the approved amounts', async () => {
    const specs = [
      { laborCents: 12_345, travelCents: 2_222 },
      { laborCents: 500, parts: [{ cents: 99_999, status: 'received' as const }] },
      { laborCents: 40_000 },
    ];
    const made = specs.map((s) => insertApprovedClaim(t, s));
    const run = (await createRun({ agencyId: harborview, claimIds: made.map((m) => m.id) })).body;
    const results = await Promise.all(Array.from({ length: 50 }, (_, i) => markPaid(run.id, { paymentDate: '2026-06-15', reference: `ACH race ${i}` })));
    const ok = results.filter((r) => r.status === 200);
    expect(ok).toHaveLength(1);
    expect(results.filter((r) => r.status === 409)).toHaveLength(49);
    expect(results.every((r) => r.status === 200 || r.status === 409)).toBe(true);

    const ids = made.map((m) => m.id);
    const events = t.db.select().from(claimEvents).where(and(inArray(claimEvents.claimId, ids), eq(claimEvents.type, 'pay'))).all();
    expect(events).toHaveLength(ids.length);
    expect(new Set(events.map((e) => e.claimId)).size).toBe(ids.length);
    const stored = t.db.select().from(paymentRuns).where(eq(paymentRuns.id, run.id)).get()!;
    expect(stored.reference).toBe(ok[0].body.reference);
    const items = t.db.select().from(paymentRunItems).where(eq(paymentRunItems.runId, run.id)).all();
    const approved = t.db.select({ c: claims.approvedTotalCents }).from(claims).where(inArray(claims.id, ids)).all();
    const sumItems = items.reduce((s, i) => s + i.amountCents, 0);
    const sumApproved = approved.reduce((s, r) => s + (r.c ?? 0), 0);
    expect(sumItems).toBe(sumApproved);
    expect(stored.totalCents).toBe(sumApproved);
    expect(sumApproved).toBe(12_345 + 2_222 + 500 + 99_999 + 40_000);
    // One remittance, not fifty.
    expect(countRows(t, 'outbox', "subject like ?", `Remittance ${run.number}:%`)).toBe(1);
  });

  it('refuses to pay a claim whose required return is not received, and rolls the whole run back', async () => {
    const fine = insertApprovedClaim(t);
    const held = insertApprovedClaim(t, { parts: [{ cents: 5_000, status: 'awaiting' }] });
    // Put the held claim in a run past the create-time check, as a run created before a rule change would be.
    const run = (await createRun({ agencyId: harborview, claimIds: [fine.id] })).body;
    t.db.insert(paymentRunItems).values({ id: newId(), runId: run.id, claimId: held.id, amountCents: held.totalCents, active: 1 }).run();
    t.db.update(paymentRuns).set({ totalCents: run.totalCents + held.totalCents }).where(eq(paymentRuns.id, run.id)).run();
    const res = await markPaid(run.id);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('returns_outstanding');
    expect(claimRow(t, fine.id).state).toBe('approved');
    expect(payEvents(t, fine.id)).toHaveLength(0);
    expect(t.db.select().from(paymentRuns).where(eq(paymentRuns.id, run.id)).get()!.state).toBe('open');
    expect(countRows(t, 'outbox', "subject like ?", `Remittance ${run.number}:%`)).toBe(0);
  });

  it('pays a claim whose required return was waived', async () => {
    const waived = insertApprovedClaim(t, { parts: [{ cents: 5_000, status: 'waived' }] });
    const run = await createRun({ agencyId: harborview, claimIds: [waived.id] });
    expect(run.status).toBe(201);
    expect((await markPaid(run.body.id)).status).toBe(200);
    expect(claimRow(t, waived.id).state).toBe('paid');
  });

  it('refuses the person who approved a claim as its payer', async () => {
    const c = insertApprovedClaim(t, { decidedByEmail: 'accounts@larkfield.test' });
    const attempt = await createRun({ agencyId: harborview, claimIds: [c.id] });
    expect(attempt.status).toBe(409);
    expect(attempt.body.error.code).toBe('same_approver_and_payer');
    // And at payment time, when the run was built before the decider was known to be the payer.
    const d = insertApprovedClaim(t);
    const run = (await createRun({ agencyId: harborview, claimIds: [d.id] })).body;
    t.db.update(claims).set({ decidedBy: userId(t, 'accounts@larkfield.test') }).where(eq(claims.id, d.id)).run();
    const pay = await markPaid(run.id);
    expect(pay.status).toBe(409);
    expect(pay.body.error.code).toBe('same_approver_and_payer');
    expect(claimRow(t, d.id).state).toBe('approved');
  });

  it('checks the body and the run state', async () => {
    const c = insertApprovedClaim(t);
    const run = (await createRun({ agencyId: harborview, claimIds: [c.id] })).body;
    for (const bad of [{}, { paymentDate: '2026-02-30', reference: 'x' }, { paymentDate: '2026-06-15', reference: '' }, { paymentDate: '2026-06-15', reference: 'a\r\nb' }, { paymentDate: '2026-06-15', reference: 'ok', state: 'paid' }]) {
      const r = await markPaid(run.id, bad);
      expect(r.status, JSON.stringify(bad)).toBe(400);
    }
    expect((await markPaid('no-such-run')).status).toBe(404);
    expect((await markPaid(run.id)).status).toBe(200);
    const again = await markPaid(run.id);
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('run_not_open');
    expect((await agents.accountant.post(`/api/payment-runs/${run.id}/void`)).status).toBe(409);
  });

  it('is refused to agency admins and reviewers', async () => {
    const c = insertApprovedClaim(t);
    const run = (await createRun({ agencyId: harborview, claimIds: [c.id] })).body;
    expect((await agents.adminA.post(`/api/payment-runs/${run.id}/paid`).send({ paymentDate: '2026-06-15', reference: 'x' })).status).toBe(403);
    // The other agency cannot see the run at all.
    expect((await agents.adminB.post(`/api/payment-runs/${run.id}/paid`).send({ paymentDate: '2026-06-15', reference: 'x' })).status).toBe(404);
    expect((await agents.reviewer.post(`/api/payment-runs/${run.id}/paid`).send({ paymentDate: '2026-06-15', reference: 'x' })).status).toBe(403);
    expect(claimRow(t, c.id).state).toBe('approved');
  });
});

describe('voiding a run', () => {
  it('voids an open run and frees its claims for another run', async () => {
    const c = insertApprovedClaim(t);
    const run = (await createRun({ agencyId: harborview, claimIds: [c.id] })).body;
    const res = await agents.accountant.post(`/api/payment-runs/${run.id}/void`);
    expect(res.status).toBe(200);
    expect(res.body.state).toBe('void');
    expect(t.db.select().from(paymentRunItems).where(eq(paymentRunItems.runId, run.id)).all().map((i) => i.active)).toEqual([null]);
    expect(claimRow(t, c.id).state).toBe('approved');
    expect((await createRun({ agencyId: harborview, claimIds: [c.id] })).status).toBe(201);
    expect((await markPaid(run.id)).status).toBe(409);
    expect((await agents.accountant.post(`/api/payment-runs/${run.id}/void`)).status).toBe(409);
  });
});

describe('reading runs', () => {
  it('shows the accountant every run and an agency admin only their own agency’s, with the claims of each', async () => {
    const h = insertApprovedClaim(t);
    const p = insertApprovedClaim(t, { agency: PRAIRIE });
    const hr = (await createRun({ agencyId: harborview, claimIds: [h.id] })).body;
    const pr = (await createRun({ agencyId: prairie, claimIds: [p.id] })).body;
    expect((await markPaid(hr.id, { paymentDate: '2026-06-15', reference: 'ACH 77' })).status).toBe(200);

    const all = await agents.accountant.get('/api/payment-runs?limit=200');
    expect(all.status).toBe(200);
    expect(all.body.items.map((r: { id: string }) => r.id)).toEqual(expect.arrayContaining([hr.id, pr.id]));
    expect(all.body.items.length).toBe(countRows(t, 'payment_runs'));

    const own = await agents.adminA.get('/api/payment-runs?limit=200');
    expect(own.status).toBe(200);
    expect(own.body.items.length).toBe(countRows(t, 'payment_runs', 'agency_id = ?', harborview));
    expect(own.body.items.every((r: { agencyId: string }) => r.agencyId === harborview)).toBe(true);

    const detail = await agents.adminA.get(`/api/payment-runs/${hr.id}`);
    expect(detail.status).toBe(200);
    expect(detail.body.reference).toBe('ACH 77');
    expect(detail.body.claims.map((c: { id: string; state: string }) => [c.id, c.state])).toEqual([[h.id, 'paid']]);
    expect(detail.body.allowedActions).toEqual([]);
    // The agency admin sees the claim marked paid on the claim itself.
    expect((await agents.adminA.get(`/api/claims/${h.id}`)).body.state).toBe('paid');

    const foreign = await agents.adminA.get(`/api/payment-runs/${pr.id}`);
    const unknown = await agents.adminA.get('/api/payment-runs/no-such-run');
    expect(foreign.status).toBe(404);
    expect(foreign.body).toEqual(unknown.body);
    for (const k of ['techA', 'reviewer', 'mfrAdmin'] as DemoKey[]) expect((await agents[k].get('/api/payment-runs')).status, k).toBe(403);
  });

  it('pages the list with a cursor and filters by state', async () => {
    const first = await agents.accountant.get('/api/payment-runs?limit=2');
    expect(first.body.items).toHaveLength(2);
    expect(first.body.nextCursor).toBeTruthy();
    const second = await agents.accountant.get(`/api/payment-runs?limit=2&cursor=${first.body.nextCursor}`);
    expect(second.status).toBe(200);
    const ids = [...first.body.items, ...second.body.items].map((r: { id: string }) => r.id);
    expect(new Set(ids).size).toBe(ids.length);
    const paid = await agents.accountant.get('/api/payment-runs?state=paid&limit=200');
    expect(paid.body.items.every((r: { state: string }) => r.state === 'paid')).toBe(true);
    expect(paid.body.items.length).toBe(countRows(t, 'payment_runs', "state = 'paid'"));
    expect((await agents.accountant.get('/api/payment-runs?cursor=garbage')).status).toBe(400);
    expect((await agents.accountant.get('/api/payment-runs?state=bogus')).status).toBe(400);
  });
});
