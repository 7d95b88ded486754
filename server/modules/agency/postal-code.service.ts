import zipcodes from 'zipcodes';
import type { PostalCodeLookup } from '@shared/schemas/admin';
import { ValidationError } from '../../lib/errors';

/**
 * Postal-code centroids from the `zipcodes` package: its US ZIP and Canadian forward-sortation
 * tables ship inside the package, so the lookup works offline. A centroid is a starting point
 * for travel checks; the agency (or the manufacturer) corrects coordinates by hand where needed.
 */
export function lookupPostalCode(raw: string): PostalCodeLookup | null {
  const code = raw.trim().toUpperCase();
  const key = /^\d{5}(-\d{4})?$/.test(code) ? code.slice(0, 5) : /^[A-Z]\d[A-Z] ?\d[A-Z]\d$/.test(code) ? code.slice(0, 3) : null;
  if (!key) return null;
  const hit = zipcodes.lookup(key);
  if (!hit || typeof hit.latitude !== 'number' || typeof hit.longitude !== 'number') return null;
  return { postalCode: code, city: hit.city, region: hit.state, country: hit.country === 'Canada' ? 'CA' : hit.country || 'US', latitude: hit.latitude, longitude: hit.longitude };
}

interface Address {
  postalCode: string | null;
  city: string | null;
  region: string | null;
  country: string;
  latitude: number | null;
  longitude: number | null;
}

type AddressPatch = Partial<Omit<Address, 'country'>>;

/**
 * Applies an address change and fills what the postal code gives:
 * - coordinates given as numbers are kept (corrected by hand);
 * - coordinates given as null, or a changed postal code without coordinates, are looked up;
 * - an unchanged postal code without coordinates keeps the stored ones;
 * - city and region are filled from the lookup only when left blank.
 * A postal code the table does not know, with no coordinates given, is a field error.
 */
export function resolveAddress(current: Address, patch: AddressPatch): Address {
  const next: Address = {
    postalCode: patch.postalCode !== undefined ? patch.postalCode : current.postalCode,
    city: patch.city !== undefined ? patch.city : current.city,
    region: patch.region !== undefined ? patch.region : current.region,
    country: current.country,
    latitude: current.latitude,
    longitude: current.longitude,
  };
  const handGiven = typeof patch.latitude === 'number' && typeof patch.longitude === 'number';
  const postalChanged = patch.postalCode !== undefined && patch.postalCode !== current.postalCode;
  const lookupWanted = !handGiven && (patch.latitude === null || postalChanged || (current.latitude === null && next.postalCode !== null));
  const hit = next.postalCode ? lookupPostalCode(next.postalCode) : null;

  if (handGiven) {
    next.latitude = patch.latitude as number;
    next.longitude = patch.longitude as number;
  } else if (lookupWanted) {
    if (next.postalCode && !hit) {
      throw new ValidationError('We could not place this postal code.', {
        postalCode: 'This postal code is not in the lookup table. Check it, or enter the latitude and longitude by hand.',
      });
    }
    next.latitude = hit ? hit.latitude : null;
    next.longitude = hit ? hit.longitude : null;
  }
  if (hit) {
    if (!next.city) next.city = hit.city;
    if (!next.region) next.region = hit.region;
    next.country = hit.country;
  }
  return next;
}
