import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import { auditLog, outbox, passwordResets, users } from '../../server/db/schema/index';
import { hashToken } from '../../server/lib/ids';
import { DEMO_PASSWORD, TestClock, demoAccounts, flushMail, makeTestApp, type TestApp } from '../factories/test-app';

// Password reset by a one-time e-mailed link: NIST SP 800-63B-4 §3.1.1.2 (new password checked
// against the block-list), OWASP Forgot Password Cheat Sheet (same answer for every address,
// token stored hashed, short expiry, single use, sessions ended), OWASP ASVS 5.0 6.4.x.

const ORIGIN = 'http://localhost:3000';
const NEW_PASSWORD = 'copper kettle drifts past midnight';

describe('password reset through the mail sink', () => {
  let t: TestApp;
  const clock = new TestClock();
  const ask = (email: string) => request(t.app).post('/api/auth/password-reset').set('Origin', ORIGIN).send({ email });
  const confirm = (token: string, password: string) => request(t.app).post('/api/auth/password-reset/confirm').set('Origin', ORIGIN).send({ token, password });
  const signIn = (email: string, password: string) => request(t.app).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email, password });
  const linkFor = (email: string): string => {
    const mails = t.sink.to(email);
    expect(mails.length).toBeGreaterThan(0);
    const m = /http:\/\/localhost:3000\/reset-password\?token=([A-Za-z0-9_%-]+)/.exec(mails.at(-1)!.text);
    expect(m).not.toBeNull();
    return decodeURIComponent(m![1]);
  };

  beforeAll(async () => {
    t = await makeTestApp({ clock });
  });
  afterAll(async () => {
    await t.close();
  });

  it('answers 202 with the same body for a known and an unknown address, and mails only the known one', async () => {
    const known = await ask(demoAccounts.techA);
    const unknown = await ask('nobody-at-all@harborview.test');
    expect(known.status).toBe(202);
    expect(unknown.status).toBe(202);
    expect(unknown.text).toBe(known.text);
    await flushMail(t);
    expect(t.sink.to('nobody-at-all@harborview.test')).toHaveLength(0);
    expect(t.sink.to(demoAccounts.techA)).toHaveLength(1);
    expect(t.sink.to(demoAccounts.techA)[0].subject).toMatch(/password/i);
  });

  it('stores only the SHA-256 of the token, with a 30-minute expiry', async () => {
    const token = linkFor(demoAccounts.techA);
    const u = t.db.select().from(users).where(eq(users.email, demoAccounts.techA)).get()!;
    const rows = t.db.select().from(passwordResets).where(eq(passwordResets.userId, u.id)).all();
    expect(rows).toHaveLength(1);
    expect(rows[0].tokenHash).toBe(hashToken(token));
    expect(rows[0].tokenHash).not.toContain(token);
    expect(new Date(rows[0].expiresAt).getTime() - new Date(rows[0].createdAt).getTime()).toBe(30 * 60 * 1000);
    expect(JSON.stringify(t.db.select().from(auditLog).all())).not.toContain(token);
  });

  it('refuses a new password that breaks the policy, and leaves the link usable', async () => {
    const token = linkFor(demoAccounts.techA);
    const short = await confirm(token, 'fourteen chars');
    expect(short.status).toBe(400);
    expect(short.body.error.fields.password).toMatch(/15 characters/);
    const context = await confirm(token, 'harborview-harborview');
    expect(context.status).toBe(400);
    expect(context.body.error.fields.password).toMatch(/name|e-mail|service/i);
    const common = await confirm(token, 'password1234567890');
    expect(common.status).toBe(400);
    expect(common.body.error.fields.password).toMatch(/common|guess/i);
    const u = t.db.select().from(users).where(eq(users.email, demoAccounts.techA)).get()!;
    expect(t.db.select().from(passwordResets).where(eq(passwordResets.userId, u.id)).get()!.usedAt).toBeNull();
  });

  it('sets the new password, ends every session, and the link cannot be used twice', async () => {
    const agent = await t.signIn('techA');
    expect((await agent.get('/api/auth/me')).status).toBe(200);

    const token = linkFor(demoAccounts.techA);
    const res = await confirm(token, NEW_PASSWORD);
    expect(res.status).toBe(204);

    expect((await agent.get('/api/auth/me')).status).toBe(401);
    expect((await signIn(demoAccounts.techA, DEMO_PASSWORD)).status).toBe(401);
    expect((await signIn(demoAccounts.techA, NEW_PASSWORD)).status).toBe(200);

    const reuse = await confirm(token, 'another fine sentence for reuse');
    expect(reuse.status).toBe(400);
    expect(reuse.body.error.code).toBe('invalid_reset_token');
    expect(reuse.body.error.message).toMatch(/already been used/);
    expect((await signIn(demoAccounts.techA, 'another fine sentence for reuse')).status).toBe(401);

    const done = t.db.select().from(auditLog).where(eq(auditLog.action, 'auth.password_reset')).all();
    expect(done.filter((r) => r.outcome === 'success')).toHaveLength(1);
  });

  it('refuses an expired link (after 30 minutes)', async () => {
    const before = t.sink.to(demoAccounts.reviewer).length;
    expect((await ask(demoAccounts.reviewer)).status).toBe(202);
    await flushMail(t);
    expect(t.sink.to(demoAccounts.reviewer)).toHaveLength(before + 1);
    const token = linkFor(demoAccounts.reviewer);
    clock.advance(30 * 60 * 1000 + 1000);
    const res = await confirm(token, NEW_PASSWORD);
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/expired/);
    expect((await signIn(demoAccounts.reviewer, DEMO_PASSWORD)).status).toBe(200);
  });

  it('refuses an unknown token with a clear 400', async () => {
    const res = await confirm('this-token-was-never-issued-by-the-server', NEW_PASSWORD);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_reset_token');
    expect(res.body.error.message).toMatch(/not valid/);
  });

  it('ends earlier open links of the same account once one is used', async () => {
    await ask(demoAccounts.adminB);
    await flushMail(t);
    const first = linkFor(demoAccounts.adminB);
    await ask(demoAccounts.adminB);
    await flushMail(t);
    const second = linkFor(demoAccounts.adminB);
    expect(second).not.toBe(first);
    expect((await confirm(second, NEW_PASSWORD)).status).toBe(204);
    expect((await confirm(first, 'some other long passphrase here')).status).toBe(400);
  });

  it('sends at most 3 links per account per 15 minutes, still answering 202', async () => {
    const who = demoAccounts.mfrAdmin;
    const outboxBefore = t.db.select().from(outbox).all().length;
    const bodies = new Set<string>();
    for (let i = 0; i < 5; i++) {
      const res = await ask(who);
      expect(res.status).toBe(202);
      bodies.add(res.text);
    }
    expect(bodies.size).toBe(1);
    expect(t.db.select().from(outbox).all().length - outboxBefore).toBe(3);
  });

  it('does not mail a deactivated account', async () => {
    t.db.update(users).set({ active: false }).where(eq(users.email, demoAccounts.techB)).run();
    const before = t.db.select().from(outbox).all().length;
    expect((await ask(demoAccounts.techB)).status).toBe(202);
    expect(t.db.select().from(outbox).all().length).toBe(before);
    t.db.update(users).set({ active: true }).where(eq(users.email, demoAccounts.techB)).run();
  });
});
