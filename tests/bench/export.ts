/**
 * Bench: the paid-claims CSV export of 100,000 paid claims through the real app (session,
 * CASL scope, its own read connection, formula guard, cents to decimals, csv-stringify with
 * backpressure), beside a bare baseline: plain node:http, better-sqlite3 `.iterate()` and
 * csv-stringify on the same rows with the same CSV options. Both answer the same bytes (checked
 * by SHA-256) before their speed is compared. The app server's resident memory (VmRSS from
 * /proc, sampled every 10 ms) during the export is compared with its idle figure.
 *
 * This one file is also the baseline server: forked with FP_BENCH_EXPORT_BASELINE=1 it
 * serves GET /paid-claims.csv and sends `{ port }` to its parent.
 */
import { fork, type ChildProcess } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { fileURLToPath } from 'node:url';
import Database from 'better-sqlite3';
import { stringify } from 'csv-stringify';
import type { Figure, Measurement } from './lib/measurement';
import { benchSignIn } from './lib/sign-in';

const here = dirname(fileURLToPath(import.meta.url));
const PAID_CLAIMS = Number(process.env.BENCH_EXPORT_CLAIMS) > 0 ? Number(process.env.BENCH_EXPORT_CLAIMS) : 100_000;
const AGENCIES = 50;
const CLAIMS_PER_RUN = 100;
const GOAL_RATIO = 0.5;
const GOAL_MEMORY_MB = 50;
const ROUNDS = 3;

/** The same statement the app runs for the accountant (no agency, no dates), written out by hand. */
const BASELINE_SQL = `
  select c.number, r.payee_name, u.name, un.serial, m.model_number, c.repair_date, r.number, r.payment_date, r.reference,
         coalesce(c.approved_labor_cents, 0), coalesce(c.approved_travel_cents, 0), coalesce(c.approved_parts_cents, 0), coalesce(c.approved_total_cents, 0), c.currency
    from claims c
    join payment_run_items i on i.claim_id = c.id and i.active = 1
    join payment_runs r on r.id = i.run_id
    join users u on u.id = c.technician_id
    left join units un on un.id = c.unit_id
    left join models m on m.id = un.model_id
   where c.state = 'paid' and r.state = 'paid'
   order by r.payment_date, r.number, c.number`;

const HEADER = ['claim_number', 'agency', 'technician', 'unit_serial', 'model', 'repair_date', 'payment_run', 'payment_date', 'payment_reference', 'approved_labor', 'approved_travel', 'approved_parts', 'approved_total', 'currency'];

// ---- the baseline server (only when forked for it) -----------------------------------------

if (process.env.FP_BENCH_EXPORT_BASELINE === '1') {
  const path = process.env.DATABASE_PATH!;
  const money = (c: number) => `${Math.trunc(c / 100)}.${String(c % 100).padStart(2, '0')}`;
  const server = http.createServer((req, res) => {
    if (req.url !== '/paid-claims.csv') {
      res.statusCode = 404;
      res.end();
      return;
    }
    const db = new Database(path, { readonly: true, fileMustExist: true });
    const rows = db.prepare(BASELINE_SQL).raw(true).iterate() as IterableIterator<unknown[]>;
    function* records() {
      for (const r of rows) {
        r[9] = money(r[9] as number);
        r[10] = money(r[10] as number);
        r[11] = money(r[11] as number);
        r[12] = money(r[12] as number);
        yield r;
      }
    }
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    pipeline(Readable.from(records(), { objectMode: true, highWaterMark: 64 }), stringify({ header: true, columns: HEADER, record_delimiter: 'windows', quoted_match: /[\r\n]/ }), res)
      .catch(() => res.destroy())
      .finally(() => db.close());
  });
  server.listen(0, '127.0.0.1', () => process.send?.({ port: (server.address() as AddressInfo).port }));
  process.on('SIGTERM', () => {
    server.close();
    server.closeAllConnections();
    process.exit(0);
  });
}

// ---- the data ------------------------------------------------------------------------------

interface ExportDataset {
  dir: string;
  databasePath: string;
  pepper: string;
  accountantEmail: string;
  accountantPassword: string;
  close(): void;
}

