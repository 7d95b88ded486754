import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { SignJWT, UnsecuredJWT } from 'jose';
import { eq, sql } from 'drizzle-orm';
import { users } from '../../server/db/schema/index';
import { hashToken, newId } from '../../server/lib/ids';
import { passwordResets } from '../../server/db/schema/index';
import { ABSOLUTE_SECONDS, AUDIENCE, IDLE_SECONDS, ISSUER, PENDING_COOKIE, SESSION_COOKIE } from '../../server/lib/session';
import { totpCodeFor } from '../factories/second-factor';
import { DEMO_PASSWORD, TestClock, demoAccounts, makeTestApp, type TestApp } from '../factories/test-app';

// Session tokens, OWASP ASVS 5.0 9.1.x (algorithm allow-list, signature, issuer, audience),
// 9.2.x (expiry) and 7.4.x (sessions end at once on sign-out, password change, deactivation and
// role change), NIST SP 800-63B-4 §5.1 (30-minute idle and 12-hour absolute limits).

const ORIGIN = 'http://localhost:3000';

function cookieOf(res: request.Response): string {
  const raw = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  const c = raw.find((v) => v.startsWith(`${SESSION_COOKIE}=`) && !v.startsWith(`${SESSION_COOKIE}=;`));
  if (!c) throw new Error('no session cookie set');
  return c.split(';')[0].slice(SESSION_COOKIE.length + 1);
}

