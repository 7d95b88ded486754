/**
 * Mileage rates as dated data.
 *
 * A rate is in force from `effectiveFrom` to `effectiveTo`, both inclusive (`effectiveTo`
 * null: until further notice), for one currency and one distance unit (per mile for USD as
 * the IRS publishes it; per kilometre for agencies paid in another currency). The rate is
 * held in tenths of a cent of the currency's minor unit (655 = 65.5 cents), because the IRS
 * publishes half cents (e.g. 65.5 cents per mile, IRS Notice 2023-03) and a tenth leaves room.
 *
 * A repair date with no rate in force is an error for the manufacturer admin to fix, never a
 * guess from the nearest year.
 */
import { CalculationInputError } from './errors';
import { compareDates, parseIsoDate } from './dates';
import { mul, rational, type Rational } from './exact';

export type DistanceUnit = 'mi' | 'km';

export interface MileageRate {
  effectiveFrom: string;
  effectiveTo: string | null;
  currency: string;
  unit: DistanceUnit;
  /** Tenths of a cent per unit of distance: 655 = 65.5 cents. */
  rateTenthCents: number;
  /** Where the figure comes from, e.g. "IRS Notice 2023-03". */
  source: string;
}

const KM_PER_MILE_EXACT: Rational = { n: 1_609_344n, d: 1_000_000n };

/** The rate in force on `date` for `currency`, or null. Periods are inclusive at both ends. */
export function mileageRateOn(rates: readonly MileageRate[] | null | undefined, date: string, currency: string): MileageRate | null {
  parseIsoDate(date, 'repairDate');
  let best: MileageRate | null = null;
  for (const r of rates ?? []) {
    if (r.currency !== currency) continue;
    if (compareDates(r.effectiveFrom, date) > 0) continue;
    if (r.effectiveTo !== null && compareDates(r.effectiveTo, date) < 0) continue;
    if (!best || compareDates(r.effectiveFrom, best.effectiveFrom) > 0) best = r;
  }
  return best;
}

/** Cents per unit of the rate as an exact fraction. */
export function centsPerUnitExact(r: MileageRate): Rational {
  if (!Number.isSafeInteger(r.rateTenthCents) || r.rateTenthCents < 0) {
    throw new CalculationInputError('mileageRate.rateTenthCents', 'a mileage rate is a whole number of tenths of a cent, 0 or more');
  }
  return { n: BigInt(r.rateTenthCents), d: 10n };
}

/** Cents per mile of the rate, exactly (a per-km rate times 1.609344 km/mi, NIST SP 811). */
export function centsPerMileExact(r: MileageRate): Rational {
  const perUnit = centsPerUnitExact(r);
  return r.unit === 'km' ? mul(perUnit, KM_PER_MILE_EXACT) : perUnit;
}

/** The message shown when no rate is in force: the manufacturer admin must add one. */
export function missingMileageRateMessage(date: string, currency: string): string {
  return `No mileage rate is in force on the repair date ${date} for ${currency}. The manufacturer admin must add one (Catalogue, mileage rates) before this travel can be valued.`;
}

/** Two periods of the same currency and unit that share a day, or null. */
export function findOverlap<T extends Pick<MileageRate, 'effectiveFrom' | 'effectiveTo' | 'currency' | 'unit'>>(rates: readonly T[]): [T, T] | null {
  const sorted = [...rates].sort((a, b) => compareDates(a.effectiveFrom, b.effectiveFrom));
  for (let i = 0; i < sorted.length; i++) {
    for (let j = i + 1; j < sorted.length; j++) {
      const a = sorted[i];
      const b = sorted[j];
      if (a.currency !== b.currency) continue;
      if (a.effectiveTo === null || compareDates(b.effectiveFrom, a.effectiveTo) <= 0) return [a, b];
    }
  }
  return null;
}

/** rational() re-exported for callers that build a rate from a decimal string ("65.5"). */
export function tenthCentsOf(cents: string | number): number {
  const r = mul(rational(cents, 'rate'), { n: 10n, d: 1n });
  if (r.n % r.d !== 0n) throw new CalculationInputError('rate', 'a mileage rate has at most one decimal place of a cent');
  return Number(r.n / r.d);
}
