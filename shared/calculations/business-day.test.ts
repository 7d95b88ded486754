import { describe, expect, it } from 'vitest';
import { businessDay, businessDaysSince, isTimeZone, startOfBusinessDay } from './business-day';
import { CalculationInputError } from './errors';

// Offsets and change-over instants are those of the IANA time zone database (tzdata):
// America/Los_Angeles: PST UTC-8, PDT UTC-7, daylight time from 2026-03-08 02:00 local to
// 2026-11-01 02:00 local (US rule: second Sunday of March, first Sunday of November).
// Europe/Berlin: CET UTC+1, CEST UTC+2, summer time from 2026-03-29 01:00 UTC to 2026-10-25
// 01:00 UTC (EU rule: last Sunday of March and of October).

describe('businessDay: the calendar day on the organisation’s wall clock', () => {
  it('is the local day across midnight, not the UTC day', () => {
    expect(businessDay('2026-06-10T06:59:59.999Z', 'America/Los_Angeles')).toBe('2026-06-09'); // tzdata: 23:59:59 PDT
    expect(businessDay('2026-06-10T07:00:00.000Z', 'America/Los_Angeles')).toBe('2026-06-10'); // tzdata: 00:00 PDT
    expect(businessDay('2026-06-15T21:59:59.999Z', 'Europe/Berlin')).toBe('2026-06-15'); // tzdata: 23:59:59 CEST
    expect(businessDay('2026-06-15T22:00:00.000Z', 'Europe/Berlin')).toBe('2026-06-16'); // tzdata: 00:00 CEST
    expect(businessDay('2026-06-15T23:30:00.000Z', 'UTC')).toBe('2026-06-15');
  });

  it('follows the spring change in Los Angeles (2026-03-08) and Berlin (2026-03-29)', () => {
    expect(businessDay('2026-03-08T07:59:59.000Z', 'America/Los_Angeles')).toBe('2026-03-07'); // tzdata: 23:59:59 PST
    expect(businessDay('2026-03-08T08:00:00.000Z', 'America/Los_Angeles')).toBe('2026-03-08'); // tzdata: 00:00 PST
    expect(businessDay('2026-03-09T06:59:00.000Z', 'America/Los_Angeles')).toBe('2026-03-08'); // tzdata: 23:59 PDT, a 23-hour day
    expect(businessDay('2026-03-09T07:00:00.000Z', 'America/Los_Angeles')).toBe('2026-03-09'); // tzdata: 00:00 PDT
    expect(businessDay('2026-03-28T22:59:00.000Z', 'Europe/Berlin')).toBe('2026-03-28'); // tzdata: 23:59 CET
    expect(businessDay('2026-03-28T23:00:00.000Z', 'Europe/Berlin')).toBe('2026-03-29'); // tzdata: 00:00 CET
    expect(businessDay('2026-03-29T21:59:00.000Z', 'Europe/Berlin')).toBe('2026-03-29'); // tzdata: 23:59 CEST
    expect(businessDay('2026-03-29T22:00:00.000Z', 'Europe/Berlin')).toBe('2026-03-30'); // tzdata: 00:00 CEST
  });

  it('follows the autumn change in Los Angeles (2026-11-01) and Berlin (2026-10-25)', () => {
    expect(businessDay('2026-11-01T06:59:00.000Z', 'America/Los_Angeles')).toBe('2026-10-31'); // tzdata: 23:59 PDT
    expect(businessDay('2026-11-01T07:00:00.000Z', 'America/Los_Angeles')).toBe('2026-11-01'); // tzdata: 00:00 PDT
    expect(businessDay('2026-11-02T07:59:00.000Z', 'America/Los_Angeles')).toBe('2026-11-01'); // tzdata: 23:59 PST, a 25-hour day
    expect(businessDay('2026-11-02T08:00:00.000Z', 'America/Los_Angeles')).toBe('2026-11-02'); // tzdata: 00:00 PST
    expect(businessDay('2026-10-24T21:59:00.000Z', 'Europe/Berlin')).toBe('2026-10-24'); // tzdata: 23:59 CEST
    expect(businessDay('2026-10-24T22:00:00.000Z', 'Europe/Berlin')).toBe('2026-10-25'); // tzdata: 00:00 CEST
    expect(businessDay('2026-10-25T22:59:00.000Z', 'Europe/Berlin')).toBe('2026-10-25'); // tzdata: 23:59 CET
    expect(businessDay('2026-10-25T23:00:00.000Z', 'Europe/Berlin')).toBe('2026-10-26'); // tzdata: 00:00 CET
  });

  it('18:30 on the last day of a window in Los Angeles is still that day, in summer and in winter', () => {
    expect(businessDay('2026-06-10T01:30:00.000Z', 'America/Los_Angeles')).toBe('2026-06-09'); // tzdata: 18:30 PDT (UTC-7)
    expect(businessDay('2026-12-02T02:30:00.000Z', 'America/Los_Angeles')).toBe('2026-12-01'); // tzdata: 18:30 PST (UTC-8)
  });
});