/** A migrated database with the demo scenario, plus 100,000 paid claims in paid runs of 100 over 50 agencies. */
export async function buildExportDataset(): Promise<ExportDataset> {
  const { openDatabase } = await import('../../server/db/client');
  const { seedDemo } = await import('../../server/db/seed/demo');
  const dir = mkdtempSync(join(tmpdir(), 'fieldproof-bench-export-'));
  const databasePath = join(dir, 'export.sqlite');
  const pepper = (await import('node:crypto')).randomBytes(24).toString('base64url');
  const db = openDatabase(databasePath);
  seedDemo(db, { pepper, bcryptCost: 4, today: new Date().toISOString().slice(0, 10) });
  const sqlite = db.$client;
  sqlite.pragma('journal_mode = MEMORY');
  sqlite.pragma('synchronous = OFF');
  const one = (q: string) => sqlite.prepare(q).pluck().get() as string;
  const accountant = one(`select id from users where role = 'accountant' limit 1`);
  const reviewer = one(`select id from users where role = 'reviewer' limit 1`);
  const models = sqlite.prepare('select id from models').pluck().all() as string[];
  const sites = sqlite.prepare('select id from sites').pluck().all() as string[];
  const now = new Date().toISOString();
  const insOrg = sqlite.prepare(`insert into organisations (id, kind, name, name_key, city, region, country, currency, active, created_at, updated_at) values (?, 'agency', ?, fp_name_key(?), 'Bench City', 'KS', 'US', 'USD', 1, ?, ?)`);
  const insUser = sqlite.prepare(`insert into users (id, organisation_id, role, email, name, active, session_version, created_at, updated_at) values (?, ?, 'technician', ?, ?, 1, 1, ?, ?)`);
  const insUnit = sqlite.prepare(`insert into units (id, serial, model_id, revision, ship_date, install_date, site_id, created_at) values (?, ?, ?, 'B', '2024-01-10', '2024-02-01', ?, ?)`);
  const insClaim = sqlite.prepare(
    `insert into claims (id, number, agency_id, technician_id, unit_id, site_id, state, version, failure_date, repair_date, currency, claimed_total_cents,
       approved_total_cents, approved_labor_cents, approved_travel_cents, approved_parts_cents, decided_at, decided_by, paid_at, created_at, updated_at)
     values (?, ?, ?, ?, ?, ?, 'paid', 6, ?, ?, 'USD', ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
  );
  const insRun = sqlite.prepare(
    `insert into payment_runs (id, number, agency_id, payee_name, state, total_cents, currency, created_by, payment_date, reference, paid_by, paid_at, created_at)
     values (?, ?, ?, (select name from organisations where id = ?), 'paid', ?, 'USD', ?, ?, ?, ?, ?, ?)`,
  );
  const updRun = sqlite.prepare('update payment_runs set total_cents = ? where id = ?');
  const insItem = sqlite.prepare('insert into payment_run_items (id, run_id, claim_id, amount_cents, active) values (?, ?, ?, ?, 1)');
  const base = Date.parse('2025-01-01T00:00:00Z');
  const day = (n: number) => new Date(base + n * 86_400_000).toISOString().slice(0, 10);
  sqlite.transaction(() => {
    const agencies: { id: string; techs: string[] }[] = [];
    for (let a = 0; a < AGENCIES; a++) {
      const id = `bx-agency-${a}`;
      const n = String(a + 1).padStart(2, '0');
      insOrg.run(id, `Bench Export Agency ${n}`, `Bench Export Agency ${n}`, now, now);
      const techs = [0, 1, 2].map((k) => {
        const tid = `bx-tech-${a}-${k}`;
        insUser.run(tid, id, `tech${k}@bench-export-${n}.test`, `Bench Technician ${n}-${k + 1}`, now, now);
        return tid;
      });
      agencies.push({ id, techs });
    }
    const units = Math.ceil(PAID_CLAIMS / 5);
    for (let u = 0; u < units; u++) insUnit.run(`bx-unit-${u}`, `BX${String(u).padStart(8, '0')}`, models[u % models.length], sites[u % sites.length], now);
    let runNo = 0;
    for (let i = 0; i < PAID_CLAIMS; i += CLAIMS_PER_RUN) {
      const agency = agencies[runNo % AGENCIES];
      const runId = `bx-run-${runNo}`;
      const paidDay = Math.floor((runNo * 500) / (PAID_CLAIMS / CLAIMS_PER_RUN));
      // Some references carry a comma, so quoting is part of the work.
      const reference = runNo % 10 === 0 ? `ACH ${String(runNo).padStart(7, '0')}, batch ${runNo % 7}` : `ACH ${String(runNo).padStart(7, '0')}`;
      insRun.run(runId, `PR-B-${String(runNo).padStart(5, '0')}`, agency.id, agency.id, 0, accountant, day(paidDay), reference, accountant, `${day(paidDay)}T16:00:00.000Z`, now);
      let total = 0;
      for (let k = 0; k < CLAIMS_PER_RUN && i + k < PAID_CLAIMS; k++) {
        const c = i + k;
        const labor = 8_000 + ((c * 37) % 9_000);
        const travel = (c * 13) % 4_000;
        const partsCents = (c * 71) % 60_000;
        const sum = labor + travel + partsCents;
        const id = `bx-claim-${c}`;
        insClaim.run(id, `FP-B-${String(c).padStart(7, '0')}`, agency.id, agency.techs[c % 3], `bx-unit-${c % units}`, sites[c % sites.length], day(paidDay - 30), day(paidDay - 29), sum, sum, labor, travel, partsCents, `${day(paidDay - 10)}T12:00:00.000Z`, reviewer, `${day(paidDay)}T16:00:00.000Z`, now, now);
        insItem.run(`bx-item-${c}`, runId, id, sum);
        total += sum;
      }
      updRun.run(total, runId);
      runNo++;
    }
  })();
  sqlite.pragma('synchronous = FULL');
  sqlite.pragma('journal_mode = WAL');
  sqlite.exec('analyze');
  sqlite.close();
  return {
    dir,
    databasePath,
    pepper,
    accountantEmail: 'accounts@larkfield.test',
    accountantPassword: 'fieldproof-demo',
    close: () => rmSync(dir, { recursive: true, force: true }),
  };
}

// ---- servers and measuring -----------------------------------------------------------------

interface Child {
  url: string;
  pid: number;
  stop(): Promise<void>;
}

function start(name: string, file: string, env: Record<string, string>): Promise<Child> {
  const child: ChildProcess = fork(file, [], { execArgv: ['--import', 'tsx'], env: { ...process.env, NODE_ENV: 'production', ...env }, stdio: ['ignore', 'inherit', 'inherit', 'ipc'] });
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      reject(new Error(`${name} did not start within 60 s`));
    }, 60_000);
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`${name} exited before listening (status ${code})`));
    });
    child.once('message', (m: unknown) => {
      clearTimeout(timer);
      const port = (m as { port?: number }).port;
      if (!port || !child.pid) return reject(new Error(`${name} sent no port`));
      resolve({
        url: `http://127.0.0.1:${port}`,
        pid: child.pid,
        stop: () =>
          new Promise<void>((done) => {
            if (child.exitCode !== null) return done();
            child.removeAllListeners('exit');
            child.once('exit', () => done());
            child.kill('SIGTERM');
            setTimeout(() => child.kill('SIGKILL'), 5_000).unref();
          }),
      });
    });
  });
}

