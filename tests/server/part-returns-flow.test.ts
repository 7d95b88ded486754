import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { attachments, claimEvents, claimPartLines, claims, models, parts, productFamilies, repairCodes, units } from '../../server/db/schema/index';
import { newId } from '../../server/lib/ids';
import { type DemoKey } from '../factories/test-app';
import { agencyId, claimRow, countRows, HARBORVIEW, insertApprovedClaim, makePaymentsApp, partLineIds, PRAIRIE, userId, type Agent, type PaymentsApp } from './payments-fixtures';

let t: PaymentsApp;
const agents = {} as Record<DemoKey, Agent>;
let harborview: string;

beforeAll(async () => {
  t = await makePaymentsApp();
  for (const k of ['techA', 'adminA', 'adminB', 'reviewer', 'accountant', 'mfrAdmin'] as DemoKey[]) agents[k] = await t.signIn(k);
  harborview = agencyId(t, HARBORVIEW);
});
afterAll(async () => {
  await t.close();
});

const base = (claimId: string) => `/api/claims/${claimId}/part-returns`;
const ship = (agent: Agent, claimId: string, lineId: string, body: object = { carrier: 'Ground parcel', trackingNumber: '1Z999AA10123456784' }) => agent.post(`${base(claimId)}/${lineId}/shipment`).send(body);
const receive = (agent: Agent, claimId: string, lineId: string, condition = 'failure_confirmed') => agent.post(`${base(claimId)}/${lineId}/receipt`).send({ condition });
const waive = (agent: Agent, claimId: string, lineId: string, reason = 'Part was scrapped on site at the reviewer’s request.') => agent.post(`${base(claimId)}/${lineId}/waiver`).send({ reason });

async function readyIds(): Promise<string[]> {
  const res = await agents.accountant.get('/api/payment-runs/ready');
  expect(res.status).toBe(200);
  return res.body.agencies.flatMap((g: { claims: { id: string }[] }) => g.claims.map((c) => c.id));
}

describe('a claim filed, approved, its part returned and paid, all through the API', () => {
  it('waits for the return-required part, then pays', async () => {
    // A grill unit and a repair code of its family; a part that must come back and one that need not.
    const unit = t.db
      .select({ serial: units.serial, familyId: models.familyId })
      .from(units)
      .innerJoin(models, eq(models.id, units.modelId))
      .innerJoin(productFamilies, eq(productFamilies.id, models.familyId))
      .where(eq(productFamilies.code, 'GRL'))
      .orderBy(units.serial)
      .get()!;
    const code = t.db.select().from(repairCodes).where(eq(repairCodes.code, 'GR-160')).get()!;
    const familyParts = t.db.select().from(parts).where(eq(parts.familyId, unit.familyId)).all();
    const mustReturn = familyParts.find((p) => p.returnRequired)!;
    const keep = familyParts.find((p) => !p.returnRequired)!;
    const day = (n: number) => new Date(Date.parse('2026-06-15T00:00:00Z') - n * 86_400_000).toISOString().slice(0, 10);
    const draft = await agents.techA.post('/api/claims').send({
      serial: unit.serial,
      complaint: 'Grill rocks on its stand and product cooks unevenly.',
      cause: 'Leveling foot worn through.',
      correction: 'Replaced the foot and set the cooking height.',
      failureDate: day(4),
      repairDate: day(3),
      laborLines: [{ repairCodeId: code.id, hoursWorked: 0.75, overtime: false, note: '' }],
      partLines: [
        { partId: mustReturn.id, quantity: 1 },
        { partId: keep.id, quantity: 1 },
      ],
      readings: [
        { key: 'cooking_height', phase: 'before', value: 35.2, unit: 'in' },
        { key: 'cooking_height', phase: 'after', value: 36.1, unit: 'in' },
      ],
    });
    expect(draft.status).toBe(201);
    const id = draft.body.id as string;
    // Evidence the repair code asks for (the upload pipeline has its own tests).
    for (const role of ['unit_overall', 'failed_part', 'serial_plate'] as const) {
      const aid = newId();
      t.db
        .insert(attachments)
        .values({ id: aid, claimId: id, organisationId: harborview, role, originalName: `${role}.jpg`, storageKey: `test/${aid}.jpg`, contentType: 'image/jpeg', sizeBytes: 1234, sha256: aid.replace(/-/g, '').padEnd(64, '0'), uploadedBy: userId(t, 'tech@harborview.test'), createdAt: new Date().toISOString() })
        .run();
    }
    let version = draft.body.version as number;
    for (const [agent, type] of [
      [agents.techA, 'submit'],
      [agents.reviewer, 'start_review'],
      [agents.reviewer, 'approve'],
    ] as const) {
      const r = await agent.post(`/api/claims/${id}/transitions`).send({ type, version });
      expect(r.status, `${type}: ${JSON.stringify(r.body)}`).toBe(200);
      version = r.body.version;
    }
    expect(claimRow(t, id).state).toBe('approved');

    const view = await agents.adminA.get(base(id));
    expect(view.status).toBe(200);
    expect(view.body.returnsSettled).toBe(false);
    const [returnLine, keptLine] = view.body.lines;
    expect([returnLine.status, returnLine.returnRequired, returnLine.allowedActions]).toEqual(['awaiting', true, ['ship']]);
    expect([keptLine.status, keptLine.settled, keptLine.allowedActions]).toEqual(['not_required', true, []]);
    expect(view.body.dueDate).toBe('2026-07-15');
    expect((await agents.reviewer.get(base(id))).body.lines[0].allowedActions).toEqual(['receive', 'waive']);

    // Not ready, and no run can take it.
    expect(await readyIds()).not.toContain(id);
    const early = await agents.accountant.post('/api/payment-runs').send({ agencyId: harborview, claimIds: [id] });
    expect(early.status).toBe(409);
    expect(early.body.error.code).toBe('returns_outstanding');

    // Shipped is not enough; received is.
    const shipped = await ship(agents.adminA, id, returnLine.id);
    expect(shipped.status).toBe(200);
    expect(shipped.body.lines[0]).toMatchObject({ status: 'shipped', carrier: 'Ground parcel', trackingNumber: '1Z999AA10123456784', settled: false });
    expect(await readyIds()).not.toContain(id);
    const received = await receive(agents.reviewer, id, returnLine.id, 'no_fault_found');
    expect(received.status).toBe(200);
    expect(received.body.lines[0]).toMatchObject({ status: 'received', receivedCondition: 'no_fault_found', settled: true, allowedActions: [] });
    expect(received.body.returnsSettled).toBe(true);
    expect(await readyIds()).toContain(id);

    const run = await agents.accountant.post('/api/payment-runs').send({ agencyId: harborview, claimIds: [id] });
    expect(run.status).toBe(201);
    expect(run.body.totalCents).toBe(claimRow(t, id).approvedTotalCents);
    const paid = await agents.accountant.post(`/api/payment-runs/${run.body.id}/paid`).send({ paymentDate: '2026-06-15', reference: 'ACH 555' });
    expect(paid.status).toBe(200);
    const events = t.db.select().from(claimEvents).where(eq(claimEvents.claimId, id)).all().map((e) => e.type);
    expect(events).toEqual(expect.arrayContaining(['submit', 'start_review', 'approve', 'part_shipped', 'part_received', 'pay']));
    // Paid claims take no further return steps.
    expect((await ship(agents.adminA, id, returnLine.id)).status).toBe(409);
  });
});

