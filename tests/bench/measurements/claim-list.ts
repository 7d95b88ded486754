import type { Measurement } from '../lib/measurement';
import { BENCH_PASSWORD } from '../lib/dataset';
import { startServer, type RunningServer } from '../lib/servers';
import { load, warmUp, type LoadResult } from '../lib/load';
import { benchSignIn } from '../lib/sign-in';

const GOAL_RATIO = 0.5;
const STATE = 'paid';


interface ListPage {
  items: Record<string, unknown>[];
  total: number;
}

async function getJson(url: string, headers: Record<string, string> = {}): Promise<ListPage> {
  const res = await fetch(url, { headers });
  if (res.status !== 200) throw new Error(`GET ${url} answered ${res.status}: ${(await res.text()).slice(0, 300)}`);
  return (await res.json()) as ListPage;
}

/** Two halves of one measurement: mean throughput and latency percentiles, summed counts. */
function combine(x: LoadResult, y: LoadResult): LoadResult {
  return {
    requestsPerSecond: (x.requestsPerSecond + y.requestsPerSecond) / 2,
    p50Ms: (x.p50Ms + y.p50Ms) / 2,
    p99Ms: (x.p99Ms + y.p99Ms) / 2,
    requests: x.requests + y.requests,
    errors: x.errors + y.errors,
    non2xx: x.non2xx + y.non2xx,
  };
}

function fmt(r: LoadResult): string {
  return `${r.requestsPerSecond.toFixed(0)} req/s, p50 ${r.p50Ms} ms, p99 ${r.p99Ms} ms (${r.requests} requests, ${r.errors} errors, ${r.non2xx} non-2xx)`;
}

/**
 * The claim list page (50 rows, state filter, agency scope) through the real app signed in as
 * an agency admin, beside the bare baseline running the same statement, at the same concurrency.
 */
export const claimList: Measurement = {
  name: `claim list page (50 rows, state=${STATE}, agency scope)`,
  async run(ctx) {
    const data = ctx.dataset();
    const env = { DATABASE_PATH: data.databasePath, STORAGE_DIR: `${data.dir}/files`, SEED_DEMO: 'false', BCRYPT_COST: '4', COOKIE_SECURE: 'false', PASSWORD_PEPPER: data.pepper };
    const app = await startServer('app', 'app-server.ts', env);
    const baseline = await startServer('baseline', 'baseline-server.ts', env);
    try {
      const cookie = await benchSignIn(app.url, data.measuredAdminEmail, BENCH_PASSWORD, data.databasePath);
      const appUrl = `${app.url}/api/claims?state=${STATE}&limit=50`;
      const baseUrl = `${baseline.url}/claims?agency=${encodeURIComponent(data.measuredAgencyId)}&state=${STATE}`;
      const appHeaders = { cookie };

      // Both must answer the same page before their speed means anything.
      const [a, b] = await Promise.all([getJson(appUrl, appHeaders), getJson(baseUrl)]);
      if (a.items.length !== 50 || a.total !== b.total || a.items.map((i) => i.id).join() !== b.items.map((i) => i.id).join()) {
        throw new Error(`the app and the baseline disagree: app ${a.items.length} rows of ${a.total}, baseline ${b.items.length} rows of ${b.total}`);
      }
      // Same fields with the same values, so neither side does less work than the other.
      for (const [i, row] of a.items.entries()) {
        for (const [k, v] of Object.entries(row)) {
          if (JSON.stringify(b.items[i][k]) !== JSON.stringify(v)) throw new Error(`field ${k} of row ${i} differs: app ${JSON.stringify(v)}, baseline ${JSON.stringify(b.items[i][k])}`);
        }
        const extra = Object.keys(b.items[i]).filter((k) => !(k in row));
        if (extra.length) throw new Error(`the baseline returns fields the app does not: ${extra.join(', ')}`);
      }
      console.log(`  same page from both: 50 rows of ${a.total} ${STATE} claims of one agency`);

      await warmUp(baseUrl);
      await warmUp(appUrl, appHeaders);
      // Baseline, app, app, baseline (half the time each): a machine that speeds up or slows
      // down during the run moves both sides alike instead of favouring the one measured last.
      const half = { connections: ctx.connections, durationSeconds: Math.max(1, ctx.durationSeconds / 2) };
      const b1 = await load(baseUrl, half);
      const a1 = await load(appUrl, { ...half, headers: appHeaders });
      const a2 = await load(appUrl, { ...half, headers: appHeaders });
      const b2 = await load(baseUrl, half);
      const base = combine(b1, b2);
      const real = combine(a1, a2);
      console.log(`  baseline: ${fmt(base)}`);
      console.log(`  app:      ${fmt(real)}`);
      if (real.non2xx > 0 || real.errors > 0 || base.non2xx > 0 || base.errors > 0) {
        throw new Error('some requests failed during the measurement; the figures are not comparable');
      }
      const ratio = real.requestsPerSecond / base.requestsPerSecond;
      return [
        { label: 'baseline throughput', value: `${base.requestsPerSecond.toFixed(0)} req/s` },
        { label: 'baseline p99', value: `${base.p99Ms} ms` },
        { label: 'app throughput', value: `${real.requestsPerSecond.toFixed(0)} req/s` },
        { label: 'app p99', value: `${real.p99Ms} ms` },
        { label: 'throughput ratio app/baseline', value: ratio.toFixed(2), goal: `>= ${GOAL_RATIO}`, met: ratio >= GOAL_RATIO },
        { label: 'p99 ratio app/baseline', value: (real.p99Ms / Math.max(base.p99Ms, 1)).toFixed(2) },
      ];
    } finally {
      await app.stop();
      await baseline.stop();
    }
  },
};
