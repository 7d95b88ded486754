import { describe, it, expect } from 'vitest';
import Decimal from 'decimal.js';
import { valueClaim, type ValuationInput, type ValuationLine } from './valuation';
import { FLAG_CODES, FLAG_INFO } from './flags';
import { CalculationInputError } from './errors';
import { MEAN_EARTH_RADIUS_KM } from './travel';
import { IRS_RATES } from './irs-rates.fixture';

// Hand-worked whole claims. Each expected figure is worked out in the comment
// beside it from the rules: labor = min(worked, allowance) x rate x overtime
// multiplier (with pre-authorisation only); travel = min(miles, cap) x mileage
// rate and min(hours, cap) x travel rate; parts = qty x list x (1 - discount) x
// (1 + handling); each line rounded half-up once; 1 mi = 1.609344 km exactly
// (NIST SP 811 B.8). The rates and dates are arbitrary test inputs.

function claim(over: Partial<ValuationInput> = {}): ValuationInput {
  return {
    claimId: 'claim-under-test',
    currency: 'USD',
    failureDate: '2024-11-04',
    repairDate: '2024-11-05',
    filedDate: '2024-11-20',
    unit: { serial: 'SN-0001', familyId: 'family-a', shipDate: '2024-01-10', installDate: '2024-03-15' },
    warrantyTerms: { partsMonths: 12, laborMonths: 12, capMonthsFromShip: 18, installGraceDays: 90 },
    contract: {
      laborRateCents: 9000, // $90.00 per hour
      overtimeMultiplier: 1.5,
      travelRateCents: 5000, // $50.00 per hour
      mileageRateCents: 65, // 65 cents per mile
      maxRoundTripMiles: 100,
      maxTravelHours: 2,
      partsDiscountBps: 1500, // 15 %
      handlingBps: 1000, // 10 %
      filingWindowDays: 30,
    },
    technician: { id: 'tech-1', certifications: [{ familyId: 'family-a', validFrom: '2024-01-01', validTo: '2025-12-31' }] },
    base: null,
    site: null,
    labor: [],
    travel: null,
    parts: [],
    ...over,
  };
}

const line = (v: { lines: ValuationLine[] }, id: string) => {
  const l = v.lines.find((x) => x.id === id);
  if (!l) throw new Error(`no line ${id}`);
  return l;
};
const codes = (v: { flags: { code: string }[] }) => v.flags.map((f) => f.code);