describe('session tokens', () => {
  let t: TestApp;
  const clock = new TestClock();
  const me = (token: string) => request(t.app).get('/api/auth/me').set('Cookie', `${SESSION_COOKIE}=${token}`);
  const signIn = async (email: string, password = DEMO_PASSWORD) => {
    const res = await request(t.app).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email, password });
    expect(res.status).toBe(200);
    if (!res.body.secondFactor) return cookieOf(res);
    // The accountant's password alone is no session: the code from the seeded authenticator completes it.
    const pending = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((v) => v.startsWith(`${PENDING_COOKIE}=`))!.split(';')[0];
    const done = await request(t.app).post('/api/auth/second-factor/totp').set('Origin', ORIGIN).set('Cookie', pending).send({ code: totpCodeFor(t.db.$client, email, clock.now().getTime()) });
    expect(done.status).toBe(200);
    return cookieOf(done);
  };
  const userRow = (email: string) => t.db.select().from(users).where(eq(users.email, email)).get()!;
  const nowS = () => Math.floor(clock.now().getTime() / 1000);
  const key = () => new TextEncoder().encode(t.env.SESSION_SECRET);
  const forge = (over: { alg?: string; key?: Uint8Array; iss?: string; aud?: string; iat?: number; exp?: number; at?: number; sv?: number; ro?: string; sub?: string } = {}) => {
    const u = userRow(demoAccounts.techA);
    const now = nowS();
    return new SignJWT({ sv: over.sv ?? u.sessionVersion, at: over.at ?? now, ro: over.ro ?? u.role })
      .setProtectedHeader({ alg: over.alg ?? 'HS256', typ: 'JWT' })
      .setSubject(over.sub ?? u.id)
      .setIssuer(over.iss ?? ISSUER)
      .setAudience(over.aud ?? AUDIENCE)
      .setIssuedAt(over.iat ?? now)
      .setExpirationTime(over.exp ?? now + IDLE_SECONDS)
      .sign(over.key ?? key());
  };

  beforeAll(async () => {
    t = await makeTestApp({ clock });
  });
  afterAll(async () => {
    await t.close();
  });

  it('answers 401 on /api/auth/me when signed out', async () => {
    const res = await request(t.app).get('/api/auth/me');
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });

  it('accepts a token made exactly as the server makes it (the forgeries below differ in one thing only)', async () => {
    const res = await me(await forge());
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe(demoAccounts.techA);
    expect(res.body.rules).toEqual(expect.arrayContaining([expect.objectContaining({ action: 'read', subject: 'Claim' })]));
  });

  it('refuses alg none', async () => {
    const u = userRow(demoAccounts.techA);
    const token = new UnsecuredJWT({ sv: u.sessionVersion, at: nowS(), ro: u.role }).setSubject(u.id).setIssuer(ISSUER).setAudience(AUDIENCE).setIssuedAt(nowS()).setExpirationTime(nowS() + 600).encode();
    expect(token.split('.')[2]).toBe('');
    const res = await me(token);
    expect(res.status).toBe(401);
  });

  it('refuses a token signed with another key, or with another HMAC algorithm', async () => {
    expect((await me(await forge({ key: new TextEncoder().encode('another-secret-that-is-long-enough-000000') }))).status).toBe(401);
    expect((await me(await forge({ alg: 'HS512' }))).status).toBe(401);
  });

  it('refuses a wrong audience or issuer', async () => {
    expect((await me(await forge({ aud: 'someone-else' }))).status).toBe(401);
    expect((await me(await forge({ iss: 'someone-else' }))).status).toBe(401);
  });

  it('refuses an expired token, and one past the 12-hour absolute limit even with a later exp', async () => {
    const now = nowS();
    expect((await me(await forge({ iat: now - 3600, exp: now - 1 }))).status).toBe(401);
    expect((await me(await forge({ at: now - ABSOLUTE_SECONDS - 1, iat: now - 60, exp: now + 600 }))).status).toBe(401);
    expect((await me('not.a.token')).status).toBe(401);
    expect((await me('')).status).toBe(401);
  });

  it('ends the session after 30 idle minutes; activity within them slides the cookie on', async () => {
    const token = await signIn(demoAccounts.reviewer);
    clock.advance(20 * 60 * 1000);
    const first = await me(token);
    expect(first.status).toBe(200);
    const slid = cookieOf(first);
    clock.advance(20 * 60 * 1000);
    expect((await me(token)).status).toBe(401); // 40 minutes after the original was issued
    expect((await me(slid)).status).toBe(200); // 20 minutes after the re-issue
    clock.advance(31 * 60 * 1000);
    expect((await me(slid)).status).toBe(401);
  });

  it('ends the session 12 hours after sign-in however active the user is', async () => {
    let token = await signIn(demoAccounts.techA);
    const start = clock.now().getTime();
    while (clock.now().getTime() - start < ABSOLUTE_SECONDS * 1000 - 25 * 60 * 1000) {
      clock.advance(25 * 60 * 1000);
      const res = await me(token);
      expect(res.status).toBe(200);
      token = cookieOf(res);
    }
    clock.set(new Date(start + ABSOLUTE_SECONDS * 1000));
    expect((await me(token)).status).toBe(401);
  });

  it('ends every session of the user at once on sign-out (old token replayed)', async () => {
    const one = await signIn(demoAccounts.techB);
    const two = await signIn(demoAccounts.techB);
    expect((await me(one)).status).toBe(200);
    const out = await request(t.app).post('/api/auth/sign-out').set('Origin', ORIGIN).set('Cookie', `${SESSION_COOKIE}=${one}`);
    expect(out.status).toBe(204);
    expect(String(out.headers['set-cookie'])).toMatch(new RegExp(`${SESSION_COOKIE}=;`));
    expect((await me(one)).status).toBe(401);
    expect((await me(two)).status).toBe(401);
    expect((await signIn(demoAccounts.techB)).length).toBeGreaterThan(0);
  });

  it('ends sessions at once after a password change (reset)', async () => {
    const token = await signIn(demoAccounts.adminA);
    const u = userRow(demoAccounts.adminA);
    const raw = 'a-reset-token-made-by-this-test-0123456789';
    t.db.insert(passwordResets).values({ id: newId(), userId: u.id, tokenHash: hashToken(raw), expiresAt: new Date(clock.now().getTime() + 600_000).toISOString(), createdAt: clock.now().toISOString() }).run();
    const res = await request(t.app).post('/api/auth/password-reset/confirm').set('Origin', ORIGIN).send({ token: raw, password: 'quiet harbour lantern moves westward' });
    expect(res.status).toBe(204);
    expect((await me(token)).status).toBe(401);
  });

  it('ends sessions at once after deactivation', async () => {
    const token = await signIn(demoAccounts.adminB);
    expect((await me(token)).status).toBe(200);
    t.db.update(users).set({ active: false }).where(eq(users.email, demoAccounts.adminB)).run();
    expect((await me(token)).status).toBe(401);
    t.db.update(users).set({ active: true }).where(eq(users.email, demoAccounts.adminB)).run();
  });

  it('ends sessions at once after a role change, with or without a version bump', async () => {
    const token = await signIn(demoAccounts.accountant);
    expect((await me(token)).status).toBe(200);
    t.db.update(users).set({ role: 'reviewer' }).where(eq(users.email, demoAccounts.accountant)).run();
    expect((await me(token)).status).toBe(401);
    t.db.update(users).set({ role: 'accountant' }).where(eq(users.email, demoAccounts.accountant)).run();

    const again = await signIn(demoAccounts.accountant);
    expect((await me(again)).status).toBe(200);
    t.db.update(users).set({ sessionVersion: sql`${users.sessionVersion} + 1` }).where(eq(users.email, demoAccounts.accountant)).run();
    expect((await me(again)).status).toBe(401);
  });

  it('clears the cookie when it presents a dead token', async () => {
    const res = await me('not.a.token');
    expect(String(res.headers['set-cookie'])).toMatch(new RegExp(`${SESSION_COOKIE}=;`));
  });
});