/** Resident set size of a process in bytes (Linux /proc). */
function rssOf(pid: number): number {
  const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
  return m ? Number(m[1]) * 1024 : 0;
}

interface Download {
  ms: number;
  bytes: number;
  rows: number;
  sha256: string;
  peakRss: number;
}

/** Downloads the whole CSV, counting CRLF-ended records, hashing the bytes and sampling the server's RSS. */
async function downloadAll(url: string, pid: number, headers: Record<string, string> = {}): Promise<Download> {
  let peakRss = rssOf(pid);
  const timer = setInterval(() => {
    peakRss = Math.max(peakRss, rssOf(pid));
  }, 10);
  const started = performance.now();
  try {
    const res = await fetch(url, { headers });
    if (res.status !== 200 || !res.body) throw new Error(`GET ${url} answered ${res.status}: ${(await res.text()).slice(0, 300)}`);
    const hash = createHash('sha256');
    let bytes = 0;
    let lines = 0;
    for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) {
      hash.update(chunk);
      bytes += chunk.byteLength;
      const b = Buffer.from(chunk.buffer, chunk.byteOffset, chunk.byteLength);
      for (let i = b.indexOf(0x0a); i !== -1; i = b.indexOf(0x0a, i + 1)) lines++;
    }
    const ms = performance.now() - started;
    peakRss = Math.max(peakRss, rssOf(pid));
    return { ms, bytes, rows: lines - 1, sha256: hash.digest('hex'), peakRss };
  } finally {
    clearInterval(timer);
  }
}


const mb = (b: number) => b / 1024 / 1024;
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

