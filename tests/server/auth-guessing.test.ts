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

// ------------------------------------------------------------------------------- device cookies
// OWASP "Slow down online guessing attacks with device cookies": a browser that signed in to an
// account before holds a signed device cookie for it and keeps its own allowance.

/** The `name=value` of the device cookie in a sign-in answer (one per account). */
function deviceCookieOf(res: request.Response): string {
  const all = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  const c = all.find((h) => h.startsWith('fp_device_'));
  if (!c) throw new Error(`no device cookie in ${JSON.stringify(all)}`);
  return c.split(';')[0];
}
const postFrom = (t: TestApp, email: string, password: string, opts: { cookie?: string; forwardedFor?: string } = {}) => {
  let r = post(t, email, password);
  if (opts.cookie) r = r.set('Cookie', opts.cookie);
  if (opts.forwardedFor) r = r.set('X-Forwarded-For', opts.forwardedFor);
  return r;
};
const processedFor = (t: TestApp, userId: string) =>
  t.db
    .select()
    .from(auditLog)
    .where(and(eq(auditLog.action, 'auth.sign_in'), eq(auditLog.recordId, userId), inArray(auditLog.outcome, ['failure', 'success'])))
    .all().length;
const userIdOf = (t: TestApp, email: string) => (t.db.$client.prepare('select id from users where email = ?').get(email) as { id: string }).id;

