import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { parse } from 'csv-parse/sync';
import Decimal from 'decimal.js';
import { type DemoKey } from '../factories/test-app';
import { totpCodeFor } from '../factories/second-factor';
import { agencyId, HARBORVIEW, insertApprovedClaim, makePaymentsApp, PRAIRIE, type Agent, type PaymentsApp } from './payments-fixtures';

let t: PaymentsApp;
const agents = {} as Record<DemoKey, Agent>;
let harborview: string;
let prairie: string;

const HEADER = ['claim_number', 'agency', 'technician', 'unit_serial', 'model', 'repair_date', 'payment_run', 'payment_date', 'payment_reference', 'approved_labor', 'approved_travel', 'approved_parts', 'approved_total', 'currency'];

/**
 * Cells a spreadsheet would run as formulas. OWASP "CSV Injection": a cell beginning with
 * = + - @, tab (0x09), carriage return (0x0D) (and line feed) must be neutralised by a
 * leading single quote; `=1+2` becomes `'=1+2`.
 */
const OWASP_SERIALS = ['=1+2', '+1+2', '-1+2', '@SUM(A1:A2)', '\t=1+2', '\r=1+2', '\n=1+2', '=HYPERLINK("http://x.test","y")'];
/** RFC 4180 section 2, rules 6 and 7: fields with commas, quotes and line breaks are quoted, quotes doubled. */
const RFC_NAME = 'Dee "the fixer" Ortiz, senior\r\nsecond line\nthird';
const UTF8_NAME = 'Zoë Ångström-Łukasz';

function neutralisedPerOwasp(v: string): string {
  return /^[=+\-@\t\r\n]/.test(v) ? `'${v}` : v;
}
/** Cents as a decimal string, with decimal.js as the reference. */
const dec = (cents: number) => new Decimal(cents).div(100).toFixed(2);

/** Makes and pays a run on its payment day (a payment date may not precede the run), then comes back to today. */
async function payRun(agency: string, claimIds: string[], paymentDate: string, reference: string) {
  const back = t.clock.now();
  t.clock.set(`${paymentDate}T15:00:00.000Z`);
  const accountant = await t.signIn('accountant');
  const run = await accountant.post('/api/payment-runs').send({ agencyId: agency, claimIds });
  if (run.status !== 201) throw new Error(`run: ${run.status} ${JSON.stringify(run.body)}`);
  const paid = await accountant.post(`/api/payment-runs/${run.body.id}/paid`).send({ paymentDate, reference });
  if (paid.status !== 200) throw new Error(`paid: ${paid.status} ${JSON.stringify(paid.body)}`);
  t.clock.set(back);
  agents.accountant = await t.signIn('accountant');
  return run.body as { id: string; number: string };
}

/** The database's paid claims, read here with SQL written for the test, in the export's order. */
function dbRows(where = '1 = 1', ...params: unknown[]): string[][] {
  const rows = t.db.$client
    .prepare(
      `select c.number, a.name as agency, u.name as tech, un.serial, m.model_number, c.repair_date, r.number as run, r.payment_date, r.reference,
              c.approved_labor_cents as labor, c.approved_travel_cents as travel, c.approved_parts_cents as parts, c.approved_total_cents as total, c.currency
         from claims c
         join payment_run_items i on i.claim_id = c.id and i.active = 1
         join payment_runs r on r.id = i.run_id and r.state = 'paid'
         join organisations a on a.id = c.agency_id
         join users u on u.id = c.technician_id
         left join units un on un.id = c.unit_id
         left join models m on m.id = un.model_id
        where c.state = 'paid' and ${where}
        order by r.payment_date, r.number, c.number`,
    )
    .all(...params) as Array<Record<string, string | number | null>>;
  const text = (v: string | number | null) => neutralisedPerOwasp(v === null ? '' : String(v));
  return rows.map((r) => [
    text(r.number),
    text(r.agency),
    text(r.tech),
    text(r.serial),
    text(r.model_number),
    text(r.repair_date),
    text(r.run),
    text(r.payment_date),
    text(r.reference),
    dec(Number(r.labor ?? 0)),
    dec(Number(r.travel ?? 0)),
    dec(Number(r.parts ?? 0)),
    dec(Number(r.total ?? 0)),
    text(r.currency),
  ]);
}

