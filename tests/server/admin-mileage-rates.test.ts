import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { agencyTerms, auditLog, mileageRates, units } from '../../server/db/schema/index';
import { newId } from '../../server/lib/ids';
import { agencyIdByName, attachEvidence, completeDraftBody, grillFixture, HARBORVIEW, makeClaimsApp, type Agent } from './claims-fixtures';

// The manufacturer admin keeps the mileage rates: periods of one currency never overlap, a
// repair date inside a new period is valued with it, and days without a rate are reported.

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let tech: Agent;
let mfr: Agent;
let modelId: string;

function unitShipped(shipDate: string): string {
  const serial = `TEST-${newId().slice(0, 8).toUpperCase()}`;
  t.db.insert(units).values({ id: newId(), serial, modelId, revision: 'A', shipDate, installDate: null, siteId: null, createdAt: new Date().toISOString() }).run();
  return serial;
}

beforeAll(async () => {
  t = await makeClaimsApp();
  tech = await t.signIn('techA');
  mfr = await t.signIn('mfrAdmin');
  const { unit } = grillFixture(t);
  modelId = t.db.select({ modelId: units.modelId }).from(units).where(eq(units.id, unit.id)).get()!.modelId;
  // contract terms for 2021 without a mileage rate of their own: the dated table applies
  t.db
    .insert(agencyTerms)
    .values({
      id: newId(), agencyId: agencyIdByName(t, HARBORVIEW), effectiveFrom: '2021-01-01', effectiveTo: '2021-12-31',
      laborRateCents: 9000, travelRateCents: 6000, mileageRateCents: null, maxRoundTripMiles: 500, maxTravelHours: 5,
      partsDiscountBps: 0, partsHandlingBps: 0, overtimeMultiplier: 1.5, filingWindowDays: 3000, createdAt: new Date().toISOString(),
    })
    .run();
});
afterAll(async () => {
  await t.close();
});

type Line = { kind: string; rateCents: number; claimedCents: number; inputs: Record<string, unknown> };

