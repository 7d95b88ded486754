import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openDatabase } from '../../../server/db/client';
import { seedDemo } from '../../../server/db/seed/demo';
import { hashPassword } from '../../../server/lib/passwords';
import { randomBytes } from 'node:crypto';
import { createRandom } from '../../../server/db/seed/random';

/** The bench agencies' users sign in with this; long enough for the password policy. */
export let demoMs = 0;
export const BENCH_PASSWORD = 'bench-agency-password-0001';

export interface BenchDataset {
  dir: string;
  databasePath: string;
  pepper: string;
  agencyIds: string[];
  /** The agency whose admin the app is measured as, with that admin's e-mail. */
  measuredAgencyId: string;
  measuredAdminEmail: string;
  counts: { claims: number; laborLines: number; partLines: number; travel: number; events: number; agencies: number };
  seedMs: number;
  close(): void;
}

type BenchState = 'draft' | 'submitted' | 'in_review' | 'returned' | 'approved' | 'denied' | 'paid' | 'withdrawn';
const STATE_WEIGHTS: readonly (readonly [BenchState, number])[] = [
  ['draft', 8],
  ['submitted', 14],
  ['in_review', 10],
  ['returned', 6],
  ['approved', 18],
  ['denied', 6],
  ['paid', 34],
  ['withdrawn', 4],
];

/** Ordered text ids (`bench-claim-00000001`): appending to each primary-key B-tree keeps the load fast. */
function idSequence(prefix: string): () => string {
  let n = 0;
  return () => `bench-${prefix}-${String(++n).padStart(8, '0')}`;
}

function isoDay(base: number, offsetDays: number): string {
  return new Date(base + offsetDays * 86_400_000).toISOString().slice(0, 10);
}

/**
 * A temp database: migrated, the demo scenario seeded, then `claims` claims spread evenly
 * over `agencies` new agencies, each claim with labor lines, travel, part lines and its
 * events. All rows go in through prepared statements inside one transaction.
 */
