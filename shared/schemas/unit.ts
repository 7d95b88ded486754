import { z } from 'zod';
import type { CoverageResult } from '../calculations/coverage';
import type { ClaimListItem } from './claim';

/** GET /api/units/:serial?on=YYYY-MM-DD */
export const unitLookupQuerySchema = z.object({
  on: z.iso.date('Use a date as YYYY-MM-DD, like 2026-03-31.').optional(),
});

/**
 * The warranty terms of one unit: those of its model in force on its registration date, or
 * its ship date when it is not registered. Later changes of the model do not change them.
 */
export interface UnitTerms {
  basis: 'registration' | 'ship';
  basisDate: string;
  /** The effective date of the model's terms that apply ('0001-01-01': since the model was created). */
  effectiveFrom: string;
  partsMonths: number;
  laborMonths: number;
  capMonthsFromShip: number;
  installGraceDays: number;
  componentTerms: { partId: string; label: string; partsMonths: number }[];
}

export interface UnitLookup {
  /** The unit's own terms (the model's terms in force when it shipped or was registered). */
  terms: UnitTerms;
  unit: { id: string; serial: string; revision: string; shipDate: string; installDate: string | null };
  model: { id: string; modelNumber: string; name: string; partsMonths: number; laborMonths: number; capMonthsFromShip: number; installGraceDays: number };
  family: { id: string; code: string; name: string; fuel: 'gas' | 'electric' };
  site: null | { id: string; name: string; addressLine: string; city: string; region: string; postalCode: string; latitude: number; longitude: number };
  /** The date coverage is judged on (the query's `on`, else today). */
  on: string;
  coverage: CoverageResult;
  /** Earlier claims on this unit that this user may see, newest repair first. */
  priorClaims: ClaimListItem[];
}
