import { describe, it, expect } from 'vitest';
import { computeLaborLine } from './labor';
import { computePartLine } from './parts';
import { CalculationInputError } from './errors';

// Hand-worked arithmetic in the comments; no value here comes from demo data.
const contract = { laborRateCents: 9000, overtimeMultiplier: 1.5 };
const code = { code: 'R-210', allowedHours: 1.5 };

describe('labor line', () => {
  it('pays hours worked within the allowance', () => {
    // 1.25 h x 9,000 cents = 11,250 cents
    const r = computeLaborLine({ repairCode: code, hoursWorked: 1.25, overtime: false }, contract);
    expect(r).toMatchObject({ payableHours: 1.25, hoursBasis: 'worked', amountCents: 11250, flags: [] });
  });

  it('caps at the allowance and flags it', () => {
    // min(2.25, 1.5) = 1.5 h; 1.5 x 9,000 = 13,500 cents; requested 2.25 x 9,000 = 20,250 cents
    const r = computeLaborLine({ repairCode: code, hoursWorked: 2.25, overtime: false }, contract);
    expect(r).toMatchObject({ payableHours: 1.5, hoursBasis: 'allowance', amountCents: 13500, requestedCents: 20250 });
    expect(r.flags).toEqual(['labor_over_allowance']);
  });

  it('a reviewer override with a reason replaces the allowance', () => {
    // override 2 h: 2 x 9,000 = 18,000 cents; still flagged as over the allowance
    const r = computeLaborLine(
      { repairCode: code, hoursWorked: 2.25, overtime: false, override: { hours: 2, reason: 'Seized fastener shown in photos' } },
      contract,
    );
    expect(r).toMatchObject({ payableHours: 2, hoursBasis: 'override', amountCents: 18000 });
    expect(r.flags).toEqual(['labor_over_allowance']);
    expect(() =>
      computeLaborLine({ repairCode: code, hoursWorked: 2.25, overtime: false, override: { hours: 2, reason: '  ' } }, contract),
    ).toThrow(/needs a reason/);
  });

  it('applies the overtime multiplier only with a pre-authorisation number', () => {
    // 1.25 h x 9,000 x 1.5 = 16,875 cents
    const ok = computeLaborLine({ repairCode: code, hoursWorked: 1.25, overtime: true, preAuthorization: 'PA-7781' }, contract);
    expect(ok).toMatchObject({ multiplier: 1.5, overtimeApplied: true, amountCents: 16875, flags: [] });
    // no number: 1.25 x 9,000 x 1 = 11,250 cents, flagged; requested stays 16,875
    const no = computeLaborLine({ repairCode: code, hoursWorked: 1.25, overtime: true, preAuthorization: '' }, contract);
    expect(no).toMatchObject({ multiplier: 1, overtimeApplied: false, amountCents: 11250, requestedCents: 16875 });
    expect(no.flags).toEqual(['overtime_without_authorization']);
  });

  it('rounds the exact product half-up once', () => {
    // 1.25 h x 8,530 cents = 10,662.5 cents: a tie, half-up -> 10,663 (decimal.js ROUND_HALF_UP; half-even would give 10,662)
    const r = computeLaborLine({ repairCode: code, hoursWorked: 1.25, overtime: false }, { laborRateCents: 8530, overtimeMultiplier: 1.5 });
    expect(r.amountCents).toBe(10663);
    // 0.1 h x 3,333 cents = 333.3 -> 333 cents
    expect(computeLaborLine({ repairCode: code, hoursWorked: 0.1, overtime: false }, { laborRateCents: 3333, overtimeMultiplier: 1 }).amountCents).toBe(333);
  });

  it('rejects bad input with the field named', () => {
    try {
      computeLaborLine({ repairCode: code, hoursWorked: -1, overtime: false }, contract, { field: 'labor.0' });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(CalculationInputError);
      expect((e as CalculationInputError).field).toBe('labor.0.hoursWorked');
    }
    expect(() => computeLaborLine({ repairCode: code, hoursWorked: 1, overtime: false }, { laborRateCents: 90.5, overtimeMultiplier: 1 })).toThrow(
      /whole number of cents/,
    );
    expect(() => computeLaborLine({ repairCode: code, hoursWorked: 1, overtime: false }, { laborRateCents: 9000, overtimeMultiplier: 0.5 })).toThrow(
      /1 or more/,
    );
  });
});

describe('parts line', () => {
  it('quantity x list less discount plus handling, rounded once', () => {
    // 12,999 x (1 - 0.15) = 11,049.15 net each; x 2 = 22,098.30; + 10 % = 2,209.83 -> 24,308.13 -> 24,308 cents
    const r = computePartLine(
      { part: { partNumber: 'P-100', listPriceCents: 12999, returnRequired: true }, quantity: 2 },
      { partsDiscountBps: 1500, handlingBps: 1000 },
    );
    expect(r).toMatchObject({ unitNetCents: 11049, unitNetExactCents: '11049.15', handlingExactCents: '2209.83', amountCents: 24308, returnRequired: true });
    // 455 x 0.85 = 386.75; x 3 = 1,160.25; x 1.1 = 1,276.275 -> 1,276 cents
    expect(
      computePartLine({ part: { partNumber: 'P-200', listPriceCents: 455, returnRequired: false }, quantity: 3 }, { partsDiscountBps: 1500, handlingBps: 1000 })
        .amountCents,
    ).toBe(1276);
  });

  it('rejects a zero quantity and out-of-range basis points', () => {
    const part = { partNumber: 'P-1', listPriceCents: 100, returnRequired: false };
    expect(() => computePartLine({ part, quantity: 0 }, { partsDiscountBps: 0, handlingBps: 0 })).toThrow(/above 0/);
    expect(() => computePartLine({ part, quantity: 1 }, { partsDiscountBps: 10_001, handlingBps: 0 })).toThrow(/basis points/);
  });
});
