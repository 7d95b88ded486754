import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { Server } from 'node:http';
import { and, eq, sql } from 'drizzle-orm';
import { auditLog } from '../../server/db/schema/index';
import { flushAuditRepeats } from '../../server/lib/audit';
import { DEFAULT_USER_RATES, DEMO_PASSWORD, TestClock, demoAccounts, makeTestApp, type TestApp } from '../factories/test-app';

// Per-user limits on writes, uploads and unit look-ups (OWASP ASVS 5.0 2.4.1, anti-automation),
// counted in the SQLite rate store on the app clock, and the audit log kept from flooding.

const ORIGIN = 'http://localhost:3000';
const BURST = 40;

async function cookieOf(server: Server, email: string): Promise<string> {
  const res = await request(server).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email, password: DEMO_PASSWORD });
  expect(res.status).toBe(200);
  return ([] as string[])
    .concat(res.headers['set-cookie'] ?? [])
    .map((c) => c.split(';')[0])
    .join('; ');
}
const auditCount = (t: TestApp) => (t.db.select({ n: sql<number>`count(*)` }).from(auditLog).get()?.n ?? 0) as number;

describe('4,000+ refused writes from one account', () => {
  let t: TestApp;
  let server: Server;
  const clock = new TestClock();
  beforeAll(async () => {
    t = await makeTestApp({ clock, env: DEFAULT_USER_RATES });
    server = t.app.listen(0, '127.0.0.1');
  });
  afterAll(async () => {
    server.closeAllConnections();
    await new Promise((r) => server.close(r));
    await t.close();
  });

  it('are throttled per account with 429 and Retry-After, and add only a handful of audit rows that still count every refusal', async () => {
    // Technician B aims at a claim of agency A: each write is refused (404) and audited as denied.
    const foreign = t.db.$client
      .prepare('select c.id from claims c where c.agency_id <> (select organisation_id from users where email = ?) limit 1')
      .get(demoAccounts.techB) as { id: string };
    const cookie = await cookieOf(server, demoAccounts.techB);
    const before = auditCount(t);

    const N = 4_200;
    const statuses = new Map<number, number>();
    const retry: number[] = [];
    const started = Date.now();
    for (let i = 0; i < N; i += BURST) {
      const burst = await Promise.all(
        Array.from({ length: Math.min(BURST, N - i) }, () =>
          request(server).post(`/api/claims/${foreign.id}/comments`).set('Origin', ORIGIN).set('Cookie', cookie).send({ body: 'Checking in on this claim.' }),
        ),
      );
      for (const r of burst) {
        statuses.set(r.status, (statuses.get(r.status) ?? 0) + 1);
        if (r.status === 429) retry.push(Number(r.headers['retry-after']));
      }
    }
    const elapsed = Date.now() - started;
    expect([...statuses.keys()].sort()).toEqual([404, 429]);
    expect(statuses.get(404)).toBe(240);
    expect(statuses.get(429)).toBe(N - 240);
    expect(retry.every((s) => s > 0 && s <= 60)).toBe(true);
    // While the minute runs: one row for the refused comment, one for the throttle.
    expect(auditCount(t) - before).toBe(2);

    // Another user is not held by technician B's limit.
    const other = await cookieOf(server, demoAccounts.adminB);
    expect((await request(server).post(`/api/claims/${foreign.id}/comments`).set('Origin', ORIGIN).set('Cookie', other).send({ body: 'x' })).status).toBe(404);

    // When the minute is over, each repeated refusal gets one summary row with its count.
    clock.advance(61_000);
    expect(flushAuditRepeats(t.db, clock)).toBe(2);
    const rows = t.db.select().from(auditLog).where(and(eq(auditLog.actorId, t.db.$client.prepare('select id from users where email = ?').pluck().get(demoAccounts.techB) as string), eq(auditLog.outcome, 'denied'))).all();
    expect(rows).toHaveLength(4);
    const total = rows.reduce((n, r) => n + (((r.detail ?? {}) as { repeats?: number }).repeats ?? 1), 0);
    expect(total).toBe(N);
    const added = auditCount(t) - before;
    expect(added).toBeLessThanOrEqual(6);
    console.log(`audit flood figures: ${N} refused writes in ${elapsed} ms from one account: ${statuses.get(404)} reached the service (404), ${statuses.get(429)} got 429; audit rows added ${added} (counts add up to ${total})`);

    // After the window the account writes again.
    expect((await request(server).post(`/api/claims/${foreign.id}/comments`).set('Origin', ORIGIN).set('Cookie', cookie).send({ body: 'x' })).status).toBe(404);
  }, 300_000);

  it('does not count sign-out: a throttled user can still leave', async () => {
    const cookie = await cookieOf(server, demoAccounts.adminA);
    for (let i = 0; i < 240; i += BURST) await Promise.all(Array.from({ length: BURST }, () => request(server).post('/api/claims/not-a-claim/comments').set('Origin', ORIGIN).set('Cookie', cookie).send({ body: 'x' })));
    expect((await request(server).post('/api/claims/not-a-claim/comments').set('Origin', ORIGIN).set('Cookie', cookie).send({ body: 'x' })).status).toBe(429);
    expect((await request(server).post('/api/auth/sign-out').set('Origin', ORIGIN).set('Cookie', cookie)).status).toBe(204);
  });
});

