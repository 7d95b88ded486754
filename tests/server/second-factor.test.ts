import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import { organisations, totpCredentials, users } from '../../server/db/schema/index';
import { PENDING_COOKIE, SESSION_COOKIE } from '../../server/lib/session';
import { totpCodeAt, totpCodeRaw } from '../../server/lib/totp';
import { TestClock, DEMO_PASSWORD, demoAccounts, makeTestApp, type TestApp } from '../factories/test-app';
import { totpCodeFor } from '../factories/second-factor';

const ORIGIN = 'http://localhost:3000';
const MINUTE = 60_000;

describe('TOTP codes against RFC 6238 Appendix B', () => {
  // Source: RFC 6238 (2011), Appendix B "Test Vectors": 8 digits, 30 s step, T0 = 0; the seeds
  // are the ASCII strings "12345678901234567890" (SHA-1), that repeated to 32 bytes (SHA-256) and to 64 bytes (SHA-512).
  const seed1 = Buffer.from('12345678901234567890', 'ascii');
  const seed256 = Buffer.from('12345678901234567890123456789012', 'ascii');
  const seed512 = Buffer.from('1234567890123456789012345678901234567890123456789012345678901234', 'ascii');
  const vectors: [number, string, string, string][] = [
    [59, '94287082', '46119246', '90693936'],
    [1111111109, '07081804', '68084774', '25091201'],
    [1111111111, '14050471', '67062674', '99943326'],
    [1234567890, '89005924', '91819424', '93441116'],
    [2000000000, '69279037', '90698825', '38618901'],
    [20000000000, '65353130', '77737706', '47863826'],
  ];
  for (const [time, sha1, sha256, sha512] of vectors) {
    it(`T = ${time} s: SHA-1 ${sha1}, SHA-256 ${sha256}, SHA-512 ${sha512} (RFC 6238 Appendix B)`, () => {
      expect(totpCodeRaw(seed1, time * 1000, 'sha1', 8)).toBe(sha1);
      expect(totpCodeRaw(seed256, time * 1000, 'sha256', 8)).toBe(sha256);
      expect(totpCodeRaw(seed512, time * 1000, 'sha512', 8)).toBe(sha512);
    });
  }
});

