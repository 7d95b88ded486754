import { describe, expect, it } from 'vitest';
import { ageInDays } from './format';

// Offsets from the IANA time zone database (tzdata): America/Los_Angeles is UTC-7 in June (PDT).
describe('ageInDays counts the organisation’s calendar days', () => {
  it('a claim submitted at 23:30 local is one day old just after local midnight', () => {
    const submitted = '2026-06-10T06:30:00.000Z'; // 23:30 PDT on 2026-06-09
    const now = new Date('2026-06-10T07:30:00.000Z'); // 00:30 PDT on 2026-06-10: one hour later
    expect(ageInDays(submitted, now, 'America/Los_Angeles')).toBe(1);
  });

  it('a claim submitted at 18:00 local is still today at 23:00 local, though UTC has changed day', () => {
    const submitted = '2026-06-10T01:00:00.000Z'; // 18:00 PDT on 2026-06-09
    const now = new Date('2026-06-10T06:00:00.000Z'); // 23:00 PDT on 2026-06-09
    expect(ageInDays(submitted, now, 'America/Los_Angeles')).toBe(0);
    expect(ageInDays('2026-06-01', now, 'America/Los_Angeles')).toBe(8);
    expect(ageInDays(null, now, 'America/Los_Angeles')).toBeNull();
  });
});
