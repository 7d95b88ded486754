import type { MileageRate } from './mileage';

// IRS business standard mileage rates, cents per mile, each from its notice (tenths of a cent).
export const IRS_RATES: MileageRate[] = [
  { effectiveFrom: '2022-01-01', effectiveTo: '2022-06-30', currency: 'USD', unit: 'mi', rateTenthCents: 585, source: 'IRS Notice 2022-03' }, // 58.5 cents
  { effectiveFrom: '2022-07-01', effectiveTo: '2022-12-31', currency: 'USD', unit: 'mi', rateTenthCents: 625, source: 'IRS Announcement 2022-13' }, // 62.5 cents (news release IR-2022-124)
  { effectiveFrom: '2023-01-01', effectiveTo: '2023-12-31', currency: 'USD', unit: 'mi', rateTenthCents: 655, source: 'IRS Notice 2023-03' }, // 65.5 cents
  { effectiveFrom: '2024-01-01', effectiveTo: '2024-12-31', currency: 'USD', unit: 'mi', rateTenthCents: 670, source: 'IRS Notice 2024-08' }, // 67 cents
  { effectiveFrom: '2025-01-01', effectiveTo: '2025-12-31', currency: 'USD', unit: 'mi', rateTenthCents: 700, source: 'IRS Notice 2025-5' }, // 70 cents
  // 72.5 cents for 2026: recalled from secondary reports of IRS Notice 2026-10, not checked against the notice text
  { effectiveFrom: '2026-01-01', effectiveTo: '2026-12-31', currency: 'USD', unit: 'mi', rateTenthCents: 725, source: 'IRS Notice 2026-10' },
];
