/**
 * The filing window of a claim: it may be filed up to `windowDays` calendar days after the
 * repair date, the last day included. `today` is the agency's business day (its IANA time
 * zone, see business-day.ts), so the window closes at the agency's own midnight.
 */
import { addDays, daysBetween } from './dates';

export interface FilingWindow {
  /** The last day the claim can be filed on time ('YYYY-MM-DD'). */
  lastDay: string;
  /** Days after the repair on `asOf` (or the filing day). */
  daysAfterRepair: number;
  /** Days left to file on time, counting `asOf` as used: 0 on the last day; negative once late. */
  daysLeft: number;
  /** True once `asOf` is after the last day. */
  late: boolean;
}

export function filingWindow(repairDate: string, windowDays: number, asOf: string): FilingWindow {
  const daysAfterRepair = daysBetween(repairDate, asOf);
  const lastDay = addDays(repairDate, windowDays);
  const daysLeft = windowDays - daysAfterRepair;
  return { lastDay, daysAfterRepair, daysLeft, late: daysLeft < 0 };
}
