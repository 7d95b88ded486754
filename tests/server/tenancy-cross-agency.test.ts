import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Claim } from '../../server/db/schema/index';
import { agencyIdByName, allClaims, claimFootprint, countRows, HARBORVIEW, makeClaimsApp, PRAIRIE, type Agent } from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let agencyA: string;
let agencyB: string;
let claimsOfA: Claim[];
const b = {} as { tech: Agent; admin: Agent };

/** Every request agency B could aim at one claim id of agency A. */
const probes: Array<{ name: string; send: (agent: Agent, id: string, version: number) => Promise<{ status: number; body: unknown }> }> = [
  { name: 'GET detail', send: (a, id) => a.get(`/api/claims/${id}`) },
  { name: 'GET detail ?agency=A', send: (a, id) => a.get(`/api/claims/${id}?agency=${agencyA}&agencyId=${agencyA}`) },
  { name: 'GET detail with tenant headers', send: (a, id) => a.get(`/api/claims/${id}`).set('X-Organisation-Id', agencyA).set('X-Agency-Id', agencyA) },
  { name: 'GET valuation', send: (a, id) => a.get(`/api/claims/${id}/valuation`) },
  { name: 'GET valuation ?agency=A', send: (a, id) => a.get(`/api/claims/${id}/valuation?agency=${agencyA}`) },
  { name: 'PATCH', send: (a, id, v) => a.patch(`/api/claims/${id}`).send({ version: v, complaint: 'Overwritten from the other agency.' }) },
  { name: 'PATCH with tenant headers', send: (a, id, v) => a.patch(`/api/claims/${id}?agency=${agencyA}`).set('X-Organisation-Id', agencyA).send({ version: v, cause: 'x' }) },
  ...(['submit', 'withdraw', 'start_review', 'return', 'deny', 'approve', 'pay'] as const).map((type) => ({
    name: `POST transition ${type}`,
    send: (a: Agent, id: string, v: number) => a.post(`/api/claims/${id}/transitions?agency=${agencyA}`).set('X-Organisation-Id', agencyA).send({ type, version: v, reason: 'other', comment: 'probe' }),
  })),
  { name: 'POST comment', send: (a, id) => a.post(`/api/claims/${id}/comments`).send({ body: 'Hello from the other agency.' }) },
  { name: 'POST adjustments', send: (a, id, v) => a.post(`/api/claims/${id}/adjustments`).send({ version: v, travel: { approvedAmountCents: 0, reason: 'probe' } }) },
];

beforeAll(async () => {
  t = await makeClaimsApp();
  agencyA = agencyIdByName(t, HARBORVIEW);
  agencyB = agencyIdByName(t, PRAIRIE);
  claimsOfA = allClaims(t).filter((c) => c.agencyId === agencyA);
  b.tech = await t.signIn('techB');
  b.admin = await t.signIn('adminB');
});
afterAll(async () => {
  await t.close();
});

