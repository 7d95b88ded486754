import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts, type DemoKey } from '../factories/test-app';
import type { Claim } from '../../server/db/schema/index';
import { agencyIdByName, allClaims, HARBORVIEW, makeClaimsApp, PRAIRIE, userId, type Agent } from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
const agents = {} as Record<DemoKey, Agent>;
let rows: Claim[];
let harborview: string;
let prairie: string;

/**
 * Who may read which claim, written from the role table independently of the CASL rules:
 * technicians their own, agency admins their agency's, reviewers everything filed,
 * accountants approved and paid, the manufacturer admin none.
 */
function expectedVisible(who: DemoKey): Set<string> {
  const filed = ['submitted', 'in_review', 'returned', 'approved', 'denied', 'paid'];
  const pick = (f: (c: Claim) => boolean) => new Set(rows.filter(f).map((c) => c.id));
  switch (who) {
    case 'techA':
      return pick((c) => c.technicianId === userId(t, demoAccounts.techA));
    case 'techB':
      return pick((c) => c.technicianId === userId(t, demoAccounts.techB));
    case 'adminA':
      return pick((c) => c.agencyId === harborview);
    case 'adminB':
      return pick((c) => c.agencyId === prairie);
    case 'reviewer':
      return pick((c) => filed.includes(c.state));
    case 'accountant':
      return pick((c) => c.state === 'approved' || c.state === 'paid');
    case 'mfrAdmin':
      return new Set();
  }
}

async function walk(agent: Agent, query: string, limit = 7): Promise<{ ids: string[]; items: Array<Record<string, unknown>>; totals: number[]; pages: number }> {
  const ids: string[] = [];
  const items: Array<Record<string, unknown>> = [];
  const totals: number[] = [];
  let cursor: string | null = null;
  let pages = 0;
  do {
    const res = await agent.get(`/api/claims?${query}&limit=${limit}${cursor ? `&cursor=${cursor}` : ''}`);
    expect(res.status).toBe(200);
    ids.push(...res.body.items.map((i: { id: string }) => i.id));
    items.push(...res.body.items);
    totals.push(res.body.total);
    cursor = res.body.nextCursor;
    pages++;
    expect(pages).toBeLessThan(100);
  } while (cursor);
  return { ids, items, totals, pages };
}

beforeAll(async () => {
  t = await makeClaimsApp();
  for (const k of Object.keys(demoAccounts) as DemoKey[]) agents[k] = await t.signIn(k);
  rows = allClaims(t);
  harborview = agencyIdByName(t, HARBORVIEW);
  prairie = agencyIdByName(t, PRAIRIE);
});
afterAll(async () => {
  await t.close();
});

describe('GET /api/claims scoping', () => {
  it('the demo has claims in every state for both agencies', () => {
    expect(new Set(rows.map((r) => r.state)).size).toBe(8);
    expect(rows.some((r) => r.agencyId === harborview) && rows.some((r) => r.agencyId === prairie)).toBe(true);
  });

  it.each(Object.keys(demoAccounts) as DemoKey[])('%s sees exactly the claims its role may read, and the total agrees', async (who) => {
    const expected = expectedVisible(who);
    const { ids, totals } = await walk(agents[who], 'sort=createdAt&dir=desc');
    expect(new Set(ids)).toEqual(expected);
    expect(ids.length).toBe(expected.size); // no duplicates across pages
    for (const total of totals) expect(total).toBe(expected.size);
  });

  it('a reviewer never sees a draft or a withdrawn claim, in the list or by id', async () => {
    const { items } = await walk(agents.reviewer, 'sort=createdAt&dir=desc', 50);
    expect(items.some((i) => i.state === 'draft' || i.state === 'withdrawn')).toBe(false);
    const drafts = rows.filter((r) => r.state === 'draft');
    expect(drafts.length).toBeGreaterThan(0);
    for (const d of drafts) {
      expect((await agents.reviewer.get(`/api/claims/${d.id}`)).status).toBe(404);
      expect((await agents.reviewer.get(`/api/claims?state=draft`)).body.total).toBe(0);
    }
  });

  it('list items carry the joined names (agency, technician, serial, model, site) without extra calls', async () => {
    const res = await agents.adminA.get('/api/claims?limit=100');
    const item = res.body.items.find((i: { serial: string | null }) => i.serial !== null);
    expect(item.agencyName).toBe(HARBORVIEW);
    expect(typeof item.technicianName).toBe('string');
    expect(item.technicianName.length).toBeGreaterThan(0);
    expect(typeof item.modelNumber).toBe('string');
    expect(Array.isArray(item.flags)).toBe(true);
  });
});