describe('startOfBusinessDay: the first instant of a local day, in UTC', () => {
  it('is local midnight, with the offset in force that night', () => {
    expect(startOfBusinessDay('2026-03-08', 'America/Los_Angeles')).toBe('2026-03-08T08:00:00.000Z'); // tzdata: PST before the 02:00 change
    expect(startOfBusinessDay('2026-03-09', 'America/Los_Angeles')).toBe('2026-03-09T07:00:00.000Z'); // tzdata: PDT
    expect(startOfBusinessDay('2026-11-01', 'America/Los_Angeles')).toBe('2026-11-01T07:00:00.000Z'); // tzdata: PDT until 02:00
    expect(startOfBusinessDay('2026-11-02', 'America/Los_Angeles')).toBe('2026-11-02T08:00:00.000Z'); // tzdata: PST
    expect(startOfBusinessDay('2026-03-29', 'Europe/Berlin')).toBe('2026-03-28T23:00:00.000Z'); // tzdata: CET
    expect(startOfBusinessDay('2026-03-30', 'Europe/Berlin')).toBe('2026-03-29T22:00:00.000Z'); // tzdata: CEST
    expect(startOfBusinessDay('2026-10-25', 'Europe/Berlin')).toBe('2026-10-24T22:00:00.000Z'); // tzdata: CEST
    expect(startOfBusinessDay('2026-10-26', 'Europe/Berlin')).toBe('2026-10-25T23:00:00.000Z'); // tzdata: CET
  });

  it('round-trips with businessDay for every day of 2026 in both zones', () => {
    for (const tz of ['America/Los_Angeles', 'Europe/Berlin', 'UTC']) {
      let ms = Date.parse('2026-01-01T12:00:00Z');
      for (let i = 0; i < 365; i++, ms += 86_400_000) {
        const day = businessDay(ms, tz);
        const start = startOfBusinessDay(day, tz);
        expect(businessDay(start, tz)).toBe(day);
        expect(businessDay(Date.parse(start) - 1, tz) < day).toBe(true);
      }
    }
  });
});

describe('days old and bad input', () => {
  it('counts local days', () => {
    // submitted 23:30 PDT on 2026-06-09 (06:30 UTC on the 10th); on 2026-06-10 it is one day old
    expect(businessDaysSince('2026-06-10T06:30:00.000Z', '2026-06-10', 'America/Los_Angeles')).toBe(1);
    expect(businessDaysSince('2026-06-10T06:30:00.000Z', '2026-06-10', 'UTC')).toBe(0);
  });

  it('refuses unknown zones and instants', () => {
    expect(isTimeZone('Europe/Berlin')).toBe(true);
    expect(isTimeZone('Mars/Olympus_Mons')).toBe(false);
    expect(() => businessDay('2026-06-10T00:00:00Z', 'Mars/Olympus_Mons')).toThrow(CalculationInputError);
    expect(() => businessDay('yesterday', 'UTC')).toThrow(CalculationInputError);
  });
});
