import { useMemo } from 'react';
import { valueClaim, type Valuation, type ValuationInput } from '@shared/calculations/valuation';
import { isCalculationInputError } from '@shared/calculations/errors';
import { KM_PER_MILE } from '@shared/calculations/travel';
import type { CatalogModel, CatalogPart, CatalogRepairCode } from '@shared/schemas/catalog';
import type { ClaimValuationBasis } from '@shared/schemas/claim';
import type { ClaimFormValues } from '../form-model';

export interface LiveValuation {
  valuation: Valuation | null;
  /** Why there is no valuation yet, in words for the technician. */
  problems: string[];
}

const ISO = /^\d{4}-\d{2}-\d{2}$/;
const okNumber = (x: unknown): x is number => typeof x === 'number' && Number.isFinite(x) && x >= 0;

/** Miles as entered, to the kilometres the computation takes (the server converts the same way). */
export function milesToKm(miles: number): number {
  return Number((miles * KM_PER_MILE).toFixed(9));
}

/**
 * The valuation input for the form as it stands: contract and warranty terms, coordinates,
 * certifications and prior repairs from the stored claim; dates, lines, travel and readings
 * from the form, priced from the catalogue. Lines still being typed are left out.
 */
export function liveInputOf(
  basis: ValuationInput,
  values: ClaimFormValues,
  catalog: { repairCodes: readonly CatalogRepairCode[]; parts: readonly CatalogPart[]; specs: CatalogModel['readingSpecs'] },
): ValuationInput {
  const codes = new Map(catalog.repairCodes.map((c) => [c.id, c]));
  const parts = new Map(catalog.parts.map((p) => [p.id, p]));
  const specs = new Map(catalog.specs.map((s) => [s.key, s]));
  const preAuthorization = values.preAuthorization && values.preAuthorization.trim() !== '' ? values.preAuthorization.trim() : null;
  return {
    ...basis,
    failureDate: values.failureDate && ISO.test(values.failureDate) ? values.failureDate : basis.failureDate,
    repairDate: values.repairDate && ISO.test(values.repairDate) ? values.repairDate : basis.repairDate,
    labor: values.laborLines.flatMap((l, i) => {
      const rc = codes.get(l.repairCodeId);
      if (!rc || !okNumber(l.hoursWorked) || l.hoursWorked === 0) return [];
      return [{ id: `labor-${i}`, repairCode: { code: rc.code, allowedHours: rc.allowedHours, description: rc.description }, hoursWorked: l.hoursWorked, overtime: !!l.overtime, preAuthorization }];
    }),
    travel:
      values.travel && okNumber(values.travel.roundTripMiles) && okNumber(values.travel.travelHours)
        ? { id: 'travel', enteredRoundTripKm: milesToKm(values.travel.roundTripMiles), travelHours: values.travel.travelHours }
        : null,
    parts: values.partLines.flatMap((p, i) => {
      const part = parts.get(p.partId);
      if (!part || !Number.isInteger(p.quantity) || p.quantity < 1) return [];
      return [{ id: `part-${i}`, part: { id: part.id, partNumber: part.partNumber, description: part.description, listPriceCents: part.listPriceCents, returnRequired: part.returnRequired }, quantity: p.quantity }];
    }),
    readings: values.readings.flatMap((r, i) => {
      const spec = specs.get(r.key);
      if (!spec || !Number.isFinite(r.value)) return [];
      return [{ id: `reading-${i}`, value: r.value, unit: r.unit, spec: { unit: spec.unit, nominal: spec.nominal, tolerance: spec.tolerance, phase: r.phase, label: spec.label } }];
    }),
    // The reviewer's adjustments belong to the lines as stored; the preview shows the form's lines as entered.
    adjustments: [],
  };
}

/** Runs the shared valuation in the browser on every change of the form. */
export function useLiveValuation(
  basis: ClaimValuationBasis | undefined,
  values: ClaimFormValues,
  catalog: { repairCodes: readonly CatalogRepairCode[]; parts: readonly CatalogPart[]; specs: CatalogModel['readingSpecs'] },
): LiveValuation {
  const key = JSON.stringify(values);
  return useMemo(() => {
    if (!basis) return { valuation: null, problems: ['Loading the contract terms…'] };
    if (!basis.input) return { valuation: null, problems: basis.problems.map((p) => p.message) };
    try {
      return { valuation: valueClaim(liveInputOf(basis.input, values, catalog)), problems: [] };
    } catch (e) {
      if (isCalculationInputError(e)) return { valuation: null, problems: [e.message] };
      throw e;
    }
    // `key` stands for the values: useWatch hands a new object on every render.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [basis, key, catalog.repairCodes, catalog.parts, catalog.specs]);
}
