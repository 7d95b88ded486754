/**
 * "Today" on the server is the organisation's business day, in its IANA time zone
 * (organisations.time_zone), never the UTC day. Instants stay UTC.
 */
import { eq } from 'drizzle-orm';
import type { Db } from '../db/client';
import { organisations } from '../db/schema/index';
import { businessDay, DEFAULT_TIME_ZONE, isTimeZone } from '@shared/calculations/business-day';
import type { Clock } from './clock';

/** The organisation's time zone (primary-key read), or the default zone when unknown. */
export function organisationTimeZone(db: Db, organisationId: string): string {
  const tz = db.select({ tz: organisations.timeZone }).from(organisations).where(eq(organisations.id, organisationId)).get()?.tz;
  return tz && isTimeZone(tz) ? tz : DEFAULT_TIME_ZONE;
}

/** Today, as the organisation's business day ('YYYY-MM-DD'). */
export function todayFor(db: Db, clock: Clock, organisationId: string): string {
  return businessDay(clock.now(), organisationTimeZone(db, organisationId));
}
