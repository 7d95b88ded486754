import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { invitations, organisations } from '../../server/db/schema/index';
import { TestClock, demoAccounts, flushMail, makeTestApp, type TestApp } from '../factories/test-app';

// An invitation must not tell one organisation whether an address has an account elsewhere
// (OWASP ASVS 5.0 V8.2.2 on data between tenants; OWASP Authentication Cheat Sheet, "account
// enumeration": the same status and body whether or not the account exists).

describe('inviting an address that already has an account', () => {
  let t: TestApp;
  let adminA: Awaited<ReturnType<TestApp['signIn']>>;
  let adminB: Awaited<ReturnType<TestApp['signIn']>>;
  let orgNameA: string;
  let orgNameB: string;

  beforeAll(async () => {
    t = await makeTestApp({ clock: new TestClock() });
    adminA = await t.signIn('adminA');
    adminB = await t.signIn('adminB');
    orgNameA = (await adminA.get('/api/agency/profile')).body.name;
    orgNameB = (await adminB.get('/api/agency/profile')).body.name;
  });
  afterAll(async () => {
    await t.close();
  });

  /** The answer without what must differ: the new row's id and the address itself. */
  const shape = (r: { status: number; body: Record<string, unknown>; headers: Record<string, string> }) => ({
    status: r.status,
    contentType: r.headers['content-type'],
    body: { ...r.body, id: typeof r.body.id, email: typeof r.body.email },
    keys: Object.keys(r.body).sort(),
  });

  it('answers the same for a new address, an address of another agency, of the manufacturer and of the inviter’s own agency', async () => {
    const fresh = await adminA.post('/api/agency/users').send({ email: 'new.person@harborview.test', role: 'technician' });
    expect(fresh.status).toBe(201);
    const answers = [
      await adminA.post('/api/agency/users').send({ email: demoAccounts.techB, role: 'technician' }),
      await adminA.post('/api/agency/users').send({ email: demoAccounts.reviewer, role: 'technician' }),
      await adminA.post('/api/agency/users').send({ email: demoAccounts.techA, role: 'technician' }),
    ];
    for (const a of answers) expect(shape(a)).toEqual(shape(fresh));
    // the list shows them alike too
    const list = await adminA.get('/api/invitations');
    const listed = list.body.items.filter((i: { email: string }) => [demoAccounts.techB, 'new.person@harborview.test'].includes(i.email));
    expect(listed).toHaveLength(2);
    expect(shape({ status: 200, headers: {}, body: listed[0] })).toEqual(shape({ status: 200, headers: {}, body: listed[1] }));
    // resending answers alike as well
    const resendFresh = await adminA.post(`/api/invitations/${fresh.body.id}/resend`).send({});
    const resendTaken = await adminA.post(`/api/invitations/${answers[0].body.id}/resend`).send({});
    expect(shape(resendTaken)).toEqual(shape(resendFresh));
  });

  it('sends the new address its link; tells the owner of a taken address, without a link; tells the inviter nothing', async () => {
    await flushMail(t);
    const invite = t.sink.to('new.person@harborview.test');
    expect(invite.length).toBeGreaterThanOrEqual(1);
    expect(invite[0].text).toMatch(/accept-invitation\?token=/);

    const notices = t.sink.to(demoAccounts.techB);
    expect(notices.map((m) => m.subject)).toEqual(['Someone tried to invite this address to Fieldproof', 'Someone tried to invite this address to Fieldproof']);
    const notice = notices[0];
    expect(notice.text).toContain(`tried to invite ${demoAccounts.techB} to join ${orgNameA} on Fieldproof as technician`);
    expect(notice.text).toContain('This address already has a Fieldproof account, so no invitation was created and no link was sent.');
    expect(notice.text).toContain('They were not told that the address has an account');
    expect(notice.text).not.toMatch(/token=|https?:\/\//);
    expect(notice.text).not.toContain(orgNameB);
    expect(t.sink.to(demoAccounts.reviewer).at(-1)!.subject).toBe('Someone tried to invite this address to Fieldproof');
    expect(t.sink.to(demoAccounts.techA).at(-1)!.subject).toBe('Someone tried to invite this address to Fieldproof');
    // the inviter receives nothing about any of these addresses
    expect(t.sink.to(demoAccounts.adminA).filter((m) => /invite/i.test(m.subject))).toHaveLength(0);
  });

  it('another organisation’s pending invitation to an address is not mentioned either', async () => {
    const b = await adminB.post('/api/agency/users').send({ email: 'shared.contact@kitchen.test', role: 'technician' });
    expect(b.status).toBe(201);
    const a = await adminA.post('/api/agency/users').send({ email: 'shared.contact@kitchen.test', role: 'technician' });
    expect(a.status).toBe(201);
    expect(a.body.organisationName).toBe(orgNameA);
    // within one organisation a second pending invitation is refused, as the inviter sees the first
    const again = await adminA.post('/api/agency/users').send({ email: 'shared.contact@kitchen.test', role: 'technician' });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('invitation_pending');
    const agencyA = t.db.select({ id: organisations.id }).from(organisations).where(eq(organisations.name, orgNameA)).get()!.id;
    expect(t.db.select().from(invitations).where(eq(invitations.email, 'shared.contact@kitchen.test')).all().filter((i) => i.organisationId === agencyA)).toHaveLength(1);
  });
});
