/**
 * The review queue's filters on GET /api/claims: several states at once, a flag, a model and a
 * claimed-amount range, oldest submission first, with who took each claim for review. Expected
 * sets are computed from the claims table directly, not from the list code.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { claims, models, units, users, type Claim } from '../../server/db/schema/index';
import { demoAccounts } from '../factories/test-app';
import { allClaims, makeClaimsApp, userId, type Agent } from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let reviewer: Agent;
let techA: Agent;
let rows: Claim[];

async function walk(agent: Agent, query: string, limit = 5) {
  const items: Array<{ id: string; state: string; submittedAt: string | null; flags: string[]; claimedTotalCents: number; reviewerName?: string | null; technicianId: string }> = [];
  let total = -1;
  let cursor: string | null = null;
  for (let page = 0; page < 100; page++) {
    const res = await agent.get(`/api/claims?${query}&limit=${limit}${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ''}`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    items.push(...res.body.items);
    if (total === -1) total = res.body.total;
    cursor = res.body.nextCursor;
    if (!cursor) break;
  }
  return { items, total };
}

const queue = 'states=submitted,in_review&sort=submittedAt&dir=asc';
const inQueue = (c: Claim) => c.state === 'submitted' || c.state === 'in_review';
const sortedIds = (xs: Array<{ id: string }>) => xs.map((x) => x.id).sort();

beforeAll(async () => {
  t = await makeClaimsApp();
  reviewer = await t.signIn('reviewer');
  techA = await t.signIn('techA');
  rows = allClaims(t);
});
afterAll(async () => {
  await t.close();
});

describe('the review queue on GET /api/claims', () => {
  it('lists submitted and in-review claims, oldest submission first, across pages', async () => {
    const { items, total } = await walk(reviewer, queue);
    const expected = rows.filter(inQueue);
    expect(expected.length).toBeGreaterThan(2);
    expect(sortedIds(items)).toEqual(sortedIds(expected));
    expect(total).toBe(expected.length);
    const times = items.map((i) => i.submittedAt ?? '');
    expect(times).toEqual([...times].sort());
  });

  it('names the reviewer who took an in-review claim, and nobody for a waiting one', async () => {
    const { items } = await walk(reviewer, queue, 50);
    const names = new Map(t.db.select({ id: users.id, name: users.name }).from(users).all().map((u) => [u.id, u.name]));
    for (const i of items) {
      const row = rows.find((r) => r.id === i.id)!;
      expect(i.reviewerName ?? null).toBe(row.reviewerId ? names.get(row.reviewerId)! : null);
    }
    expect(items.some((i) => i.state === 'in_review' && i.reviewerName)).toBe(true);
  });

  it('narrows by flag: every claim carrying it, and only those', async () => {
    const flagged = rows.filter(inQueue).flatMap((c) => c.flags);
    expect(flagged.length).toBeGreaterThan(0);
    const flag = flagged[0];
    const { items, total } = await walk(reviewer, `${queue}&flag=${flag}`);
    const expected = rows.filter((c) => inQueue(c) && c.flags.includes(flag));
    expect(sortedIds(items)).toEqual(sortedIds(expected));
    expect(total).toBe(expected.length);
    expect(expected.length).toBeLessThan(rows.filter(inQueue).length);
  });

  it('narrows by model and by a claimed-amount range (bounds included)', async () => {
    const withModel = rows
      .filter(inQueue)
      .map((c) => ({ c, model: c.unitId ? t.db.select({ modelId: units.modelId }).from(units).where(eq(units.id, c.unitId)).get()?.modelId : undefined }))
      .filter((x): x is { c: Claim; model: string } => !!x.model);
    const model = withModel[0].model;
    const byModel = await walk(reviewer, `${queue}&model=${model}`);
    expect(sortedIds(byModel.items)).toEqual(sortedIds(withModel.filter((x) => x.model === model).map((x) => x.c)));
    expect(t.db.select().from(models).where(eq(models.id, model)).get()).toBeDefined();

    const amounts = rows
      .filter(inQueue)
      .map((c) => c.claimedTotalCents)
      .sort((a, b) => a - b);
    const lo = amounts[1];
    const hi = amounts[amounts.length - 2];
    const range = await walk(reviewer, `${queue}&minCents=${lo}&maxCents=${hi}`);
    const expected = rows.filter((c) => inQueue(c) && c.claimedTotalCents >= lo && c.claimedTotalCents <= hi);
    expect(sortedIds(range.items)).toEqual(sortedIds(expected));
    expect(range.items.every((i) => i.claimedTotalCents >= lo && i.claimedTotalCents <= hi)).toBe(true);
  });

  it('only narrows the scope: a technician asking for the queue still sees only their own claims', async () => {
    const { items } = await walk(techA, queue);
    const mine = userId(t, demoAccounts.techA);
    expect(sortedIds(items)).toEqual(sortedIds(rows.filter((c) => inQueue(c) && c.technicianId === mine)));
    expect(items.every((i) => i.technicianId === mine)).toBe(true);
  });

  it('refuses unknown states and flags and bad amounts with a 400 on the field', async () => {
    const bad = await reviewer.get('/api/claims?states=submitted,lost');
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields ?? {})).toContain('states');
    const flag = await reviewer.get('/api/claims?flag=not_a_flag');
    expect(flag.status).toBe(400);
    expect(Object.keys(flag.body.error.fields ?? {})).toContain('flag');
    const cents = await reviewer.get('/api/claims?minCents=-5');
    expect(cents.status).toBe(400);
    expect(Object.keys(cents.body.error.fields ?? {})).toContain('minCents');
    // a draft never reaches the queue, even when asked for by name
    const drafts = await reviewer.get('/api/claims?states=draft,submitted&limit=100');
    expect(drafts.status).toBe(200);
    expect(drafts.body.items.every((i: { state: string }) => i.state === 'submitted')).toBe(true);
    expect(rows.some((c) => c.state === 'draft')).toBe(true);
  });

  it('agrees with the stored claims on reviewer ids', () => {
    const taken = t.db.select({ id: claims.id, reviewerId: claims.reviewerId, state: claims.state }).from(claims).all();
    expect(taken.filter((c) => c.state === 'in_review').every((c) => c.reviewerId !== null)).toBe(true);
  });
});