describe('second factor at sign-in', () => {
  let t: TestApp;
  const clock = new TestClock();
  beforeAll(async () => {
    t = await makeTestApp({ clock });
  });
  afterAll(() => t.close());

  const cookies = (res: request.Response) => ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  const hasLiveCookie = (res: request.Response, name: string) => cookies(res).some((c) => c.startsWith(`${name}=`) && !c.startsWith(`${name}=;`));
  const passwordOnly = async (email: string) => {
    const agent = request.agent(t.app);
    const res = await agent.post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email, password: DEMO_PASSWORD });
    return { agent, res };
  };
  const post = (agent: ReturnType<typeof request.agent>, path: string, body: unknown = {}) => agent.post(path).set('Origin', ORIGIN).send(body as object);
  const code = (email: string) => totpCodeFor(t.db.$client, email, clock.now().getTime());

  it("gives no session for the accountant's password alone: /api/auth/me stays 401", async () => {
    const { agent, res } = await passwordOnly(demoAccounts.accountant);
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ secondFactor: { purpose: 'verify', methods: ['totp'] } });
    expect(hasLiveCookie(res, SESSION_COOKIE)).toBe(false);
    expect(hasLiveCookie(res, PENDING_COOKIE)).toBe(true);
    expect((await agent.get('/api/auth/me')).status).toBe(401);
    expect((await agent.get('/api/payment-runs')).status).toBe(401);
    // The pending token presented as a session cookie is refused (own audience).
    const pending = cookies(res).find((c) => c.startsWith(`${PENDING_COOKIE}=`))!.split(';')[0].slice(PENDING_COOKIE.length + 1);
    expect((await request(t.app).get('/api/auth/me').set('Cookie', `${SESSION_COOKIE}=${pending}`)).status).toBe(401);
  });

  it('gives the session after the right code, refuses a wrong one and the same code twice (RFC 6238 §5.2)', async () => {
    const { agent } = await passwordOnly(demoAccounts.mfrAdmin);
    expect((await post(agent, '/api/auth/second-factor/totp', { code: '000000' })).status).toBe(400);
    const right = code(demoAccounts.mfrAdmin);
    const ok = await post(agent, '/api/auth/second-factor/totp', { code: right });
    expect(ok.status).toBe(200);
    expect(ok.body.user.email).toBe(demoAccounts.mfrAdmin);
    expect((await agent.get('/api/auth/me')).status).toBe(200);
    // The pending state is spent; a second sign-in cannot reuse the code just accepted.
    const again = await passwordOnly(demoAccounts.mfrAdmin);
    const replay = await post(again.agent, '/api/auth/second-factor/totp', { code: right });
    expect(replay.status).toBe(400);
    expect(replay.body.error.code).toBe('invalid_second_factor');
    expect((await again.agent.get('/api/auth/me')).status).toBe(401);
  });

  it('refuses the pending state after 5 minutes', async () => {
    const { agent } = await passwordOnly(demoAccounts.accountant);
    clock.advance(5 * MINUTE + 1000);
    const late = await post(agent, '/api/auth/second-factor/totp', { code: code(demoAccounts.accountant) });
    expect(late.status).toBe(401);
    expect(late.body.error.code).toBe('unauthenticated');
  });

  it('throttles wrong codes per account (429 after 10)', async () => {
    const { agent } = await passwordOnly(demoAccounts.accountant);
    const statuses: number[] = [];
    for (let i = 0; i < 12; i++) statuses.push((await post(agent, '/api/auth/second-factor/totp', { code: String(100000 + i) })).status);
    expect(statuses.slice(0, 10).every((s) => s === 400)).toBe(true);
    expect(statuses.slice(10)).toEqual([429, 429]);
    clock.advance(16 * MINUTE);
  });

  it('makes an accountant without a factor enrol before the first session, and shows 10 recovery codes once', async () => {
    const id = t.db.select({ id: users.id }).from(users).where(eq(users.email, demoAccounts.accountant)).get()!.id;
    const saved = t.db.select().from(totpCredentials).where(eq(totpCredentials.userId, id)).get()!;
    t.db.delete(totpCredentials).where(eq(totpCredentials.userId, id)).run();
    try {
      const { agent, res } = await passwordOnly(demoAccounts.accountant);
      expect(res.body).toEqual({ secondFactor: { purpose: 'enrol', methods: ['totp'] } });
      expect((await agent.get('/api/auth/me')).status).toBe(401);
      // The enrol state cannot skip to verification, nor to the account page.
      expect((await post(agent, '/api/auth/second-factor/totp', { code: '123456' })).status).toBe(401);
      expect((await agent.get('/api/account/security')).status).toBe(401);
      const setup = await post(agent, '/api/auth/second-factor/enrol/totp');
      expect(setup.status).toBe(200);
      expect(setup.body.otpauthUri).toMatch(/^otpauth:\/\/totp\/Fieldproof:/);
      expect(setup.body.qrDataUrl).toMatch(/^data:image\/svg\+xml;base64,/);
      const done = await post(agent, '/api/auth/second-factor/enrol/totp/confirm', { code: totpCodeAt(setup.body.secret, clock.now().getTime()) });
      expect(done.status).toBe(200);
      expect(done.body.recoveryCodes).toHaveLength(10);
      expect(new Set(done.body.recoveryCodes).size).toBe(10);
      expect((await agent.get('/api/auth/me')).status).toBe(200);
      // Stored hashed: no code appears in the table.
      const stored = t.db.$client.prepare('select code_hash from recovery_codes where user_id = ?').pluck().all(id) as string[];
      expect(stored).toHaveLength(10);
      for (const c of done.body.recoveryCodes as string[]) expect(stored.join(' ')).not.toContain(c.replace('-', ''));

      // A recovery code signs in once.
      const first = await passwordOnly(demoAccounts.accountant);
      expect(first.res.body.secondFactor.methods).toEqual(['totp', 'recovery']);
      const rc = done.body.recoveryCodes[3] as string;
      expect((await post(first.agent, '/api/auth/second-factor/recovery', { code: rc.toLowerCase() })).status).toBe(200);
      expect((await first.agent.get('/api/auth/me')).status).toBe(200);
      const second = await passwordOnly(demoAccounts.accountant);
      const reuse = await post(second.agent, '/api/auth/second-factor/recovery', { code: rc });
      expect(reuse.status).toBe(400);
      expect((await second.agent.get('/api/auth/me')).status).toBe(401);
      expect((await t.db.$client.prepare('select count(*) from recovery_codes where user_id = ? and used_at is null').pluck().get(id)) as number).toBe(9);
    } finally {
      t.db.$client.prepare('delete from recovery_codes where user_id = ?').run(id);
      t.db.delete(totpCredentials).where(eq(totpCredentials.userId, id)).run();
      t.db.insert(totpCredentials).values(saved).run();
    }
  });

  it('lets a technician add a factor from the account page; then the password alone no longer signs in', async () => {
    const agent = await t.signIn('techB');
    const status = await agent.get('/api/account/security');
    expect(status.body).toMatchObject({ totp: false, passkeys: [], recoveryCodesLeft: 0, required: false });
    const setup = await post(agent, '/api/account/security/totp');
    const done = await post(agent, '/api/account/security/totp/confirm', { code: totpCodeAt(setup.body.secret, clock.now().getTime()) });
    expect(done.status).toBe(200);
    expect(done.body.recoveryCodes).toHaveLength(10);
    const { res } = await passwordOnly(demoAccounts.techB);
    expect(res.body.secondFactor.purpose).toBe('verify');
    expect(hasLiveCookie(res, SESSION_COOKIE)).toBe(false);
  });

  it("lets an agency admin require a factor for the agency's users (with a recent sign-in)", async () => {
    const admin = await t.signIn('adminA');
    const put = await admin.put('/api/account/security/organisation').set('Origin', ORIGIN).send({ requireSecondFactor: true });
    expect(put.status).toBe(200);
    const { agent, res } = await passwordOnly(demoAccounts.techA);
    expect(res.body).toEqual({ secondFactor: { purpose: 'enrol', methods: ['totp'] } });
    expect((await agent.get('/api/auth/me')).status).toBe(401);
    // A technician may not change the setting.
    const tech = await t.signIn('techB');
    expect((await tech.put('/api/account/security/organisation').set('Origin', ORIGIN).send({ requireSecondFactor: false })).status).toBe(403);
    const orgId = t.db.select({ o: users.organisationId }).from(users).where(eq(users.email, demoAccounts.techA)).get()!.o;
    t.db.update(organisations).set({ requireSecondFactor: false }).where(eq(organisations.id, orgId)).run();
  });
});

