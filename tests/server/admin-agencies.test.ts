import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import { agencyTerms, organisations, users } from '../../server/db/schema/index';
import { termsOn } from '../../server/modules/admin/agencies.queries';
import { demoAccounts, flushMail, makeTestApp, TestClock, type TestApp } from '../factories/test-app';

// Contract terms are periods with inclusive ends that never overlap, so exactly one set of terms
// is in force on any repair date (common practice for dated price agreements). Rates here are
// values chosen for the test, not taken from the demo data.

type Agent = Awaited<ReturnType<TestApp['signIn']>>;
const ORIGIN = 'http://localhost:3000';
const TODAY = '2026-06-15';

const terms = (over: Record<string, unknown> = {}) => ({
  effectiveFrom: '2026-01-01',
  effectiveTo: null,
  laborRateCents: 9_000,
  travelRateCents: 6_000,
  mileageRateCents: null,
  maxRoundTripMiles: 100,
  maxTravelHours: 2,
  partsDiscountBps: 1_000,
  partsHandlingBps: 500,
  overtimeMultiplier: 1.5,
  filingWindowDays: 30,
  ...over,
});

describe('agencies and contract terms', () => {
  let t: TestApp;
  let mfr: Agent;
  let agencyId: string;

  beforeAll(async () => {
    t = await makeTestApp({ clock: new TestClock(new Date(`${TODAY}T12:00:00.000Z`)) });
    mfr = await t.signIn('mfrAdmin');
  });
  afterAll(async () => {
    await t.close();
  });

  it('creates an agency with its first admin invited by e-mail, who accepts and manages the agency', async () => {
    const r = await mfr.post('/api/admin/agencies').send({
      name: 'Lakeshore Galley Service',
      contactEmail: 'desk@lakeshore-galley.test',
      addressLine: '18 Pier Road',
      city: '',
      region: '',
      postalCode: '60601',
      timeZone: 'America/Chicago',
      adminEmail: 'owner@lakeshore-galley.test',
    });
    expect(r.status).toBe(201);
    agencyId = r.body.id;
    expect(r.body).toMatchObject({ name: 'Lakeshore Galley Service', region: 'IL', userCount: 0, activeAdminCount: 0, currentTerms: null });
    expect(typeof r.body.latitude).toBe('number');
    expect(r.body.pendingInvitations).toEqual([expect.objectContaining({ email: 'owner@lakeshore-galley.test', role: 'agency_admin', status: 'pending' })]);

    await flushMail(t);
    const mail = t.sink.to('owner@lakeshore-galley.test').at(-1)!;
    expect(mail.subject).toMatch(/Lakeshore Galley Service/);
    const token = decodeURIComponent(/accept-invitation\?token=([A-Za-z0-9_%-]+)/.exec(mail.text)![1]);
    const ok = await request(t.app).post('/api/invitations/accept').set('Origin', ORIGIN).send({ token, name: 'Odile Brannock', password: 'harbor slate pelican umbrella' });
    expect(ok.status).toBe(201);
    const owner = await t.signIn('owner@lakeshore-galley.test', 'harbor slate pelican umbrella');
    const own = await owner.get('/api/agency/users');
    expect(own.status).toBe(200);
    expect(own.body.items).toEqual([expect.objectContaining({ email: 'owner@lakeshore-galley.test', role: 'agency_admin' })]);

    const again = await mfr.post(`/api/admin/agencies/${agencyId}/admin-invitation`).send({ email: 'second@lakeshore-galley.test' });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('has_admin');
  });

  it('refuses a duplicate agency name, creating nothing; an admin address that already has an account gets the same answer as any other, but no link', async () => {
    const before = t.db.select().from(organisations).all().length;
    const dup = await mfr.post('/api/admin/agencies').send({ name: 'lakeshore galley service', contactEmail: null, addressLine: null, city: null, region: null, postalCode: null, timeZone: 'America/Chicago', adminEmail: 'a@b.test' });
    expect(dup.status).toBe(400);
    expect(dup.body.error.fields.name).toBeTruthy();
    const taken = await mfr.post('/api/admin/agencies').send({ name: 'Ridgeback Range Repair', contactEmail: null, addressLine: null, city: null, region: null, postalCode: null, timeZone: 'America/Denver', adminEmail: demoAccounts.adminA });
    expect(taken.status).toBe(201);
    expect(taken.body.pendingInvitations).toEqual([expect.objectContaining({ email: demoAccounts.adminA, role: 'agency_admin', status: 'pending' })]);
    expect(t.db.select().from(organisations).all().length).toBe(before + 1);
    await flushMail(t);
    const notice = t.sink.to(demoAccounts.adminA).at(-1)!;
    expect(notice.subject).toBe('Someone tried to invite this address to Fieldproof');
    expect(notice.text).not.toMatch(/accept-invitation/);
  });

  it('refuses contract terms whose dates overlap, with a clear message', async () => {
    const first = await mfr.post(`/api/admin/agencies/${agencyId}/terms`).send(terms({ effectiveFrom: '2026-01-01', effectiveTo: '2026-06-30' }));
    expect(first.status).toBe(201);
    const overlap = await mfr.post(`/api/admin/agencies/${agencyId}/terms`).send(terms({ effectiveFrom: '2026-06-30', effectiveTo: null }));
    expect(overlap.status).toBe(409);
    expect(overlap.body.error.code).toBe('terms_overlap');
    expect(overlap.body.error.message).toMatch(/2026-01-01 to 2026-06-30/);
    const inside = await mfr.post(`/api/admin/agencies/${agencyId}/terms`).send(terms({ effectiveFrom: '2026-03-01', effectiveTo: '2026-03-31' }));
    expect(inside.status).toBe(409);
    const around = await mfr.post(`/api/admin/agencies/${agencyId}/terms`).send(terms({ effectiveFrom: '2025-01-01', effectiveTo: '2027-01-01' }));
    expect(around.status).toBe(409);
    const reversed = await mfr.post(`/api/admin/agencies/${agencyId}/terms`).send(terms({ effectiveFrom: '2026-08-01', effectiveTo: '2026-07-01' }));
    expect(reversed.status).toBe(400);
    expect(reversed.body.error.fields.effectiveTo).toBeTruthy();

    const next = await mfr.post(`/api/admin/agencies/${agencyId}/terms`).send(terms({ effectiveFrom: '2026-07-01', effectiveTo: null, laborRateCents: 9_500, mileageRateCents: 67 }));
    expect(next.status).toBe(201);
    // Open-ended terms block any later start until they are ended ...
    const later = await mfr.post(`/api/admin/agencies/${agencyId}/terms`).send(terms({ effectiveFrom: '2027-01-01', laborRateCents: 9_900 }));
    expect(later.status).toBe(409);
    expect(later.body.error.message).toMatch(/no end date/);
    // ... or closePrevious ends them on the day before.
    const closed = await mfr.post(`/api/admin/agencies/${agencyId}/terms`).send(terms({ effectiveFrom: '2027-01-01', laborRateCents: 9_900, closePrevious: true }));
    expect(closed.status).toBe(201);
    expect(t.db.select().from(agencyTerms).where(eq(agencyTerms.id, next.body.id)).get()!.effectiveTo).toBe('2026-12-31');

    // Editing dates into a neighbour is refused too.
    const stretch = await mfr.patch(`/api/admin/agencies/${agencyId}/terms/${first.body.id}`).send({ effectiveTo: '2026-07-15' });
    expect(stretch.status).toBe(409);
    const fine = await mfr.patch(`/api/admin/agencies/${agencyId}/terms/${first.body.id}`).send({ filingWindowDays: 45 });
    expect(fine.status).toBe(200);
    expect(fine.body.filingWindowDays).toBe(45);
  });

  it('finds the terms in force on a repair date, both ends inclusive', () => {
    expect(termsOn(t.db, agencyId, '2025-12-31')).toBeUndefined();
    expect(termsOn(t.db, agencyId, '2026-01-01')?.laborRateCents).toBe(9_000);
    expect(termsOn(t.db, agencyId, '2026-06-30')?.laborRateCents).toBe(9_000);
    expect(termsOn(t.db, agencyId, '2026-07-01')?.laborRateCents).toBe(9_500);
    expect(termsOn(t.db, agencyId, '2026-07-01')?.mileageRateCents).toBe(67);
    expect(termsOn(t.db, agencyId, '2026-12-31')?.laborRateCents).toBe(9_500);
    expect(termsOn(t.db, agencyId, '2027-01-01')?.laborRateCents).toBe(9_900);
    expect(termsOn(t.db, agencyId, '2031-05-05')?.mileageRateCents).toBeNull();
  });

  it('lists agencies with the terms in force today, edits and deactivates one (ending its sessions)', async () => {
    const list = await mfr.get('/api/admin/agencies');
    expect(list.status).toBe(200);
    const mine = list.body.items.find((a: { id: string }) => a.id === agencyId);
    expect(mine.currentTerms.laborRateCents).toBe(9_000);
    expect(mine.activeAdminCount).toBe(1);
    const detail = await mfr.get(`/api/admin/agencies/${agencyId}`);
    expect(detail.body.terms).toHaveLength(3);
    expect((await mfr.get('/api/admin/agencies/no-such-agency')).status).toBe(404);
    const manufacturerId = t.db.select().from(users).where(eq(users.email, demoAccounts.mfrAdmin)).get()!.organisationId;
    expect((await mfr.get(`/api/admin/agencies/${manufacturerId}`)).status).toBe(404);

    const owner = await t.signIn('owner@lakeshore-galley.test', 'harbor slate pelican umbrella');
    const off = await mfr.patch(`/api/admin/agencies/${agencyId}`).send({ active: false });
    expect(off.status).toBe(200);
    expect(off.body.active).toBe(false);
    expect((await owner.get('/api/auth/me')).status).toBe(401);
    expect((await mfr.patch(`/api/admin/agencies/${agencyId}`).send({ active: true })).body.active).toBe(true);
  });

  it('keeps agency admins and others out (403)', async () => {
    const adminA = await t.signIn('adminA');
    expect((await adminA.get('/api/admin/agencies')).status).toBe(403);
    expect((await adminA.post(`/api/admin/agencies/${agencyId}/terms`).send(terms())).status).toBe(403);
    const reviewer = await t.signIn('reviewer');
    expect((await reviewer.get(`/api/admin/agencies/${agencyId}/terms`)).status).toBe(403);
  });
});