describe('agency B replays every claim id of agency A', () => {
  it('agency A has claims in many states to aim at', () => {
    expect(claimsOfA.length).toBeGreaterThan(10);
    expect(new Set(claimsOfA.map((c) => c.state)).size).toBeGreaterThan(5);
  });

  it.each(probes.map((p) => [p.name, p] as const))('%s: 404 for every id, same body as for an id that never existed, nothing written', async (_name, probe) => {
    const before = claimsOfA.map((c) => claimFootprint(t, c.id));
    const auditBefore = countRows(t, 'audit_log', "outcome = 'success'");
    const outboxBefore = countRows(t, 'outbox');
    for (const agent of [b.tech, b.admin]) {
      const ghost = await probe.send(agent, '00000000-0000-4000-8000-000000000000', 1);
      expect(ghost.status).toBe(404);
      for (const c of claimsOfA) {
        const res = await probe.send(agent, c.id, c.version);
        expect(res.status, `${probe.name} ${c.number} (${c.state})`).toBe(404);
        expect(res.body).toEqual(ghost.body);
      }
    }
    expect(claimsOfA.map((c) => claimFootprint(t, c.id))).toEqual(before);
    expect(countRows(t, 'audit_log', "outcome = 'success'")).toBe(auditBefore);
    expect(countRows(t, 'outbox')).toBe(outboxBefore);
  });

  it('a body naming agency A is refused whole (400) for every id alike, and nothing is written', async () => {
    const before = claimsOfA.map((c) => claimFootprint(t, c.id));
    const bodies = [{ agencyId: agencyA }, { organisationId: agencyA }, { technicianId: claimsOfA[0].technicianId }];
    const ghost = await b.admin.patch('/api/claims/00000000-0000-4000-8000-000000000000').send({ version: 1, complaint: 'x', agencyId: agencyA });
    expect(ghost.status).toBe(400);
    for (const c of claimsOfA) {
      for (const extra of bodies) {
        const res = await b.admin.patch(`/api/claims/${c.id}`).send({ version: c.version, complaint: 'x', ...extra });
        expect(res.status).toBe(400);
        expect(res.body.error.code).toBe('validation_failed');
        const t2 = await b.admin.post(`/api/claims/${c.id}/transitions`).send({ type: 'submit', version: c.version, ...extra });
        expect(t2.status).toBe(400);
      }
      const same = await b.admin.patch(`/api/claims/${c.id}`).send({ version: 1, complaint: 'x', agencyId: agencyA });
      expect(same.body).toEqual(ghost.body);
    }
    expect(claimsOfA.map((c) => claimFootprint(t, c.id))).toEqual(before);
  });

  it('a draft created by agency B while naming agency A is refused, and no claim lands in agency A', async () => {
    const countA = countRows(t, 'claims', 'agency_id = ?', agencyA);
    const res = await b.tech.post('/api/claims').set('X-Organisation-Id', agencyA).send({ serial: 'anything', agencyId: agencyA });
    expect(res.status).toBe(400);
    expect(countRows(t, 'claims', 'agency_id = ?', agencyA)).toBe(countA);
  });

  it("the list with agency A's id as filter, query or header shows agency B nothing of A", async () => {
    for (const agent of [b.tech, b.admin]) {
      for (const res of [
        await agent.get(`/api/claims?agency=${agencyA}&limit=100`),
        await agent.get(`/api/claims?limit=100`).set('X-Organisation-Id', agencyA),
        await agent.get(`/api/claims?limit=100&agencyId=${agencyA}&organisationId=${agencyA}`),
      ]) {
        expect(res.status).toBe(200);
        for (const item of res.body.items) expect(item.agencyId).toBe(agencyB);
        expect(res.body.items.every((i: { agencyId: string }) => i.agencyId !== agencyA)).toBe(true);
      }
    }
  });

  it("the unit history by serial lists no claim of agency A to agency B", async () => {
    const withUnit = claimsOfA.filter((c) => c.unitId !== null);
    for (const c of withUnit.slice(0, 10)) {
      const { serial } = t.db.$client.prepare('select serial from units where id = ?').get(c.unitId) as { serial: string };
      const res = await b.admin.get(`/api/units/${encodeURIComponent(serial)}`);
      expect(res.status).toBe(200);
      for (const p of res.body.priorClaims) expect(p.agencyId).toBe(agencyB);
    }
    // the same history read by agency A does list its own claim
    const a = await t.signIn('adminA');
    const c = withUnit[0];
    const { serial } = t.db.$client.prepare('select serial from units where id = ?').get(c.unitId) as { serial: string };
    const mine = await a.get(`/api/units/${encodeURIComponent(serial)}`);
    expect(mine.body.priorClaims.map((p: { id: string }) => p.id)).toContain(c.id);
  });

  it('the home page of agency B counts nothing of agency A', async () => {
    const res = await b.admin.get('/api/home');
    expect(res.status).toBe(200);
    const countOfB = (state: string) => allClaims(t).filter((c) => c.agencyId === agencyB && c.state === state).length;
    const card = (key: string) => res.body.cards.find((c: { key: string }) => c.key === key);
    expect(card('agency_drafts').count).toBe(countOfB('draft'));
    expect(card('agency_returned').count).toBe(countOfB('returned'));
    expect(card('agency_approved').count).toBe(countOfB('approved'));
    for (const c of res.body.cards) for (const i of c.items) expect(i.agencyId).toBe(agencyB);
  });
});
