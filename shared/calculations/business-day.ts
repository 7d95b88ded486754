/**
 * Business days in an organisation's own time zone. Instants are stored in UTC; a business
 * day (today, the filing date, a deadline, "days old", "not in the future") is the calendar
 * day on the organisation's wall clock, by the IANA time zone database (tzdata) as shipped
 * with the runtime's Intl, read through @date-fns/tz.
 */
import { TZDate } from '@date-fns/tz';
import { CalculationInputError } from './errors';
import { daysBetween, formatIsoDate, parseIsoDate } from './dates';

/** The zone an organisation gets when none was chosen (the column's default). */
export const DEFAULT_TIME_ZONE = 'America/Chicago';

const VALID_ZONES = new Map<string, boolean>();

/** True for a name the IANA time zone database knows (e.g. "Europe/Berlin", "UTC"). */
export function isTimeZone(name: unknown): name is string {
  if (typeof name !== 'string' || name.length === 0 || name.length > 64) return false;
  const hit = VALID_ZONES.get(name);
  if (hit !== undefined) return hit;
  let ok = true;
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: name });
  } catch {
    ok = false;
  }
  if (VALID_ZONES.size > 1024) VALID_ZONES.clear();
  VALID_ZONES.set(name, ok);
  return ok;
}

function zoneOf(timeZone: string): string {
  if (!isTimeZone(timeZone)) throw new CalculationInputError('timeZone', `"${String(timeZone)}" is not a time zone of the IANA time zone database.`);
  return timeZone;
}

function msOf(instant: Date | string | number): number {
  const ms = instant instanceof Date ? instant.getTime() : typeof instant === 'number' ? instant : Date.parse(instant);
  if (!Number.isFinite(ms)) throw new CalculationInputError('instant', `"${String(instant)}" is not a point in time.`);
  return ms;
}

/** The calendar day ('YYYY-MM-DD') that `instant` falls on in `timeZone`. */
export function businessDay(instant: Date | string | number, timeZone: string): string {
  const d = new TZDate(msOf(instant), zoneOf(timeZone));
  return formatIsoDate({ year: d.getFullYear(), month: d.getMonth() + 1, day: d.getDate() });
}

/**
 * The first instant (UTC ISO string) of the business day `day` in `timeZone`. Where a zone
 * skips its midnight, the day starts at the first wall-clock time that exists.
 */
export function startOfBusinessDay(day: string, timeZone: string): string {
  const { year, month, day: d } = parseIsoDate(day, 'day');
  return new Date(new TZDate(year, month - 1, d, 0, 0, 0, zoneOf(timeZone)).getTime()).toISOString();
}

/** Whole business days from the day of `instant` to `today` ("days old"), both in `timeZone`. */
export function businessDaysSince(instant: Date | string | number, today: string, timeZone: string): number {
  return daysBetween(businessDay(instant, timeZone), today);
}
