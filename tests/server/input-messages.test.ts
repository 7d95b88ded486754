/**
 * Numbers are parsed strictly and every refusal reads as written for people, through the API:
 * 400 with field messages, never zod's defaults ("Too big: expected number to be <=24").
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { completeDraftBody, makeClaimsApp, type Agent } from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let techA: Agent;
let mfr: Agent;
let accountant: Agent;

beforeAll(async () => {
  t = await makeClaimsApp();
  techA = await t.signIn('techA');
  mfr = await t.signIn('mfrAdmin');
  accountant = await t.signIn('accountant');
});
afterAll(async () => {
  await t.close();
});

const ZOD_DEFAULT = /Too big|Too small|expected|Invalid input|Invalid option|Unrecognized key|Invalid ISO/;

async function refusedDraft(extra: Record<string, unknown>) {
  const res = await techA.post('/api/claims').send(completeDraftBody(t, extra));
  expect(res.status, JSON.stringify(res.body)).toBe(400);
  const fields = res.body.error.fields as Record<string, string>;
  for (const m of Object.values(fields)) expect(m).not.toMatch(ZOD_DEFAULT);
  return fields;
}

describe('strict numbers on the server', () => {
  it('hours "1,5" are refused, not read as 15', async () => {
    const { code } = { code: (completeDraftBody(t).laborLines as { repairCodeId: string }[])[0] };
    const f = await refusedDraft({ laborLines: [{ ...code, hoursWorked: '1,5', overtime: false, note: '' }] });
    expect(f['laborLines.0.hoursWorked']).toMatch(/point for decimals/);
  });

  it('readings "35O", "1e6" and "12..5" are refused, each with its reason', async () => {
    for (const [value, why] of [
      ['35O', /not a number/],
      ['1e6', /exponent/],
      ['12..5', /more than one decimal separator/],
    ] as const) {
      const f = await refusedDraft({ readings: [{ key: 'cooking_height', phase: 'before', value, unit: 'in' }] });
      expect(f['readings.0.value'], value).toMatch(why);
    }
  });

  it('a reading outside the plausible range of its unit is refused with the range shown', async () => {
    const f = await refusedDraft({ readings: [{ key: 'cooking_height', phase: 'before', value: 9_999_999, unit: 'F' }] });
    expect(f['readings.0.value']).toBe('A reading in °F must be between -100 and 1,500 °F.');
  });
});

describe('messages written for people', () => {
  it('bounds, unknown fields and dates name what is expected', async () => {
    const f = await refusedDraft({ readings: [{ key: '', phase: 'during', value: 36, unit: 'in' }], failureDate: '06/01/2026', colour: 'red' });
    expect(f['readings.0.key']).toBe('This cannot be empty.');
    expect(f['readings.0.phase']).toBe('Choose one of: before, after.');
    expect(f.failureDate).toBe('Use a date as YYYY-MM-DD, like 2026-03-31.');
    expect(f._).toBe('Not a field of this form: colour.');
  });

  it('a negative price says it cannot be negative', async () => {
    const res = await mfr.post('/api/admin/parts').send({ partNumber: 'TST-NEG-1', description: 'Test gasket', listPriceCents: -500, returnRequired: false });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.listPriceCents).toMatch(/cannot be negative/i);
  });

  it('a reversed date range names both dates', async () => {
    const exp = await accountant.get('/api/exports/paid-claims.csv?from=2026-06-15&to=2026-06-01');
    expect(exp.status).toBe(400);
    expect(exp.body.error.fields.to).toBe('The end date (2026-06-01) is before the start date (2026-06-15).');
    const agencies = await mfr.get('/api/admin/agencies');
    const agencyId = (agencies.body.items ?? agencies.body)[0].id as string;
    const terms = await mfr.post(`/api/admin/agencies/${agencyId}/terms`).send({
      effectiveFrom: '2027-03-31',
      effectiveTo: '2027-03-01',
      laborRateCents: 9_000,
      travelRateCents: 6_000,
      mileageRateCents: null,
      maxRoundTripMiles: 100,
      maxTravelHours: 2,
      partsDiscountBps: 1_000,
      partsHandlingBps: 500,
      overtimeMultiplier: 1.5,
      filingWindowDays: 30,
    });
    expect(terms.status).toBe(400);
    expect(terms.body.error.fields.effectiveTo).toBe('The end date (2027-03-01) is before the start date (2027-03-31).');
  });
});
