import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { auditLog, users } from '../../server/db/schema/index';
import { demoAccounts, makeTestApp, type TestApp } from '../factories/test-app';

// Deactivation and role change end sessions at once (OWASP ASVS 5.0 V7.4: sessions are ended
// when an account is disabled or its privileges change); tenants never see each other's users
// (OWASP ASVS 5.0 V8.2: data-level access control, unknown and forbidden records answer alike).

type Agent = Awaited<ReturnType<TestApp['signIn']>>;
const userId = (t: TestApp, email: string) => t.db.select().from(users).where(eq(users.email, email)).get()!.id;

describe('agency users', () => {
  let t: TestApp;
  let adminA: Agent;

  beforeAll(async () => {
    t = await makeTestApp();
    adminA = await t.signIn('adminA');
  });
  afterAll(async () => {
    await t.close();
  });

  it("lists only the agency's own users, with role, status, last sign-in and certification state", async () => {
    const res = await adminA.get('/api/agency/users');
    expect(res.status).toBe(200);
    const emails = res.body.items.map((u: { email: string }) => u.email);
    expect(emails).toContain(demoAccounts.techA);
    expect(emails).toContain(demoAccounts.adminA);
    expect(emails).not.toContain(demoAccounts.techB);
    expect(emails).not.toContain(demoAccounts.reviewer);
    const me = res.body.items.find((u: { email: string }) => u.email === demoAccounts.adminA);
    expect(me).toMatchObject({ role: 'agency_admin', active: true });
    expect(typeof me.lastSignInAt).toBe('string');
    for (const u of res.body.items) expect(['none', 'valid', 'expiring', 'expired']).toContain(u.certification.summary);
    expect(res.body.items[0]).not.toHaveProperty('passwordHash');
  });

  it('refuses technicians and manufacturer users on the agency users page (403)', async () => {
    const tech = await t.signIn('techA');
    expect((await tech.get('/api/agency/users')).status).toBe(403);
    expect((await tech.patch(`/api/agency/users/${userId(t, demoAccounts.techA)}`).send({ role: 'agency_admin' })).status).toBe(403);
    const mfr = await t.signIn('mfrAdmin');
    expect((await mfr.get('/api/agency/users')).status).toBe(403);
  });

  it("answers 404 for another agency's user and changes nothing", async () => {
    const other = userId(t, demoAccounts.techB);
    const before = t.db.select().from(users).where(eq(users.id, other)).get()!;
    expect((await adminA.patch(`/api/agency/users/${other}`).send({ active: false })).status).toBe(404);
    expect((await adminA.patch(`/api/agency/users/${other}`).send({ role: 'agency_admin' })).status).toBe(404);
    expect((await adminA.patch('/api/agency/users/no-such-user').send({ active: false })).status).toBe(404);
    const after = t.db.select().from(users).where(eq(users.id, other)).get()!;
    expect(after).toEqual(before);
  });

  it('never gives a manufacturer role from the agency side (400 on the role field)', async () => {
    const tech = userId(t, demoAccounts.techA);
    for (const role of ['reviewer', 'accountant', 'manufacturer_admin']) {
      const r = await adminA.patch(`/api/agency/users/${tech}`).send({ role });
      expect(r.status).toBe(400);
      expect(r.body.error.fields.role).toBeTruthy();
    }
    const bogus = await adminA.patch(`/api/agency/users/${tech}`).send({ role: 'owner' });
    expect(bogus.status).toBe(400);
    const extra = await adminA.patch(`/api/agency/users/${tech}`).send({ active: true, organisationId: 'elsewhere' });
    expect(extra.status).toBe(400);
    expect(t.db.select().from(users).where(eq(users.id, tech)).get()!.role).toBe('technician');
  });

  it('ends a live session on its next request when the user is deactivated, and lets them back after reactivation', async () => {
    const tech = await t.signIn('techA');
    expect((await tech.get('/api/auth/me')).status).toBe(200);
    const id = userId(t, demoAccounts.techA);
    const off = await adminA.patch(`/api/agency/users/${id}`).send({ active: false });
    expect(off.status).toBe(200);
    expect(off.body.active).toBe(false);
    expect((await tech.get('/api/auth/me')).status).toBe(401);
    await expect(t.signIn('techA')).rejects.toThrow(/401/);
    const audit = t.db.select().from(auditLog).where(eq(auditLog.recordId, id)).all();
    expect(audit.some((a) => a.action === 'user.deactivate' && a.outcome === 'success')).toBe(true);

    const on = await adminA.patch(`/api/agency/users/${id}`).send({ active: true });
    expect(on.status).toBe(200);
    const back = await t.signIn('techA');
    expect((await back.get('/api/auth/me')).status).toBe(200);
  });

  it('ends the sessions of a user whose role changes', async () => {
    const tech = await t.signIn('techA');
    const id = userId(t, demoAccounts.techA);
    const r = await adminA.patch(`/api/agency/users/${id}`).send({ role: 'agency_admin' });
    expect(r.status).toBe(200);
    expect(r.body.role).toBe('agency_admin');
    expect((await tech.get('/api/auth/me')).status).toBe(401);
    const again = await t.signIn('techA');
    expect((await again.get('/api/auth/me')).body.user.role).toBe('agency_admin');
    // Back to technician for the tests that follow; now two admins exist only until then.
    expect((await adminA.patch(`/api/agency/users/${id}`).send({ role: 'technician' })).status).toBe(200);
  });

  it('keeps the last active agency admin: cannot be demoted or deactivated (409)', async () => {
    const adminId = userId(t, demoAccounts.adminA);
    const demote = await adminA.patch(`/api/agency/users/${adminId}`).send({ role: 'technician' });
    expect(demote.status).toBe(409);
    expect(demote.body.error.code).toBe('last_admin');
    expect(demote.body.error.message).toMatch(/last active agency admin/);
    const off = await adminA.patch(`/api/agency/users/${adminId}`).send({ active: false });
    expect(off.status).toBe(409);
    expect(t.db.select().from(users).where(eq(users.id, adminId)).get()).toMatchObject({ role: 'agency_admin', active: true });

    // With a second active admin, the first may step down.
    const tech2 = userId(t, 'priya.halvorsen@harborview.test');
    expect((await adminA.patch(`/api/agency/users/${tech2}`).send({ role: 'agency_admin' })).status).toBe(200);
    expect((await adminA.patch(`/api/agency/users/${adminId}`).send({ role: 'technician' })).status).toBe(200);
    // The admin who stepped down lost the session; the one left is now the last.
    expect((await adminA.get('/api/agency/users')).status).toBe(401);
    const priya = await t.signIn('priya.halvorsen@harborview.test');
    const self = await priya.patch(`/api/agency/users/${tech2}`).send({ active: false });
    expect(self.status).toBe(409);
    expect((await priya.patch(`/api/agency/users/${adminId}`).send({ role: 'agency_admin' })).status).toBe(200);
    adminA = await t.signIn('adminA');
    expect((await adminA.get('/api/agency/users')).status).toBe(200);
  });
});
