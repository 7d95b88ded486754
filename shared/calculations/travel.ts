/**
 * Travel: distance and time.
 *
 * Distances are held in kilometres (the canonical unit of the data) and shown in
 * miles as well; contract caps and mileage rates are per mile (1 mi = 1.609344 km
 * exactly, NIST SP 811 B.8).
 *
 * - Floor: the round trip can not be shorter than twice the great-circle
 *   distance from the agency's base to the site (haversine, mean Earth radius
 *   6371.0088 km, IUGG). An entered distance below the floor is flagged.
 * - Upper check: road distance is typically 1.2-1.5x the great-circle distance
 *   (common practice). An entered round trip above max(1.6 x floor, floor + 10 km)
 *   is flagged; the 10 km of slack keeps short trips through street grids from
 *   being flagged.
 * - Payable distance = min(entered, contract cap); payable time = min(entered, cap).
 * - Mileage at the contract's rate; without one, the dated mileage rate in force on the
 *   repair date for the agency's currency (per mile or per kilometre, see mileage.ts).
 *   No rate in force is an input error, never the nearest year's rate.
 * - Distance and time are two lines, each rounded half-up once to whole cents.
 */
import { CalculationInputError } from './errors';
import { cmp, div, mul, product, rational, toNumber, type Rational } from './exact';
import { roundRationalToCents } from './money';
import { centsPerMileExact, centsPerUnitExact, mileageRateOn, missingMileageRateMessage, type MileageRate } from './mileage';
import { money, num, rateText } from './format';
import { assertNonNegative, assertRateCents } from './labor';

export interface LatLon {
  lat: number;
  lon: number;
}

/** IUGG mean Earth radius R1 (GRS80). */
export const MEAN_EARTH_RADIUS_KM = 6371.0088;
export const KM_PER_MILE = 1.609344;
const KM_PER_MILE_EXACT: Rational = { n: 1_609_344n, d: 1_000_000n };

/** Upper plausibility factor over the great-circle round trip (common practice: roads run 1.2-1.5x). */
export const ROAD_DISTANCE_FACTOR = 1.6;
/** Minimum slack over the floor before a round trip is called too long. */
export const ROAD_DISTANCE_MIN_SLACK_KM = 10;

const toRad = (deg: number): number => (deg * Math.PI) / 180;

function assertCoordinate(p: LatLon, field: string): void {
  if (!p || typeof p.lat !== 'number' || typeof p.lon !== 'number' || !Number.isFinite(p.lat) || !Number.isFinite(p.lon)) {
    throw new CalculationInputError(field, `${field} needs numeric lat and lon`);
  }
  if (p.lat < -90 || p.lat > 90) throw new CalculationInputError(`${field}.lat`, `${field}.lat must be within -90..90`);
  if (p.lon < -180 || p.lon > 180) throw new CalculationInputError(`${field}.lon`, `${field}.lon must be within -180..180`);
}

/** Great-circle distance by the haversine formula, in km. */
export function haversineKm(a: LatLon, b: LatLon, radiusKm: number = MEAN_EARTH_RADIUS_KM): number {
  assertCoordinate(a, 'a');
  assertCoordinate(b, 'b');
  const dLat = toRad(b.lat - a.lat);
  const dLon = toRad(b.lon - a.lon);
  const s = Math.sin(dLat / 2) ** 2 + Math.sin(dLon / 2) ** 2 * Math.cos(toRad(a.lat)) * Math.cos(toRad(b.lat));
  return 2 * radiusKm * Math.atan2(Math.sqrt(s), Math.sqrt(1 - s));
}

export interface TravelInput {
  id?: string;
  enteredRoundTripKm: number;
  travelHours: number;
}

export interface TravelContract {
  /** Cents per hour of travel time. */
  travelRateCents: number;
  /** Cents per mile (may carry a fraction, e.g. 65.5); null: the dated mileage rate in force on the repair date. */
  mileageRateCents: number | null;
  maxRoundTripMiles: number | null;
  maxTravelHours: number | null;
}

export interface TravelContext {
  base: LatLon | null;
  site: LatLon | null;
  repairDate: string;
  /** The dated mileage rates (for the agency's currency); used when the contract has no rate. */
  mileageRates?: readonly MileageRate[] | null;
}

export type TravelFlagCode = 'travel_over_cap' | 'travel_distance_implausible';