describe('hand-worked whole claims', () => {
  it('labor capped by the allowance', () => {
    const v = valueClaim(claim({ labor: [{ id: 'L1', repairCode: { code: 'R-210', allowedHours: 1.5 }, hoursWorked: 2.25, overtime: false }] }));
    const l = line(v, 'L1');
    expect(l.requestedCents).toBe(20250); // 2.25 h x 9,000 = 20,250 cents as entered
    expect(l.claimedCents).toBe(13500); // min(2.25, 1.5) = 1.5 h x 9,000 = 13,500 cents
    expect(l.binding).toEqual(['allowance of 1.5 h for repair code R-210']);
    expect(v.totals.claimed).toEqual({ laborCents: 13500, travelCents: 0, partsCents: 0, totalCents: 13500 });
    expect(codes(v)).toEqual(['labor_over_allowance']);
    expect(v.flags[0].lineIds).toEqual(['L1']);
  });

  it('travel capped in distance and time', () => {
    // base (40.0, -90.0), site (40.7, -90.0): great circle along a meridian = 6371.0088 x 0.7 x pi/180 = 77.836 km;
    // floor 2 x 77.836 = 155.67 km; plausible up to 1.6 x 155.67 = 249.08 km (common practice factor)
    const v = valueClaim(
      claim({
        base: { lat: 40, lon: -90 },
        site: { lat: 40.7, lon: -90 },
        travel: { enteredRoundTripKm: 193.12128, travelHours: 2.75 }, // 193.12128 km = 120 x 1.609344 = 120 mi
        labor: [{ id: 'L1', repairCode: { code: 'R-100', allowedHours: 1 }, hoursWorked: 1, overtime: false }],
      }),
    );
    const d = line(v, 'travel-distance');
    expect(d.inputs.floorKm as number).toBeCloseTo((2 * MEAN_EARTH_RADIUS_KM * 0.7 * Math.PI) / 180, 9);
    expect(d.inputs.enteredRoundTripMiles).toBe(120); // 193.12128 / 1.609344 = 120 (NIST SP 811 B.8)
    expect(d.quantity).toBe(100); // min(120, cap 100) = 100 mi
    expect(d.requestedCents).toBe(7800); // 120 mi x 65 = 7,800 cents
    expect(d.claimedCents).toBe(6500); // 100 mi x 65 = 6,500 cents
    const t = line(v, 'travel-time');
    expect(t.quantity).toBe(2); // min(2.75, cap 2) = 2 h
    expect(t.requestedCents).toBe(13750); // 2.75 h x 5,000 = 13,750 cents
    expect(t.claimedCents).toBe(10000); // 2 h x 5,000 = 10,000 cents
    expect(v.totals.claimed).toEqual({ laborCents: 9000, travelCents: 16500, partsCents: 0, totalCents: 25500 }); // 9,000 + 6,500 + 10,000
    expect(codes(v)).toEqual(['travel_over_cap']);
    expect(v.flags[0].lineIds).toEqual(['travel-distance', 'travel-time']);
  });

  it('overtime with and without pre-authorisation', () => {
    const v = valueClaim(
      claim({
        labor: [
          { id: 'OT-auth', repairCode: { code: 'R-300', allowedHours: 2 }, hoursWorked: 1.25, overtime: true, preAuthorization: 'PA-7781' },
          { id: 'OT-none', repairCode: { code: 'R-301', allowedHours: 2 }, hoursWorked: 1.25, overtime: true, preAuthorization: null },
        ],
      }),
    );
    expect(line(v, 'OT-auth').claimedCents).toBe(16875); // 1.25 h x 9,000 x 1.5 = 16,875 cents
    expect(line(v, 'OT-none').claimedCents).toBe(11250); // 1.25 h x 9,000 x 1 = 11,250 cents (multiplier withheld)
    expect(line(v, 'OT-none').requestedCents).toBe(16875); // asked at 1.25 x 9,000 x 1.5
    expect(v.totals.claimed.laborCents).toBe(28125); // 16,875 + 11,250
    expect(codes(v)).toEqual(['overtime_without_authorization']);
    expect(v.flags[0].lineIds).toEqual(['OT-none']);
  });

  it('overtime half-cent tie rounds up once per line', () => {
    // 1.25 h x 8,530 x 1.5 = 15,993.75 -> 15,994 cents; 0.5 h x 8,530 x 1.5 = 6,397.5 (a tie) -> 6,398 cents
    const v = valueClaim(
      claim({
        contract: { ...claim().contract, laborRateCents: 8530 },
        labor: [
          { id: 'A', repairCode: { code: 'R-1', allowedHours: 4 }, hoursWorked: 1.25, overtime: true, preAuthorization: 'PA-1' },
          { id: 'B', repairCode: { code: 'R-2', allowedHours: 4 }, hoursWorked: 0.5, overtime: true, preAuthorization: 'PA-1' },
        ],
      }),
    );
    expect(line(v, 'A').claimedCents).toBe(15994);
    expect(line(v, 'B').claimedCents).toBe(6398); // decimal.js ROUND_HALF_UP: 6397.5 -> 6398
    expect(v.totals.claimed.laborCents).toBe(22392); // 15,994 + 6,398 (sum of rounded lines, not 22,391.25 rounded)
  });

  it('parts with discount and handling, return-required marked', () => {
    const v = valueClaim(
      claim({
        parts: [
          { id: 'P1', part: { id: 'part-100', partNumber: 'P-100', listPriceCents: 12999, returnRequired: true }, quantity: 2 },
          { id: 'P2', part: { id: 'part-200', partNumber: 'P-200', listPriceCents: 455, returnRequired: false }, quantity: 3 },
        ],
      }),
    );
    // P-100: 12,999 x 0.85 = 11,049.15 each; x 2 = 22,098.30; x 1.10 = 24,308.13 -> 24,308 cents
    expect(line(v, 'P1').claimedCents).toBe(24308);
    // P-200: 455 x 0.85 = 386.75 each; x 3 = 1,160.25; x 1.10 = 1,276.275 -> 1,276 cents
    expect(line(v, 'P2').claimedCents).toBe(1276);
    expect(v.totals.claimed.partsCents).toBe(25584); // 24,308 + 1,276
    expect(line(v, 'P1').returnRequired).toBe(true);
    expect(v.partsToReturn).toEqual([{ lineId: 'P1', partNumber: 'P-100', quantity: 2 }]);
    expect(line(v, 'P1').explanation.join(' ')).toMatch(/Return required/);
  });

  const boundaryClaim = (failureDate: string) =>
    claim({
      failureDate,
      repairDate: '2025-03-17',
      filedDate: '2025-03-20',
      labor: [{ id: 'L1', repairCode: { code: 'R-100', allowedHours: 1.5 }, hoursWorked: 1, overtime: false }],
      travel: { enteredRoundTripKm: 80.4672, travelHours: 1 }, // 80.4672 km = 50 x 1.609344 = 50 mi
      parts: [{ id: 'P1', part: { partNumber: 'P-300', listPriceCents: 10000, returnRequired: false }, quantity: 1 }],
    });

  it('out of coverage by one day: lines shown, valued at 0', () => {
    // install 2024-03-15 + 12 months = 2025-03-15 is the last covered day; failure on 2025-03-16 is one day late
    const v = valueClaim(boundaryClaim('2025-03-16'));
    expect(v.coverage.parts).toMatchObject({ covered: false, until: '2025-03-15' });
    expect(v.lines.map((l) => [l.id, l.covered, l.claimedCents])).toEqual([
      ['L1', false, 0],
      ['travel-distance', false, 0],
      ['travel-time', false, 0],
      ['P1', false, 0],
    ]);
    // requested: labor 1 x 9,000 = 9,000; distance 50 x 65 = 3,250; time 1 x 5,000 = 5,000; part 10,000 x 0.85 x 1.1 = 9,350
    expect(v.totals.requested).toEqual({ laborCents: 9000, travelCents: 8250, partsCents: 9350, totalCents: 26600 });
    expect(v.totals.claimed.totalCents).toBe(0);
    expect(v.flags.filter((f) => f.code === 'out_of_coverage').map((f) => f.scope)).toEqual(['labor', 'parts']);
    expect(line(v, 'L1').explanation.join(' ')).toMatch(/1 day after the last covered day 2025-03-15.*valued at 0/);
  });

  it('covered on the last day', () => {
    // failure on 2025-03-15, the last covered day itself: 9,000 + 3,250 + 5,000 + 9,350 = 26,600 cents
    const v = valueClaim(boundaryClaim('2025-03-15'));
    expect(v.coverage.parts).toMatchObject({ covered: true, until: '2025-03-15' });
    expect(v.totals.claimed).toEqual({ laborCents: 9000, travelCents: 8250, partsCents: 9350, totalCents: 26600 });
    expect(v.totals.approved.totalCents).toBe(26600);
    expect(codes(v)).toEqual([]);
  });

  it('a whole-trip travel amount keeps distance and time apart', () => {
    // distance 50 mi x 65 cents = 3,250; time 1.5 h x 5,000 = 7,500; together 10,750.
    // The reviewer approves 8,000 for the whole trip: distance 8,000 x 3,250 / 10,750 = 2,418.60... -> 2,419 (half-up), time 8,000 - 2,419 = 5,581.
    const v = valueClaim(
      claim({
        labor: [{ id: 'L1', repairCode: { code: 'R-100', allowedHours: 2 }, hoursWorked: 1, overtime: false }],
        travel: { id: 'T1', enteredRoundTripKm: 80.4672, travelHours: 1.5 }, // 80.4672 km = 50 mi (NIST SP 811 B.8)
        adjustments: [{ lineId: 'T1', amountCents: 8000, reason: 'Shorter route' }],
      }),
    );
    const ref = new Decimal(8000).times(3250).dividedBy(10750).toDecimalPlaces(0, Decimal.ROUND_HALF_UP).toNumber(); // decimal.js
    expect(line(v, 'T1-distance').claimedCents).toBe(3250);
    expect(line(v, 'T1-time').claimedCents).toBe(7500);
    expect(line(v, 'T1-distance').approvedCents).toBe(ref);
    expect(line(v, 'T1-distance').approvedCents).toBe(2419);
    expect(line(v, 'T1-time').approvedCents).toBe(5581);
    expect(v.totals.approved.travelCents).toBe(8000);
  });

  it('approved totals take the reviewer adjustments per line', () => {
    const v = valueClaim(
      claim({
        labor: [{ id: 'L1', repairCode: { code: 'R-210', allowedHours: 1.5 }, hoursWorked: 2.25, overtime: false }],
        travel: { enteredRoundTripKm: 80.4672, travelHours: 1.5 }, // 50 mi
        parts: [{ id: 'P1', part: { partNumber: 'P-100', listPriceCents: 12999, returnRequired: true }, quantity: 2 }],
        adjustments: [
          { lineId: 'L1', hours: 2, reason: 'Seized fastener shown in photos' }, // 2 h x 9,000 = 18,000
          { lineId: 'P1', quantity: 1, reason: 'One part was not replaced' }, // 12,999 x 0.85 x 1.1 = 12,154.065 -> 12,154
          { lineId: 'travel-time', amountCents: 5000, reason: 'One hour is the usual time to this site' },
          { lineId: 'travel-distance', distanceKm: 64.37376, reason: 'Shorter route' }, // 64.37376 km = 40 mi; 40 x 65 = 2,600
        ],
      }),
    );
    expect(line(v, 'L1')).toMatchObject({ claimedCents: 13500, approvedCents: 18000 });
    expect(line(v, 'P1')).toMatchObject({ claimedCents: 24308, approvedCents: 12154 });
    expect(line(v, 'travel-time')).toMatchObject({ claimedCents: 7500, approvedCents: 5000 }); // claimed 1.5 x 5,000
    expect(line(v, 'travel-distance')).toMatchObject({ claimedCents: 3250, approvedCents: 2600 }); // claimed 50 x 65
    expect(v.totals.approved).toEqual({ laborCents: 18000, travelCents: 7600, partsCents: 12154, totalCents: 37754 });
    expect(line(v, 'L1').explanation.at(-1)).toMatch(/Reviewer approved 2 h.*Seized fastener/);
    expect(line(v, 'L1').adjustment?.reason).toBe('Seized fastener shown in photos');
  });
});

