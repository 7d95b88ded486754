/**
 * A payment date lies between the day the run was created and tomorrow, both in the paying
 * organisation's time zone (IANA tz); the message names both bounds; nothing is paid otherwise.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { organisations, paymentRuns, users } from '../../server/db/schema/index';
import { agencyId, claimRow, HARBORVIEW, insertApprovedClaim, makePaymentsApp, type Agent, type PaymentsApp } from './payments-fixtures';

let t: PaymentsApp;
let accountant: Agent;
let harborview: string;

beforeAll(async () => {
  t = await makePaymentsApp();
  harborview = agencyId(t, HARBORVIEW);
  const org = t.db.select({ id: users.organisationId }).from(users).where(eq(users.email, 'accounts@larkfield.test')).get()!.id;
  t.db.update(organisations).set({ timeZone: 'America/Chicago' }).where(eq(organisations.id, org)).run();
});
afterAll(async () => {
  await t.close();
});

async function openRun(createdAt: string) {
  t.clock.set(createdAt);
  accountant = await t.signIn('accountant');
  const c = insertApprovedClaim(t, { laborCents: 10_000 });
  const res = await accountant.post('/api/payment-runs').send({ agencyId: harborview, claimIds: [c.id] });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return { run: res.body as { id: string }, claimId: c.id };
}
const markPaid = (runId: string, paymentDate: string) => accountant.post(`/api/payment-runs/${runId}/paid`).send({ paymentDate, reference: 'ACH 55120' });

describe('payment date bounds', () => {
  it('refuses a date far in the future, and one before the run was created, naming both bounds', async () => {
    const { run, claimId } = await openRun('2026-11-30T16:00:00.000Z'); // 10:00 CST on 2026-11-30
    t.clock.set('2026-12-02T16:00:00.000Z'); // 10:00 CST on 2026-12-02
    accountant = await t.signIn('accountant');
    for (const date of ['2027-06-01', '2026-12-04', '2026-11-29']) {
      const res = await markPaid(run.id, date);
      expect(res.status, date).toBe(400);
      expect(res.body.error.fields.paymentDate).toBe('The payment date must be between 2026-11-30 and 2026-12-03.');
    }
    expect(t.db.select().from(paymentRuns).where(eq(paymentRuns.id, run.id)).get()!.state).toBe('open');
    expect(claimRow(t, claimId).state).toBe('approved');
    // tomorrow (the margin) and the creation day are accepted
    expect((await markPaid(run.id, '2026-12-03')).status).toBe(200);
  });

  it('counts today in the paying organisation’s zone: at 20:00 CST it is still the 2nd, so the 4th is refused', async () => {
    const { run } = await openRun('2026-12-01T16:00:00.000Z');
    t.clock.set('2026-12-03T02:00:00.000Z'); // 20:00 CST on 2026-12-02; UTC is on the 3rd
    accountant = await t.signIn('accountant');
    const refused = await markPaid(run.id, '2026-12-04');
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields.paymentDate).toBe('The payment date must be between 2026-12-01 and 2026-12-03.');
    expect((await markPaid(run.id, '2026-12-01')).status).toBe(200);
  });
});