/** Many paid claims in one paid run, written in one statement batch (export volume, not realism). */
function bulkPaidClaims(n: number): void {
  const db = t.db.$client;
  const tech = db.prepare("select id from users where email = 'tech@harborview.test'").pluck().get() as string;
  const unit = db.prepare('select id from units order by serial limit 1').pluck().get() as string;
  const accountant = db.prepare("select id from users where email = 'accounts@larkfield.test'").pluck().get() as string;
  const runId = `bulk-run-${n}`;
  const now = '2026-06-15T12:00:00.000Z';
  db.transaction(() => {
    db.prepare(
      `insert into payment_runs (id, number, agency_id, payee_name, state, total_cents, currency, created_by, payment_date, reference, paid_by, paid_at, created_at)
       values (?, 'PR-2026-9999', ?, (select name from organisations where id = ?), 'paid', ?, 'USD', ?, '2026-06-13', 'ACH bulk', ?, ?, ?)`,
    ).run(runId, harborview, harborview, n * 15_000, accountant, accountant, now, now);
    const claim = db.prepare(
      `insert into claims (id, number, agency_id, technician_id, unit_id, state, version, repair_date, currency, claimed_total_cents,
         approved_total_cents, approved_labor_cents, approved_travel_cents, approved_parts_cents, paid_at, created_at, updated_at)
       values (?, ?, ?, ?, ?, 'paid', 6, '2026-05-20', 'USD', 15000, 15000, 10000, 2000, 3000, ?, ?, ?)`,
    );
    const item = db.prepare('insert into payment_run_items (id, run_id, claim_id, amount_cents, active) values (?, ?, ?, 15000, 1)');
    for (let i = 0; i < n; i++) {
      const id = `bulk-claim-${i}`;
      claim.run(id, `FP-2025-${String(i).padStart(6, '0')}`, harborview, tech, unit, now, now, now);
      item.run(`bulk-item-${i}`, runId, id);
    }
  })();
}

async function download(agent: Agent, query = '') {
  const res = await agent.get(`/api/exports/paid-claims.csv${query}`).buffer(true).parse((response, done) => {
    const chunks: Buffer[] = [];
    response.on('data', (c: Buffer) => chunks.push(c));
    response.on('end', () => done(null, Buffer.concat(chunks)));
  });
  return { res, bytes: res.body as Buffer, text: Buffer.isBuffer(res.body) ? (res.body as Buffer).toString('utf8') : '' };
}

const records = (text: string) => parse(text, { record_delimiter: ['\r\n'], relax_quotes: false }) as string[][];

let runs: { mixed: { id: string; number: string }; prairieRun: { id: string; number: string } };

beforeAll(async () => {
  t = await makePaymentsApp();
  for (const k of ['techA', 'adminA', 'adminB', 'reviewer', 'accountant', 'mfrAdmin'] as DemoKey[]) agents[k] = await t.signIn(k);
  harborview = agencyId(t, HARBORVIEW);
  prairie = agencyId(t, PRAIRIE);
  const tricky = [
    ...OWASP_SERIALS.map((serial, i) => insertApprovedClaim(t, { unitSerial: serial, laborCents: 10_000 + i, travelCents: 1_234, parts: [{ cents: 5, status: 'received' }] })),
    insertApprovedClaim(t, { technicianName: RFC_NAME, unitSerial: 'SN,with,commas', laborCents: 1 }),
    insertApprovedClaim(t, { technicianName: UTF8_NAME, laborCents: 999_999_99 }),
  ];
  const mixed = await payRun(harborview, tricky.map((c) => c.id), '2026-06-12', '=HYPERLINK("http://x.test")');
  const p = [insertApprovedClaim(t, { agency: PRAIRIE, laborCents: 4_400 }), insertApprovedClaim(t, { agency: PRAIRIE, laborCents: 5_500, travelCents: 60 })];
  const prairieRun = await payRun(prairie, p.map((c) => c.id), '2026-06-14', 'CHK 1001, "priority"');
  runs = { mixed, prairieRun };
});
afterAll(async () => {
  await t.close();
});

