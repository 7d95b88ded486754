import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { agencyTerms, units } from '../../server/db/schema/index';
import { newId } from '../../server/lib/ids';
import { agencyIdByName, claimIn, completeDraftBody, attachEvidence, daysAgo, grillFixture, HARBORVIEW, makeClaimsApp, move, TODAY, type Agent } from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let tech: Agent;
let reviewer: Agent;
let modelId: string;
let mfr: Agent;
const oldTermsId = newId();

/** A unit of the demo grill model, shipped on the given day. */
function unitShipped(shipDate: string): string {
  const serial = `TEST-${newId().slice(0, 8).toUpperCase()}`;
  t.db.insert(units).values({ id: newId(), serial, modelId, revision: 'A', shipDate, installDate: null, siteId: null, createdAt: new Date().toISOString() }).run();
  return serial;
}

async function draft(extra: Record<string, unknown>) {
  const res = await tech.post('/api/claims').send(completeDraftBody(t, extra));
  expect(res.status).toBe(201);
  attachEvidence(t, res.body.id, 'unit_overall', 'tech@harborview.test');
  return res.body as { id: string; version: number };
}

beforeAll(async () => {
  t = await makeClaimsApp();
  tech = await t.signIn('techA');
  reviewer = await t.signIn('reviewer');
  mfr = await t.signIn('mfrAdmin');
  const { unit } = (await import('./claims-fixtures')).grillFixture(t);
  modelId = t.db.select({ modelId: units.modelId }).from(units).where(eq(units.id, unit.id)).get()!.modelId;
  // contract terms of the agency for 2021-2022 without a mileage rate of their own (the dated rate applies)
  t.db
    .insert(agencyTerms)
    .values({
      id: oldTermsId, agencyId: agencyIdByName(t, HARBORVIEW), effectiveFrom: '2021-01-01', effectiveTo: '2022-12-31',
      laborRateCents: 9000, travelRateCents: 6000, mileageRateCents: null, maxRoundTripMiles: 500, maxTravelHours: 5,
      partsDiscountBps: 0, partsHandlingBps: 0, overtimeMultiplier: 1.5, filingWindowDays: 3000, createdAt: new Date().toISOString(),
    })
    .run();
});
afterAll(async () => {
  await t.close();
});

const distanceLine = (body: { lines: { kind: string; rateCents: number; claimedCents: number; inputs: Record<string, unknown> }[] }) => body.lines.find((l) => l.kind === 'travel_distance')!;

describe('mileage rates are dated data', () => {
  it('a 2022 repair takes 58.5 or 62.5 cents by its date, not 65.5', async () => {
    const serial = unitShipped('2021-10-01');
    const spring = await draft({ serial, failureDate: '2022-03-14', repairDate: '2022-03-15', travel: { roundTripMiles: 100, travelHours: 0 } });
    const v1 = await tech.get(`/api/claims/${spring.id}/valuation`);
    expect(v1.status).toBe(200);
    expect(distanceLine(v1.body).rateCents).toBe(58.5); // IRS Notice 2022-03: 58.5 cents per mile, 2022-01-01 to 2022-06-30
    expect(distanceLine(v1.body).claimedCents).toBe(5850); // 100 mi x 58.5 cents
    expect(distanceLine(v1.body).inputs.mileageRateNotice).toBe('IRS Notice 2022-03');
    const autumn = await draft({ serial, failureDate: '2022-07-30', repairDate: '2022-08-01', travel: { roundTripMiles: 100, travelHours: 0 } });
    const v2 = await tech.get(`/api/claims/${autumn.id}/valuation`);
    expect(distanceLine(v2.body).rateCents).toBe(62.5); // IRS Announcement 2022-13 (IR-2022-124): 62.5 cents from 2022-07-01
    expect(distanceLine(v2.body).claimedCents).toBe(6250);
  });

  it('a repair date with no rate in force is refused at submit with a message, not guessed', async () => {
    const serial = unitShipped('2021-03-01');
    const c = await draft({ serial, failureDate: '2021-06-01', repairDate: '2021-06-02', travel: { roundTripMiles: 40, travelHours: 1 } });
    const v = await tech.get(`/api/claims/${c.id}/valuation`);
    expect(JSON.stringify(v.body)).toMatch(/No mileage rate is in force on the repair date 2021-06-02 for USD/);
    const r = await move(tech, c.id, 'submit', c.version);
    expect(r.status).toBe(400);
    expect(r.body.error.fields.repairDate).toMatch(/No mileage rate is in force on the repair date 2021-06-02/);
  });
});

