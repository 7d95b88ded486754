import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { addMonths, addDays as fnsAddDays, differenceInCalendarDays } from 'date-fns';
import { addMonthsClamped, addDays, daysBetween, daysInMonth, isLeapYear, isIsoDate, parseIsoDate, toDayNumber, fromDayNumber } from './dates';
import { CalculationInputError } from './errors';

const pad = (n: number, w = 2) => String(n).padStart(w, '0');
const iso = (d: Date) => `${pad(d.getFullYear(), 4)}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
const local = (s: string) => {
  const { year, month, day } = parseIsoDate(s);
  return new Date(year, month - 1, day);
};

/** Generated calendar dates, weighted towards month ends and 29 February. */
const dateArb = fc.oneof(
  fc.record({ y: fc.integer({ min: 1901, max: 2199 }), m: fc.integer({ min: 1, max: 12 }), d: fc.integer({ min: 1, max: 31 }) }).map(
    ({ y, m, d }) => `${y}-${pad(m)}-${pad(Math.min(d, daysInMonth(y, m)))}`,
  ),
  fc.record({ y: fc.integer({ min: 1901, max: 2199 }), m: fc.integer({ min: 1, max: 12 }) }).map(
    ({ y, m }) => `${y}-${pad(m)}-${pad(daysInMonth(y, m))}`, // month ends
  ),
  fc.integer({ min: 476, max: 549 }).map((k) => k * 4).filter(isLeapYear).map((y) => `${y}-02-29`), // 29 February of leap years 1904..2196
);

describe('month arithmetic against date-fns addMonths', () => {
  it('known month-end and leap-day cases', () => {
    expect(isLeapYear(2024) && isLeapYear(2000) && !isLeapYear(2100) && !isLeapYear(2023)).toBe(true); // Gregorian rule
    // date-fns addMonths clamps to the last day of the target month; the expected values below are its results
    expect(addMonthsClamped('2024-01-31', 1)).toBe(iso(addMonths(local('2024-01-31'), 1))); // date-fns addMonths
    expect(addMonthsClamped('2024-01-31', 1)).toBe('2024-02-29'); // date-fns addMonths: Jan 31 + 1 month in a leap year
    expect(addMonthsClamped('2023-01-31', 1)).toBe('2023-02-28'); // date-fns addMonths: Jan 31 + 1 month in a common year
    expect(addMonthsClamped('2024-02-29', 12)).toBe('2025-02-28'); // date-fns addMonths: 29 Feb + 12 months
    expect(addMonthsClamped('2024-02-29', 48)).toBe('2028-02-29'); // date-fns addMonths: 29 Feb + 48 months
    expect(addMonthsClamped('2024-03-31', -1)).toBe('2024-02-29'); // date-fns addMonths: Mar 31 - 1 month
    expect(addMonthsClamped('2023-08-31', 1)).toBe('2023-09-30'); // date-fns addMonths: Aug 31 + 1 month
    expect(addMonthsClamped('2099-12-15', 1)).toBe('2100-01-15'); // date-fns addMonths: across a year end
    expect(addMonthsClamped('2100-01-31', 1)).toBe('2100-02-28'); // date-fns addMonths: 2100 is not a leap year
    expect(addMonthsClamped('2000-01-31', 1)).toBe('2000-02-29'); // date-fns addMonths: 2000 is a leap year
  });

  it('agrees with date-fns addMonths on generated dates, month ends and 29 February', () => {
    fc.assert(
      fc.property(dateArb, fc.integer({ min: -240, max: 240 }), (date, months) => {
        expect(addMonthsClamped(date, months)).toBe(iso(addMonths(local(date), months))); // date-fns addMonths
      }),
      { numRuns: 10_000 },
    );
  });

  it('agrees with date-fns addDays and differenceInCalendarDays', () => {
    fc.assert(
      fc.property(dateArb, fc.integer({ min: -2000, max: 2000 }), (date, days) => {
        const later = addDays(date, days);
        expect(later).toBe(iso(fnsAddDays(local(date), days))); // date-fns addDays
        expect(daysBetween(date, later)).toBe(days);
      }),
      { numRuns: 5_000 },
    );
    fc.assert(
      fc.property(dateArb, dateArb, (a, b) => {
        expect(daysBetween(a, b)).toBe(differenceInCalendarDays(local(b), local(a))); // date-fns differenceInCalendarDays
      }),
      { numRuns: 5_000 },
    );
  });

  it('day numbers count from 1970-01-01 and round-trip', () => {
    expect(toDayNumber('1970-01-01')).toBe(0); // POSIX epoch
    expect(toDayNumber('2000-03-01')).toBe(11017); // Date.UTC(2000, 2, 1) / 86400000
    expect(toDayNumber('2000-03-01')).toBe(Date.UTC(2000, 2, 1) / 86_400_000); // ECMAScript Date.UTC
    fc.assert(
      fc.property(fc.integer({ min: -700_000, max: 2_900_000 }), (n) => {
        expect(toDayNumber(fromDayNumber(n))).toBe(n);
      }),
      { numRuns: 5_000 },
    );
  });
});

describe('date input checks', () => {
  it('accepts only real calendar dates as YYYY-MM-DD', () => {
    expect(isIsoDate('2024-02-29')).toBe(true);
    expect(isIsoDate('2023-02-29')).toBe(false);
    expect(isIsoDate('2024-13-01')).toBe(false);
    expect(isIsoDate('2024-4-01')).toBe(false);
    expect(isIsoDate('2024-04-01T00:00:00Z')).toBe(false);
    expect(() => addMonthsClamped('2023-02-30', 1)).toThrow(CalculationInputError);
    expect(() => addMonthsClamped('2024-01-31', 1.5)).toThrow(/whole number/);
  });
});
