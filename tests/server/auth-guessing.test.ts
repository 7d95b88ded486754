import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { Server } from 'node:http';
import { and, eq, inArray } from 'drizzle-orm';
import { auditLog } from '../../server/db/schema/index';
import { DEMO_PASSWORD, TestClock, demoAccounts, makeTestApp, type TestApp } from '../factories/test-app';

// Online guessing, NIST SP 800-63B-4 §3.2.2 (rate limiting: no more than 100 failed attempts)
// and OWASP ASVS 5.0 6.3.x. An attempt counts as "processed" when its password was compared,
// which is when a sign-in audit row with outcome failure or success is written.

const ORIGIN = 'http://localhost:3000';
// One listening server per app, so a thousand requests do not each open a new one.
const servers = new Map<TestApp, Server>();
const post = (t: TestApp, email: string, password: string) => {
  let server = servers.get(t);
  if (!server) {
    server = t.app.listen(0, '127.0.0.1');
    servers.set(t, server);
  }
  return request(server).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email, password });
};
const closeServer = (t: TestApp) =>
  new Promise<void>((resolve) => {
    const server = servers.get(t);
    servers.delete(t);
    if (!server) return resolve();
    server.closeAllConnections();
    server.close(() => resolve());
  });

/** Requests sent at once: attempts are counted before the password is compared, so bursts cannot slip past. */
const BURST = 25;

const processed = (t: TestApp) =>
  t.db
    .select()
    .from(auditLog)
    .where(and(eq(auditLog.action, 'auth.sign_in'), inArray(auditLog.outcome, ['failure', 'success'])))
    .all().length;

describe('500 wrong passwords on one account', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await makeTestApp({ clock: new TestClock() });
  });
  afterAll(async () => {
    await closeServer(t);
    await t.close();
  });

  it('is throttled after a few failures, and at most 100 attempts are processed', async () => {
    // The first ten one after another, to see where throttling starts ...
    const statuses: number[] = [];
    for (let i = 0; i < 10; i++) statuses.push((await post(t, demoAccounts.techA, `guess-number-${i}-for-this-account`)).status);
    const firstRefused = statuses.indexOf(429);
    expect(firstRefused).toBeGreaterThan(0);
    expect(firstRefused).toBeLessThanOrEqual(5);
    expect(statuses.slice(0, firstRefused).every((s) => s === 401)).toBe(true);
    expect(statuses.slice(firstRefused).every((s) => s === 429)).toBe(true);
    // ... then the other 490 in parallel bursts, as a script would send them.
    for (let i = 10; i < 500; i += BURST) {
      const burst = await Promise.all(Array.from({ length: Math.min(BURST, 500 - i) }, (_, k) => post(t, demoAccounts.techA, `guess-number-${i + k}-for-this-account`)));
      statuses.push(...burst.map((r) => r.status));
    }
    expect(statuses).toHaveLength(500);
    expect(statuses.filter((s) => s === 429)).toHaveLength(500 - firstRefused);
    expect(processed(t)).toBeLessThanOrEqual(100);
    expect(processed(t)).toBe(firstRefused);
    // The denial is recorded once per window, not 495 times.
    const denials = t.db.select().from(auditLog).where(and(eq(auditLog.action, 'auth.sign_in'), eq(auditLog.outcome, 'denied'))).all();
    expect(denials).toHaveLength(1);
    // Even the right password is refused while the account is throttled.
    expect((await post(t, demoAccounts.techA, DEMO_PASSWORD)).status).toBe(429);
  }, 180_000);
});

describe('one password tried on 1,000 accounts from one address', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await makeTestApp({ clock: new TestClock() });
  });
  afterAll(async () => {
    await closeServer(t);
    await t.close();
  });

  it('is throttled per address: at most 100 attempts processed, the same 429 for known and unknown accounts', async () => {
    const known = Object.values(demoAccounts);
    const targets = Array.from({ length: 1000 }, (_, i) => (i % 100 === 50 ? known[(i / 100) % known.length | 0] : `person-${i}@example-agency.test`));
    const results: { email: string; status: number; text: string; retryAfter?: string }[] = [];
    for (let i = 0; i < targets.length; i += BURST) {
      const emails = targets.slice(i, i + BURST);
      const burst = await Promise.all(emails.map((email) => post(t, email, 'Spring-Season-Password-1')));
      burst.forEach((res, k) => results.push({ email: emails[k], status: res.status, text: res.text, retryAfter: res.headers['retry-after'] }));
    }
    const ok = results.filter((r) => r.status === 401).length;
    expect(ok).toBeLessThanOrEqual(100);
    expect(processed(t)).toBeLessThanOrEqual(100);
    expect(results.filter((r) => r.status === 429).length).toBe(1000 - ok);
    expect(results.every((r) => r.status === 401 || r.status === 429)).toBe(true);

    const refusedKnown = results.filter((r) => r.status === 429 && (known as string[]).includes(r.email));
    const refusedUnknown = results.filter((r) => r.status === 429 && !(known as string[]).includes(r.email));
    expect(refusedKnown.length).toBeGreaterThan(0);
    for (const r of [...refusedKnown, ...refusedUnknown]) {
      expect(r.text).toBe(refusedUnknown[0].text);
      expect(Number(r.retryAfter)).toBeGreaterThan(0);
    }
    // A real user on the same address is throttled too until the window passes.
    expect((await post(t, demoAccounts.reviewer, DEMO_PASSWORD)).status).toBe(429);
  }, 180_000);
});

describe('throttling state belongs to one app', () => {
  it('does not leak from one app instance into another', async () => {
    const a = await makeTestApp({ clock: new TestClock() });
    const b = await makeTestApp({ clock: new TestClock() });
    try {
      for (let i = 0; i < 6; i++) await post(a, demoAccounts.adminA, `guess-number-${i}-for-this-account`);
      expect((await post(a, demoAccounts.adminA, DEMO_PASSWORD)).status).toBe(429);
      expect((await post(b, demoAccounts.adminA, DEMO_PASSWORD)).status).toBe(200);
    } finally {
      await closeServer(a);
      await closeServer(b);
      await a.close();
      await b.close();
    }
  });

  it('takes its limits from the app options', async () => {
    const { createApp } = await import('../../server/app');
    const base = await makeTestApp({ clock: new TestClock() });
    try {
      const { app } = createApp({
        db: base.db,
        env: base.env,
        mailer: { send: async () => {} },
        clock: new TestClock(),
        authLimits: { account: [{ limit: 2, windowMs: 60_000 }] },
      });
      const tryOnce = (password: string) => request(app).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: demoAccounts.techB, password });
      expect((await tryOnce('first-wrong-password-here')).status).toBe(401);
      expect((await tryOnce('second-wrong-password-here')).status).toBe(401);
      expect((await tryOnce(DEMO_PASSWORD)).status).toBe(429);
    } finally {
      await base.close();
    }
  });
});