export interface TravelDistanceResult {
  enteredKm: number;
  enteredMiles: number;
  greatCircleKm: number | null;
  floorKm: number | null;
  plausibleUpToKm: number | null;
  payableKm: number;
  payableMiles: number;
  boundBy: 'entered' | 'cap';
  /** Cents per mile (a per-km rate converted exactly). */
  centsPerMile: number;
  /** The same, as an exact fraction (for reviewer adjustments by distance). */
  centsPerMileExact: Rational;
  rateSource: 'contract' | 'dated';
  /** The dated rate used, when the contract has none. */
  datedRate: MileageRate | null;
  requestedCents: number;
  amountCents: number;
  flags: TravelFlagCode[];
  explanation: string[];
}

export interface TravelTimeResult {
  enteredHours: number;
  payableHours: number;
  boundBy: 'entered' | 'cap';
  rateCents: number;
  requestedCents: number;
  amountCents: number;
  flags: TravelFlagCode[];
  explanation: string[];
}

export interface TravelResult {
  distance: TravelDistanceResult;
  time: TravelTimeResult;
  amountCents: number;
  flags: TravelFlagCode[];
  explanation: string[];
}

export function kmToMilesExact(km: number | Rational): Rational {
  return div(rational(km), KM_PER_MILE_EXACT);
}