export const paidClaimsExport: Measurement = {
  name: `paid-claims CSV export (${PAID_CLAIMS.toLocaleString('en-US')} paid claims, accountant)`,
  async run() {
    console.log(`  building the export database: ${PAID_CLAIMS.toLocaleString('en-US')} paid claims in runs of ${CLAIMS_PER_RUN} over ${AGENCIES} agencies...`);
    const t0 = performance.now();
    const data = await buildExportDataset();
    console.log(`  built in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
    const env = { DATABASE_PATH: data.databasePath, STORAGE_DIR: `${data.dir}/files`, SEED_DEMO: 'false', BCRYPT_COST: '4', COOKIE_SECURE: 'false', PASSWORD_PEPPER: data.pepper };
    let app: Child | null = null;
    let baseline: Child | null = null;
    try {
      app = await start('app', join(here, 'servers/app-server.ts'), env);
      baseline = await start('export baseline', join(here, 'export.ts'), { ...env, FP_BENCH_EXPORT_BASELINE: '1' });
      const cookie = await benchSignIn(app.url, data.accountantEmail, data.accountantPassword, data.databasePath);
      const appUrl = `${app.url}/api/exports/paid-claims.csv`;
      const baseUrl = `${baseline.url}/paid-claims.csv`;
      const headers = { cookie };

      // Idle: signed in and through the export's code once (an empty export), before any large one.
      const empty = await fetch(`${appUrl}?to=2000-01-01`, { headers });
      if (empty.status !== 200) throw new Error(`empty export answered ${empty.status}`);
      await empty.arrayBuffer();
      await new Promise((r) => setTimeout(r, 500));
      const idle = rssOf(app.pid);

      // Warm both (JIT, page cache), and check they answer the same bytes.
      const wa = await downloadAll(appUrl, app.pid, headers);
      const wb = await downloadAll(baseUrl, baseline.pid);
      if (wa.rows < PAID_CLAIMS || wa.rows !== wb.rows || wa.sha256 !== wb.sha256) {
        throw new Error(`the app and the baseline disagree: app ${wa.rows} rows ${wa.bytes} bytes, baseline ${wb.rows} rows ${wb.bytes} bytes`);
      }
      console.log(`  same CSV from both: ${wa.rows.toLocaleString('en-US')} rows, ${mb(wa.bytes).toFixed(1)} MB, sha256 ${wa.sha256.slice(0, 12)}…`);

      const appRuns: Download[] = [wa];
      const baseRuns: Download[] = [];
      for (let i = 0; i < ROUNDS; i++) {
        baseRuns.push(await downloadAll(baseUrl, baseline.pid));
        appRuns.push(await downloadAll(appUrl, app.pid, headers));
      }
      const baseRate = median(baseRuns.map((d) => d.rows / (d.ms / 1000)));
      const appRate = median(appRuns.slice(1).map((d) => d.rows / (d.ms / 1000)));
      const peak = Math.max(...appRuns.map((d) => d.peakRss));
      const growth = mb(peak - idle);
      const ratio = appRate / baseRate;
      console.log(`  baseline: ${baseRuns.map((d) => `${d.ms.toFixed(0)} ms`).join(', ')}; app: ${appRuns.slice(1).map((d) => `${d.ms.toFixed(0)} ms`).join(', ')} (median of ${ROUNDS} each, interleaved)`);
      console.log(`  app RSS idle ${mb(idle).toFixed(1)} MB, peak during ${appRuns.length} exports ${mb(peak).toFixed(1)} MB`);
      const figures: Figure[] = [
        { label: 'baseline export', value: `${baseRate.toFixed(0)} rows/s` },
        { label: 'app export', value: `${appRate.toFixed(0)} rows/s` },
        { label: 'export ratio app/baseline', value: ratio.toFixed(2), goal: `>= ${GOAL_RATIO}`, met: ratio >= GOAL_RATIO },
        { label: 'app RSS idle', value: `${mb(idle).toFixed(1)} MB` },
        { label: 'app RSS peak in export', value: `${mb(peak).toFixed(1)} MB` },
        { label: 'app RSS growth in export', value: `${growth.toFixed(1)} MB`, goal: `< ${GOAL_MEMORY_MB} MB`, met: growth < GOAL_MEMORY_MB },
        { label: 'export size', value: `${mb(wa.bytes).toFixed(1)} MB` },
      ];
      return figures;
    } finally {
      await app?.stop();
      await baseline?.stop();
      data.close();
    }
  },
};
