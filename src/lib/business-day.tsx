import { createContext, useContext, type ReactNode } from 'react';
import { businessDay, isTimeZone } from '@shared/calculations/business-day';

/** The browser's own zone: the fallback while no organisation zone is known (signed out). */
const browserZone = (): string => {
  const tz = Intl.DateTimeFormat().resolvedOptions().timeZone;
  return isTimeZone(tz) ? tz : 'UTC';
};

const TimeZoneContext = createContext<string | null>(null);

/** Provides the signed-in organisation's IANA time zone (from /api/auth/me). */
export function OrganisationTimeZoneProvider({ timeZone, children }: { timeZone: string | null | undefined; children: ReactNode }) {
  return <TimeZoneContext.Provider value={timeZone && isTimeZone(timeZone) ? timeZone : null}>{children}</TimeZoneContext.Provider>;
}

/** The organisation's time zone, or the browser's when none is known. */
export function useOrganisationTimeZone(): string {
  return useContext(TimeZoneContext) ?? browserZone();
}

/**
 * Today as the organisation's business day ('YYYY-MM-DD'), the day the server counts in, so
 * the date pickers' max and "not in the future" agree on both sides.
 */
export function useBusinessToday(now: Date = new Date()): string {
  return businessDay(now, useOrganisationTimeZone());
}
