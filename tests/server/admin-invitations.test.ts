import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { and, eq } from 'drizzle-orm';
import { auditLog, invitations, organisations, users } from '../../server/db/schema/index';
import { hashToken } from '../../server/lib/ids';
import { TestClock, flushMail, makeTestApp, type TestApp } from '../factories/test-app';

// One-time invitation links: OWASP ASVS 5.0 V6.4 (authentication secrets are random, stored
// hashed, single use and short-lived) and NIST SP 800-63B-4 §3.1.1.2 (the invitee's password is
// checked against the same block-list as any new password).

const ORIGIN = 'http://localhost:3000';
const GOOD_PASSWORD = 'lantern orchard velvet compass';
const DAY = 24 * 60 * 60 * 1000;

describe('invitations through the mail sink', () => {
  let t: TestApp;
  const clock = new TestClock();
  let admin: Awaited<ReturnType<TestApp['signIn']>>;

  const anon = () => request(t.app);
  const accept = (token: string, name = 'Ines Marlow', password = GOOD_PASSWORD) =>
    anon().post('/api/invitations/accept').set('Origin', ORIGIN).send({ token, name, password });
  const linkFor = async (email: string): Promise<string> => {
    await flushMail(t);
    const mails = t.sink.to(email);
    expect(mails.length).toBeGreaterThan(0);
    const m = /http:\/\/localhost:3000\/accept-invitation\?token=([A-Za-z0-9_%-]+)/.exec(mails.at(-1)!.text);
    expect(m).not.toBeNull();
    return decodeURIComponent(m![1]);
  };

  beforeAll(async () => {
    t = await makeTestApp({ clock });
    admin = await t.signIn('adminA');
  });
  afterAll(async () => {
    await t.close();
  });

  it('invites a technician: one mail with a one-time link, only the token hash stored, 7-day expiry', async () => {
    const res = await admin.post('/api/agency/users').send({ email: 'Ines.Marlow@Harborview.test', role: 'technician' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ email: 'ines.marlow@harborview.test', role: 'technician', status: 'pending' });
    const token = await linkFor('ines.marlow@harborview.test');
    const row = t.db.select().from(invitations).where(eq(invitations.id, res.body.id)).get()!;
    expect(row.tokenHash).toBe(hashToken(token));
    expect(new Date(row.expiresAt).getTime() - new Date(row.createdAt).getTime()).toBe(7 * DAY);
    expect(JSON.stringify(t.db.select().from(auditLog).all())).not.toContain(token);

    const list = await admin.get('/api/invitations');
    expect(list.status).toBe(200);
    expect(list.body.items.map((i: { email: string }) => i.email)).toContain('ines.marlow@harborview.test');

    const preview = await anon().post('/api/invitations/preview').set('Origin', ORIGIN).send({ token });
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({ email: 'ines.marlow@harborview.test', role: 'technician', organisationName: 'Harborview Appliance Service' });
  });

  it('applies the password policy on acceptance and keeps the link usable after a refusal', async () => {
    const token = await linkFor('ines.marlow@harborview.test');
    const short = await accept(token, 'Ines Marlow', 'short');
    expect(short.status).toBe(400);
    expect(short.body.error.fields.password).toBeTruthy();
    const common = await accept(token, 'Ines Marlow', 'passwordpassword');
    expect(common.status).toBe(400);
    expect(common.body.error.fields.password).toMatch(/common|guess/i);
    const own = await accept(token, 'Ines Marlow', 'ines.marlow@harborview.test');
    expect(own.status).toBe(400);
    expect(t.db.select().from(users).where(eq(users.email, 'ines.marlow@harborview.test')).get()).toBeUndefined();
  });

  it('creates the user on acceptance, who then signs in; the same link does not work twice', async () => {
    const token = await linkFor('ines.marlow@harborview.test');
    const ok = await accept(token);
    expect(ok.status).toBe(201);
    expect(ok.body).toEqual({ email: 'ines.marlow@harborview.test' });
    const u = t.db.select().from(users).where(eq(users.email, 'ines.marlow@harborview.test')).get()!;
    const harborview = t.db.select().from(organisations).where(eq(organisations.name, 'Harborview Appliance Service')).get()!;
    expect(u).toMatchObject({ role: 'technician', organisationId: harborview.id, active: true, name: 'Ines Marlow' });

    const agent = await t.signIn('ines.marlow@harborview.test', GOOD_PASSWORD);
    const me = await agent.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.user.role).toBe('technician');

    const again = await accept(token, 'Someone Else');
    expect(again.status).toBe(400);
    expect(again.body.error.code).toBe('invalid_invitation');
    expect(again.body.error.message).toMatch(/already been used/);
    // No longer listed as pending.
    const list = await admin.get('/api/invitations');
    expect(list.body.items.map((i: { email: string }) => i.email)).not.toContain('ines.marlow@harborview.test');
  });

  it('refuses an expired link (after 7 days) and a resend gives a fresh one', async () => {
    const res = await admin.post('/api/invitations').send({ email: 'late.reply@harborview.test', role: 'technician' });
    expect(res.status).toBe(201);
    const token = await linkFor('late.reply@harborview.test');
    clock.advance(7 * DAY + 60_000);
    admin = await t.signIn('adminA'); // the old session ran past its 12-hour limit
    const expired = await accept(token, 'Late Reply');
    expect(expired.status).toBe(400);
    expect(expired.body.error.message).toMatch(/expired/);
    const list = await admin.get('/api/invitations');
    expect(list.body.items.find((i: { id: string }) => i.id === res.body.id)?.status).toBe('expired');

    const resent = await admin.post(`/api/invitations/${res.body.id}/resend`).send({});
    expect(resent.status).toBe(200);
    expect(resent.body.status).toBe('pending');
    const fresh = await linkFor('late.reply@harborview.test');
    expect(fresh).not.toBe(token);
    const old = await accept(token, 'Late Reply');
    expect(old.status).toBe(400);
    expect(old.body.error.message).toMatch(/not valid/);
    expect((await accept(fresh, 'Late Reply')).status).toBe(201);
  });

  it('kills the old link on resend of a pending invitation', async () => {
    const res = await admin.post('/api/invitations').send({ email: 'twice.sent@harborview.test', role: 'agency_admin' });
    const first = await linkFor('twice.sent@harborview.test');
    await admin.post(`/api/invitations/${res.body.id}/resend`).send({});
    const second = await linkFor('twice.sent@harborview.test');
    expect((await accept(first, 'Twice Sent')).status).toBe(400);
    expect((await accept(second, 'Twice Sent')).status).toBe(201);
    expect(t.db.select().from(users).where(eq(users.email, 'twice.sent@harborview.test')).get()?.role).toBe('agency_admin');
  });

  it('refuses a revoked link (revoke by POST and by DELETE)', async () => {
    const a = await admin.post('/api/invitations').send({ email: 'withdrawn.one@harborview.test', role: 'technician' });
    const tokenA = await linkFor('withdrawn.one@harborview.test');
    const revoked = await admin.post(`/api/invitations/${a.body.id}/revoke`).send({});
    expect(revoked.status).toBe(200);
    expect(revoked.body.status).toBe('revoked');
    const r = await accept(tokenA, 'Withdrawn One');
    expect(r.status).toBe(400);
    expect(r.body.error.message).toMatch(/withdrawn/);

    const b = await admin.post('/api/invitations').send({ email: 'withdrawn.two@harborview.test', role: 'technician' });
    const tokenB = await linkFor('withdrawn.two@harborview.test');
    expect((await admin.delete(`/api/invitations/${b.body.id}`)).status).toBe(200);
    expect((await accept(tokenB, 'Withdrawn Two')).status).toBe(400);
    expect((await admin.post(`/api/invitations/${b.body.id}/resend`).send({})).status).toBe(409);
  });

  it('refuses clearly a second pending invitation to the same address in the same organisation', async () => {
    expect((await admin.post('/api/agency/users').send({ email: 'only.once@harborview.test', role: 'technician' })).status).toBe(201);
    const pending = await admin.post('/api/agency/users').send({ email: 'only.once@harborview.test', role: 'technician' });
    expect(pending.status).toBe(409);
    expect(pending.body.error.code).toBe('invitation_pending');
  });

  it('lets an agency admin invite only agency roles, and a technician not at all', async () => {
    for (const role of ['reviewer', 'accountant', 'manufacturer_admin']) {
      const r = await admin.post('/api/agency/users').send({ email: `sneaky.${role}@harborview.test`, role });
      expect(r.status).toBe(400);
      expect(r.body.error.fields.role).toMatch(/technician or agency admin/);
      const r2 = await admin.post('/api/invitations').send({ email: `sneaky2.${role}@harborview.test`, role });
      expect(r2.status).toBe(400);
    }
    expect(t.db.select().from(invitations).where(eq(invitations.role, 'manufacturer_admin')).all()).toHaveLength(0);
    const tech = await t.signIn('techA');
    expect((await tech.post('/api/invitations').send({ email: 'friend@harborview.test', role: 'technician' })).status).toBe(403);
    expect((await tech.get('/api/invitations')).status).toBe(403);
    expect((await anon().post('/api/invitations').set('Origin', ORIGIN).send({ email: 'x@harborview.test', role: 'technician' })).status).toBe(401);
  });

  it("hides another agency's invitations (404 on resend and revoke)", async () => {
    const other = await t.signIn('adminB');
    const mine = await admin.post('/api/invitations').send({ email: 'private.invite@harborview.test', role: 'technician' });
    expect((await other.post(`/api/invitations/${mine.body.id}/resend`).send({})).status).toBe(404);
    expect((await other.post(`/api/invitations/${mine.body.id}/revoke`).send({})).status).toBe(404);
    const list = await other.get('/api/invitations');
    expect(list.body.items.map((i: { email: string }) => i.email)).not.toContain('private.invite@harborview.test');
    const row = t.db.select().from(invitations).where(and(eq(invitations.id, mine.body.id))).get()!;
    expect(row.revokedAt).toBeNull();
  });

  it('answers 400, never 500, to malformed acceptance bodies and unknown tokens', async () => {
    expect((await anon().post('/api/invitations/accept').set('Origin', ORIGIN).send({})).status).toBe(400);
    expect((await anon().post('/api/invitations/accept').set('Origin', ORIGIN).send({ token: 12, name: [], password: null })).status).toBe(400);
    const unknown = await accept('a'.repeat(43));
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.code).toBe('invalid_invitation');
    expect((await anon().post('/api/invitations/preview').set('Origin', ORIGIN).send({ token: 'b'.repeat(43) })).status).toBe(400);
  });

  it('lets the manufacturer admin invite manufacturer roles only', async () => {
    const mfr = await t.signIn('mfrAdmin');
    const ok = await mfr.post('/api/admin/users').send({ email: 'new.reviewer@larkfield.test', role: 'reviewer' });
    expect(ok.status).toBe(201);
    const token = await linkFor('new.reviewer@larkfield.test');
    expect((await accept(token, 'New Reviewer')).status).toBe(201);
    const u = t.db.select().from(users).where(eq(users.email, 'new.reviewer@larkfield.test')).get()!;
    expect(u.role).toBe('reviewer');
    const wrong = await mfr.post('/api/admin/users').send({ email: 'field.person@larkfield.test', role: 'technician' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields.role).toBeTruthy();
  });
});