describe('GET /api/claims paging, sorting and filters', () => {
  const sorts = ['createdAt', 'submittedAt', 'repairDate', 'number', 'claimedTotalCents', 'state'] as const;
  const keyOf = (c: Claim, s: (typeof sorts)[number]): string | number => {
    const v = c[s];
    return v === null ? '' : (v as string | number);
  };

  it.each(sorts.flatMap((s) => (['asc', 'desc'] as const).map((d) => [s, d] as const)))('sort %s %s: pages join into one ordered list with a stable tie-break on id', async (sort, dir) => {
    const { ids } = await walk(agents.reviewer, `sort=${sort}&dir=${dir}`, 5);
    const visible = rows.filter((r) => expectedVisible('reviewer').has(r.id));
    const sign = dir === 'asc' ? 1 : -1;
    const expected = [...visible]
      .sort((a, b) => {
        const ka = keyOf(a, sort);
        const kb = keyOf(b, sort);
        if (ka < kb) return -sign;
        if (ka > kb) return sign;
        return a.id < b.id ? -sign : a.id > b.id ? sign : 0;
      })
      .map((r) => r.id);
    expect(ids).toEqual(expected);
  });

  it('state filter narrows', async () => {
    const { ids, totals } = await walk(agents.reviewer, 'state=approved');
    const expected = rows.filter((r) => r.state === 'approved').map((r) => r.id);
    expect(new Set(ids)).toEqual(new Set(expected));
    expect(totals[0]).toBe(expected.length);
  });

  it('agency filter narrows a reviewer to one agency', async () => {
    const { ids, totals } = await walk(agents.reviewer, `agency=${prairie}`);
    const expected = rows.filter((r) => r.agencyId === prairie && expectedVisible('reviewer').has(r.id)).map((r) => r.id);
    expect(expected.length).toBeGreaterThan(0);
    expect(new Set(ids)).toEqual(new Set(expected));
    expect(totals[0]).toBe(expected.length);
  });

  it('agency filter never widens: an agency asking for the other agency gets nothing', async () => {
    for (const [who, other] of [
      ['adminB', () => harborview],
      ['techB', () => harborview],
      ['adminA', () => prairie],
      ['techA', () => prairie],
    ] as const) {
      const res = await agents[who].get(`/api/claims?agency=${other()}`);
      expect(res.status).toBe(200);
      expect(res.body.items).toEqual([]);
      expect(res.body.total).toBe(0);
    }
  });

  it('q matches a claim number or a serial, within the scope', async () => {
    const target = rows.find((r) => r.agencyId === harborview && r.unitId !== null)!;
    const byNumber = await agents.adminA.get(`/api/claims?q=${target.number.slice(-6)}`);
    expect(byNumber.body.items.map((i: { id: string }) => i.id)).toContain(target.id);
    const serial = t.db.$client.prepare('select serial from units where id = ?').get(target.unitId) as { serial: string };
    const bySerial = await agents.adminA.get(`/api/claims?q=${encodeURIComponent(serial.serial.slice(2))}&limit=100`);
    expect(bySerial.body.items.map((i: { id: string }) => i.id)).toContain(target.id);
    for (const i of bySerial.body.items) expect(i.agencyId).toBe(harborview);
    expect(bySerial.body.total).toBe(bySerial.body.items.length);
    const fromB = await agents.adminB.get(`/api/claims?q=${target.number}`);
    expect(fromB.body.total).toBe(0);
    // LIKE wildcards are taken literally
    expect((await agents.reviewer.get('/api/claims?q=%25')).body.total).toBe(0);
    expect((await agents.reviewer.get('/api/claims?q=_')).body.total).toBe(0);
  });

  it('from/to filter the repair date, inclusive', async () => {
    const dated = rows.filter((r) => r.repairDate && expectedVisible('reviewer').has(r.id)).map((r) => r.repairDate!).sort();
    const from = dated[Math.floor(dated.length / 4)];
    const to = dated[Math.floor((dated.length * 3) / 4)];
    const { ids, totals } = await walk(agents.reviewer, `from=${from}&to=${to}`);
    const expected = rows.filter((r) => expectedVisible('reviewer').has(r.id) && r.repairDate !== null && r.repairDate >= from && r.repairDate <= to).map((r) => r.id);
    expect(new Set(ids)).toEqual(new Set(expected));
    expect(totals[0]).toBe(expected.length);
  });

  it('rejects bad filters and foreign or forged cursors with 400, never 500', async () => {
    const first = await agents.reviewer.get('/api/claims?limit=2&sort=number&dir=asc');
    const cursor = first.body.nextCursor as string;
    expect(typeof cursor).toBe('string');
    const otherSort = await agents.reviewer.get(`/api/claims?limit=2&sort=createdAt&dir=asc&cursor=${cursor}`);
    expect(otherSort.status).toBe(400);
    expect(otherSort.body.error.fields.cursor).toBeTruthy();
    for (const q of [
      'cursor=not*base64',
      `cursor=${Buffer.from('{"a":1}').toString('base64url')}`,
      `cursor=${Buffer.from('["number","asc",{"$gt":""},"x"]').toString('base64url')}`,
      'limit=0',
      'limit=101',
      'limit=abc',
      'state=lost',
      'sort=password',
      'dir=sideways',
      'from=2026-13-01',
    ]) {
      const res = await agents.reviewer.get(`/api/claims?${q}`);
      expect(res.status, q).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
    }
  });

  it('answers 401 signed out', async () => {
    const { default: request } = await import('supertest');
    const res = await request(t.app).get('/api/claims');
    expect(res.status).toBe(401);
  });
});

describe('list agrees with detail', () => {
  it('for random (user, claim) pairs: may read <=> in the list <=> counted in the total', async () => {
    let seed = 20260615;
    const rand = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    const lists = {} as Record<DemoKey, Set<string>>;
    const totals = {} as Record<DemoKey, number>;
    for (const who of Object.keys(demoAccounts) as DemoKey[]) {
      const { ids, totals: tt } = await walk(agents[who], 'sort=createdAt&dir=desc', 25);
      lists[who] = new Set(ids);
      totals[who] = tt[0];
    }
    const whos = Object.keys(demoAccounts) as DemoKey[];
    let readable = 0;
    for (let i = 0; i < 120; i++) {
      const who = whos[Math.floor(rand() * whos.length)];
      const claim = rows[Math.floor(rand() * rows.length)];
      const res = await agents[who].get(`/api/claims/${claim.id}`);
      expect([200, 404]).toContain(res.status);
      expect(res.status === 200, `${who} ${claim.number} ${claim.state}`).toBe(lists[who].has(claim.id));
      if (res.status === 200) {
        readable++;
        expect(res.body.id).toBe(claim.id);
      }
    }
    expect(readable).toBeGreaterThan(0);
    for (const who of whos) expect(totals[who]).toBe(lists[who].size);
  });
});
