import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { parse } from 'csv-parse/sync';
import { organisations } from '../../server/db/schema/index';
import { flushMail, type DemoKey } from '../factories/test-app';
import { agencyId, HARBORVIEW, insertApprovedClaim, makePaymentsApp, type Agent, type PaymentsApp } from './payments-fixtures';

let t: PaymentsApp;
const agents = {} as Record<DemoKey, Agent>;
let harborview: string;

beforeAll(async () => {
  t = await makePaymentsApp();
  for (const k of ['adminA', 'accountant'] as DemoKey[]) agents[k] = await t.signIn(k);
  harborview = agencyId(t, HARBORVIEW);
});
afterAll(async () => {
  await t.close();
});

describe('payment runs keep the payee they were made for', () => {
  it('a rename after the run is made changes neither the run, its CSV nor its remittance; the mail also goes to the contact address', async () => {
    const c = insertApprovedClaim(t, { laborCents: 10_000 });
    const run = await agents.accountant.post('/api/payment-runs').send({ agencyId: harborview, claimIds: [c.id] });
    expect(run.status).toBe(201);
    expect(run.body.agencyName).toBe(HARBORVIEW);

    const profile = (await agents.adminA.get('/api/agency/profile')).body;
    const renamed = await agents.adminA.patch('/api/agency/profile').send({ name: 'Harborview Renamed Service', contactEmail: 'payables@harborview-office.test', addressLine: profile.addressLine, city: profile.city, region: profile.region, postalCode: profile.postalCode, latitude: profile.latitude, longitude: profile.longitude, timeZone: profile.timeZone });
    expect(renamed.status, JSON.stringify(renamed.body)).toBe(200);
    expect(t.db.select({ name: organisations.name }).from(organisations).where(eq(organisations.id, harborview)).get()!.name).toBe('Harborview Renamed Service');

    const before = t.sink.messages.length;
    const paid = await agents.accountant.post(`/api/payment-runs/${run.body.id}/paid`).send({ paymentDate: '2026-06-15', reference: 'ACH 20260615-9' });
    expect(paid.status).toBe(200);
    expect(paid.body.agencyName).toBe(HARBORVIEW);
    expect((await agents.accountant.get(`/api/payment-runs/${run.body.id}`)).body.agencyName).toBe(HARBORVIEW);
    const list = (await agents.accountant.get('/api/payment-runs')).body.items as { id: string; agencyName: string }[];
    expect(list.find((r) => r.id === run.body.id)!.agencyName).toBe(HARBORVIEW);

    await flushMail(t);
    const mail = t.sink.messages.slice(before).find((m) => m.subject.startsWith(`Remittance ${run.body.number}:`))!;
    expect(mail.subject).toContain(`paid to ${HARBORVIEW}`);
    expect(mail.text).toContain(`for ${HARBORVIEW} was paid`);
    expect(mail.to.map((a: string) => a.toLowerCase())).toContain('payables@harborview-office.test');
    expect(mail.to).toContain('admin@harborview.test');
    const rows = parse(mail.attachments[0].content, { columns: true, record_delimiter: ['\r\n'] }) as Record<string, string>[];
    expect(rows.find((r) => r.claim_number === c.number)!.agency).toBe(HARBORVIEW);
  });
});