export function computeTravel(
  travel: TravelInput,
  context: TravelContext,
  contract: TravelContract,
  options: { currency?: string } = {},
): TravelResult {
  const currency = options.currency;
  if (!travel || typeof travel !== 'object') throw new CalculationInputError('travel', 'travel is required');
  const enteredKm = assertNonNegative(travel.enteredRoundTripKm, 'travel.enteredRoundTripKm');
  const enteredHours = assertNonNegative(travel.travelHours, 'travel.travelHours');
  const travelRateCents = assertRateCents(contract.travelRateCents, 'contract.travelRateCents');
  const maxMiles = contract.maxRoundTripMiles == null ? null : assertNonNegative(contract.maxRoundTripMiles, 'contract.maxRoundTripMiles');
  const maxHours = contract.maxTravelHours == null ? null : assertNonNegative(contract.maxTravelHours, 'contract.maxTravelHours');

  // ---- distance
  const dFlags: TravelFlagCode[] = [];
  const dExpl: string[] = [];
  const enteredMilesExact = kmToMilesExact(enteredKm);
  const enteredMiles = toNumber(enteredMilesExact);
  dExpl.push(`Entered round trip ${num(enteredKm, 1)} km (${num(enteredMilesExact, 1)} mi).`);

  let greatCircleKm: number | null = null;
  let floorKm: number | null = null;
  let plausibleUpToKm: number | null = null;
  if (context.base && context.site) {
    greatCircleKm = haversineKm(context.base, context.site);
    floorKm = 2 * greatCircleKm;
    plausibleUpToKm = Math.max(floorKm * ROAD_DISTANCE_FACTOR, floorKm + ROAD_DISTANCE_MIN_SLACK_KM);
    if (enteredKm < floorKm) {
      dFlags.push('travel_distance_implausible');
      dExpl.push(
        `Below the floor: twice the great-circle distance from the base to the site is ${num(floorKm, 1)} km (2 x ${num(greatCircleKm, 1)} km), and no road trip is shorter.`,
      );
    } else if (enteredKm > plausibleUpToKm) {
      dFlags.push('travel_distance_implausible');
      dExpl.push(
        `Far above the floor of ${num(floorKm, 1)} km: more than ${num(plausibleUpToKm, 1)} km (the larger of ${ROAD_DISTANCE_FACTOR} x the floor and the floor + ${ROAD_DISTANCE_MIN_SLACK_KM} km; roads typically run 1.2-1.5x the great-circle distance, common practice).`,
      );
    } else {
      dExpl.push(`Plausible: between the great-circle floor of ${num(floorKm, 1)} km and ${num(plausibleUpToKm, 1)} km.`);
    }
  } else {
    dExpl.push('Base or site coordinates are missing: the great-circle floor check was not made.');
  }

  let payableMilesExact = enteredMilesExact;
  let dBound: 'entered' | 'cap' = 'entered';
  if (maxMiles !== null) {
    const cap = rational(maxMiles);
    if (cmp(enteredMilesExact, cap) > 0) {
      payableMilesExact = cap;
      dBound = 'cap';
      dFlags.push('travel_over_cap');
      dExpl.push(`The contract caps the round trip at ${num(maxMiles)} mi: ${num(maxMiles)} mi payable.`);
    } else {
      dExpl.push(`Within the contract cap of ${num(maxMiles)} mi.`);
    }
  }

  let perMile: Rational;
  let rateSource: 'contract' | 'dated';
  let datedRate: MileageRate | null = null;
  let rateLine: string;
  if (contract.mileageRateCents != null) {
    perMile = rational(assertNonNegative(contract.mileageRateCents, 'contract.mileageRateCents'));
    rateSource = 'contract';
    dExpl.push(`Mileage rate from the contract terms: ${num(perMile)} cents per mile.`);
    rateLine = `${num(payableMilesExact, 4)} mi x ${rateText(perMile, currency)}/mi`;
  } else {
    const cur = currency ?? 'USD';
    datedRate = mileageRateOn(context.mileageRates, context.repairDate, cur);
    if (!datedRate) throw new CalculationInputError('repairDate', missingMileageRateMessage(context.repairDate, cur));
    perMile = centsPerMileExact(datedRate);
    rateSource = 'dated';
    const perUnit = centsPerUnitExact(datedRate);
    dExpl.push(
      `The contract has no mileage rate; the rate in force on ${context.repairDate} is ${num(perUnit)} cents per ${datedRate.unit === 'km' ? 'kilometre' : 'mile'} (${datedRate.source}, ${datedRate.effectiveFrom} to ${datedRate.effectiveTo ?? 'further notice'}).`,
    );
    rateLine =
      datedRate.unit === 'km'
        ? `${num(mul(payableMilesExact, KM_PER_MILE_EXACT), 4)} km x ${rateText(perUnit, currency)}/km`
        : `${num(payableMilesExact, 4)} mi x ${rateText(perUnit, currency)}/mi`;
  }
  const centsPerMile = toNumber(perMile);
  const distanceExact = mul(payableMilesExact, perMile);
  const distanceCents = roundRationalToCents(distanceExact);
  const distanceRequestedCents = roundRationalToCents(mul(enteredMilesExact, perMile));
  dExpl.push(`${rateLine} = ${rateText(distanceExact, currency)}, rounded half-up to ${money(distanceCents, currency)}.`);
  const payableKm = toNumber(mul(payableMilesExact, KM_PER_MILE_EXACT));

  // ---- time
  const tFlags: TravelFlagCode[] = [];
  const tExpl: string[] = [`Travel time entered ${num(enteredHours)} h.`];
  let payableHours = enteredHours;
  let tBound: 'entered' | 'cap' = 'entered';
  if (maxHours !== null) {
    if (enteredHours > maxHours) {
      payableHours = maxHours;
      tBound = 'cap';
      tFlags.push('travel_over_cap');
      tExpl.push(`The contract caps travel time at ${num(maxHours)} h: ${num(maxHours)} h payable.`);
    } else {
      tExpl.push(`Within the contract cap of ${num(maxHours)} h.`);
    }
  }
  const timeExact = product([payableHours, travelRateCents]);
  const timeCents = roundRationalToCents(timeExact);
  const timeRequestedCents = roundRationalToCents(product([enteredHours, travelRateCents]));
  tExpl.push(
    `${num(payableHours)} h x ${money(travelRateCents, currency)}/h = ${rateText(timeExact, currency)}, rounded half-up to ${money(timeCents, currency)}.`,
  );

  const flags = [...new Set([...dFlags, ...tFlags])];
  return {
    distance: {
      enteredKm,
      enteredMiles,
      greatCircleKm,
      floorKm,
      plausibleUpToKm,
      payableKm,
      payableMiles: toNumber(payableMilesExact),
      boundBy: dBound,
      centsPerMile,
      centsPerMileExact: perMile,
      rateSource,
      datedRate,
      requestedCents: distanceRequestedCents,
      amountCents: distanceCents,
      flags: dFlags,
      explanation: dExpl,
    },
    time: {
      enteredHours,
      payableHours,
      boundBy: tBound,
      rateCents: travelRateCents,
      requestedCents: timeRequestedCents,
      amountCents: timeCents,
      flags: tFlags,
      explanation: tExpl,
    },
    amountCents: distanceCents + timeCents,
    flags,
    explanation: [...dExpl, ...tExpl],
  };
}
