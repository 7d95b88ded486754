import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildBenchDataset, type BenchDataset } from './lib/dataset';
import type { BenchContext, Figure, Measurement } from './lib/measurement';
import { claimList } from './measurements/claim-list';
import { clientBundle } from './measurements/client-bundle';
import { paidClaimsExport } from './export';
import { photoIntake } from './photo-intake';
import { valuation } from './measurements/valuation';

/**
 * `npm run bench`: every measurement in order, then one summary. Add a measurement by writing
 * tests/bench/measurements/<name>.ts and listing it here.
 * Options (environment): BENCH_CONNECTIONS (10), BENCH_DURATION seconds (10), BENCH_CLAIMS (100000),
 * BENCH_ONLY (comma-separated substrings of measurement names).
 */
const measurements: Measurement[] = [claimList, valuation, clientBundle, paidClaimsExport, photoIntake];

const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const num = (v: string | undefined, d: number) => (v && Number.isFinite(Number(v)) && Number(v) > 0 ? Number(v) : d);
const claims = num(process.env.BENCH_CLAIMS, 100_000);
const only = process.env.BENCH_ONLY?.split(',').map((s) => s.trim().toLowerCase()).filter(Boolean);

let dataset: BenchDataset | null = null;
const ctx: BenchContext = {
  root,
  connections: num(process.env.BENCH_CONNECTIONS, 10),
  durationSeconds: num(process.env.BENCH_DURATION, 10),
  dataset() {
    if (!dataset) {
      console.log(`  building the bench database: ${claims.toLocaleString('en-US')} claims over 50 agencies...`);
      dataset = buildBenchDataset({ claims, agencies: 50 });
      const c = dataset.counts;
      console.log(
        `  ${c.claims} claims, ${c.laborLines} labor lines, ${c.partLines} part lines, ${c.travel} travel rows, ${c.events} events in ${(dataset.seedMs / 1000).toFixed(1)} s`,
      );
    }
    return dataset;
  },
};

const summary: { name: string; figures: Figure[]; error?: string }[] = [];
let failed = false;
try {
  for (const m of measurements) {
    if (only && !only.some((o) => m.name.toLowerCase().includes(o))) continue;
    console.log(`\n== ${m.name}`);
    try {
      summary.push({ name: m.name, figures: await m.run(ctx) });
    } catch (e) {
      failed = true;
      console.error(`  failed: ${(e as Error).message}`);
      summary.push({ name: m.name, figures: [], error: (e as Error).message });
    }
  }
} finally {
  (dataset as BenchDataset | null)?.close();
}

console.log(`\n== summary (${ctx.connections} connections, ${ctx.durationSeconds} s each, loopback)`);
for (const s of summary) {
  console.log(s.name);
  if (s.error) console.log(`  ERROR: ${s.error}`);
  for (const f of s.figures) {
    const goal = f.goal ? `  goal ${f.goal}: ${f.met ? 'met' : 'NOT met'}` : '';
    console.log(`  ${f.label.padEnd(32)} ${f.value.padStart(12)}${goal}`);
  }
}
process.exit(failed ? 1 : 0);