describe('serial-number look-ups', () => {
  it('are throttled per user: 300 guessed serials answer 30 times, then 429 with Retry-After; another user is not held', async () => {
    const clock = new TestClock();
    const t = await makeTestApp({ clock, env: DEFAULT_USER_RATES });
    try {
      const techA = await t.signIn('techA');
      const statuses: number[] = [];
      let retry = 0;
      for (let i = 0; i < 300; i++) {
        const r = await techA.get(`/api/units/GUESS-${String(100000 + i)}`);
        statuses.push(r.status);
        if (r.status === 429) retry = Number(r.headers['retry-after']);
      }
      expect(statuses.slice(0, 30).every((s) => s === 404)).toBe(true);
      expect(statuses.slice(30).every((s) => s === 429)).toBe(true);
      expect(retry).toBeGreaterThan(0);
      const adminA = await t.signIn('adminA');
      expect((await adminA.get('/api/units/GUESS-1')).status).toBe(404);
      clock.advance(61_000);
      expect((await techA.get('/api/units/GUESS-1')).status).toBe(404);
    } finally {
      await t.close();
    }
  });
});

describe('uploads per user and minute', () => {
  it('the 31st upload request within a minute answers 429 with Retry-After, before the body is read', async () => {
    const clock = new TestClock();
    const t = await makeTestApp({ clock, env: DEFAULT_USER_RATES });
    try {
      const techA = await t.signIn('techA');
      const statuses: number[] = [];
      for (let i = 0; i < 35; i++) {
        const r = await techA.post('/api/claims/no-such-claim/attachments').set('Origin', ORIGIN).attach('files', Buffer.from('not an image'), 'note.jpg');
        statuses.push(r.status);
        if (i === 34) expect(Number(r.headers['retry-after'])).toBeGreaterThan(0);
      }
      expect(statuses.slice(0, 30).every((s) => s !== 429)).toBe(true);
      expect(statuses.slice(30)).toEqual([429, 429, 429, 429, 429]);
      // Readings imports are uploads too.
      expect((await techA.post('/api/claims/no-such-claim/readings/import').set('Origin', ORIGIN).attach('file', Buffer.from('a,b\n'), 'r.csv')).status).toBe(429);
      clock.advance(61_000);
      expect((await techA.post('/api/claims/no-such-claim/attachments').set('Origin', ORIGIN).attach('files', Buffer.from('x'), 'n.jpg')).status).not.toBe(429);
    } finally {
      await t.close();
    }
  });
});