describe('flags', () => {
  const laborOnly = (over: Partial<ValuationInput> = {}) =>
    claim({ labor: [{ id: 'L1', repairCode: { code: 'R-100', allowedHours: 2 }, hoursWorked: 1, overtime: false }], ...over });

  it('filed late: the last day of the window counts', () => {
    // repair 2024-11-05 + 30 days = 2024-12-05 (25 days left in November + 5)
    expect(codes(valueClaim(laborOnly({ filedDate: '2024-12-05' })))).toEqual([]);
    const late = valueClaim(laborOnly({ filedDate: '2024-12-06' }));
    expect(codes(late)).toEqual(['filed_late']);
    expect(late.flags[0].reason).toBe('Filed on 2024-12-06, 31 days after the repair on 2024-11-05; the filing window is 30 days.');
    // a draft is judged as of the given date
    expect(valueClaim(laborOnly({ filedDate: null, asOfDate: '2025-01-01' })).flags[0].reason).toMatch(/^Not yet filed/);
    expect(codes(valueClaim(laborOnly({ filedDate: null, asOfDate: null })))).toEqual([]);
  });

  it('repeat repair of the same unit and repair code within 90 days', () => {
    // 2024-08-07 to 2024-11-05: 24 + 30 + 31 + 5 = 90 days -> within; 2024-08-06 is 91 days -> not
    const prior = (repairDate: string, repairCode = 'R-100', serial = 'SN-0001', claimId = 'claim-earlier') => ({ claimId, serial, repairCode, repairDate });
    expect(codes(valueClaim(laborOnly({ priorRepairs: [prior('2024-08-07')] })))).toEqual(['repeat_repair']);
    expect(codes(valueClaim(laborOnly({ priorRepairs: [prior('2024-08-06')] })))).toEqual([]);
    expect(codes(valueClaim(laborOnly({ priorRepairs: [prior('2024-10-01', 'R-999')] })))).toEqual([]);
    expect(codes(valueClaim(laborOnly({ priorRepairs: [prior('2024-10-01', 'R-100', 'SN-0002')] })))).toEqual([]);
    expect(codes(valueClaim(laborOnly({ priorRepairs: [prior('2024-10-01', 'R-100', 'SN-0001', 'claim-under-test')] })))).toEqual([]);
    const v = valueClaim(laborOnly({ priorRepairs: [prior('2024-10-01')] }));
    expect(v.flags[0].reason).toMatch(/2024-10-01 \(claim claim-earlier\), 35 days before/);
    expect(line(v, 'L1').flags).toContain('repeat_repair');
  });

  it('technician not certified for the family on the repair date (validity inclusive)', () => {
    const cert = (validFrom: string, validTo: string | null, familyId = 'family-a') => ({ technician: { id: 't', certifications: [{ familyId, validFrom, validTo }] } });
    expect(codes(valueClaim(laborOnly(cert('2023-11-05', '2024-11-05'))))).toEqual([]);
    expect(codes(valueClaim(laborOnly(cert('2024-11-05', null))))).toEqual([]);
    expect(codes(valueClaim(laborOnly(cert('2023-11-05', '2024-11-04'))))).toEqual(['technician_not_certified']);
    expect(codes(valueClaim(laborOnly(cert('2024-11-06', null))))).toEqual(['technician_not_certified']);
    const other = valueClaim(laborOnly(cert('2020-01-01', null, 'family-b')));
    expect(other.flags[0].reason).toMatch(/holds no certification for product family family-a/);
  });

  it('travel distance below the great-circle floor', () => {
    // floor 2 x 77.836 = 155.67 km for a site 0.7 degrees of latitude away; 120 km is below it
    const v = valueClaim(
      laborOnly({ base: { lat: 40, lon: -90 }, site: { lat: 40.7, lon: -90 }, travel: { enteredRoundTripKm: 120, travelHours: 1 } }),
    );
    expect(codes(v)).toEqual(['travel_distance_implausible']);
    expect(v.flags[0].reason).toMatch(/Below the floor/);
  });

  it('dated IRS mileage rate in force on the repair date when the contract has none', () => {
    const v = valueClaim(laborOnly({ mileageRates: IRS_RATES, contract: { ...claim().contract, mileageRateCents: null }, travel: { enteredRoundTripKm: 80.4672, travelHours: 1 } }));
    const d = line(v, 'travel-distance');
    expect(d.rateCents).toBe(67); // IRS Notice 2024-08: 67 cents per mile for 2024
    expect(d.inputs.mileageRateNotice).toBe('IRS Notice 2024-08');
    expect(d.claimedCents).toBe(3350); // 50 mi x 67 = 3,350 cents
  });

  it('after-repair readings out of tolerance', () => {
    const v = valueClaim(
      laborOnly({
        readings: [
          { value: 300, unit: 'F', spec: { unit: 'F', nominal: 350, tolerance: 10, phase: 'before' } },
          { value: 345, unit: 'F', spec: { unit: 'F', nominal: 350, tolerance: 10, phase: 'after' } },
        ],
      }),
    );
    expect(codes(v)).toEqual([]);
    const bad = valueClaim(laborOnly({ readings: [{ value: 160, unit: 'C', spec: { unit: 'F', nominal: 350, tolerance: 10, phase: 'after' } }] }));
    // 160 °C = 160 x 1.8 + 32 = 320 °F (NIST SP 811 B.9), 30 °F below nominal
    expect(bad.readings[0].convertedValue).toBe(320);
    expect(codes(bad)).toEqual(['readings_out_of_tolerance']);
  });

  it('every flag raised has a label in the index', () => {
    for (const code of FLAG_CODES) expect(FLAG_INFO[code].label.length).toBeGreaterThan(0);
    const v = valueClaim(laborOnly({ filedDate: '2025-06-01', failureDate: '2025-06-01', repairDate: '2025-06-01' }));
    for (const f of v.flags) expect(f.label).toBe(FLAG_INFO[f.code].label);
  });
});