export function buildBenchDataset(opts: { claims?: number; agencies?: number } = {}): BenchDataset {
  const totalClaims = opts.claims ?? 100_000;
  const agencyCount = opts.agencies ?? 50;
  const started = performance.now();
  const dir = mkdtempSync(join(tmpdir(), 'fieldproof-bench-'));
  const databasePath = join(dir, 'bench.sqlite');
  // A random pepper of this run; the bench servers get it through PASSWORD_PEPPER.
  const pepper = randomBytes(24).toString('base64url');

  const db = openDatabase(databasePath);
  const today = new Date().toISOString().slice(0, 10);
  const t0 = performance.now();
  seedDemo(db, { pepper, bcryptCost: 4, today });
  demoMs = performance.now() - t0;
  const sqlite = db.$client;
  // Bulk load only: the bench measures reads, and the servers reopen the file normally.
  // A large page cache keeps the random-id B-trees in memory until the one commit.
  sqlite.pragma('journal_mode = MEMORY');
  sqlite.pragma('synchronous = OFF');
  sqlite.pragma('cache_size = -1048576');
  sqlite.pragma('temp_store = MEMORY');

  const col = <T>(q: string) => sqlite.prepare(q).pluck().all() as T[];
  const manufacturerId = col<string>(`SELECT id FROM organisations WHERE kind = 'manufacturer' LIMIT 1`)[0];
  const repairCodes = sqlite.prepare('SELECT id, allowed_hours AS hours FROM repair_codes').all() as { id: string; hours: number }[];
  const parts = sqlite.prepare('SELECT id, list_price_cents AS price FROM parts').all() as { id: string; price: number }[];
  const models = col<string>('SELECT id FROM models');
  const sites = col<string>('SELECT id FROM sites');
  const reviewerId = col<string>(`SELECT id FROM users WHERE role = 'reviewer' LIMIT 1`)[0];
  if (!manufacturerId || repairCodes.length === 0 || parts.length === 0 || models.length === 0 || sites.length === 0) {
    throw new Error('the demo seed did not leave the catalogue the bench builds on');
  }

  const rnd = createRandom(20_260_101);
  const passwordHash = hashPassword(BENCH_PASSWORD, pepper, 4);
  const now = new Date().toISOString();
  const base = Date.parse('2024-01-01T00:00:00Z');

  const insOrg = sqlite.prepare(
    `INSERT INTO organisations (id, kind, name, name_key, contact_email, city, region, country, latitude, longitude, time_zone, currency, active, created_at, updated_at)
     VALUES (?, 'agency', ?, fp_name_key(?), ?, ?, ?, 'US', ?, ?, 'America/Chicago', 'USD', 1, ?, ?)`,
  );
  const insTerms = sqlite.prepare(
    `INSERT INTO agency_terms (id, agency_id, effective_from, effective_to, labor_rate_cents, travel_rate_cents, mileage_rate_cents, max_round_trip_miles, max_travel_hours, parts_discount_bps, parts_handling_bps, overtime_multiplier, filing_window_days, created_at)
     VALUES (?, ?, '2020-01-01', NULL, ?, ?, NULL, 150, 3, 0, 1000, 1.5, 30, ?)`,
  );
  const insUser = sqlite.prepare(
    `INSERT INTO users (id, organisation_id, role, email, name, password_hash, active, session_version, created_at, updated_at)
     VALUES (?, ?, ?, ?, ?, ?, 1, 1, ?, ?)`,
  );
  const insUnit = sqlite.prepare(
    `INSERT INTO units (id, serial, model_id, revision, ship_date, install_date, site_id, created_at) VALUES (?, ?, ?, 'A', ?, ?, ?, ?)`,
  );
  const insClaim = sqlite.prepare(
    `INSERT INTO claims (id, number, agency_id, technician_id, unit_id, site_id, state, version, complaint, cause, correction, failure_date, repair_date, currency,
       claimed_total_cents, approved_total_cents, flags, resubmission_count, first_submitted_at, submitted_at, reviewer_id, decided_at, decided_by, paid_at, created_at, updated_at)
     VALUES (?, ?, ?, ?, ?, ?, ?, 1, ?, ?, ?, ?, ?, 'USD', ?, ?, '[]', 0, ?, ?, ?, ?, ?, ?, ?, ?)`,
  );
  const insLabor = sqlite.prepare(
    `INSERT INTO claim_labor_lines (id, claim_id, position, repair_code_id, hours_worked, overtime, note) VALUES (?, ?, ?, ?, ?, 0, '')`,
  );
  const insTravel = sqlite.prepare(`INSERT INTO claim_travel (id, claim_id, round_trip_miles, travel_hours) VALUES (?, ?, ?, ?)`);
  const insPart = sqlite.prepare(
    `INSERT INTO claim_part_lines (id, claim_id, position, part_id, quantity, return_status) VALUES (?, ?, ?, ?, ?, 'not_required')`,
  );
  const insEvent = sqlite.prepare(
    `INSERT INTO claim_events (id, claim_id, actor_id, organisation_id, type, from_state, to_state, at) VALUES (?, ?, ?, ?, ?, ?, ?, ?)`,
  );

  const nextId = {
    org: idSequence('org'),
    terms: idSequence('terms'),
    user: idSequence('user'),
    unit: idSequence('unit'),
    claim: idSequence('claim'),
    labor: idSequence('labor'),
    part: idSequence('part'),
    travel: idSequence('travel'),
    event: idSequence('event'),
  };
  const counts = { claims: 0, laborLines: 0, partLines: 0, travel: 0, events: 0, agencies: agencyCount };
  const agencyIds: string[] = [];
  const admins: string[] = [];

  // Secondary indexes of the bulk-loaded tables are dropped and rebuilt after the load (a
  // sorted build is far faster than 100,000 random inserts into each), from their own DDL.
  const bulkTables = ['organisations', 'agency_terms', 'users', 'units', 'claims', 'claim_labor_lines', 'claim_travel', 'claim_part_lines', 'claim_events'];
  const indexes = sqlite
    .prepare(`SELECT name, sql FROM sqlite_master WHERE type = 'index' AND sql IS NOT NULL AND tbl_name IN (${bulkTables.map(() => '?').join(',')})`)
    .all(...bulkTables) as { name: string; sql: string }[];

  sqlite.transaction(() => {
    for (const ix of indexes) sqlite.exec(`DROP INDEX "${ix.name}"`);
    const agencyTechs: string[][] = [];
    const agencyAdmins: string[] = [];
    for (let a = 0; a < agencyCount; a++) {
      const id = nextId.org();
      const n = String(a + 1).padStart(2, '0');
      insOrg.run(id, `Bench Service Agency ${n}`, `Bench Service Agency ${n}`, `office@bench-${n}.test`, 'Bench City', 'KS', 37 + rnd.real(0, 2), -97 - rnd.real(0, 2), now, now);
      insTerms.run(nextId.terms(), id, 9500 + a * 10, 6500, now);
      const adminId = nextId.user();
      const email = `admin@bench-${n}.test`;
      insUser.run(adminId, id, 'agency_admin', email, `Bench Admin ${n}`, passwordHash, now, now);
      const techs: string[] = [];
      for (let t = 0; t < 4; t++) {
        const techId = nextId.user();
        insUser.run(techId, id, 'technician', `tech${t + 1}@bench-${n}.test`, `Bench Technician ${n}-${t + 1}`, passwordHash, now, now);
        techs.push(techId);
      }
      agencyIds.push(id);
      admins.push(email);
      agencyTechs.push(techs);
      agencyAdmins.push(adminId);
    }

    // One unit per five claims, on the demo's models and sites.
    const units: { id: string; site: string }[] = [];
    const unitCount = Math.ceil(totalClaims / 5);
    for (let u = 0; u < unitCount; u++) {
      const id = nextId.unit();
      const ship = rnd.int(0, 700);
      const site = rnd.pick(sites);
      insUnit.run(id, `BN${String(u).padStart(8, '0')}`, rnd.pick(models), isoDay(base, ship - 400), isoDay(base, ship - 380), site, now);
      units.push({ id, site });
    }

    for (let i = 0; i < totalClaims; i++) {
      const a = i % agencyCount;
      const agencyId = agencyIds[a];
      const tech = rnd.pick(agencyTechs[a]);
      const unit = units[i % units.length];
      const state = rnd.weighted(STATE_WEIGHTS);
      const day = rnd.int(0, 800);
      const created = new Date(base + day * 86_400_000 + rnd.int(0, 86_399) * 1000).toISOString();
      const submitted = state === 'draft' ? null : new Date(Date.parse(created) + 3_600_000).toISOString();
      const decided = ['approved', 'denied', 'paid'].includes(state) ? new Date(Date.parse(created) + 5 * 86_400_000).toISOString() : null;
      const paid = state === 'paid' ? new Date(Date.parse(created) + 20 * 86_400_000).toISOString() : null;
      const claimId = nextId.claim();
      const number = `BN-${String(i + 1).padStart(7, '0')}`;

      let total = 0;
      const labor: [string, number][] = [];
      for (let p = rnd.int(1, 2); p > 0; p--) {
        const code = rnd.pick(repairCodes);
        const hours = Math.max(0.5, Math.round(code.hours * rnd.real(0.8, 1.3) * 10) / 10);
        total += Math.round(hours * 9500);
        labor.push([code.id, hours]);
      }
      const miles = rnd.int(5, 140);
      total += Math.round(miles * 70);
      const partLines: [string, number][] = [];
      for (let p = rnd.int(0, 2); p > 0; p--) {
        const part = rnd.pick(parts);
        const qty = rnd.int(1, 2);
        total += part.price * qty;
        partLines.push([part.id, qty]);
      }

      insClaim.run(
        claimId, number, agencyId, tech, unit.id, unit.site, state,
        'Unit does not hold temperature.', 'Failed component.', 'Replaced component, tested to spec.',
        isoDay(base, day - 2), isoDay(base, day - 1),
        total, decided && state !== 'denied' ? total : decided ? 0 : null,
        submitted, submitted, submitted ? reviewerId : null, decided, decided ? reviewerId : null, paid, created, decided ?? submitted ?? created,
      );
      labor.forEach(([codeId, hours], p) => insLabor.run(nextId.labor(), claimId, p + 1, codeId, hours));
      partLines.forEach(([partId, qty], p) => insPart.run(nextId.part(), claimId, p + 1, partId, qty));
      counts.laborLines += labor.length;
      counts.partLines += partLines.length;
      insTravel.run(nextId.travel(), claimId, miles, Math.round((miles / 45) * 10) / 10);
      counts.travel++;
      counts.claims++;

      insEvent.run(nextId.event(), claimId, tech, agencyId, 'created', null, 'draft', created);
      counts.events++;
      if (submitted) {
        insEvent.run(nextId.event(), claimId, tech, agencyId, 'transition', 'draft', 'submitted', submitted);
        counts.events++;
      }
      if (decided) {
        insEvent.run(nextId.event(), claimId, reviewerId, manufacturerId, 'transition', 'in_review', state === 'paid' ? 'approved' : state, decided);
        counts.events++;
      }
    }
    for (const ix of indexes) sqlite.exec(ix.sql);
  })();
  sqlite.pragma('synchronous = FULL');
  sqlite.pragma('journal_mode = WAL');
  sqlite.close();

  return {
    dir,
    databasePath,
    pepper,
    agencyIds,
    measuredAgencyId: agencyIds[Math.floor(agencyCount / 2)],
    measuredAdminEmail: admins[Math.floor(agencyCount / 2)],
    counts,
    seedMs: performance.now() - started,
    close() {
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