describe('lockout: 1,000 wrong guesses on one account from fresh clients, then the owner on a trusted device', () => {
  let t: TestApp;
  const clock = new TestClock();
  beforeAll(async () => {
    // Behind a proxy that sets X-Forwarded-For, so every attacker request has its own address.
    t = await makeTestApp({ clock, env: { TRUST_PROXY: 'true' } });
  });
  afterAll(async () => {
    await closeServer(t);
    await t.close();
  });

  it('the owner signs in; the attacker gets 429 with Retry-After; at most 100 passwords are compared', async () => {
    const email = demoAccounts.accountant;
    const userId = userIdOf(t, email);
    // Last week the owner signed in from this browser: it holds the account's device cookie.
    const earlier = await postFrom(t, email, DEMO_PASSWORD, { forwardedFor: '198.51.100.7' });
    expect(earlier.status).toBe(200);
    const device = deviceCookieOf(earlier);
    clock.advance(7 * 24 * 3600_000);
    const before = processedFor(t, userId);

    // 1,000 guesses from fresh clients: no cookies, a different address each (203.0.113.0/24 and 192.0.2.0/24, RFC 5737).
    const statuses = new Map<number, number>();
    const retryAfter: number[] = [];
    const started = Date.now();
    for (let i = 0; i < 1000; i += BURST) {
      const burst = await Promise.all(
        Array.from({ length: Math.min(BURST, 1000 - i) }, (_, k) => {
          const n = i + k;
          return postFrom(t, email, `attacker-guess-${n}-spring-2026`, { forwardedFor: `${n < 500 ? '203.0.113' : '192.0.2'}.${n % 250}` });
        }),
      );
      for (const r of burst) {
        statuses.set(r.status, (statuses.get(r.status) ?? 0) + 1);
        if (r.status === 429) retryAfter.push(Number(r.headers['retry-after']));
      }
    }
    const attackMs = Date.now() - started;
    const compared = processedFor(t, userId) - before;
    expect([...statuses.keys()].sort()).toEqual([401, 429]);
    expect(statuses.get(401)).toBe(5);
    expect(statuses.get(429)).toBe(995);
    expect(compared).toBe(5);
    expect(compared).toBeLessThanOrEqual(100);
    expect(retryAfter.every((s) => Number.isInteger(s) && s > 0)).toBe(true);

    // The owner, on the trusted device, mistypes twice (401, not 429), then signs in.
    expect((await postFrom(t, email, 'owner-typo-in-the-password-1', { cookie: device, forwardedFor: '198.51.100.7' })).status).toBe(401);
    expect((await postFrom(t, email, 'owner-typo-in-the-password-2', { cookie: device, forwardedFor: '198.51.100.7' })).status).toBe(401);
    const owner = await postFrom(t, email, DEMO_PASSWORD, { cookie: device, forwardedFor: '198.51.100.7' });
    expect(owner.status).toBe(200);
    // The password is accepted; the accountant's second factor comes next (no session from the password alone).
    expect(owner.body.secondFactor?.purpose).toBe('verify');

    // The attacker is still locked out, even with the right password, from a fresh client.
    const after = await postFrom(t, email, DEMO_PASSWORD, { forwardedFor: '203.0.113.99' });
    expect(after.status).toBe(429);
    expect(Number(after.headers['retry-after'])).toBeGreaterThan(0);

    // The flood of refusals is one denied audit row (repeats within a minute collapse).
    const denials = t.db.select().from(auditLog).where(and(eq(auditLog.action, 'auth.sign_in'), eq(auditLog.outcome, 'denied'), eq(auditLog.recordId, userId))).all();
    expect(denials.length).toBeLessThanOrEqual(2);
    console.log(
      `lockout figures: 1,000 guesses in ${attackMs} ms from 500 addresses: ${statuses.get(401)} answered 401 (password compared), ${statuses.get(429)} answered 429 ` +
        `(Retry-After ${Math.min(...retryAfter)}-${Math.max(...retryAfter)} s); passwords compared ${compared}; owner on the trusted device: 2 typos 401, then 200; ` +
        `attacker afterwards: ${after.status}; denied audit rows ${denials.length}`,
    );
  }, 300_000);

  it('a device cookie is HttpOnly, SameSite=Strict, scoped to /api/auth, long-lived and bound to its account', async () => {
    const res = await postFrom(t, demoAccounts.techB, DEMO_PASSWORD);
    expect(res.status).toBe(200);
    const header = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((h) => h.startsWith('fp_device_'))!;
    expect(header).toMatch(/HttpOnly/i);
    expect(header).toMatch(/SameSite=Strict/i);
    expect(header).toMatch(/Path=\/api\/auth/);
    expect(Number(/Max-Age=(\d+)/.exec(header)?.[1])).toBeGreaterThanOrEqual(180 * 24 * 3600);
    expect(header).not.toMatch(/Secure/i); // NODE_ENV=test; production sets Secure (auth-cookies tests the session cookie)
    const cookie = header.split(';')[0];
    const [name, value] = cookie.split('=');
    // The cookie of one account does not make the browser trusted for another ...
    for (let i = 0; i < 5; i++) await postFrom(t, demoAccounts.adminB, `guess-number-${i}-for-this-account`);
    expect((await postFrom(t, demoAccounts.adminB, DEMO_PASSWORD, { cookie })).status).toBe(429);
    // ... and a tampered one is no cookie at all.
    for (let i = 0; i < 5; i++) await postFrom(t, demoAccounts.techB, `guess-number-${i}-for-this-account`);
    const tampered = `${name}=${value.slice(0, -4)}AAAA`;
    expect((await postFrom(t, demoAccounts.techB, DEMO_PASSWORD, { cookie: tampered })).status).toBe(429);
    expect((await postFrom(t, demoAccounts.techB, DEMO_PASSWORD, { cookie })).status).toBe(200);
  });

  it('a trusted device has a small allowance of its own: its failures are throttled per cookie', async () => {
    const email = demoAccounts.adminA;
    const device = deviceCookieOf(await postFrom(t, email, DEMO_PASSWORD));
    const statuses: number[] = [];
    for (let i = 0; i < 8; i++) statuses.push((await postFrom(t, email, `forgotten-password-${i}-try`, { cookie: device })).status);
    expect(statuses).toEqual([401, 401, 401, 401, 401, 429, 429, 429]);
    // When the device's window is over, it may try again.
    clock.advance(16 * 60_000);
    expect((await postFrom(t, email, DEMO_PASSWORD, { cookie: device })).status).toBe(200);
  });
});

describe('at most 100 consecutive failures per account are processed (NIST SP 800-63B-4 §3.2.2)', () => {
  let t: TestApp;
  const clock = new TestClock();
  beforeAll(async () => {
    t = await makeTestApp({ clock, env: { TRUST_PROXY: 'true' } });
  });
  afterAll(async () => {
    await closeServer(t);
    await t.close();
  });

  it('a patient attacker who waits out every Retry-After gets 90 compared; the trusted device the rest; then nothing until a reset', async () => {
    const email = demoAccounts.mfrAdmin;
    const userId = userIdOf(t, email);
    const device = deviceCookieOf(await postFrom(t, email, DEMO_PASSWORD));
    const base = processedFor(t, userId);
    let sent = 0;
    let lastRetry = 0;
    // Guess, and whenever refused, wait exactly as long as Retry-After says (weeks of clock time).
    while (sent < 1000) {
      const r = await postFrom(t, email, `patient-guess-${sent}-of-many`, { forwardedFor: `203.0.113.${sent % 250}` });
      sent++;
      if (r.status === 429) {
        lastRetry = Number(r.headers['retry-after']);
        if (lastRetry > 30 * 24 * 3600) break; // the run of failures now holds the account
        clock.advance(lastRetry * 1000 + 1);
      } else expect(r.status).toBe(401);
    }
    expect(processedFor(t, userId) - base).toBe(90);
    // The owner's trusted device still works, with its own allowance, until 100 in a row ...
    for (let i = 0; i < 10; i++) {
      if (i % 5 === 0) clock.advance(16 * 60_000);
      expect((await postFrom(t, email, `owner-forgot-${i}-the-password`, { cookie: device })).status).toBe(401);
    }
    expect(processedFor(t, userId) - base).toBe(100);
    clock.advance(16 * 60_000);
    // ... and after 100 consecutive failures no password is compared at all, even the right one.
    expect((await postFrom(t, email, DEMO_PASSWORD, { cookie: device })).status).toBe(429);
    expect(processedFor(t, userId) - base).toBe(100);
    console.log(`consecutive-failure figures: ${sent} patient guesses over ${Math.round((clock.now().getTime() - Date.parse('2026-06-15T12:00:00Z')) / 86_400_000)} days of clock: 90 compared; trusted device 10 more; then 429 (Retry-After ${lastRetry} s) for all`);
  }, 300_000);
});