describe('mileage rates kept by the manufacturer admin', () => {
  it('lists the seeded rates by currency and date', async () => {
    const r = await mfr.get('/api/admin/mileage-rates?currency=usd&unit=mi');
    expect(r.status).toBe(200);
    const froms = (r.body.items as { effectiveFrom: string }[]).map((i) => i.effectiveFrom);
    expect(froms).toEqual([...froms].sort());
    expect(froms[0]).toBe('2022-01-01');
    expect((await mfr.get('/api/admin/mileage-rates?unit=yd')).status).toBe(400);
  });

  it('refuses a period that overlaps one in force, naming that period', async () => {
    const r = await mfr.post('/api/admin/mileage-rates').send({ currency: 'USD', unit: 'mi', effectiveFrom: '2022-06-01', effectiveTo: '2022-12-31', rateCents: '60', source: 'Overlap check', reason: 'Overlap check' });
    expect(r.status).toBe(409);
    expect(r.body.error.fields.effectiveFrom).toMatch(/2022-01-01 to 2022-06-30/);
    expect(r.body.error.fields.effectiveFrom).toMatch(/58\.5 cents per mi/);
  });

  it('reads the rate strictly as cents with one decimal place', async () => {
    for (const rateCents of ['72,5', '1e2', '72.55', '12..5', '-3', '0']) {
      const r = await mfr.post('/api/admin/mileage-rates').send({ currency: 'CAD', unit: 'km', effectiveFrom: '2099-01-01', rateCents, source: 'Strict parse check' });
      expect(r.status, rateCents).toBe(400);
      expect(r.body.error.fields.rateCents, rateCents).toBeTruthy();
    }
    const bad = await mfr.post('/api/admin/mileage-rates').send({ currency: 'XYZ', unit: 'ft', effectiveFrom: '2099-02-01', rateCents: '10', source: '' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['currency', 'source', 'unit']);
    const reversed = await mfr.post('/api/admin/mileage-rates').send({ currency: 'CAD', unit: 'km', effectiveFrom: '2099-02-01', effectiveTo: '2099-01-01', rateCents: '10', source: 'Reversed check' });
    expect(reversed.status).toBe(400);
    expect(reversed.body.error.fields.effectiveTo).toMatch(/2099-01-01.*2099-02-01/);
  });

  it('reports a repair date with no rate as a gap, then values it with the rate added for its period', async () => {
    const d = await tech.post('/api/claims').send(completeDraftBody(t, { serial: unitShipped('2021-03-01'), failureDate: '2021-06-01', repairDate: '2021-06-02', travel: { roundTripMiles: 100, travelHours: 0 } }));
    expect(d.status).toBe(201);
    attachEvidence(t, d.body.id, 'unit_overall', 'tech@harborview.test');

    const before = await mfr.get('/api/admin/mileage-rates');
    const gap = (before.body.gaps as { currency: string; from: string; to: string | null; openClaims: number }[]).find((g) => g.currency === 'USD' && g.to === '2021-12-31');
    expect(gap).toBeTruthy();
    expect(gap!.openClaims).toBeGreaterThanOrEqual(1);

    // 56 cents per mile for 2021: IRS Notice 2021-02 (recalled, not checked against the notice here)
    const body = { currency: 'USD', unit: 'mi', effectiveFrom: '2021-01-01', effectiveTo: '2021-12-31', rateCents: '56', source: 'IRS Notice 2021-02' };
    const noReason = await mfr.post('/api/admin/mileage-rates').send(body);
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.fields.reason).toMatch(/in the past \(2021-01-01\)/);
    const added = await mfr.post('/api/admin/mileage-rates').send({ ...body, reason: 'The 2021 rate was missing' });
    expect(added.status).toBe(201);
    expect(added.body.rateTenthCents).toBe(560);
    const audit = t.db.select().from(auditLog).where(eq(auditLog.recordId, added.body.id)).all();
    expect(audit.map((a) => a.action)).toEqual(['catalog.mileage_rate.create']);

    const v = await tech.get(`/api/claims/${d.body.id}/valuation`);
    expect(v.status).toBe(200);
    const distance = (v.body.lines as Line[]).find((l) => l.kind === 'travel_distance')!;
    expect(distance.rateCents).toBe(56);
    expect(distance.claimedCents).toBe(5600); // 100 mi x 56 cents
    const after = await mfr.get('/api/admin/mileage-rates');
    expect((after.body.gaps as { currency: string; to: string | null }[]).some((g) => g.currency === 'USD' && g.to === '2021-12-31')).toBe(false);
  });

  it('reports a gap between two periods and a currency with no rate today; ends a rate', async () => {
    const a = await mfr.post('/api/admin/mileage-rates').send({ currency: 'CAD', unit: 'km', effectiveFrom: '2040-01-01', effectiveTo: '2040-12-31', rateCents: '70.5', source: 'Gap check A' });
    expect(a.status).toBe(201);
    const b = await mfr.post('/api/admin/mileage-rates').send({ currency: 'CAD', unit: 'km', effectiveFrom: '2042-01-01', rateCents: '72', source: 'Gap check B' });
    expect(b.status).toBe(201);
    const list = await mfr.get('/api/admin/mileage-rates?currency=CAD');
    expect(list.body.items).toHaveLength(2);
    expect(list.body.gaps).toEqual([{ currency: 'CAD', from: '2041-01-01', to: '2041-12-31', openClaims: 0 }]);
    expect(list.body.noRateToday).toContain('CAD');

    const ended = await mfr.patch(`/api/admin/mileage-rates/${b.body.id}`).send({ effectiveTo: '2042-12-31' });
    expect(ended.status).toBe(200);
    expect(ended.body.effectiveTo).toBe('2042-12-31');
    expect(t.db.select().from(mileageRates).where(eq(mileageRates.id, b.body.id)).get()!.effectiveTo).toBe('2042-12-31');
    const gaps = (await mfr.get('/api/admin/mileage-rates?currency=CAD')).body.gaps as { from: string; to: string | null }[];
    expect(gaps.map((g) => `${g.from}..${g.to}`)).toEqual(['2041-01-01..2041-12-31', '2043-01-01..null']);

    const reversed = await mfr.patch(`/api/admin/mileage-rates/${b.body.id}`).send({ effectiveTo: '2041-06-01' });
    expect(reversed.status).toBe(400);
    expect(reversed.body.error.fields.effectiveTo).toMatch(/2041-06-01.*2042-01-01/);
    const past = await mfr.patch('/api/admin/mileage-rates/mr-usd-2022a').send({ effectiveTo: '2022-03-31' });
    expect(past.status).toBe(400);
    expect(past.body.error.fields.reason).toBeTruthy();
  });

  it('is the manufacturer admin’s alone (403)', async () => {
    for (const who of ['reviewer', 'accountant', 'adminA', 'techA'] as const) {
      const a = await t.signIn(who);
      expect((await a.get('/api/admin/mileage-rates')).status, who).toBe(403);
      expect((await a.post('/api/admin/mileage-rates').send({})).status, who).toBe(403);
      expect((await a.patch('/api/admin/mileage-rates/mr-usd-2026').send({ effectiveTo: '2026-12-31' })).status, who).toBe(403);
    }
  });

  it('asks for the password or a code again before a change once the sign-in is older than 5 minutes', async () => {
    t.clock.advance(6 * 60_000);
    expect((await mfr.get('/api/admin/mileage-rates')).status).toBe(200);
    const add = await mfr.post('/api/admin/mileage-rates').send({ currency: 'CAD', unit: 'km', effectiveFrom: '2060-01-01', rateCents: '50', source: 'Step-up check' });
    expect(add.status).toBe(401);
    expect(add.body.error.code).toBe('step_up_required');
    const end = await mfr.patch('/api/admin/mileage-rates/mr-usd-2026').send({ effectiveTo: '2026-12-31' });
    expect(end.status).toBe(401);
    expect(end.body.error.code).toBe('step_up_required');
  });
});
