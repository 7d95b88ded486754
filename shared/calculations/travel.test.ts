import { describe, it, expect } from 'vitest';
import Decimal from 'decimal.js';
import { CalculationInputError } from './errors';
import { findOverlap, mileageRateOn, tenthCentsOf, type MileageRate } from './mileage';
import { IRS_RATES } from './irs-rates.fixture';
import fc from 'fast-check';
import { distance as turfDistance } from '@turf/distance';
import {
  haversineKm,
  MEAN_EARTH_RADIUS_KM,
  computeTravel,
  ROAD_DISTANCE_FACTOR,
  type TravelContract,
} from './travel';

const BNA = { lat: 36.12, lon: -86.67 };
const LAX = { lat: 33.94, lon: -118.4 };

describe('haversine great-circle distance', () => {
  it('BNA to LAX, Rosetta Code worked example, both radii', () => {
    // Rosetta Code "Haversine formula": BNA (36.12, -86.67) to LAX (33.94, -118.40), R = 6371.0 km
    expect(haversineKm(BNA, LAX, 6371.0)).toBeCloseTo(2886.44444283798, 9);
    // Rosetta Code "Haversine formula": same pair, R = 6372.8 km
    expect(haversineKm(BNA, LAX, 6372.8)).toBeCloseTo(2887.25995060711, 9);
  });

  it('defaults to the mean Earth radius 6371.0088 km', () => {
    expect(MEAN_EARTH_RADIUS_KM).toBe(6371.0088); // IUGG / GRS80 mean radius R1
    expect(haversineKm(BNA, LAX)).toBeCloseTo(2886.448, 3); // IUGG R1 with the Rosetta Code pair: 2886.448 km (@turf/distance 7.4 agrees)
    // @turf/distance README example: [-75.343, 39.984] to [-75.534, 39.123] = 97.1292 km
    expect(haversineKm({ lat: 39.984, lon: -75.343 }, { lat: 39.123, lon: -75.534 })).toBeCloseTo(97.1292, 4);
  });

  it('agrees with @turf/distance on 1,000 random point pairs within 1e-9 relative', () => {
    const coord = fc.record({
      lat: fc.double({ min: -90, max: 90, noNaN: true }),
      lon: fc.double({ min: -180, max: 180, noNaN: true }),
    });
    fc.assert(
      fc.property(coord, coord, (a, b) => {
        const ours = haversineKm(a, b);
        const ref = turfDistance([a.lon, a.lat], [b.lon, b.lat], { units: 'kilometers' }); // @turf/distance 7.4
        if (ref === 0) expect(ours).toBeLessThan(1e-9);
        else expect(Math.abs(ours - ref) / ref).toBeLessThanOrEqual(1e-9);
      }),
      { numRuns: 1_000 },
    );
  });

  it('is symmetric and zero for one point', () => {
    expect(haversineKm(BNA, BNA)).toBe(0);
    expect(haversineKm(LAX, BNA)).toBeCloseTo(haversineKm(BNA, LAX), 9);
    expect(() => haversineKm({ lat: 91, lon: 0 }, BNA)).toThrow(/lat/);
  });
});

describe('dated mileage rates', () => {
  const contract: TravelContract = { travelRateCents: 0, mileageRateCents: null, maxRoundTripMiles: null, maxTravelHours: null };
  const hundredMiles = { enteredRoundTripKm: 160.9344, travelHours: 0 }; // 100 mi exactly (NIST SP 811 B.8)
  const at = (repairDate: string) => computeTravel(hundredMiles, { base: null, site: null, repairDate, mileageRates: IRS_RATES }, contract, { currency: 'USD' });

  it('a 2022 repair takes 58.5 or 62.5 cents by its date, not 65.5', () => {
    expect(at('2022-03-15').distance.amountCents).toBe(5850); // IRS Notice 2022-03: 100 mi x 58.5 cents
    expect(at('2022-06-30').distance.amountCents).toBe(5850); // last day of the first-half 2022 rate, inclusive
    expect(at('2022-07-01').distance.amountCents).toBe(6250); // IRS Announcement 2022-13 (IR-2022-124): 62.5 cents from 2022-07-01
    expect(at('2022-07-01').distance.datedRate?.source).toBe('IRS Announcement 2022-13');
  });

  it('each year by its notice', () => {
    expect(at('2023-06-01').distance.centsPerMile).toBe(65.5); // IRS Notice 2023-03
    expect(at('2024-01-01').distance.centsPerMile).toBe(67); // IRS Notice 2024-08
    expect(at('2025-12-31').distance.centsPerMile).toBe(70); // IRS Notice 2025-5
    expect(at('2026-03-01').distance.centsPerMile).toBe(72.5); // IRS Notice 2026-10, recalled (see the table above)
    expect(at('2023-06-01').explanation.join(' ')).toMatch(/IRS Notice 2023-03/);
  });

  it('a repair date with no rate in force is an error, never the nearest year', () => {
    expect(() => at('2021-05-05')).toThrow(CalculationInputError);
    expect(() => at('2021-05-05')).toThrow(/No mileage rate is in force on the repair date 2021-05-05 for USD/);
    expect(() => at('2027-01-01')).toThrow(/No mileage rate is in force/);
    expect(mileageRateOn(IRS_RATES, '2021-12-31', 'USD')).toBeNull();
    expect(mileageRateOn(IRS_RATES, '2024-07-04', 'CAD')).toBeNull();
  });

  it('a per-kilometre rate for another currency: km x rate', () => {
    // arbitrary test rate of 61.5 cents per km; 100 mi = 160.9344 km (NIST SP 811 B.8)
    const cad: MileageRate = { effectiveFrom: '2025-01-01', effectiveTo: null, currency: 'CAD', unit: 'km', rateTenthCents: 615, source: 'test rate' };
    const t = computeTravel(hundredMiles, { base: null, site: null, repairDate: '2025-04-01', mileageRates: [cad, ...IRS_RATES] }, contract, { currency: 'CAD' });
    // 160.9344 km x 61.5 = 9897.4656 cents -> 9897 (half-up; decimal.js agrees)
    expect(t.distance.amountCents).toBe(new Decimal('160.9344').times('61.5').toDecimalPlaces(0, Decimal.ROUND_HALF_UP).toNumber());
    expect(t.distance.amountCents).toBe(9897);
    expect(t.distance.explanation.join(' ')).toMatch(/cents per kilometre/);
  });

  it('finds overlapping periods of one currency', () => {
    expect(findOverlap(IRS_RATES)).toBeNull();
    const extra = { effectiveFrom: '2024-12-01', effectiveTo: null, currency: 'USD', unit: 'mi' as const };
    expect(findOverlap([...IRS_RATES, extra])?.map((r) => r.effectiveFrom)).toEqual(['2024-01-01', '2024-12-01']);
    expect(tenthCentsOf('65.5')).toBe(655);
    expect(() => tenthCentsOf('65.55')).toThrow(/one decimal place/);
  });
});

