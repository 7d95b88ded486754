/**
 * Query keys of the claim form. The claim's own keys start with ['claims', 'detail', id], so
 * invalidating ['claims'] (as every claim write does) refreshes the valuation input too.
 */
export const claimFormKeys = {
  unit: (serial: string, on: string | null) => ['units', serial, on ?? 'today'] as const,
  repairCodes: (family: string) => ['catalog', 'repair-codes', family] as const,
  parts: (family: string) => ['catalog', 'parts', family] as const,
  models: (family: string) => ['catalog', 'models', family] as const,
  claimDetail: (id: string) => ['claims', 'detail', id] as const,
  valuationBasis: (id: string) => ['claims', 'detail', id, 'valuation-input'] as const,
};