describe('manufacturer users', () => {
  let t: TestApp;
  let mfr: Agent;
  beforeAll(async () => {
    t = await makeTestApp();
    mfr = await t.signIn('mfrAdmin');
  });
  afterAll(async () => {
    await t.close();
  });

  it('lists only manufacturer users, deactivates a reviewer (ending the session), keeps the last admin', async () => {
    const list = await mfr.get('/api/admin/users');
    expect(list.status).toBe(200);
    const emails = list.body.items.map((u: { email: string }) => u.email);
    expect(emails).toContain(demoAccounts.reviewer);
    expect(emails).not.toContain(demoAccounts.adminA);

    const reviewer = await t.signIn('reviewer');
    const reviewerId = t.db.select().from(users).where(eq(users.email, demoAccounts.reviewer)).get()!.id;
    const off = await mfr.patch(`/api/admin/users/${reviewerId}`).send({ active: false });
    expect(off.status).toBe(200);
    expect((await reviewer.get('/api/auth/me')).status).toBe(401);

    const adminId = t.db.select().from(users).where(eq(users.email, demoAccounts.mfrAdmin)).get()!.id;
    const demote = await mfr.patch(`/api/admin/users/${adminId}`).send({ role: 'reviewer' });
    expect(demote.status).toBe(409);
    expect(demote.body.error.message).toMatch(/last active manufacturer admin/);
    const agencyRole = await mfr.patch(`/api/admin/users/${reviewerId}`).send({ role: 'technician' });
    expect(agencyRole.status).toBe(400);
    const otherOrg = t.db.select().from(users).where(eq(users.email, demoAccounts.techA)).get()!.id;
    expect((await mfr.patch(`/api/admin/users/${otherOrg}`).send({ active: false })).status).toBe(404);
  });
});
