import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { auditLog, certifications, productFamilies, users } from '../../server/db/schema/index';
import { isCertified } from '../../server/modules/agency/agency.queries';
import { TestClock, makeTestApp, type TestApp } from '../factories/test-app';

type Agent = Awaited<ReturnType<TestApp['signIn']>>;

describe('certificate revocation', () => {
  let t: TestApp;
  let admin: Agent;
  let techId: string;
  let familyId: string;

  beforeAll(async () => {
    t = await makeTestApp({ clock: new TestClock(new Date('2026-06-15T12:00:00.000Z')) });
    admin = await t.signIn('adminA');
    techId = t.db.select().from(users).where(eq(users.email, 'tomas.ferlund@harborview.test')).get()!.id;
    familyId = t.db.select().from(productFamilies).all().find((f) => f.code === 'OVN')!.id;
  });
  afterAll(async () => {
    await t.close();
  });

  const record = async (certificateNumber: string, validTo = '2026-07-01') => {
    const res = await admin.post('/api/agency/certifications').send({ userId: techId, familyId, certificateNumber, validFrom: '2026-01-01', validTo });
    expect(res.status).toBe(201);
    return res.body.id as string;
  };

  it('needs a reason: a blank one is a 400 with a field message and changes nothing', async () => {
    const id = await record('RV-100');
    for (const body of [{}, { reason: '   ' }]) {
      const res = await admin.post(`/api/agency/certifications/${id}/revocation`).send(body);
      expect(res.status).toBe(400);
      expect(res.body.error.fields.reason).toBeTruthy();
    }
    expect(t.db.select().from(certifications).where(eq(certifications.id, id)).get()!.revokedAt).toBeNull();
  });

  it('revokes with the reason, writes the audit row, shows it in the list and refuses a second revocation or an edit', async () => {
    const id = await record('RV-200');
    const res = await admin.post(`/api/agency/certifications/${id}/revocation`).send({ reason: 'Issued in error' });
    expect(res.status).toBe(200);
    expect(res.body.revokedAt).toBe('2026-06-15T12:00:00.000Z');
    expect(res.body.revokeReason).toBe('Issued in error');
    expect(res.body.revokedByName).toBeTruthy();

    const audit = t.db.select().from(auditLog).where(and(eq(auditLog.recordId, id), eq(auditLog.action, 'certification.revoke'))).all();
    expect(audit).toHaveLength(1);

    const list = await admin.get(`/api/agency/certifications?userId=${techId}`);
    const item = list.body.items.find((c: { id: string }) => c.id === id);
    expect(item.revokeReason).toBe('Issued in error');

    expect((await admin.post(`/api/agency/certifications/${id}/revocation`).send({ reason: 'Again' })).status).toBe(409);
    expect((await admin.patch(`/api/agency/certifications/${id}`).send({ certificateNumber: 'RV-201' })).status).toBe(409);
  });

  it("answers 404 to another agency's admin and to a technician's 403, leaving the certificate in force", async () => {
    const id = await record('RV-300');
    const other = await t.signIn('adminB');
    expect((await other.post(`/api/agency/certifications/${id}/revocation`).send({ reason: 'Not ours' })).status).toBe(404);
    const tech = await t.signIn('techA');
    expect((await tech.post(`/api/agency/certifications/${id}/revocation`).send({ reason: 'Mine' })).status).toBe(403);
    expect(t.db.select().from(certifications).where(eq(certifications.id, id)).get()!.revokedAt).toBeNull();
  });

  it('a revoked certificate no longer counts: not certified, no expiry warning, not in the users table', async () => {
    // a new technician with this one certificate only, so it is the one that counts
    const orgId = t.db.select().from(users).where(eq(users.id, techId)).get()!.organisationId;
    const newTech = 'revocation-fixture-technician';
    const now = '2026-06-15T12:00:00.000Z';
    t.db.$client
      .prepare('insert into users (id, organisation_id, role, email, name, password_hash, active, session_version, created_at, updated_at) values (?, ?, ?, ?, ?, ?, 1, 1, ?, ?)')
      .run(newTech, orgId, 'technician', 'revocation.fixture@harborview.test', 'Revocation Fixture', 'not-a-usable-hash', now, now);
    const fam = familyId;
    const res = await admin.post('/api/agency/certifications').send({ userId: newTech, familyId: fam, certificateNumber: 'RV-400', validFrom: '2026-01-01', validTo: '2026-07-01' });
    expect(res.status).toBe(201);
    const id = res.body.id as string;
    const expiringIds = async () => ((await admin.get('/api/agency/certifications/expiring')).body.items as { id: string }[]).map((c) => c.id);
    const familiesOfTech = async () =>
      ((await admin.get('/api/agency/users')).body.items as { id: string; certification: { families: { familyId: string }[] } }[]).find((u) => u.id === newTech)!.certification.families.map((f) => f.familyId);
    expect(isCertified(t.db, newTech, fam, '2026-06-15')).toBe(true);
    expect(await expiringIds()).toContain(id);
    expect(await familiesOfTech()).toContain(fam);

    expect((await admin.post(`/api/agency/certifications/${id}/revocation`).send({ reason: 'Training not completed' })).status).toBe(200);
    expect(isCertified(t.db, newTech, fam, '2026-06-15')).toBe(false);
    expect(await expiringIds()).not.toContain(id);
    expect(await familiesOfTech()).not.toContain(fam);
  });
});
