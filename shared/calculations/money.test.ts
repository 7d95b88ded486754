import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import Decimal from 'decimal.js';
import {
  roundHalfUpToCents,
  productCents,
  centsToDecimalString,
  decimalStringToCents,
  formatCents,
  minorUnits,
  ISO_4217_MINOR_UNITS,
} from './money';
import { computeLaborLine } from './labor';
import { computePartLine } from './parts';

const HalfUp = Decimal.clone({ rounding: Decimal.ROUND_HALF_UP, precision: 40 });

/** Reference: decimal.js ROUND_HALF_UP to whole cents. */
function refCents(x: number): number {
  return new HalfUp(x).toDecimalPlaces(2, Decimal.ROUND_HALF_UP).times(100).toNumber() + 0;
}

describe('half-up rounding to cents', () => {
  it('tie cases go away from zero', () => {
    expect(roundHalfUpToCents(2.345)).toBe(235); // decimal.js ROUND_HALF_UP: 2.345 -> 2.35
    expect(roundHalfUpToCents(-2.345)).toBe(-235); // decimal.js ROUND_HALF_UP: -2.345 -> -2.35
    expect(roundHalfUpToCents(0.125)).toBe(13); // decimal.js ROUND_HALF_UP: 0.125 -> 0.13
    // decimal.js ROUND_HALF_EVEN would give 2.34 and 0.12: our rule is not banker's rounding
    expect(new Decimal(2.345).toDecimalPlaces(2, Decimal.ROUND_HALF_EVEN).toString()).toBe('2.34'); // decimal.js ROUND_HALF_EVEN: 2.345 -> 2.34
    expect(new Decimal(0.125).toDecimalPlaces(2, Decimal.ROUND_HALF_EVEN).toString()).toBe('0.12'); // decimal.js ROUND_HALF_EVEN: 0.125 -> 0.12
    expect(roundHalfUpToCents(2.345)).not.toBe(234);
    // naive binary floats get ties wrong (1.005 * 100 = 100.49999999999999), which is why they are not used
    expect(Math.round(1.005 * 100)).toBe(100);
    expect(roundHalfUpToCents(1.005)).toBe(refCents(1.005)); // decimal.js ROUND_HALF_UP: 1.005 -> 1.01
    expect(refCents(1.005)).toBe(101);
  });

  it('agrees with decimal.js ROUND_HALF_UP on 10,000 generated amounts', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e9, max: 1e9, noNaN: true, noDefaultInfinity: true }), (x) => {
        expect(roundHalfUpToCents(x)).toBe(refCents(x)); // decimal.js ROUND_HALF_UP
      }),
      { numRuns: 10_000 },
    );
  });

  it('agrees with decimal.js on 10,000 generated ties and near-ties (x.xx5 and its neighbours)', () => {
    fc.assert(
      fc.property(fc.integer({ min: -10_000_000, max: 10_000_000 }), fc.constantFrom(-1, 0, 1), (k, nudge) => {
        const x = (k * 10 + 5 + nudge) / 1000; // e.g. 2.345 (a tie at the cent), 2.344 and 2.346 beside it
        expect(roundHalfUpToCents(x)).toBe(refCents(x)); // decimal.js ROUND_HALF_UP
      }),
      { numRuns: 10_000 },
    );
  });

  it('labor lines (hours x rate x multiplier) agree with decimal.js on 10,000 generated lines', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 4_000 }), // hundredths of an hour, 0..40 h
        fc.integer({ min: 0, max: 50_000 }), // cents per hour
        fc.constantFrom(1, 1.25, 1.5, 1.75, 2),
        (hh, rate, mult) => {
          const hours = hh / 100;
          const got = computeLaborLine(
            { repairCode: { code: 'X', allowedHours: 100 }, hoursWorked: hours, overtime: true, preAuthorization: 'PA' },
            { laborRateCents: rate, overtimeMultiplier: mult },
          ).amountCents;
          // decimal.js ROUND_HALF_UP of the exact product
          const ref = new HalfUp(hours).times(rate).times(mult).toDecimalPlaces(0, Decimal.ROUND_HALF_UP).toNumber();
          expect(got).toBe(ref);
          expect(productCents([hours, rate, mult])).toBe(ref);
        },
      ),
      { numRuns: 10_000 },
    );
  });

  it('parts lines (quantity x list x discount x handling) agree with decimal.js on 10,000 generated lines', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 50 }),
        fc.integer({ min: 1, max: 500_000 }),
        fc.integer({ min: 0, max: 10_000 }),
        fc.integer({ min: 0, max: 5_000 }),
        (qty, list, disc, handling) => {
          const got = computePartLine(
            { part: { partNumber: 'X', listPriceCents: list, returnRequired: false }, quantity: qty },
            { partsDiscountBps: disc, handlingBps: handling },
          ).amountCents;
          // decimal.js ROUND_HALF_UP of the exact line value
          const ref = new HalfUp(qty)
            .times(list)
            .times(new HalfUp(10_000 - disc).div(10_000))
            .times(new HalfUp(10_000 + handling).div(10_000))
            .toDecimalPlaces(0, Decimal.ROUND_HALF_UP)
            .toNumber();
          expect(got).toBe(ref);
        },
      ),
      { numRuns: 10_000 },
    );
  });
});

describe('cents as text', () => {
  it('decimal strings', () => {
    expect(centsToDecimalString(1234)).toBe('12.34');
    expect(centsToDecimalString(-5)).toBe('-0.05');
    expect(centsToDecimalString(0)).toBe('0.00');
    expect(centsToDecimalString(100)).toBe('1.00');
    expect(decimalStringToCents('12.34')).toBe(1234);
    expect(decimalStringToCents('-0.005')).toBe(-1); // decimal.js ROUND_HALF_UP: -0.005 -> -0.01
    expect(() => centsToDecimalString(1.5)).toThrow(/whole number of cents/);
  });

  it('round-trips every cents value through its decimal string', () => {
    fc.assert(
      fc.property(fc.integer({ min: -1e12, max: 1e12 }), (c) => {
        expect(decimalStringToCents(centsToDecimalString(c))).toBe(c);
      }),
      { numRuns: 2000 },
    );
  });

  it('formats with the currency symbol and grouping', () => {
    expect(formatCents(123456, 'USD')).toBe('$1,234.56');
    expect(formatCents(-5, 'CAD')).toBe('-CA$0.05');
    expect(formatCents(340, 'EUR')).toBe('€3.40');
    expect(formatCents(100000000, 'USD')).toBe('$1,000,000.00');
    expect(() => formatCents(100, 'XYZ')).toThrow(/Unsupported currency/);
  });

  it('ISO 4217 minor units', () => {
    expect(minorUnits('USD')).toBe(2); // ISO 4217: USD minor unit 2
    expect(minorUnits('CAD')).toBe(2); // ISO 4217: CAD minor unit 2
    expect(minorUnits('EUR')).toBe(2); // ISO 4217: EUR minor unit 2
    expect(Object.keys(ISO_4217_MINOR_UNITS).sort()).toEqual(['CAD', 'EUR', 'USD']);
  });
});
