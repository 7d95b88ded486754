import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { HomeCard } from '../../shared/schemas/home';
import { claimIn, makeClaimsApp, move, type Agent } from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let techA: Agent;
let adminA: Agent;
let reviewer: Agent;
let accountant: Agent;
let mAdmin: Agent;

beforeAll(async () => {
  t = await makeClaimsApp();
  techA = await t.signIn('techA');
  adminA = await t.signIn('adminA');
  reviewer = await t.signIn('reviewer');
  accountant = await t.signIn('accountant');
  mAdmin = await t.signIn('mfrAdmin');
});
afterAll(async () => {
  await t.close();
});

const cards = async (agent: Agent): Promise<HomeCard[]> => {
  const res = await agent.get('/api/home');
  expect(res.status).toBe(200);
  return res.body.cards;
};

describe('home cards', () => {
  it('list approved claims with the approved amount, not the amount the rules allowed', async () => {
    const c = await claimIn(t, { tech: techA, reviewer }, 'in_review');
    const detail = (await reviewer.get(`/api/claims/${c.id}`)).body;
    const adj = await reviewer.post(`/api/claims/${c.id}/adjustments`).send({ version: c.version, laborLines: [{ id: detail.laborLines[0].id, approvedHours: 0.25, reason: 'Only the front foot needed leveling.' }] });
    expect(adj.status).toBe(200);
    const approved = await move(reviewer, c.id, 'approve', adj.body.version);
    expect(approved.status).toBe(200);
    expect(approved.body.approvedTotalCents).toBeLessThan(approved.body.claimedTotalCents);

    for (const [agent, key] of [[adminA, 'agency_approved'], [accountant, 'ready_to_pay']] as const) {
      const card = (await cards(agent)).find((k) => k.key === key)!;
      expect(card.kind).toBe('queue');
      expect(card.amount).toBe('approved');
      const item = card.items.find((i) => i.id === c.id)!;
      expect(item.approvedTotalCents).toBe(approved.body.approvedTotalCents);
    }
  });

  it('mark plain counts as counts, so a count above zero never shows as an empty queue', async () => {
    for (const agent of [mAdmin, accountant]) {
      for (const card of await cards(agent)) {
        if (card.items.length === 0 && card.count > 0) expect(card.kind).toBe('count');
      }
    }
    const admin = await cards(mAdmin);
    expect(admin.every((c) => c.kind === 'count')).toBe(true);
    expect((await cards(accountant)).find((c) => c.key === 'open_runs')!.kind).toBe('count');
  });
});