describe('submit refuses claims the terms cannot value', () => {
  it('a claim dated before the unit shipped', async () => {
    const serial = unitShipped(daysAgo(3));
    const c = await draft({ serial, failureDate: daysAgo(5), repairDate: daysAgo(2) });
    const r = await move(tech, c.id, 'submit', c.version);
    expect(r.status).toBe(400);
    expect(r.body.error.fields.failureDate).toBe(`The failure date ${daysAgo(5)} is before the unit shipped on ${daysAgo(3)}; check the date or the serial number.`);
  });

  it('a repair date with no contract terms in force', async () => {
    const serial = unitShipped('2023-01-10');
    const c = await draft({ serial, failureDate: '2023-05-01', repairDate: '2023-05-02' }); // the agency has no terms for 2023 before the seeded period
    const r = await move(tech, c.id, 'submit', c.version);
    expect(r.status).toBe(400);
    expect(r.body.error.fields.repairDate).toMatch(/no contract terms in force on the repair date 2023-05-02/);
    expect((await reviewer.get(`/api/claims/${c.id}`)).status).toBe(404); // still a draft
  });
});

describe('warranty terms are fixed per unit by the terms in force when it shipped', () => {
  it('editing the model labor term from 24 to 1 month does not change the value of a claim already in review', async () => {
    // the claim's unit: a grill shipped before today; give the model a 24-month labor term first, in force since the start
    const before = await mfr.patch(`/api/admin/models/${modelId}`).send({ laborMonths: 24, capMonthsFromShip: 120, partsMonths: 24, termsEffectiveFrom: '2000-01-01', reason: 'Terms as contracted' });
    expect(before.status).toBe(200);
    const c = await claimIn(t, { tech, reviewer }, 'in_review');
    const v1 = await reviewer.get(`/api/claims/${c.id}/valuation`);
    expect(v1.status).toBe(200);
    expect(v1.body.totals.claimed.laborCents).toBeGreaterThan(0);

    const change = await mfr.patch(`/api/admin/models/${modelId}`).send({ laborMonths: 1 }); // effective today
    expect(change.status).toBe(200);
    expect(change.body.laborMonths).toBe(1);
    const v2 = await reviewer.get(`/api/claims/${c.id}/valuation`);
    expect(v2.body.totals).toEqual(v1.body.totals);

    // the claim page and the lookup show the unit's own terms, not the model's new ones
    const detail = await reviewer.get(`/api/claims/${c.id}`);
    expect(detail.body.unit.terms).toMatchObject({ basis: 'ship', laborMonths: 24, partsMonths: 24, effectiveFrom: '2000-01-01' });
    const serial = grillFixture(t).unit.serial;
    const lookup = await tech.get(`/api/units/${encodeURIComponent(serial)}`);
    expect(lookup.body.terms.laborMonths).toBe(24);

    // a unit shipped today takes the new term
    const fresh = unitShipped(TODAY);
    expect((await tech.get(`/api/units/${fresh}`)).body.terms).toMatchObject({ laborMonths: 1, effectiveFrom: TODAY, basisDate: TODAY });
  });

  it('a registered unit takes the terms in force on its registration date', async () => {
    await mfr.patch(`/api/admin/models/${modelId}`).send({ laborMonths: 6, termsEffectiveFrom: '2024-01-01', reason: 'New terms from 2024' });
    const serial = unitShipped('2023-06-01');
    expect((await tech.get(`/api/units/${serial}`)).body.terms).toMatchObject({ basis: 'ship', laborMonths: 24 });
    t.db.update(units).set({ registeredOn: '2024-02-01' }).where(eq(units.serial, serial)).run();
    expect((await tech.get(`/api/units/${serial}`)).body.terms).toMatchObject({ basis: 'registration', basisDate: '2024-02-01', laborMonths: 6 });
  });

  it('a change in the past needs a reason and names the filed claims it touches', async () => {
    const serial = unitShipped(daysAgo(40));
    const c = await draft({ serial });
    const filed = await move(tech, c.id, 'submit', c.version);
    expect(filed.status).toBe(200);
    const noReason = await mfr.patch(`/api/admin/models/${modelId}`).send({ partsMonths: 12, termsEffectiveFrom: daysAgo(45) });
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.fields.reason).toMatch(/takes effect in the past/);
    const ok = await mfr.patch(`/api/admin/models/${modelId}`).send({ partsMonths: 12, termsEffectiveFrom: daysAgo(45), reason: 'Correction of a typing error' });
    expect(ok.status).toBe(200);
    expect(ok.body.affectedClaims.count).toBeGreaterThanOrEqual(1);
    expect(ok.body.affectedClaims.numbers).toContain(filed.body.number);
  });
});

describe('contract terms that have ended are read-only', () => {
  it('an edit of expired terms is refused; terms in force stay editable', async () => {
    const agencyId = agencyIdByName(t, HARBORVIEW);
    const r = await mfr.patch(`/api/admin/agencies/${agencyId}/terms/${oldTermsId}`).send({ partsDiscountBps: 0, laborRateCents: 1 });
    expect(r.status).toBe(409);
    expect(r.body.error.code).toBe('terms_expired');
    expect(r.body.error.message).toMatch(/ended on 2022-12-31 and are read-only/);
    expect(t.db.select().from(agencyTerms).where(eq(agencyTerms.id, oldTermsId)).get()!.laborRateCents).toBe(9000);
  });
});