describe('input and output', () => {
  it('plain serialisable in and out, deterministic', () => {
    const input = claim({
      labor: [{ repairCode: { code: 'R-1', allowedHours: 1 }, hoursWorked: 1.5, overtime: true }],
      parts: [{ part: { partNumber: 'P-1', listPriceCents: 999, returnRequired: true }, quantity: 1 }],
      travel: { enteredRoundTripKm: 30, travelHours: 0.5 },
    });
    const a = valueClaim(JSON.parse(JSON.stringify(input)));
    const b = valueClaim(input);
    expect(a).toEqual(b);
    expect(JSON.parse(JSON.stringify(a))).toEqual(a);
    expect(a.lines.map((l) => l.id)).toEqual(['labor-1', 'travel-distance', 'travel-time', 'part-1']);
  });

  it('malformed input is a CalculationInputError naming the field', () => {
    const fieldOf = (f: () => unknown) => {
      try {
        f();
      } catch (e) {
        expect(e).toBeInstanceOf(CalculationInputError);
        return (e as CalculationInputError).field;
      }
      return null;
    };
    expect(fieldOf(() => valueClaim(claim({ currency: 'XYZ' })))).toBe('currency');
    expect(fieldOf(() => valueClaim(claim({ repairDate: '2024-13-01' })))).toBe('repairDate');
    expect(fieldOf(() => valueClaim(claim({ adjustments: [{ lineId: 'nope', amountCents: 1, reason: 'x' }] })))).toBe('adjustments.0.lineId');
    expect(
      fieldOf(() =>
        valueClaim(
          claim({
            labor: [{ id: 'L1', repairCode: { code: 'R', allowedHours: 1 }, hoursWorked: 1, overtime: false }],
            adjustments: [{ lineId: 'L1', hours: 1, reason: '' }],
          }),
        ),
      ),
    ).toBe('adjustments.0.reason');
    expect(fieldOf(() => valueClaim(claim({ labor: [{ repairCode: { code: 'R', allowedHours: 1 }, hoursWorked: Number.NaN, overtime: false }] })))).toBe(
      'labor.0.hoursWorked',
    );
    expect(fieldOf(() => valueClaim(claim({ contract: { ...claim().contract, filingWindowDays: -1 } })))).toBe('contract.filingWindowDays');
  });
});