describe('per-address limits and TRUST_PROXY', () => {
  it('without TRUST_PROXY a forwarded-for header is ignored: 150 unknown accounts from one socket meet the address limit at 100', async () => {
    const t = await makeTestApp({ clock: new TestClock() });
    try {
      const statuses: number[] = [];
      for (let i = 0; i < 150; i += BURST) {
        const burst = await Promise.all(Array.from({ length: Math.min(BURST, 150 - i) }, (_, k) => postFrom(t, `nobody-${i + k}@example-agency.test`, 'Spring-Season-Password-1', { forwardedFor: `203.0.113.${i + k}` })));
        statuses.push(...burst.map((r) => r.status));
      }
      expect(statuses.filter((s) => s === 401)).toHaveLength(100);
      expect(statuses.filter((s) => s === 429)).toHaveLength(50);
    } finally {
      await closeServer(t);
      await t.close();
    }
  });

  it('with TRUST_PROXY the forwarded address is the client: the same 150 are each their own address', async () => {
    const t = await makeTestApp({ clock: new TestClock(), env: { TRUST_PROXY: 'true' } });
    try {
      const statuses: number[] = [];
      for (let i = 0; i < 150; i += BURST) {
        const burst = await Promise.all(Array.from({ length: Math.min(BURST, 150 - i) }, (_, k) => postFrom(t, `nobody-${i + k}@example-agency.test`, 'Spring-Season-Password-1', { forwardedFor: `203.0.113.${i + k}` })));
        statuses.push(...burst.map((r) => r.status));
      }
      expect(statuses.every((s) => s === 401)).toBe(true);
    } finally {
      await closeServer(t);
      await t.close();
    }
  });
});

describe('throttling state lives in the database', () => {
  it('is shared by two app processes on one database file, and survives a restart', async () => {
    const { createApp } = await import('../../server/app');
    const { openDatabase } = await import('../../server/db/client');
    const base = await makeTestApp({ clock: new TestClock() });
    const clock = new TestClock();
    const second = openDatabase(base.env.DATABASE_PATH);
    const third = openDatabase(base.env.DATABASE_PATH);
    try {
      const b = createApp({ db: second, env: base.env, mailer: { send: async () => {} }, clock });
      for (let i = 0; i < 5; i++) expect((await post(base, demoAccounts.adminA, `guess-number-${i}-for-this-account`)).status).toBe(401);
      // The other process refuses the sixth attempt ...
      const fromB = await request(b.app).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: demoAccounts.adminA, password: DEMO_PASSWORD });
      expect(fromB.status).toBe(429);
      await b.deps.outbox.stop();
      // ... and so does a process started afterwards on the same file (a restart).
      const c = createApp({ db: third, env: base.env, mailer: { send: async () => {} }, clock });
      expect((await request(c.app).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: demoAccounts.adminA, password: DEMO_PASSWORD })).status).toBe(429);
      await c.deps.outbox.stop();
      // Separate databases do not share anything.
      const other = await makeTestApp({ clock: new TestClock() });
      expect((await post(other, demoAccounts.adminA, DEMO_PASSWORD)).status).toBe(200);
      await closeServer(other);
      await other.close();
    } finally {
      second.$client.close();
      third.$client.close();
      await closeServer(base);
      await base.close();
    }
  });

  it('takes its limits from the app options', async () => {
    const { createApp } = await import('../../server/app');
    const base = await makeTestApp({ clock: new TestClock() });
    try {
      const { app, deps } = createApp({
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
      await deps.outbox.stop();
    } finally {
      await base.close();
    }
  });
});
