/** Query keys of the manufacturer admin's screens. */
export const adminKeys = {
  all: ['admin'] as const,
  families: () => [...adminKeys.all, 'families'] as const,
  models: () => [...adminKeys.all, 'models'] as const,
  parts: () => [...adminKeys.all, 'parts'] as const,
  partPrices: (id: string) => [...adminKeys.all, 'parts', id, 'prices'] as const,
  repairCodes: () => [...adminKeys.all, 'repair-codes'] as const,
  allowances: (id: string) => [...adminKeys.all, 'repair-codes', id, 'allowances'] as const,
  agencies: () => [...adminKeys.all, 'agencies'] as const,
  agency: (id: string) => [...adminKeys.all, 'agencies', id] as const,
};

export const enc = encodeURIComponent;