describe('paid-claims export', () => {
  it('answers CSV as a UTF-8 attachment, header first, with the total row count', async () => {
    const { res, bytes, text } = await download(agents.accountant);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="paid-claims-[\w-]+\.csv"$/);
    expect(res.headers['cache-control']).toBe('no-store');
    // Streamed: no length known up front.
    expect(res.headers['content-length']).toBeUndefined();
    expect(text.startsWith(`${HEADER.join(',')}\r\n`)).toBe(true);
    expect(bytes[0]).not.toBe(0xef); // no byte-order mark
    expect(Number(res.headers['x-total-rows'])).toBe(records(text).length - 1);
  });

  it('parses back with csv-parse into exactly the database rows', async () => {
    const { text } = await download(agents.accountant);
    const [header, ...rows] = records(text);
    expect(header).toEqual(HEADER);
    const expected = dbRows();
    expect(expected.length).toBeGreaterThan(12);
    expect(rows).toEqual(expected);
  });

  it('follows RFC 4180: CRLF records, commas, quotes and line breaks quoted, quotes doubled', async () => {
    const { text } = await download(agents.accountant);
    expect(text.endsWith('\r\n')).toBe(true);
    expect(text).toContain('"Dee ""the fixer"" Ortiz, senior\r\nsecond line\nthird"');
    expect(text).toContain(',"SN,with,commas",');
    expect(text).toContain(`,${runs.prairieRun.number},2026-06-14,"CHK 1001, ""priority""",`);
    // Outside quoted fields every line ends in CRLF: strip the quoted fields and look for a bare LF or CR.
    const unquoted = text.replace(/"(?:[^"]|"")*"/g, '""');
    expect(unquoted).not.toMatch(/[^\r]\n/);
    expect(unquoted).not.toMatch(/\r(?!\n)/);
    const parsed = records(text);
    expect(parsed.every((r) => r.length === HEADER.length)).toBe(true);
    expect(parsed.some((r) => r[2] === RFC_NAME)).toBe(true);
  });

  it('neutralises cells that would start a formula (OWASP CSV Injection)', async () => {
    const { text } = await download(agents.accountant);
    const bySerial = new Map(records(text).map((r) => [r[3], r]));
    // The OWASP examples, each with its leading quote.
    expect(bySerial.has("'=1+2")).toBe(true);
    expect(bySerial.has("'+1+2")).toBe(true);
    expect(bySerial.has("'-1+2")).toBe(true);
    expect(bySerial.has("'@SUM(A1:A2)")).toBe(true);
    expect(bySerial.has("'\t=1+2")).toBe(true);
    expect(bySerial.has("'\r=1+2")).toBe(true);
    expect(bySerial.has("'\n=1+2")).toBe(true);
    expect(bySerial.has('\'=HYPERLINK("http://x.test","y")')).toBe(true);
    for (const serial of OWASP_SERIALS) expect(bySerial.has(serial), JSON.stringify(serial)).toBe(false);
    const row = bySerial.get("'=1+2")!;
    expect(row[8]).toBe('\'=HYPERLINK("http://x.test")');
    // Amounts are plain decimals from cents, never prefixed: 10,000 + 1,234 + 5 cents.
    expect(row.slice(9, 13)).toEqual(['100.00', '12.34', '0.05', '112.39']);
    expect(bySerial.get("'-1+2")!.slice(9, 13)).toEqual(['100.02', '12.34', '0.05', '112.41']);
  });

  it('writes UTF-8 text and large amounts exactly', async () => {
    const { bytes, text } = await download(agents.accountant);
    expect(bytes.includes(Buffer.from('Zoë Ångström-Łukasz', 'utf8'))).toBe(true);
    const row = records(text).find((r) => r[2] === UTF8_NAME)!;
    expect(row[9]).toBe('999999.99');
    expect(row[12]).toBe('999999.99');
  });

  it('gives an agency admin only their own agency, and the accountant every agency or the one asked for', async () => {
    const own = records((await download(agents.adminA)).text).slice(1);
    expect(own).toEqual(dbRows('c.agency_id = ?', harborview));
    expect(own.every((r) => r[1] === HARBORVIEW)).toBe(true);
    expect(own.length).toBeGreaterThan(5);

    const b = records((await download(agents.adminB)).text).slice(1);
    expect(b).toEqual(dbRows('c.agency_id = ?', prairie));
    expect(b.some((r) => r[6] === runs.mixed.number)).toBe(false);

    // Their own agency named explicitly is the same export; a foreign one is not found.
    expect(records((await download(agents.adminA, `?agency=${harborview}`)).text).slice(1)).toEqual(own);
    const foreign = await download(agents.adminA, `?agency=${prairie}`);
    const unknown = await download(agents.adminA, '?agency=no-such-agency');
    expect(foreign.res.status).toBe(404);
    expect(unknown.res.status).toBe(404);
    expect(foreign.text).toBe(unknown.text);

    const onlyPrairie = records((await download(agents.accountant, `?agency=${prairie}`)).text).slice(1);
    expect(onlyPrairie).toEqual(dbRows('c.agency_id = ?', prairie));
    expect((await download(agents.accountant, '?agency=no-such-agency')).res.status).toBe(404);
  });

  it('filters on the payment date, both ends inclusive', async () => {
    const day = records((await download(agents.accountant, '?from=2026-06-14&to=2026-06-14')).text).slice(1);
    expect(day).toEqual(dbRows("r.payment_date between '2026-06-14' and '2026-06-14'"));
    expect(day.map((r) => r[6])).toContain(runs.prairieRun.number);
    expect(day.every((r) => r[7] === '2026-06-14')).toBe(true);
    const from = records((await download(agents.accountant, '?from=2026-06-12')).text).slice(1);
    expect(from).toEqual(dbRows("r.payment_date >= '2026-06-12'"));
    expect(from.length).toBe(OWASP_SERIALS.length + 2 + 2);
    const none = records((await download(agents.accountant, '?to=2000-01-01')).text);
    expect(none).toEqual([HEADER]);
  });

  it('refuses bad filters with 400 and everyone but accountants and agency admins with 403', async () => {
    for (const q of ['?from=2026-13-01', '?to=yesterday', '?from=2026-06-15&to=2026-06-01', '?agency=', '?extra=1']) {
      const { res } = await download(agents.accountant, q);
      expect(res.status, q).toBe(400);
    }
    for (const k of ['techA', 'reviewer', 'mfrAdmin'] as DemoKey[]) expect((await download(agents[k])).res.status, k).toBe(403);
  });

  it('streams 5,000 rows to a slow reader, serving other requests meanwhile', async () => {
    bulkPaidClaims(5_000);
    const server = t.app.listen(0, '127.0.0.1');
    await new Promise((r) => server.once('listening', r));
    const port = (server.address() as AddressInfo).port;
    try {
      const signed = await fetch(`http://127.0.0.1:${port}/api/auth/sign-in`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', origin: new URL(t.env.PUBLIC_URL).origin },
        body: JSON.stringify({ email: 'accounts@larkfield.test', password: 'fieldproof-demo' }),
      });
      // The accountant's second factor: the code from the seeded authenticator secret.
      const pending = signed.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
      const second = await fetch(`http://127.0.0.1:${port}/api/auth/second-factor/totp`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', origin: new URL(t.env.PUBLIC_URL).origin, cookie: pending },
        body: JSON.stringify({ code: totpCodeFor(t.db.$client, 'accounts@larkfield.test', t.deps.clock.now().getTime()) }),
      });
      expect(second.status).toBe(200);
      const session = second.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
      const paused = await new Promise<http.IncomingMessage>((resolve, reject) => {
        const req = http.get({ host: '127.0.0.1', port, path: '/api/exports/paid-claims.csv', headers: { cookie: session } }, resolve);
        req.on('error', reject);
      });
      expect(paused.statusCode).toBe(200);
      paused.pause();
      const other = await fetch(`http://127.0.0.1:${port}/api/payment-runs?limit=5`, { headers: { cookie: session } });
      expect(other.status).toBe(200);
      const ready = await fetch(`http://127.0.0.1:${port}/api/payment-runs/ready`, { headers: { cookie: session } });
      expect(ready.status).toBe(200);
      paused.resume();
      const chunks: Buffer[] = [];
      for await (const c of paused) chunks.push(c as Buffer);
      const all = records(Buffer.concat(chunks).toString('utf8')).slice(1);
      expect(all.length).toBeGreaterThan(5_000);
      expect(all).toEqual(dbRows());
    } finally {
      server.closeAllConnections();
      await new Promise((r) => server.close(r));
    }
  });

  it('holds its database iterator on a connection of its own, so the app’s connection stays free mid-export', async () => {
    const { createExportsService } = await import('../../server/modules/exports/exports.service');
    const { defineAbilityFor } = await import('../../shared/permissions/ability');
    const user = { id: 'x', organisationId: 'y', organisationKind: 'manufacturer' as const, role: 'accountant' as const, name: 'Test', email: 'x@test' };
    const cursor = createExportsService(t.deps).prepare({ ctx: { user, ability: defineAbilityFor(user) } }, {}).open();
    try {
      const first = cursor.rows.next();
      expect(first.done).toBe(false);
      // better-sqlite3 refuses writes on a connection whose iterator is open ("busy executing a
      // query"); a payment run written now goes through the app's connection.
      const c = insertApprovedClaim(t);
      const res = await agents.accountant.post('/api/payment-runs').send({ agencyId: harborview, claimIds: [c.id] });
      expect(res.status).toBe(201);
      let n = 1;
      while (!cursor.rows.next().done) n++;
      expect(n).toBe(cursor.total);
    } finally {
      cursor.close();
    }
  });
});
