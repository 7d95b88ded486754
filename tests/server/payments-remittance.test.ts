import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { parse } from 'csv-parse/sync';
import { users } from '../../server/db/schema/index';
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

describe('remittance mail', () => {
  it('goes to the agency’s active admins only, with the run’s lines attached as CSV', async () => {
    // A second admin of the agency, and one who was deactivated: only active admins hear of the payment.
    const now = new Date().toISOString();
    t.db.insert(users).values({ id: 'second-admin', organisationId: harborview, role: 'agency_admin', email: 'office@harborview.test', name: 'Second Admin', createdAt: now, updatedAt: now }).run();
    t.db.insert(users).values({ id: 'gone-admin', organisationId: harborview, role: 'agency_admin', email: 'former@harborview.test', name: 'Former Admin', active: false, createdAt: now, updatedAt: now }).run();
    const a = insertApprovedClaim(t, { laborCents: 12_500, travelCents: 3_000, parts: [{ cents: 7_125, status: 'received' }] });
    const b = insertApprovedClaim(t, { laborCents: 4_000, unitSerial: '=2+3' });
    const run = await agents.accountant.post('/api/payment-runs').send({ agencyId: harborview, claimIds: [a.id, b.id] });
    expect(run.status).toBe(201);
    const before = t.sink.messages.length;
    const paid = await agents.accountant.post(`/api/payment-runs/${run.body.id}/paid`).send({ paymentDate: '2026-06-15', reference: 'ACH 20260615-7' });
    expect(paid.status).toBe(200);
    await flushMail(t);

    const mails = t.sink.messages.slice(before).filter((m) => m.subject.startsWith(`Remittance ${run.body.number}:`));
    expect(mails).toHaveLength(1);
    const mail = mails[0];
    const expectedTo = t.db
      .select({ email: users.email })
      .from(users)
      .where(and(eq(users.organisationId, harborview), eq(users.role, 'agency_admin'), eq(users.active, true)))
      .all()
      .map((u) => u.email)
      .sort();
    expect(expectedTo).toEqual(['admin@harborview.test', 'office@harborview.test']);
    expect([...mail.to].sort()).toEqual(expectedTo);
    expect(mail.subject).toContain('$266.25');
    expect(mail.text).toContain('ACH 20260615-7');
    expect(mail.text).toContain(a.number);

    expect(mail.attachments).toHaveLength(1);
    const file = mail.attachments[0];
    expect(file.filename).toBe(`remittance-${run.body.number}.csv`);
    expect(file.contentType).toBe('text/csv');
    expect(file.content.split('\r\n')[0]).toBe('claim_number,agency,technician,unit_serial,model,repair_date,payment_run,payment_date,payment_reference,approved_labor,approved_travel,approved_parts,approved_total,currency');
    const rows = parse(file.content, { columns: true, record_delimiter: ['\r\n'] }) as Record<string, string>[];
    expect(rows.map((r) => r.claim_number).sort()).toEqual([a.number, b.number].sort());
    const ra = rows.find((r) => r.claim_number === a.number)!;
    expect([ra.approved_labor, ra.approved_travel, ra.approved_parts, ra.approved_total, ra.payment_run, ra.payment_date, ra.payment_reference, ra.agency]).toEqual([
      '125.00',
      '30.00',
      '71.25',
      '226.25',
      run.body.number,
      '2026-06-15',
      'ACH 20260615-7',
      HARBORVIEW,
    ]);
    // The attachment neutralises formula cells like the export (OWASP CSV Injection).
    expect(rows.find((r) => r.claim_number === b.number)!.unit_serial).toBe("'=2+3");
  });

  it('is not queued when the payment is refused', async () => {
    const c = insertApprovedClaim(t);
    const run = (await agents.accountant.post('/api/payment-runs').send({ agencyId: harborview, claimIds: [c.id] })).body;
    expect((await agents.accountant.post(`/api/payment-runs/${run.id}/void`)).status).toBe(200);
    expect((await agents.accountant.post(`/api/payment-runs/${run.id}/paid`).send({ paymentDate: '2026-06-15', reference: 'late' })).status).toBe(409);
    await flushMail(t);
    expect(t.sink.messages.filter((m) => m.subject.startsWith(`Remittance ${run.number}:`))).toHaveLength(0);
  });
});