describe('step-up: a sign-in or second factor within the last 5 minutes', () => {
  let t: TestApp;
  const clock = new TestClock();
  beforeAll(async () => {
    t = await makeTestApp({ clock });
  });
  afterAll(() => t.close());

  const anyId = '00000000-0000-4000-8000-000000000000';
  const protectedRoutes: { who: 'accountant' | 'mfrAdmin' | 'adminA'; method: 'post' | 'patch' | 'put' | 'delete'; path: string; body?: object }[] = [
    { who: 'accountant', method: 'post', path: `/api/payment-runs/${anyId}/paid`, body: { paymentDate: '2026-06-15', reference: 'ACH 1' } },
    { who: 'accountant', method: 'post', path: `/api/payment-runs/${anyId}/void` },
    { who: 'mfrAdmin', method: 'patch', path: `/api/admin/users/${anyId}`, body: { role: 'reviewer' } },
    { who: 'adminA', method: 'patch', path: `/api/agency/users/${anyId}`, body: { role: 'agency_admin' } },
    { who: 'mfrAdmin', method: 'post', path: `/api/admin/agencies/${anyId}/terms`, body: {} },
    { who: 'mfrAdmin', method: 'patch', path: `/api/admin/agencies/${anyId}/terms/${anyId}`, body: {} },
    { who: 'mfrAdmin', method: 'patch', path: `/api/admin/parts/${anyId}`, body: { listPriceCents: 1234 } },
    { who: 'mfrAdmin', method: 'patch', path: `/api/admin/repair-codes/${anyId}`, body: { allowedHours: 1.5 } },
    { who: 'adminA', method: 'put', path: '/api/account/security/organisation', body: { requireSecondFactor: true } },
    { who: 'accountant', method: 'delete', path: '/api/account/security/totp' },
    { who: 'accountant', method: 'post', path: '/api/account/security/recovery-codes' },
  ];

  for (const r of protectedRoutes) {
    it(`${r.method.toUpperCase()} ${r.path.replaceAll(anyId, ':id')} answers 401 step_up_required after 5 minutes, and not within them`, async () => {
      const agent = await t.signIn(r.who);
      const send = () => agent[r.method](r.path).set('Origin', ORIGIN).send(r.body ?? {});
      const fresh = await send();
      expect(fresh.body?.error?.code).not.toBe('step_up_required');
      // Active all along (the token is re-issued every minute), yet the last authentication is what counts.
      for (let i = 0; i < 6; i++) {
        clock.advance(MINUTE);
        expect((await agent.get('/api/auth/me')).status).toBe(200);
      }
      const stale = await send();
      expect(stale.status).toBe(401);
      expect(stale.body.error.code).toBe('step_up_required');
      expect((await agent.get('/api/auth/me')).status).toBe(200); // still signed in
    });
  }

  it('mark paid with a stale sign-in: 401 step_up_required; a wrong password keeps it refused; the password then lets the retry through', async () => {
    const agent = await t.signIn('accountant');
    clock.advance(6 * MINUTE);
    const path = `/api/payment-runs/${anyId}/paid`;
    const body = { paymentDate: '2026-06-15', reference: 'ACH 2' };
    expect((await agent.post(path).set('Origin', ORIGIN).send(body)).body.error.code).toBe('step_up_required');
    expect((await agent.post('/api/auth/step-up').set('Origin', ORIGIN).send({ password: 'not-the-password' })).status).toBe(400);
    expect((await agent.post(path).set('Origin', ORIGIN).send(body)).body.error.code).toBe('step_up_required');
    expect((await agent.post('/api/auth/step-up').set('Origin', ORIGIN).send({ password: DEMO_PASSWORD })).status).toBe(204);
    const retry = await agent.post(path).set('Origin', ORIGIN).send(body);
    expect(retry.body?.error?.code).not.toBe('step_up_required');
    expect(retry.status).toBe(404); // no such run: past the step-up, the service answers
  });

  it('step-up with an authenticator code works too, and the code works once', async () => {
    const agent = await t.signIn('accountant');
    clock.advance(6 * MINUTE);
    const c = totpCodeFor(t.db.$client, demoAccounts.accountant, clock.now().getTime());
    expect((await agent.post('/api/auth/step-up').set('Origin', ORIGIN).send({ code: c })).status).toBe(204);
    expect((await agent.post('/api/auth/step-up').set('Origin', ORIGIN).send({ code: c })).status).toBe(400);
    expect((await agent.post(`/api/payment-runs/${anyId}/void`).set('Origin', ORIGIN).send({})).status).toBe(404);
  });

  it('refuses step-up signed out', async () => {
    expect((await request(t.app).post('/api/auth/step-up').set('Origin', ORIGIN).send({ password: DEMO_PASSWORD })).status).toBe(401);
  });
});
