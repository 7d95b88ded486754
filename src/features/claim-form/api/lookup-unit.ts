import { queryOptions, useQuery } from '@tanstack/react-query';
import type { UnitLookup } from '@shared/schemas/unit';
import { api } from '@/lib/api-client';
import { claimFormKeys } from './claim-form-keys';

/** GET /api/units/:serial?on=: the unit, its model and site, and its coverage on that date. */
export function lookupUnit(serial: string, on: string | null, signal?: AbortSignal): Promise<UnitLookup> {
  return api.get<UnitLookup>(`/api/units/${encodeURIComponent(serial)}`, { on }, signal);
}

export function unitLookupQuery(serial: string, on: string | null) {
  return queryOptions({
    queryKey: claimFormKeys.unit(serial, on),
    queryFn: ({ signal }) => lookupUnit(serial, on, signal),
    staleTime: 60_000,
  });
}

/** Looks the serial up once it is long enough to be one; an unknown serial is a 404 the screen explains. */
export function useUnitLookup(serial: string, on: string | null) {
  const s = serial.trim();
  return useQuery({ ...unitLookupQuery(s, on), enabled: s.length >= 3 && s.length <= 60 });
}
