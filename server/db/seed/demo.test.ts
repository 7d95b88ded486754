import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, existsSync, writeFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import { spawnSync } from 'node:child_process';
import { addDays, addMonthsClamped } from '@shared/calculations/dates';
import { openDatabase, type Db } from '../client';
import { verifyPassword } from '../../lib/passwords';
import { claimStates, attachmentRoles } from '../schema/index';
import { DEMO_PASSWORD, demoSignIns, isEmpty, printDemoSignIns, seedDemo } from './demo';
import { removeDatabaseFiles } from './reset';
import { loadClaimInputs, valueFromInputs } from '../../modules/claims/valuation.builder';
import { claims as claimsTable } from '../schema/index';

const PEPPER = 'test-pepper-0123456789abcdef';
const TODAY = '2026-06-15';
const dir = mkdtempSync(join(tmpdir(), 'fieldproof-seed-'));
const root = resolve(dirname(fileURLToPath(import.meta.url)), '../../..');

type Row = Record<string, unknown>;
const all = (db: Db, sql: string, ...params: unknown[]): Row[] => db.$client.prepare(sql).all(...params) as Row[];
const one = (db: Db, sql: string, ...params: unknown[]): Row => db.$client.prepare(sql).get(...params) as Row;
const n = (db: Db, sql: string, ...params: unknown[]): number => Number(Object.values(one(db, sql, ...params))[0]);

function freshDb(name: string): Db {
  return openDatabase(join(dir, `${name}.sqlite`));
}