describe('part-return steps', () => {
  it('waiving a return with a reason makes the claim ready', async () => {
    const c = insertApprovedClaim(t, { parts: [{ cents: 2_000, status: 'awaiting' }] });
    const [line] = partLineIds(t, c.id);
    expect(await readyIds()).not.toContain(c.id);
    const bad = await agents.reviewer.post(`${base(c.id)}/${line}/waiver`).send({ reason: '' });
    expect(bad.status).toBe(400);
    const res = await waive(agents.reviewer, c.id, line);
    expect(res.status).toBe(200);
    expect(res.body.lines[0]).toMatchObject({ status: 'waived', settled: true, waiveReason: 'Part was scrapped on site at the reviewer’s request.' });
    expect(await readyIds()).toContain(c.id);
    expect(countRows(t, 'claim_events', "claim_id = ? and type = 'part_return_waived'", c.id)).toBe(1);
  });

  it('a shipment that arrives without the part does not settle the return until the part comes or is waived', async () => {
    const c = insertApprovedClaim(t, { parts: [{ cents: 2_000, status: 'shipped' }] });
    const [line] = partLineIds(t, c.id);
    const empty = await receive(agents.reviewer, c.id, line, 'not_returned');
    expect(empty.status).toBe(200);
    expect(empty.body.lines[0]).toMatchObject({ status: 'received', receivedCondition: 'not_returned', settled: false });
    expect(await readyIds()).not.toContain(c.id);
    // The agency ships again; the part arrives.
    expect((await ship(agents.adminA, c.id, line, { carrier: 'Freight', trackingNumber: 'FR-2' })).status).toBe(200);
    expect((await receive(agents.reviewer, c.id, line)).status).toBe(200);
    expect(await readyIds()).toContain(c.id);
    // Settled: nothing more can be recorded.
    expect((await waive(agents.reviewer, c.id, line)).status).toBe(409);
    expect((await receive(agents.reviewer, c.id, line)).status).toBe(409);
  });

  it('keeps each side to its own step, and other agencies out', async () => {
    const c = insertApprovedClaim(t, { parts: [{ cents: 2_000, status: 'awaiting' }, { cents: 100 }] });
    const [line, plain] = partLineIds(t, c.id);
    const before = t.db.select().from(claimPartLines).where(eq(claimPartLines.id, line)).get();
    // The reviewer cannot record the agency's shipment, nor the agency a receipt or waiver.
    expect((await ship(agents.reviewer, c.id, line)).status).toBe(403);
    expect((await receive(agents.adminA, c.id, line)).status).toBe(403);
    expect((await waive(agents.adminA, c.id, line)).status).toBe(403);
    // Technicians, accountants and the manufacturer admin take no step.
    expect((await ship(agents.techA, c.id, line)).status).toBe(403);
    expect((await receive(agents.accountant, c.id, line)).status).toBe(403);
    expect((await receive(agents.mfrAdmin, c.id, line)).status).toBe(404);
    // The other agency cannot see the claim at all: 404 like an unknown claim.
    const foreign = await ship(agents.adminB, c.id, line);
    const unknown = await ship(agents.adminB, 'no-such-claim', line);
    expect(foreign.status).toBe(404);
    expect(foreign.body).toEqual(unknown.body);
    expect(t.db.select().from(claimPartLines).where(eq(claimPartLines.id, line)).get()).toEqual(before);
    // A line of another claim, a line that needs no return, and bad bodies.
    const other = insertApprovedClaim(t, { parts: [{ cents: 1, status: 'awaiting' }] });
    expect((await ship(agents.adminA, c.id, partLineIds(t, other.id)[0])).status).toBe(404);
    expect((await ship(agents.adminA, c.id, plain)).status).toBe(409);
    for (const body of [{}, { carrier: '', trackingNumber: 'x' }, { carrier: 'x', trackingNumber: 'a\nb' }, { carrier: 'x', trackingNumber: 'y', returnStatus: 'received' }]) {
      expect((await ship(agents.adminA, c.id, line, body)).status, JSON.stringify(body)).toBe(400);
    }
    expect((await receive(agents.reviewer, c.id, line, 'like_new')).status).toBe(400);
  });

  it('works only while the claim is approved', async () => {
    const c = insertApprovedClaim(t, { parts: [{ cents: 2_000, status: 'awaiting' }] });
    t.db.update(claims).set({ state: 'paid' }).where(eq(claims.id, c.id)).run();
    const res = await ship(agents.adminA, c.id, partLineIds(t, c.id)[0]);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('not_approved');
    // Nothing changed on the line.
    expect(t.db.select().from(claimPartLines).where(eq(claimPartLines.claimId, c.id)).get()!.returnStatus).toBe('awaiting');
  });

  it('shows overdue returns on the agency admin’s and the reviewer’s home pages', async () => {
    // Approved 31 days before the test day: past the 30-day window. One of the other agency too.
    const late = insertApprovedClaim(t, { decidedOn: '2026-05-15', parts: [{ cents: 1_000, status: 'awaiting' }] });
    insertApprovedClaim(t, { agency: PRAIRIE, decidedOn: '2026-05-01', parts: [{ cents: 1_000, status: 'shipped' }] });
    const notice = async (agent: Agent) => ((await agent.get('/api/home')).body.notices as { key: string; message: string }[]).find((n) => n.key === 'part_returns_overdue');
    const count = (who: 'a' | 'all') =>
      countRows(
        t,
        'claims c',
        `c.state = 'approved' and substr(c.decided_at, 1, 10) < '2026-05-16' ${who === 'a' ? 'and c.agency_id = ?' : 'and ? = ?'}
         and exists (select 1 from claim_part_lines l where l.claim_id = c.id and (l.return_status in ('awaiting', 'shipped') or (l.return_status = 'received' and l.received_condition = 'not_returned')))`,
        ...(who === 'a' ? [harborview] : [1, 1]),
      );
    const a = await notice(agents.adminA);
    expect(a?.message).toMatch(new RegExp(`^${count('a')} approved claim`));
    const r = await notice(agents.reviewer);
    expect(r?.message).toMatch(new RegExp(`^${count('all')} approved claim`));
    expect(count('all')).toBeGreaterThan(count('a'));
    expect((await agents.adminA.get(base(late.id))).body.lines[0].overdue).toBe(true);
    expect((await agents.adminA.get(base(late.id))).body.overdueDays).toBe(1);
    // Within the window: not overdue.
    const fresh = insertApprovedClaim(t, { decidedOn: '2026-06-01', parts: [{ cents: 1_000, status: 'awaiting' }] });
    expect((await agents.adminA.get(base(fresh.id))).body.lines[0].overdue).toBe(false);
    // Settling the late one takes it off the count.
    expect((await waive(agents.reviewer, late.id, partLineIds(t, late.id)[0])).status).toBe(200);
    const after = await notice(agents.adminA);
    const left = count('a');
    if (left === 0) expect(after).toBeUndefined();
    else expect(after?.message).toMatch(new RegExp(`^${left} approved claim`));
  });
});
