import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { and, eq } from 'drizzle-orm';
import { auditLog, users } from '../../server/db/schema/index';
import { hashPassword } from '../../server/lib/passwords';
import { newId } from '../../server/lib/ids';
import { DEMO_PASSWORD, TestClock, demoAccounts, makeTestApp, type TestApp } from '../factories/test-app';

// Sign-in answers per NIST SP 800-63B-4 §3.2.2 and OWASP ASVS 5.0 6.3.x: the same status and body
// for an unknown e-mail, a wrong password and a deactivated account; throttled with 429 + Retry-After.

const ORIGIN = 'http://localhost:3000';
const post = (t: TestApp, email: string, password: string) =>
  request(t.app).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email, password });

describe('POST /api/auth/sign-in', () => {
  let t: TestApp;
  const clock = new TestClock();

  beforeAll(async () => {
    t = await makeTestApp({ clock });
  });
  afterAll(async () => {
    await t.close();
  });

  it('signs in with the right password: 200, the user, organisation and rules, and a session cookie', async () => {
    const res = await post(t, demoAccounts.techA, DEMO_PASSWORD);
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe(demoAccounts.techA);
    expect(res.body.user.role).toBe('technician');
    expect(res.body.organisation.kind).toBe('agency');
    expect(Array.isArray(res.body.rules)).toBe(true);
    expect(res.body.rules.length).toBeGreaterThan(0);
    expect(res.body.user).not.toHaveProperty('passwordHash');
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/fp_session=[^;]+/);

    const row = t.db.select().from(users).where(eq(users.email, demoAccounts.techA)).get()!;
    expect(row.lastSignInAt).toBe(clock.now().toISOString());
    const audit = t.db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.action, 'auth.sign_in'), eq(auditLog.actorId, row.id), eq(auditLog.outcome, 'success')))
      .all();
    expect(audit).toHaveLength(1);
    expect(audit[0].organisationId).toBe(row.organisationId);
    expect(audit[0].at).toBe(clock.now().toISOString());
  });

  it('treats the e-mail case-insensitively and trims it', async () => {
    const res = await post(t, `  ${demoAccounts.adminA.toUpperCase()} `, DEMO_PASSWORD);
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe(demoAccounts.adminA);
  });

  it('answers a wrong password, an unknown e-mail and a deactivated account with the same 401 body', async () => {
    const wrong = await post(t, demoAccounts.reviewer, 'not-the-right-password-at-all');
    const unknown = await post(t, 'nobody-here@harborview.test', 'not-the-right-password-at-all');

    const admin = t.db.select().from(users).where(eq(users.email, demoAccounts.adminB)).get()!;
    t.db.update(users).set({ active: false }).where(eq(users.id, admin.id)).run();
    const inactive = await post(t, demoAccounts.adminB, DEMO_PASSWORD);
    t.db.update(users).set({ active: true }).where(eq(users.id, admin.id)).run();

    for (const r of [wrong, unknown, inactive]) {
      expect(r.status).toBe(401);
      expect(r.headers['set-cookie'] ?? []).not.toEqual(expect.arrayContaining([expect.stringMatching(/fp_session=[^;]+;/)]));
    }
    expect(wrong.body).toEqual({ error: { code: 'invalid_credentials', message: expect.any(String) } });
    expect(unknown.body).toEqual(wrong.body);
    expect(inactive.body).toEqual(wrong.body);
    expect(unknown.text).toBe(wrong.text);
  });

  it('writes a failure audit row for each failed attempt without the password or the unknown address', async () => {
    const failures = () => t.db.select().from(auditLog).where(and(eq(auditLog.action, 'auth.sign_in'), eq(auditLog.outcome, 'failure'))).all();
    const before = new Set(failures().map((r) => r.id));
    await post(t, 'stranger@prairieline.test', 'Secret-Guess-Number-One');
    const added = failures().filter((r) => !before.has(r.id));
    expect(added).toHaveLength(1);
    const everything = JSON.stringify(t.db.select().from(auditLog).all());
    expect(everything).not.toContain('Secret-Guess-Number-One');
    expect(everything).not.toContain('stranger@prairieline.test');
    const last = added[0];
    expect(last.actorId).toBeNull();
    expect(last.detail).toEqual({ reason: 'unknown_account', emailDigest: expect.stringMatching(/^[0-9a-f]{32}$/) });
  });

  it('rejects a malformed body with 400 and field errors, never 500', async () => {
    for (const body of [{}, { email: 'not-an-email', password: 'x' }, { email: demoAccounts.techA }, { email: demoAccounts.techA, password: 'x', role: 'manufacturer_admin' }, []]) {
      const res = await request(t.app).post('/api/auth/sign-in').set('Origin', ORIGIN).send(body);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
    }
    const bad = await request(t.app).post('/api/auth/sign-in').set('Origin', ORIGIN).set('Content-Type', 'application/json').send('{"email":');
    expect(bad.status).toBe(400);
  });

  it('throttles one account after 5 failures with 429 and Retry-After, even for the right password', async () => {
    const email = demoAccounts.accountant;
    for (let i = 0; i < 5; i++) expect((await post(t, email, `wrong-password-number-${i}`)).status).toBe(401);
    const blocked = await post(t, email, DEMO_PASSWORD);
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    expect(Number(blocked.headers['retry-after'])).toBeLessThanOrEqual(15 * 60);
    expect(blocked.body.error.code).toBe('too_many_requests');

    // An unknown address throttled the same way gives the identical 429 body.
    for (let i = 0; i < 5; i++) await post(t, 'ghost@larkfield.test', `wrong-password-number-${i}`);
    const ghost = await post(t, 'ghost@larkfield.test', 'wrong-password-number-9');
    expect(ghost.status).toBe(429);
    expect(ghost.text).toBe(blocked.text);

    // Another account is not affected.
    expect((await post(t, demoAccounts.techB, DEMO_PASSWORD)).status).toBe(200);

    // After the 15-minute window the account may sign in again.
    clock.advance(15 * 60 * 1000 + 1000);
    expect((await post(t, email, DEMO_PASSWORD)).status).toBe(200);
  });

  it('clears the failure count of an account on a successful sign-in', async () => {
    const email = demoAccounts.mfrAdmin;
    for (let i = 0; i < 4; i++) expect((await post(t, email, `wrong-password-number-${i}`)).status).toBe(401);
    expect((await post(t, email, DEMO_PASSWORD)).status).toBe(200);
    for (let i = 0; i < 4; i++) expect((await post(t, email, `wrong-password-again-${i}`)).status).toBe(401);
    expect((await post(t, email, DEMO_PASSWORD)).status).toBe(200);
  });
});

