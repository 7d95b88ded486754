import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { certifications, productFamilies, users } from '../../server/db/schema/index';
import { TestClock, makeTestApp, type TestApp } from '../factories/test-app';

type Agent = Awaited<ReturnType<TestApp['signIn']>>;

describe('certification duplicates', () => {
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

  it('refuses an exact duplicate with 409 and a message, on create and on an edit that would make one', async () => {
    const body = { userId: techId, familyId, certificateNumber: 'CV-5120', validFrom: '2026-01-01', validTo: '2027-12-31' };
    const first = await admin.post('/api/agency/certifications').send(body);
    expect(first.status).toBe(201);
    const again = await admin.post('/api/agency/certifications').send(body);
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/already holds certificate CV-5120/);
    const count = () => t.db.select().from(certifications).where(and(eq(certifications.userId, techId), eq(certifications.certificateNumber, 'CV-5120'))).all().length;
    expect(count()).toBe(1);

    // a renewal (other validity) is not a duplicate; editing it into the first one is
    const renewal = await admin.post('/api/agency/certifications').send({ ...body, validFrom: '2028-01-01', validTo: '2029-12-31' });
    expect(renewal.status).toBe(201);
    const edit = await admin.patch(`/api/agency/certifications/${renewal.body.id}`).send({ validFrom: '2026-01-01', validTo: '2027-12-31' });
    expect(edit.status).toBe(409);
    expect(count()).toBe(2);
  });
});