describe('travel floor, plausibility and caps', () => {
  const contract: TravelContract = { travelRateCents: 5000, mileageRateCents: 60, maxRoundTripMiles: null, maxTravelHours: null };
  // A site 0.5 degrees of latitude north of the base: great circle = R x 0.5 x pi / 180
  const base = { lat: 40, lon: -90 };
  const site = { lat: 40.5, lon: -90 };
  const gc = (MEAN_EARTH_RADIUS_KM * 0.5 * Math.PI) / 180; // 55.597 km, haversine along a meridian
  const ctx = { base, site, repairDate: '2025-05-01' };

  it('floor is twice the great-circle distance', () => {
    const t = computeTravel({ enteredRoundTripKm: 130, travelHours: 2 }, ctx, contract);
    expect(t.distance.greatCircleKm).toBeCloseTo(gc, 9); // arc length along a meridian = R x delta-lat (radians)
    expect(t.distance.floorKm).toBeCloseTo(2 * gc, 9);
    expect(t.flags).toEqual([]);
  });

  it('flags a round trip below the floor', () => {
    const t = computeTravel({ enteredRoundTripKm: 100, travelHours: 2 }, ctx, contract);
    expect(t.distance.flags).toContain('travel_distance_implausible');
    expect(t.explanation.join(' ')).toMatch(/Below the floor/);
  });

  it(`flags a round trip above ${ROAD_DISTANCE_FACTOR} x the floor (common practice: roads run 1.2-1.5x great circle)`, () => {
    const limit = 2 * gc * ROAD_DISTANCE_FACTOR; // 177.91 km
    expect(computeTravel({ enteredRoundTripKm: Math.floor(limit * 10) / 10, travelHours: 2 }, ctx, contract).flags).toEqual([]);
    expect(computeTravel({ enteredRoundTripKm: Math.ceil(limit * 10) / 10, travelHours: 2 }, ctx, contract).flags).toEqual([
      'travel_distance_implausible',
    ]);
  });

  it('short trips get at least 10 km of slack over the floor', () => {
    const near = { base, site: { lat: 40.01, lon: -90 }, repairDate: '2025-05-01' }; // 1.11 km away: floor 2.22 km
    expect(computeTravel({ enteredRoundTripKm: 8, travelHours: 0.5 }, near, contract).flags).toEqual([]);
    expect(computeTravel({ enteredRoundTripKm: 13, travelHours: 0.5 }, near, contract).flags).toEqual(['travel_distance_implausible']);
  });

  it('skips the floor check without coordinates and says so', () => {
    const t = computeTravel({ enteredRoundTripKm: 5, travelHours: 1 }, { base: null, site, repairDate: '2025-05-01' }, contract);
    expect(t.flags).toEqual([]);
    expect(t.distance.floorKm).toBeNull();
    expect(t.explanation.join(' ')).toMatch(/floor check was not made/);
  });

  it('caps distance and time and pays the dated IRS rate when the contract has none', () => {
    const t = computeTravel(
      { enteredRoundTripKm: 321.8688, travelHours: 3.5 }, // 321.8688 km = 200 mi exactly (NIST SP 811 B.8: 1 mi = 1.609344 km)
      { base: null, site: null, repairDate: '2024-09-10', mileageRates: IRS_RATES },
      { travelRateCents: 4000, mileageRateCents: null, maxRoundTripMiles: 150, maxTravelHours: 3 },
    );
    expect(t.distance.enteredMiles).toBe(200); // NIST SP 811 B.8
    expect(t.distance.payableMiles).toBe(150);
    expect(t.distance.centsPerMile).toBe(67); // IRS Notice 2024-08: 67 cents per mile in 2024
    expect(t.distance.amountCents).toBe(10050); // 150 mi x 67 = 10,050 cents
    expect(t.distance.requestedCents).toBe(13400); // 200 mi x 67 = 13,400 cents
    expect(t.time.amountCents).toBe(12000); // 3 h x 4,000 = 12,000 cents
    expect(t.flags).toEqual(['travel_over_cap']);
  });
});
