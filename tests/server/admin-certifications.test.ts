import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { auditLog, organisations, productFamilies, users } from '../../server/db/schema/index';
import { certificationState, expiringCertifications, isCertified } from '../../server/modules/agency/agency.queries';
import { lookupPostalCode } from '../../server/modules/agency/postal-code.service';
import zipcodes from 'zipcodes';
import { TestClock, demoAccounts, makeTestApp, type TestApp } from '../factories/test-app';

// Certificate validity is inclusive of both dates and warned 30 days ahead (common practice for
// expiry reminders). Postal-code centroids come from the zipcodes package's own table.

type Agent = Awaited<ReturnType<TestApp['signIn']>>;
const TODAY = '2026-06-15';

describe('technician certifications', () => {
  let t: TestApp;
  let admin: Agent;
  let techId: string;
  let familyId: string;
  let otherFamilyId: string;
  let orgId: string;

  beforeAll(async () => {
    t = await makeTestApp({ clock: new TestClock(new Date(`${TODAY}T12:00:00.000Z`)) });
    admin = await t.signIn('adminA');
    techId = t.db.select().from(users).where(eq(users.email, 'tomas.ferlund@harborview.test')).get()!.id;
    orgId = t.db.select().from(users).where(eq(users.email, demoAccounts.adminA)).get()!.organisationId;
    // The seeded technician holds no oven certificate, so the oven family starts clean.
    const fams = t.db.select().from(productFamilies).all();
    familyId = fams.find((f) => f.code === 'OVN')!.id;
    otherFamilyId = fams.find((f) => f.code === 'FRY')!.id;
  });
  afterAll(async () => {
    await t.close();
  });

  it('states: inclusive ends, warning from 30 days before the end', () => {
    expect(certificationState('2026-01-01', '2026-07-15', TODAY)).toBe('expiring'); // 30 days left
    expect(certificationState('2026-01-01', '2026-07-16', TODAY)).toBe('valid'); // 31 days left
    expect(certificationState('2026-01-01', TODAY, TODAY)).toBe('expiring');
    expect(certificationState('2026-01-01', '2026-06-14', TODAY)).toBe('expired');
    expect(certificationState('2026-06-16', '2027-06-16', TODAY)).toBe('not_yet_valid');
  });

  it('records a certification with its audit row, refusing bad dates and other agencies’ people', async () => {
    const bad = await admin.post('/api/agency/certifications').send({ userId: techId, familyId, certificateNumber: 'CV-7781', validFrom: '2026-05-01', validTo: '2026-04-01' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.validTo).toBeTruthy();
    const notDate = await admin.post('/api/agency/certifications').send({ userId: techId, familyId, certificateNumber: 'CV-7781', validFrom: '2026-02-30', validTo: '2027-01-01' });
    expect(notDate.status).toBe(400);
    const stranger = t.db.select().from(users).where(eq(users.email, demoAccounts.techB)).get()!.id;
    const foreign = await admin.post('/api/agency/certifications').send({ userId: stranger, familyId, certificateNumber: 'CV-1', validFrom: '2026-01-01', validTo: '2027-01-01' });
    expect(foreign.status).toBe(400);
    expect(foreign.body.error.fields.userId).toBeTruthy();
    const noPdf = await admin.post('/api/agency/certifications').send({ userId: techId, familyId, certificateNumber: 'CV-1', validFrom: '2026-01-01', validTo: '2027-01-01', attachmentId: 'nope' });
    expect(noPdf.status).toBe(400);
    expect(noPdf.body.error.fields.attachmentId).toBeTruthy();

    const ok = await admin.post('/api/agency/certifications').send({ userId: techId, familyId, certificateNumber: 'CV-7781', validFrom: '2025-07-01', validTo: '2026-06-25' });
    expect(ok.status).toBe(201);
    expect(ok.body).toMatchObject({ userId: techId, familyCode: 'OVN', state: 'expiring', daysLeft: 10, attachmentId: null });
    expect(t.db.select().from(auditLog).where(eq(auditLog.recordId, ok.body.id)).all().map((a) => a.action)).toEqual(['certification.create']);
  });

  it('shows the expiring certificate on the users page and in the home-page list, until a renewal is on file', async () => {
    const users1 = await admin.get('/api/agency/users');
    const tomas = users1.body.items.find((u: { id: string }) => u.id === techId);
    expect(tomas.certification.families.find((f: { familyCode: string }) => f.familyCode === 'OVN')).toMatchObject({ state: 'expiring', daysLeft: 10 });
    expect(tomas.certification.summary).toBe('expiring');

    const exp = await admin.get('/api/agency/certifications/expiring');
    expect(exp.status).toBe(200);
    expect(exp.body.items.some((c: { userId: string; familyCode: string }) => c.userId === techId && c.familyCode === 'OVN')).toBe(true);
    expect(expiringCertifications(t.db, orgId, TODAY).some((c) => c.userId === techId && c.familyId === familyId)).toBe(true);
    // Ten days ahead is outside a 5-day window.
    expect(expiringCertifications(t.db, orgId, TODAY, 5).some((c) => c.userId === techId && c.familyId === familyId)).toBe(false);

    const renewal = await admin.post('/api/agency/certifications').send({ userId: techId, familyId, certificateNumber: 'CV-9012', validFrom: '2026-06-20', validTo: '2028-06-19' });
    expect(renewal.status).toBe(201);
    expect(expiringCertifications(t.db, orgId, TODAY).some((c) => c.userId === techId && c.familyId === familyId)).toBe(false);
  });

  it('answers whether a technician was certified for a family on a repair date (both ends inclusive)', () => {
    expect(isCertified(t.db, techId, familyId, '2025-07-01')).toBe(true);
    expect(isCertified(t.db, techId, familyId, '2025-06-30')).toBe(false);
    expect(isCertified(t.db, techId, familyId, '2026-06-25')).toBe(true);
    expect(isCertified(t.db, techId, familyId, '2028-06-19')).toBe(true);
    expect(isCertified(t.db, techId, familyId, '2028-06-20')).toBe(false);
  });

  it("edits a certification; another agency's admin gets 404 and a technician 403", async () => {
    const list = await admin.get(`/api/agency/certifications?userId=${techId}`);
    const cert = list.body.items.find((c: { certificateNumber: string }) => c.certificateNumber === 'CV-7781');
    const patched = await admin.patch(`/api/agency/certifications/${cert.id}`).send({ familyId: otherFamilyId, certificateNumber: 'FR-7781' });
    expect(patched.status).toBe(200);
    expect(patched.body).toMatchObject({ familyCode: 'FRY', certificateNumber: 'FR-7781' });
    const reversed = await admin.patch(`/api/agency/certifications/${cert.id}`).send({ validTo: '2020-01-01' });
    expect(reversed.status).toBe(400);

    const other = await t.signIn('adminB');
    expect((await other.patch(`/api/agency/certifications/${cert.id}`).send({ certificateNumber: 'X-1' })).status).toBe(404);
    const otherList = await other.get('/api/agency/certifications');
    expect(otherList.body.items.some((c: { id: string }) => c.id === cert.id)).toBe(false);

    const tech = await t.signIn('techA');
    expect((await tech.post('/api/agency/certifications').send({})).status).toBe(403);
    const own = await tech.get('/api/agency/certifications');
    expect(own.status).toBe(200);
    const me = t.db.select().from(users).where(eq(users.email, demoAccounts.techA)).get()!.id;
    expect(own.body.items.length).toBeGreaterThan(0);
    expect(own.body.items.every((c: { userId: string }) => c.userId === me)).toBe(true);
  });
});

describe('agency profile', () => {
  let t: TestApp;
  let admin: Agent;
  beforeAll(async () => {
    t = await makeTestApp();
    admin = await t.signIn('adminB');
  });
  afterAll(async () => {
    await t.close();
  });

  it('fills coordinates, city and region from the postal code, from the offline table', async () => {
    // ZIP 10001 is in Manhattan, New York, NY (USPS); its centroid is near 40.75 N, 74.00 W (recalled).
    const expected = zipcodes.lookup('10001')!;
    expect(lookupPostalCode('10001')).toMatchObject({ latitude: expected.latitude, longitude: expected.longitude, region: 'NY' });
    expect(Math.abs(expected.latitude - 40.75)).toBeLessThan(0.1);
    expect(Math.abs(expected.longitude + 74.0)).toBeLessThan(0.1);

    const r = await admin.patch('/api/agency/profile').send({ postalCode: '10001', city: null, region: null });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ postalCode: '10001', latitude: expected.latitude, longitude: expected.longitude, region: 'NY' });
    const lookup = await admin.get('/api/postal-codes/10001');
    expect(lookup.status).toBe(200);
    expect(lookup.body.latitude).toBe(expected.latitude);
    expect((await admin.get('/api/postal-codes/00000')).status).toBe(404);
    expect((await admin.get('/api/postal-codes/not-a-zip')).status).toBe(400);
  });

  it('keeps coordinates corrected by hand, and refuses an unknown postal code without coordinates', async () => {
    const hand = await admin.patch('/api/agency/profile').send({ latitude: 40.7411, longitude: -73.9897 });
    expect(hand.status).toBe(200);
    expect(hand.body).toMatchObject({ latitude: 40.7411, longitude: -73.9897, postalCode: '10001' });
    const name = await admin.patch('/api/agency/profile').send({ name: 'Prairie Line Kitchen Repair East' });
    expect(name.body).toMatchObject({ latitude: 40.7411, longitude: -73.9897 });

    const unknown = await admin.patch('/api/agency/profile').send({ postalCode: '00000' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fields.postalCode).toMatch(/by hand/);
    const withCoords = await admin.patch('/api/agency/profile').send({ postalCode: '00000', latitude: 41, longitude: -73 });
    expect(withCoords.status).toBe(200);
    const half = await admin.patch('/api/agency/profile').send({ latitude: 41 });
    expect(half.status).toBe(400);
    expect(half.body.error.fields.longitude).toBeTruthy();
  });

  it('validates the time zone and the e-mail, and is only for the agency admin', async () => {
    expect((await admin.patch('/api/agency/profile').send({ timeZone: 'Mars/Olympus' })).status).toBe(400);
    expect((await admin.patch('/api/agency/profile').send({ contactEmail: 'not-an-address' })).status).toBe(400);
    const ok = await admin.patch('/api/agency/profile').send({ timeZone: 'America/Denver', contactEmail: '' });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ timeZone: 'America/Denver', contactEmail: null });
    const row = t.db.select().from(organisations).where(eq(organisations.id, ok.body.id)).get()!;
    expect(row.timeZone).toBe('America/Denver');
    const tech = await t.signIn('techB');
    expect((await tech.patch('/api/agency/profile').send({ name: 'Taken over' })).status).toBe(403);
    expect((await tech.get('/api/agency/profile')).status).toBe(403);
    const mfr = await t.signIn('mfrAdmin');
    expect((await mfr.get('/api/agency/profile')).status).toBe(403);
  });
});