let db: Db;
beforeAll(() => {
  db = freshDb('main');
  seedDemo(db, { pepper: PEPPER, bcryptCost: 4, today: TODAY });
});
afterAll(() => {
  db?.$client.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('demo seed: catalogue, people and places', () => {
  it('has the manufacturer and both agencies, each with an expired and a current contract period that do not overlap', () => {
    expect(all(db, 'SELECT name, kind FROM organisations ORDER BY name')).toEqual([
      { name: 'Harborview Appliance Service', kind: 'agency' },
      { name: 'Larkfield Cookline Co.', kind: 'manufacturer' },
      { name: 'Prairie Line Kitchen Repair', kind: 'agency' },
    ]);
    for (const agency of all(db, "SELECT id, latitude, longitude FROM organisations WHERE kind = 'agency'")) {
      expect(agency.latitude).toEqual(expect.any(Number));
      expect(agency.longitude).toEqual(expect.any(Number));
      const terms = all(db, 'SELECT effective_from, effective_to, overtime_multiplier FROM agency_terms WHERE agency_id = ? ORDER BY effective_from', agency.id);
      expect(terms).toHaveLength(2);
      const [expired, current] = terms;
      expect(expired.effective_to).not.toBeNull();
      expect(String(expired.effective_to) < TODAY).toBe(true);
      expect(String(expired.effective_to) < String(current.effective_from)).toBe(true);
      expect(String(current.effective_from) <= TODAY).toBe(true);
      expect(current.effective_to === null || String(current.effective_to) >= TODAY).toBe(true);
      expect(current.overtime_multiplier).toBe(1.5);
    }
    // One agency defers to the IRS mileage rate (null), the other has its own.
    expect(n(db, 'SELECT COUNT(DISTINCT agency_id) FROM agency_terms WHERE mileage_rate_cents IS NULL')).toBe(1);
    expect(n(db, 'SELECT COUNT(DISTINCT agency_id) FROM agency_terms WHERE mileage_rate_cents IS NOT NULL')).toBe(1);
  });

  it('has at least 3 families, 4 models with warranty terms and reading specs, 15 parts, 12 repair codes', () => {
    expect(n(db, 'SELECT COUNT(*) FROM product_families')).toBeGreaterThanOrEqual(3);
    expect(n(db, 'SELECT COUNT(*) FROM models WHERE parts_months > 0 AND labor_months > 0 AND cap_months_from_ship >= parts_months')).toBeGreaterThanOrEqual(4);
    expect(n(db, 'SELECT COUNT(*) FROM models m WHERE NOT EXISTS (SELECT 1 FROM reading_specs s WHERE s.model_id = m.id)')).toBe(0);
    expect(n(db, 'SELECT COUNT(*) FROM component_terms')).toBeGreaterThanOrEqual(1);
    expect(n(db, 'SELECT COUNT(*) FROM parts WHERE list_price_cents > 0')).toBeGreaterThanOrEqual(15);
    expect(n(db, 'SELECT COUNT(*) FROM parts WHERE return_required = 1')).toBeGreaterThanOrEqual(3);
    expect(n(db, 'SELECT COUNT(*) FROM parts WHERE return_required = 0')).toBeGreaterThanOrEqual(3);

    const codes = all(db, 'SELECT code, allowed_hours, required_evidence FROM repair_codes');
    expect(codes.length).toBeGreaterThanOrEqual(12);
    const roles = new Set<string>(attachmentRoles);
    for (const c of codes) {
      expect(c.allowed_hours as number).toBeGreaterThan(0);
      const evidence = JSON.parse(String(c.required_evidence)) as string[];
      expect(evidence.length).toBeGreaterThan(0);
      for (const r of evidence) expect(roles.has(r)).toBe(true);
    }
    const codeSet = new Set(codes.map((c) => String(c.code)));
    for (const s of all(db, 'SELECT required_for_codes, tolerance FROM reading_specs')) {
      expect(s.tolerance as number).toBeGreaterThan(0);
      for (const c of JSON.parse(String(s.required_for_codes)) as string[]) expect(codeSet.has(c)).toBe(true);
    }
  });

  it('has at least 20 restaurants and 60 units, some without an install date and some out of coverage today', () => {
    expect(n(db, 'SELECT COUNT(*) FROM sites WHERE latitude BETWEEN -90 AND 90 AND longitude BETWEEN -180 AND 180')).toBeGreaterThanOrEqual(20);
    const unitRows = all(
      db,
      'SELECT u.serial, u.revision, u.ship_date, u.install_date, u.site_id, m.cap_months_from_ship FROM units u JOIN models m ON m.id = u.model_id',
    );
    expect(unitRows.length).toBeGreaterThanOrEqual(60);
    expect(new Set(unitRows.map((u) => u.serial)).size).toBe(unitRows.length);
    expect(new Set(unitRows.map((u) => u.revision))).toEqual(new Set(['A', 'B', 'C']));
    for (const u of unitRows) {
      // a registered installation (install date) carries its site; an unregistered unit none
      expect(u.site_id === null).toBe(u.install_date === null);
      expect(String(u.ship_date) < TODAY).toBe(true);
      if (u.install_date !== null) {
        expect(String(u.install_date) >= String(u.ship_date)).toBe(true);
        expect(String(u.install_date) <= TODAY).toBe(true);
      }
    }
    expect(unitRows.filter((u) => u.install_date === null).length).toBeGreaterThan(0);
    // Past the cap counted from the ship date: out of coverage whatever the install date.
    const pastCap = unitRows.filter((u) => addMonthsClamped(String(u.ship_date), Number(u.cap_months_from_ship)) < TODAY);
    expect(pastCap.length).toBeGreaterThan(0);
  });

  it('has the seven demo accounts with their roles, all signing in with the demo password', async () => {
    const expected = [
      ['tech@harborview.test', 'technician', 'Harborview Appliance Service'],
      ['admin@harborview.test', 'agency_admin', 'Harborview Appliance Service'],
      ['tech@prairieline.test', 'technician', 'Prairie Line Kitchen Repair'],
      ['admin@prairieline.test', 'agency_admin', 'Prairie Line Kitchen Repair'],
      ['reviewer@larkfield.test', 'reviewer', 'Larkfield Cookline Co.'],
      ['accounts@larkfield.test', 'accountant', 'Larkfield Cookline Co.'],
      ['admin@larkfield.test', 'manufacturer_admin', 'Larkfield Cookline Co.'],
    ];
    for (const [email, role, org] of expected) {
      const u = one(db, 'SELECT u.role, u.active, u.password_hash, o.name FROM users u JOIN organisations o ON o.id = u.organisation_id WHERE u.email = ?', email);
      expect(u, email).toBeDefined();
      expect([u.role, u.name, u.active]).toEqual([role, org, 1]);
      expect(await verifyPassword(DEMO_PASSWORD, String(u.password_hash), PEPPER)).toBe(true);
      expect(await verifyPassword('fieldproof-demo!', String(u.password_hash), PEPPER)).toBe(false);
    }
    expect(demoSignIns().map((s) => [s.email, s.role, s.organisation])).toEqual(expected);
    expect(n(db, "SELECT COUNT(*) FROM users WHERE role = 'reviewer'")).toBeGreaterThanOrEqual(2);
    expect(n(db, "SELECT COUNT(*) FROM users WHERE role = 'technician'")).toBeGreaterThan(2);
  });

  it('has certifications including one expiring within 30 days and one already expired', () => {
    const rows = all(db, "SELECT c.valid_from, c.valid_to FROM certifications c JOIN users u ON u.id = c.user_id WHERE u.role = 'technician'");
    expect(rows.length).toBeGreaterThan(4);
    for (const r of rows) expect(String(r.valid_from) < String(r.valid_to)).toBe(true);
    expect(rows.some((r) => String(r.valid_to) >= TODAY && String(r.valid_to) <= addDays(TODAY, 30))).toBe(true);
    expect(rows.some((r) => String(r.valid_to) < TODAY)).toBe(true);
  });

  it('prints the sign-in table with every demo account and the password', () => {
    const lines: string[] = [];
    printDemoSignIns((l) => lines.push(l));
    const text = lines.join('\n');
    for (const s of demoSignIns()) expect(text).toContain(s.email);
    expect(text).toContain(DEMO_PASSWORD);
    // a title, a header, one row per account, then three lines on the authenticator code
    expect(lines).toHaveLength(2 + 7 + 3);
    const marked = lines.filter((l) => l.includes('@') && l.endsWith('(+ authenticator code)'));
    expect(marked.map((l) => l.trim().split(/\s+/)[0])).toEqual(['accounts@larkfield.test', 'admin@larkfield.test']);
    expect(text).toContain('npm run demo:code -- accounts@larkfield.test');
  });
});

describe('demo seed: claims', () => {
  it('has at least 40 claims over every state, for both agencies', () => {
    expect(n(db, 'SELECT COUNT(*) FROM claims')).toBeGreaterThanOrEqual(40);
    const states = all(db, 'SELECT state, COUNT(*) AS c FROM claims GROUP BY state').map((r) => r.state);
    expect(new Set(states)).toEqual(new Set(claimStates));
    expect(n(db, 'SELECT COUNT(DISTINCT agency_id) FROM claims')).toBe(2);
    for (const s of claimStates) expect(n(db, 'SELECT COUNT(DISTINCT agency_id) FROM claims WHERE state = ?', s), s).toBeGreaterThanOrEqual(1);
  });

  it('numbers claims uniquely and keeps the counters ahead of the highest number of each year', () => {
    const numbers = all(db, 'SELECT number FROM claims').map((r) => String(r.number));
    expect(new Set(numbers).size).toBe(numbers.length);
    const maxByYear = new Map<number, number>();
    for (const num of numbers) {
      const m = /^FP-(\d{4})-(\d{6})$/.exec(num);
      expect(m, num).not.toBeNull();
      const [year, seq] = [Number(m![1]), Number(m![2])];
      maxByYear.set(year, Math.max(maxByYear.get(year) ?? 0, seq));
    }
    for (const [year, max] of maxByYear) expect(n(db, 'SELECT next FROM claim_counters WHERE year = ?', year)).toBeGreaterThan(max);
    expect(n(db, 'SELECT COUNT(*) FROM claim_counters WHERE year = ?', Number(TODAY.slice(0, 4)))).toBe(1);
  });

  it('keeps an audit trail that starts at draft, chains from/to states and ends at the claim state', () => {
    const claimsRows = all(db, 'SELECT id, number, state, version, created_at, first_submitted_at, submitted_at, decided_at, decided_by, paid_at, updated_at FROM claims');
    for (const c of claimsRows) {
      const events = all(db, 'SELECT type, from_state, to_state, reason, comment, at, actor_id FROM claim_events WHERE claim_id = ? ORDER BY at, rowid', c.id);
      const label = String(c.number);
      expect(events[0].type, label).toBe('created');
      expect(events[0].to_state, label).toBe('draft');
      expect(events[0].at, label).toBe(c.created_at);
      expect(events[events.length - 1].to_state, label).toBe(c.state);
      expect(events[events.length - 1].at, label).toBe(c.updated_at);
      const transitions = events.filter((e) => e.to_state !== null);
      for (let i = 1; i < transitions.length; i++) expect(transitions[i].from_state, label).toBe(transitions[i - 1].to_state);
      for (let i = 1; i < events.length; i++) expect(String(events[i].at) > String(events[i - 1].at), label).toBe(true);
      expect(String(events[events.length - 1].at) < `${TODAY}T00:00:00.000Z`, label).toBe(true);
      expect(c.version, label).toBe(transitions.length);
      for (const e of events.filter((x) => x.type === 'return' || x.type === 'deny')) {
        expect(String(e.reason ?? ''), label).not.toBe('');
        expect(String(e.comment ?? ''), label).not.toBe('');
      }
      const submits = events.filter((e) => e.type === 'submit');
      expect(c.first_submitted_at ?? null, label).toBe(submits[0]?.at ?? null);
      expect(c.submitted_at ?? null, label).toBe(submits[submits.length - 1]?.at ?? null);
      const decision = events.find((e) => e.type === 'approve' || e.type === 'deny');
      expect(c.decided_at ?? null, label).toBe(decision?.at ?? null);
      expect(c.decided_by ?? null, label).toBe(decision?.actor_id ?? null);
      const pay = events.find((e) => e.type === 'pay');
      expect(c.paid_at ?? null, label).toBe(pay?.at ?? null);
      // Nobody approves and pays the same claim.
      if (pay) expect(pay.actor_id, label).not.toBe(decision!.actor_id);
    }
  });

  it('dates failures within the last months, repairs on or after the failure, lines from the unit family', () => {
    for (const c of all(db, 'SELECT number, failure_date, repair_date, unit_id FROM claims')) {
      expect(String(c.failure_date) >= addDays(TODAY, -130) && String(c.failure_date) < TODAY, String(c.number)).toBe(true);
      if (c.repair_date !== null) {
        expect(String(c.repair_date) >= String(c.failure_date)).toBe(true);
        expect(String(c.repair_date) < TODAY).toBe(true);
      }
    }
    expect(
      n(
        db,
        `SELECT COUNT(*) FROM claim_labor_lines l JOIN claims c ON c.id = l.claim_id JOIN units u ON u.id = c.unit_id
         JOIN models m ON m.id = u.model_id JOIN repair_codes r ON r.id = l.repair_code_id WHERE r.family_id <> m.family_id`,
      ),
    ).toBe(0);
    // Every non-draft claim has labor, travel and readings before and after the repair.
    const filed = "c.state NOT IN ('draft')";
    expect(n(db, `SELECT COUNT(*) FROM claims c WHERE ${filed} AND NOT EXISTS (SELECT 1 FROM claim_labor_lines l WHERE l.claim_id = c.id)`)).toBe(0);
    expect(n(db, `SELECT COUNT(*) FROM claims c WHERE ${filed} AND NOT EXISTS (SELECT 1 FROM claim_travel t WHERE t.claim_id = c.id)`)).toBe(0);
    expect(n(db, `SELECT COUNT(*) FROM claims c WHERE ${filed} AND NOT EXISTS (SELECT 1 FROM claim_readings r WHERE r.claim_id = c.id AND r.phase = 'before')`)).toBe(0);
    expect(n(db, "SELECT COUNT(*) FROM claim_readings WHERE phase = 'after'")).toBeGreaterThan(20);
    // Every repair date falls within one of the agency's contract periods.
    expect(
      n(
        db,
        `SELECT COUNT(*) FROM claims c WHERE c.repair_date IS NOT NULL AND NOT EXISTS (SELECT 1 FROM agency_terms t WHERE t.agency_id = c.agency_id
         AND t.effective_from <= c.repair_date AND (t.effective_to IS NULL OR c.repair_date <= t.effective_to))`,
      ),
    ).toBe(0);
  });

  it('freezes approved amounts on approved and paid claims only, adding up line by line', () => {
    for (const c of all(db, 'SELECT * FROM claims')) {
      const decided = c.state === 'approved' || c.state === 'paid';
      if (!decided) {
        expect(c.approved_total_cents, String(c.number)).toBeNull();
        continue;
      }
      const labor = n(db, 'SELECT COALESCE(SUM(approved_amount_cents), 0) FROM claim_labor_lines WHERE claim_id = ?', c.id);
      const travel = n(db, 'SELECT COALESCE(SUM(approved_amount_cents), 0) FROM claim_travel WHERE claim_id = ?', c.id);
      const partsCents = n(db, 'SELECT COALESCE(SUM(approved_amount_cents), 0) FROM claim_part_lines WHERE claim_id = ?', c.id);
      expect([c.approved_labor_cents, c.approved_travel_cents, c.approved_parts_cents]).toEqual([labor, travel, partsCents]);
      expect(c.approved_total_cents).toBe(labor + travel + partsCents);
      expect(c.approved_total_cents as number).toBeGreaterThan(0);
      expect(c.approved_total_cents as number).toBeLessThanOrEqual(c.claimed_total_cents as number);
    }
  });

  it('tracks part returns: received before payment, awaiting/shipped/received when approved, not required otherwise', () => {
    const lines = all(db, 'SELECT c.state, p.return_required, l.return_status, l.shipped_at, l.received_at FROM claim_part_lines l JOIN claims c ON c.id = l.claim_id JOIN parts p ON p.id = l.part_id');
    for (const l of lines) {
      if (!l.return_required) expect(l.return_status).toBe('not_required');
      else if (l.state === 'paid') expect(l.return_status).toBe('received');
      else if (l.state === 'approved') expect(['awaiting', 'shipped', 'received']).toContain(l.return_status);
      else expect(l.return_status).toBe('not_required');
      if (l.return_status === 'received') expect(String(l.received_at) > String(l.shipped_at)).toBe(true);
    }
    const approvedStatuses = new Set(lines.filter((l) => l.state === 'approved' && l.return_required).map((l) => l.return_status));
    expect(approvedStatuses).toEqual(new Set(['awaiting', 'shipped', 'received']));
  });

  it('pays every paid claim through exactly one paid run, and holds some approved claims in one open run', () => {
    const runs = all(db, 'SELECT * FROM payment_runs');
    for (const r of runs) {
      expect(String(r.number)).toMatch(/^PR-\d{4}-\d{4}$/);
      const items = all(db, 'SELECT i.amount_cents, i.active, c.state, c.agency_id, c.approved_total_cents, c.paid_at, c.decided_at FROM payment_run_items i JOIN claims c ON c.id = i.claim_id WHERE i.run_id = ?', r.id);
      expect(items.length).toBeGreaterThan(0);
      expect(r.total_cents).toBe(items.reduce((s, i) => s + Number(i.amount_cents), 0));
      for (const i of items) {
        expect(i.active).toBe(1);
        expect(i.agency_id).toBe(r.agency_id);
        expect(i.amount_cents).toBe(i.approved_total_cents);
        expect(String(i.decided_at) < String(r.created_at)).toBe(true);
        if (r.state === 'paid') {
          expect(i.state).toBe('paid');
          expect(i.paid_at).toBe(r.paid_at);
        } else {
          expect(i.state).toBe('approved');
        }
      }
      if (r.state === 'paid') {
        expect(r.reference).toEqual(expect.any(String));
        expect(r.payment_date).toBe(String(r.paid_at).slice(0, 10));
        expect(r.paid_by).not.toBeNull();
      }
    }
    expect(runs.filter((r) => r.state === 'open')).toHaveLength(1);
    expect(runs.filter((r) => r.state === 'paid').length).toBeGreaterThanOrEqual(2);
    expect(new Set(runs.map((r) => r.number)).size).toBe(runs.length);
    expect(
      n(db, "SELECT COUNT(*) FROM claims c WHERE c.state = 'paid' AND (SELECT COUNT(*) FROM payment_run_items i JOIN payment_runs r ON r.id = i.run_id WHERE i.claim_id = c.id AND i.active = 1 AND r.state = 'paid') <> 1"),
    ).toBe(0);
    // Approved claims waiting for a part return are not in any run.
    expect(
      n(
        db,
        `SELECT COUNT(*) FROM payment_run_items i JOIN claim_part_lines l ON l.claim_id = i.claim_id
         WHERE i.active = 1 AND l.return_status IN ('awaiting', 'shipped')`,
      ),
    ).toBe(0);
  });

  it('raises flags the reviewer expects to see somewhere in the scenario', () => {
    const flags = new Set(all(db, 'SELECT flags FROM claims').flatMap((r) => JSON.parse(String(r.flags)) as string[]));
    for (const f of ['filed_late', 'out_of_coverage', 'repeat_repair', 'technician_not_certified', 'readings_out_of_tolerance', 'travel_over_cap']) {
      expect(flags.has(f), f).toBe(true);
    }
    expect(n(db, "SELECT COUNT(*) FROM claims WHERE state = 'draft' AND flags <> '[]'")).toBe(0);
  });

  it('leaves a database that passes the foreign key and integrity checks', () => {
    expect(db.$client.pragma('foreign_key_check')).toEqual([]);
    expect(db.$client.pragma('integrity_check', { simple: true })).toBe('ok');
    expect(n(db, 'SELECT COUNT(*) FROM comments')).toBeGreaterThan(3);
  });
});

describe('demo seed: runs', () => {
  it('refuses a database that already holds data, and isEmpty tells', () => {
    expect(isEmpty(db)).toBe(false);
    expect(() => seedDemo(db, { pepper: PEPPER, bcryptCost: 4, today: TODAY })).toThrow(/already holds data/);
    const empty = freshDb('empty');
    expect(isEmpty(empty)).toBe(true);
    expect(() => seedDemo(empty, { pepper: PEPPER, bcryptCost: 4, today: '2026-02-30' })).toThrow(/YYYY-MM-DD/);
    expect(isEmpty(empty)).toBe(true);
    empty.$client.close();
  });

  it('is reproducible: the same day gives the same scenario', () => {
    const again = freshDb('again');
    seedDemo(again, { pepper: PEPPER, bcryptCost: 4, today: TODAY });
    const q = `SELECT c.number, c.state, c.failure_date, c.repair_date, c.claimed_total_cents, c.approved_total_cents, c.flags, c.submitted_at, u.serial
               FROM claims c LEFT JOIN units u ON u.id = c.unit_id ORDER BY c.number`;
    expect(all(again, q)).toEqual(all(db, q));
    again.$client.close();
  });

  it('stays consistent when the scenario spans a new year', () => {
    const jan = freshDb('january');
    const today = '2027-01-06';
    seedDemo(jan, { pepper: PEPPER, bcryptCost: 4, today });
    const years = all(jan, 'SELECT DISTINCT substr(number, 4, 4) AS y FROM claims ORDER BY y').map((r) => r.y);
    expect(years).toEqual(['2026', '2027']);
    for (const y of [2026, 2027]) {
      const max = n(jan, "SELECT MAX(CAST(substr(number, 9) AS INTEGER)) FROM claims WHERE substr(number, 4, 4) = ?", String(y));
      expect(n(jan, 'SELECT next FROM claim_counters WHERE year = ?', y)).toBe(max + 1);
    }
    expect(n(jan, "SELECT COUNT(*) FROM claim_events WHERE at >= ?", `${today}T00:00:00.000Z`)).toBe(0);
    expect(jan.$client.pragma('foreign_key_check')).toEqual([]);
    jan.$client.close();
  });

  it('npm run db:seed seeds once, then says "already seeded"; --reset starts over and empties the file store', () => {
    const databasePath = join(dir, 'cli', 'fieldproof.sqlite');
    const storageDir = join(dir, 'cli', 'files');
    const run = (...args: string[]) =>
      spawnSync(process.execPath, ['--import', 'tsx', 'server/cli/seed.ts', ...args], {
        cwd: root,
        encoding: 'utf8',
        env: { ...process.env, DATABASE_PATH: databasePath, STORAGE_DIR: storageDir, BCRYPT_COST: '4', NODE_ENV: 'test' },
      });
    // A file left in the store from an earlier run is removed by --reset.
    mkdirSync(storageDir, { recursive: true });
    writeFileSync(join(storageDir, 'left-over.jpg'), 'x');
    const first = run('--reset');
    expect(first.status, first.stderr).toBe(0);
    expect(first.stdout).toContain('Seeded the demo scenario');
    expect(first.stdout).toContain('tech@harborview.test');
    expect(existsSync(join(storageDir, 'left-over.jpg'))).toBe(false);
    const second = run();
    expect(second.status, second.stderr).toBe(0);
    expect(second.stdout).toContain('already seeded');
    expect(second.stdout).toContain('admin@larkfield.test');

    const bad = run('--wipe');
    expect(bad.status).toBe(2);
    expect(bad.stderr).toContain('Unknown argument');
  }, 120_000);

  it('refuses to empty a storage folder that is the filesystem root or the working directory', () => {
    expect(() => removeDatabaseFiles(':memory:', '/')).toThrow(/Refusing/);
    expect(() => removeDatabaseFiles(':memory:', process.cwd())).toThrow(/Refusing/);
  });
});

describe('seeded amounts agree with the computation', () => {
  it('stores the claimed total the valuation gives, and freezes its approved totals on approved and paid claims', () => {
    const rows = db.select().from(claimsTable).all();
    let checked = 0;
    for (const row of rows) {
      const v = valueFromInputs(loadClaimInputs(db, row), TODAY).valuation;
      if (!v) continue;
      expect(row.claimedTotalCents, row.number).toBe(v.totals.claimed.totalCents);
      if (row.state === 'approved' || row.state === 'paid') {
        expect(row.approvedTotalCents, row.number).toBe(v.totals.approved.totalCents);
        expect((row.approvedLaborCents ?? 0) + (row.approvedTravelCents ?? 0) + (row.approvedPartsCents ?? 0)).toBe(row.approvedTotalCents);
      }
      checked++;
    }
    expect(checked).toBeGreaterThanOrEqual(40);
  });

  it('gives every payment run the sum of its items, and every item its claim\'s approved total', () => {
    const bad = db.$client
      .prepare(
        `SELECT r.number FROM payment_runs r WHERE r.total_cents != (SELECT COALESCE(SUM(i.amount_cents),0) FROM payment_run_items i WHERE i.run_id = r.id)
         UNION ALL SELECT c.number FROM payment_run_items i JOIN claims c ON c.id = i.claim_id WHERE i.amount_cents != c.approved_total_cents`,
      )
      .all();
    expect(bad).toEqual([]);
    const runs = db.$client.prepare('SELECT COUNT(*) AS n FROM payment_runs').get() as { n: number };
    expect(runs.n).toBeGreaterThan(0);
  });
});
