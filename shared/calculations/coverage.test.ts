import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { addMonths } from 'date-fns';
import { computeCoverage, coverageForPart, type CoverageTerms } from './coverage';
import { CalculationInputError } from './errors';

// Hand-worked examples: every expected date below is written out from the rule
// "covered from the start through start + N calendar months (clamped at month
// ends), never past ship + cap months, the last day included".
const terms: CoverageTerms = { partsMonths: 12, laborMonths: 12, capMonthsFromShip: 18, installGraceDays: 90 };

describe('coverage on a failure date', () => {
  it('is covered on the last day and not the day after', () => {
    // install 2024-03-15 + 12 months = 2025-03-15; cap 2024-01-10 + 18 months = 2025-07-10; the term binds
    const base = { shipDate: '2024-01-10', installDate: '2024-03-15', terms };
    const last = computeCoverage({ ...base, failureDate: '2025-03-15' });
    expect(last.startBasis).toBe('install');
    expect(last.startDate).toBe('2024-03-15');
    expect(last.parts).toMatchObject({ covered: true, until: '2025-03-15', boundBy: 'term', reasonCode: 'within_term' });
    expect(last.labor.covered).toBe(true);
    expect(last.parts.reason).toMatch(/end date itself is covered/);

    const dayAfter = computeCoverage({ ...base, failureDate: '2025-03-16' });
    expect(dayAfter.parts).toMatchObject({ covered: false, until: '2025-03-15', reasonCode: 'term_ended' });
    expect(dayAfter.parts.reason).toMatch(/1 day after the last covered day 2025-03-15/);
  });

  it('counts months right at month ends and on 29 February', () => {
    // install 2024-01-31 + 1 month = 2024-02-29 (February of a leap year has 29 days)
    const jan31 = computeCoverage({
      failureDate: '2024-02-29', shipDate: '2024-01-02', installDate: '2024-01-31',
      terms: { partsMonths: 1, laborMonths: 1, capMonthsFromShip: 6, installGraceDays: 0 },
    });
    expect(jan31.parts).toMatchObject({ covered: true, until: '2024-02-29' });
    // install 2024-02-29 + 12 months = 2025-02-28 (no 29 February in 2025): 2025-03-01 is one day late
    const leap = computeCoverage({
      failureDate: '2025-03-01', shipDate: '2024-02-01', installDate: '2024-02-29',
      terms: { partsMonths: 12, laborMonths: 12, capMonthsFromShip: 24, installGraceDays: 0 },
    });
    expect(leap.parts).toMatchObject({ covered: false, until: '2025-02-28' });
    expect(leap.parts.reason).toMatch(/1 day after/);
  });

  it('end dates agree with date-fns addMonths on generated install dates', () => {
    const day = (n: number) => String(n).padStart(2, '0');
    fc.assert(
      fc.property(
        fc.integer({ min: 2000, max: 2040 }), fc.integer({ min: 1, max: 12 }), fc.integer({ min: 1, max: 31 }), fc.integer({ min: 0, max: 120 }),
        (y, m, d, months) => {
          const dim = new Date(Date.UTC(y, m, 0)).getUTCDate();
          const install = `${y}-${day(m)}-${day(Math.min(d, dim))}`;
          const c = computeCoverage({
            failureDate: install, shipDate: install, installDate: install,
            terms: { partsMonths: months, laborMonths: months, capMonthsFromShip: 1000, installGraceDays: 0 },
          });
          const ref = addMonths(new Date(y, m - 1, Math.min(d, dim)), months); // date-fns addMonths
          expect(c.parts.until).toBe(`${ref.getFullYear()}-${day(ref.getMonth() + 1)}-${day(ref.getDate())}`);
        },
      ),
      { numRuns: 2000 },
    );
  });

  it('never runs past the cap from the ship date', () => {
    // ship 2023-01-10 + 18 months = 2024-07-10, earlier than install 2023-12-01 + 12 months = 2024-12-01
    const c = computeCoverage({ failureDate: '2024-07-11', shipDate: '2023-01-10', installDate: '2023-12-01', terms });
    expect(c.parts).toMatchObject({ covered: false, until: '2024-07-10', boundBy: 'ship_cap', reasonCode: 'ship_cap_reached' });
    expect(c.parts.termEnds).toBe('2024-12-01');
    expect(c.parts.capEnds).toBe('2024-07-10');
    const onCap = computeCoverage({ failureDate: '2024-07-10', shipDate: '2023-01-10', installDate: '2023-12-01', terms });
    expect(onCap.parts.covered).toBe(true);
  });

  it('uses the ship date plus grace when the install date is unknown', () => {
    // ship 2024-01-10 + 90 days = 2024-04-09 (21 + 29 + 31 + 9); + 12 months = 2025-04-09; cap 2025-07-10
    const c = computeCoverage({ failureDate: '2025-04-09', shipDate: '2024-01-10', installDate: null, terms });
    expect(c.startBasis).toBe('ship_plus_grace');
    expect(c.startDate).toBe('2024-04-09');
    expect(c.parts).toMatchObject({ covered: true, until: '2025-04-09' });
    expect(c.explanation[0]).toMatch(/No install date is recorded/);
    expect(computeCoverage({ failureDate: '2025-04-10', shipDate: '2024-01-10', installDate: null, terms }).parts.covered).toBe(false);
  });

  it('treats parts and labor separately', () => {
    // labor 3 months: install 2024-05-20 + 3 = 2024-08-20; parts 12 months: 2025-05-20
    const c = computeCoverage({
      failureDate: '2024-09-01', shipDate: '2024-05-01', installDate: '2024-05-20',
      terms: { partsMonths: 12, laborMonths: 3, capMonthsFromShip: 18, installGraceDays: 90 },
    });
    expect(c.parts).toMatchObject({ covered: true, until: '2025-05-20' });
    expect(c.labor).toMatchObject({ covered: false, until: '2024-08-20', reasonCode: 'term_ended' });
  });

  it('a component carries a longer parts-only term with an extended cap', () => {
    // component 60 months from install 2020-03-01 = 2025-03-01; its cap: ship 2020-01-15 + (60 + 18 - 12) = 66 months = 2025-07-15
    const c = computeCoverage({
      failureDate: '2025-03-01', shipDate: '2020-01-15', installDate: '2020-03-01', terms,
      componentTerms: [{ partId: 'part-comp', partsMonths: 60, label: 'Heating element' }],
    });
    expect(c.parts.covered).toBe(false);
    expect(c.labor.covered).toBe(false);
    expect(c.components[0]).toMatchObject({ partId: 'part-comp', covered: true, until: '2025-03-01', capMonths: 66, boundBy: 'term' });
    expect(coverageForPart(c, 'part-comp')).toMatchObject({ covered: true, source: 'component' });
    expect(coverageForPart(c, 'part-other')).toMatchObject({ covered: false, source: 'standard' });
    expect(coverageForPart(c, null).source).toBe('standard');
  });

  it('a component term shorter than the standard term governs its part (6-month gasket on a 24-month model)', () => {
    // Common practice: a wear part carries a shorter parts term than the unit. Hand-worked dates:
    // install 2024-01-15 + 6 months = 2024-07-15 (inclusive); the gasket's cap, ship 2024-01-02 + (6 + 30 - 24) = 12 months = 2025-01-02, is later.
    // The standard parts term runs install + 24 months = 2026-01-15.
    const model = { partsMonths: 24, laborMonths: 24, capMonthsFromShip: 30, installGraceDays: 90 };
    const gasket = [{ partId: 'part-gasket', partsMonths: 6, label: 'Door gasket' }];
    const at = (failureDate: string) => computeCoverage({ failureDate, shipDate: '2024-01-02', installDate: '2024-01-15', terms: model, componentTerms: gasket });
    const month8 = at('2024-09-15'); // month 8 after installation
    expect(month8.parts).toMatchObject({ covered: true, until: '2026-01-15' });
    expect(coverageForPart(month8, 'part-gasket')).toMatchObject({ covered: false, until: '2024-07-15', source: 'component' });
    expect(coverageForPart(month8, 'part-gasket').reason).toMatch(/Door gasket \(parts only\) not covered: the failure date 2024-09-15 is 62 days after the last covered day 2024-07-15/);
    expect(coverageForPart(month8, 'part-other')).toMatchObject({ covered: true, source: 'standard' });
    expect(coverageForPart(at('2024-07-15'), 'part-gasket').covered).toBe(true); // the last day is covered
    expect(coverageForPart(at('2024-07-16'), 'part-gasket').covered).toBe(false);
  });

  it('is not covered before the ship date; an install date before shipping counts from shipping', () => {
    const early = computeCoverage({ failureDate: '2024-01-09', shipDate: '2024-01-10', installDate: '2024-02-01', terms });
    expect(early.parts).toMatchObject({ covered: false, reasonCode: 'before_ship_date' });
    const odd = computeCoverage({ failureDate: '2024-06-01', shipDate: '2024-01-10', installDate: '2023-12-01', terms });
    expect(odd.startBasis).toBe('ship');
    expect(odd.startDate).toBe('2024-01-10');
    expect(odd.parts.until).toBe('2025-01-10');
  });

  it('rejects malformed input with the field named', () => {
    expect(() => computeCoverage({ failureDate: '2024-02-30', shipDate: '2024-01-10', installDate: null, terms })).toThrow(CalculationInputError);
    try {
      computeCoverage({ failureDate: '2024-02-01', shipDate: '2024-01-10', installDate: null, terms: { ...terms, partsMonths: -1 } });
      expect.unreachable();
    } catch (e) {
      expect((e as CalculationInputError).field).toBe('terms.partsMonths');
    }
  });
});