describe('sign-in timing for unknown accounts', () => {
  let t: TestApp;
  const email = 'timing-check@harborview.test';
  const password = 'a long enough timing check passphrase';

  beforeAll(async () => {
    // Cost 10 so one bcrypt comparison (tens of milliseconds) dominates the request time.
    t = await makeTestApp({ env: { BCRYPT_COST: '10' } });
    const org = t.db.select().from(users).where(eq(users.email, demoAccounts.techA)).get()!.organisationId;
    const now = new Date().toISOString();
    t.db
      .insert(users)
      .values({ id: newId(), organisationId: org, role: 'technician', email, name: 'Timing Check', passwordHash: hashPassword(password, t.env.PASSWORD_PEPPER, 10), createdAt: now, updatedAt: now })
      .run();
  });
  afterAll(async () => {
    await t.close();
  });

  it('compares an unknown e-mail against a hash of the same cost (similar time to a wrong password)', async () => {
    const time = async (who: string) => {
      const start = performance.now();
      const res = await post(t, who, 'definitely-not-the-password');
      expect(res.status).toBe(401);
      return performance.now() - start;
    };
    const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
    const wrong: number[] = [];
    const unknown: number[] = [];
    for (let i = 0; i < 4; i++) {
      wrong.push(await time(email));
      unknown.push(await time(`unknown-${i}@harborview.test`));
    }
    const ratio = median(unknown) / median(wrong);
    expect(ratio).toBeGreaterThan(0.5);
    expect(ratio).toBeLessThan(2);
  });
});
