/**
 * Calendar dates as 'YYYY-MM-DD' strings, in pure integer arithmetic (proleptic
 * Gregorian calendar, no time zones, no Date objects).
 */
import { CalculationInputError } from './errors';

const ISO_DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;

export interface CalendarDate {
  year: number;
  month: number;
  day: number;
}

export function isLeapYear(year: number): boolean {
  return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
}

const MONTH_DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

export function daysInMonth(year: number, month: number): number {
  return month === 2 && isLeapYear(year) ? 29 : MONTH_DAYS[month - 1];
}

function readDate(s: unknown): CalendarDate | null {
  if (typeof s !== 'string' || s.length !== 10) return null;
  const m = ISO_DATE_RE.exec(s);
  if (!m) return null;
  const year = Number(m[1]);
  const month = Number(m[2]);
  const day = Number(m[3]);
  if (year < 1 || month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return null;
  return { year, month, day };
}

export function isIsoDate(s: unknown): s is string {
  return readDate(s) !== null;
}

export function parseIsoDate(s: string, field = 'date'): CalendarDate {
  const d = readDate(s);
  if (!d) throw new CalculationInputError(field, `${field} must be a calendar date as YYYY-MM-DD, got "${String(s)}"`);
  return d;
}

export function formatIsoDate({ year, month, day }: CalendarDate): string {
  if (year < 1 || year > 9999) throw new CalculationInputError('date', `year ${year} is outside 0001-9999`);
  return `${String(year).padStart(4, '0')}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;
}

// Day numbers of recently seen dates: a pure memo (same answer for the same
// string), bounded so it can not grow without limit.
const DAY_NUMBER_MEMO = new Map<string, number>();
const DAY_NUMBER_MEMO_LIMIT = 4096;

/** Days since 1970-01-01 (H. Hinnant's days_from_civil). */
export function toDayNumber(date: string, field = 'date'): number {
  const hit = typeof date === 'string' ? DAY_NUMBER_MEMO.get(date) : undefined;
  if (hit !== undefined) return hit;
  const { year, month, day } = parseIsoDate(date, field);
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const doy = Math.floor((153 * (month + (month > 2 ? -3 : 9)) + 2) / 5) + day - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  const n = era * 146097 + doe - 719468;
  if (DAY_NUMBER_MEMO.size >= DAY_NUMBER_MEMO_LIMIT) DAY_NUMBER_MEMO.clear();
  DAY_NUMBER_MEMO.set(date, n);
  return n;
}

export function fromDayNumber(days: number): string {
  const z = days + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const day = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const month = mp < 10 ? mp + 3 : mp - 9;
  const year = yoe + era * 400 + (month <= 2 ? 1 : 0);
  return formatIsoDate({ year, month, day });
}

function assertInteger(n: number, field: string): void {
  if (!Number.isSafeInteger(n)) throw new CalculationInputError(field, `${field} must be a whole number`);
}

export function addDays(date: string, days: number): string {
  assertInteger(days, 'days');
  return fromDayNumber(toDayNumber(date) + days);
}

/** Whole days from `from` to `to` (positive when `to` is later): daysBetween('2024-02-28', '2024-03-01') = 2. */
export function daysBetween(from: string, to: string): number {
  return toDayNumber(to, 'to') - toDayNumber(from, 'from');
}

/**
 * Adds calendar months; when the day does not exist in the target month it is
 * clamped to that month's last day: 2024-01-31 + 1 = 2024-02-29,
 * 2023-01-31 + 1 = 2023-02-28, 2024-02-29 + 12 = 2025-02-28.
 */
export function addMonthsClamped(date: string, months: number): string {
  assertInteger(months, 'months');
  const { year, month, day } = parseIsoDate(date);
  const index = year * 12 + (month - 1) + months;
  const y = Math.floor(index / 12);
  const m = index - y * 12 + 1;
  return formatIsoDate({ year: y, month: m, day: Math.min(day, daysInMonth(y, m)) });
}

export function compareDates(a: string, b: string): number {
  const d = toDayNumber(a, 'a') - toDayNumber(b, 'b');
  return d < 0 ? -1 : d > 0 ? 1 : 0;
}

export function minDate(a: string, b: string): string {
  return compareDates(a, b) <= 0 ? a : b;
}

export function maxDate(a: string, b: string): string {
  return compareDates(a, b) >= 0 ? a : b;
}

/** Inclusive on both ends. */
export function isWithin(date: string, from: string, to: string): boolean {
  return compareDates(from, date) <= 0 && compareDates(date, to) <= 0;
}

export function yearOf(date: string): number {
  return parseIsoDate(date).year;
}
