import { valueClaim, type ValuationInput } from '../../../shared/calculations/valuation';
import type { Measurement } from '../lib/measurement';
import { BENCH_PASSWORD } from '../lib/dataset';
import { startServer } from '../lib/servers';
import { load, warmUp } from '../lib/load';
import { benchSignIn } from '../lib/sign-in';
import type { MileageRate } from '../../../shared/calculations/mileage';
import { createRandom } from '../../../server/db/seed/random';

const CLAIMS = 10_000;
const GOAL_OVERHEAD = 0.1;

/** The dated rate the generated claims' repair dates fall in, as the catalogue holds it. */
const MILEAGE_RATES: readonly MileageRate[] = [
  { effectiveFrom: '2026-01-01', effectiveTo: '2026-12-31', currency: 'USD', unit: 'mi', rateTenthCents: 725, source: 'bench: a dated USD rate per mile' },
];

/** A generated claim of 5 valued lines: 2 labor, travel distance and time, 1 part. */
function generatedClaim(i: number, rng: ReturnType<typeof createRandom>): ValuationInput {
  const day = 1 + (i % 27);
  return {
    claimId: `bench-${i}`,
    currency: 'USD',
    failureDate: `2026-03-${String(day).padStart(2, '0')}`,
    repairDate: `2026-03-${String(day + 1).padStart(2, '0')}`,
    filedDate: '2026-04-10',
    unit: { serial: `SN-${i}`, familyId: 'family-a', shipDate: '2025-01-10', installDate: i % 5 === 0 ? null : '2025-02-15' },
    warrantyTerms: { partsMonths: 24, laborMonths: 12, capMonthsFromShip: 30, installGraceDays: 90 },
    contract: {
      laborRateCents: 8500 + rng.int(0, 3000),
      overtimeMultiplier: 1.5,
      travelRateCents: 4500,
      mileageRateCents: i % 2 === 0 ? null : 65.5,
      maxRoundTripMiles: 120,
      maxTravelHours: 2.5,
      partsDiscountBps: 1200,
      handlingBps: 800,
      filingWindowDays: 30,
    },
    technician: { id: 'tech', certifications: [{ familyId: 'family-a', validFrom: '2025-01-01', validTo: '2027-12-31' }] },
    base: { lat: 36.12 + rng.int(0, 100) / 1000, lon: -86.67 },
    site: { lat: 36.3, lon: -86.9 + rng.int(0, 100) / 1000 },
    labor: [
      { id: 'L1', repairCode: { code: 'R-1', allowedHours: 1.5 }, hoursWorked: rng.int(5, 30) / 10, overtime: i % 7 === 0, preAuthorization: i % 14 === 0 ? 'PA-1' : null },
      { id: 'L2', repairCode: { code: 'R-2', allowedHours: 0.75 }, hoursWorked: rng.int(3, 12) / 10, overtime: false },
    ],
    travel: { enteredRoundTripKm: rng.int(40, 250), travelHours: rng.int(5, 40) / 10 },
    mileageRates: MILEAGE_RATES,
    parts: [{ id: 'P1', part: { partNumber: 'P-1', listPriceCents: rng.int(500, 40_000), returnRequired: i % 3 === 0 }, quantity: rng.int(1, 4) }],
  } as ValuationInput;
}


/**
 * The shared valuation on 10,000 generated claims (lines per second), and its share of the
 * claim detail endpoint's time: the in-process cost of valuing one stored claim against the
 * detail endpoint's median latency on the same claim.
 */
export const valuation: Measurement = {
  name: `valuation (${CLAIMS.toLocaleString('en-US')} generated claims of 5 lines; detail endpoint share)`,
  async run(ctx) {
    const rng = createRandom(20261201);
    const inputs = Array.from({ length: CLAIMS }, (_, i) => generatedClaim(i, rng));
    for (const input of inputs.slice(0, 200)) valueClaim(input); // warm the JIT
    let lines = 0;
    const t0 = performance.now();
    for (const input of inputs) lines += valueClaim(input).lines.length;
    const seconds = (performance.now() - t0) / 1000;
    const linesPerSecond = lines / seconds;
    console.log(`  ${lines.toLocaleString('en-US')} lines in ${seconds.toFixed(2)} s`);

    const data = ctx.dataset();
    const env = { DATABASE_PATH: data.databasePath, STORAGE_DIR: `${data.dir}/files`, SEED_DEMO: 'false', BCRYPT_COST: '4', COOKIE_SECURE: 'false', PASSWORD_PEPPER: data.pepper };
    const app = await startServer('app', 'app-server.ts', env);
    try {
      const cookie = await benchSignIn(app.url, data.measuredAdminEmail, BENCH_PASSWORD, data.databasePath);
      const headers = { cookie };
      const list = (await (await fetch(`${app.url}/api/claims?state=paid&limit=1`, { headers })).json()) as { items: { id: string }[] };
      const id = list.items[0]?.id;
      if (!id) throw new Error('no claim to measure');
      const detailUrl = `${app.url}/api/claims/${id}`;
      const inputRes = await fetch(`${app.url}/api/claims/${id}/valuation-input`, { headers });
      if (inputRes.status !== 200) throw new Error(`valuation-input answered ${inputRes.status}`);
      const body = (await inputRes.json()) as { input?: ValuationInput } & ValuationInput;
      const stored = (body.input ?? body) as ValuationInput;
      for (let i = 0; i < 500; i++) valueClaim(stored);
      const n = 5000;
      const v0 = performance.now();
      for (let i = 0; i < n; i++) valueClaim(stored);
      const valuationMs = (performance.now() - v0) / n;

      await warmUp(detailUrl, headers);
      const detail = await load(detailUrl, { connections: 1, durationSeconds: Math.max(2, ctx.durationSeconds / 2), headers });
      if (detail.non2xx > 0 || detail.errors > 0) throw new Error('detail requests failed during the measurement');
      const share = valuationMs / Math.max(detail.p50Ms, 0.001);
      console.log(`  detail p50 ${detail.p50Ms} ms at 1 connection; valuing that claim in process ${valuationMs.toFixed(3)} ms`);
      return [
        { label: 'valuation throughput', value: `${Math.round(linesPerSecond).toLocaleString('en-US')} lines/s` },
        { label: 'claim detail p50 (1 connection)', value: `${detail.p50Ms} ms` },
        { label: 'valuation of that claim', value: `${valuationMs.toFixed(3)} ms` },
        { label: 'valuation share of the detail time', value: `${(share * 100).toFixed(1)} %`, goal: `< ${GOAL_OVERHEAD * 100} %`, met: share < GOAL_OVERHEAD },
      ];
    } finally {
      await app.stop();
    }
  },
};
