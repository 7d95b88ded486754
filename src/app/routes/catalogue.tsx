import { useSearchParams } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { isApiError } from '@/lib/api-client';
import { cx } from '@/lib/cx';
import { familiesQuery } from '@/features/admin/api/get-families';
import { FamiliesPanel } from '@/features/admin/components/families-panel';
import { ModelsPanel } from '@/features/admin/components/models-panel';
import { PartsPanel } from '@/features/admin/components/parts-panel';
import { RepairCodesPanel } from '@/features/admin/components/repair-codes-panel';
import { MileageRatesPanel } from '@/features/admin/components/mileage-rates-panel';

const tabs = [
  { key: 'repair-codes', label: 'Repair codes' },
  { key: 'parts', label: 'Parts' },
  { key: 'models', label: 'Models' },
  { key: 'families', label: 'Product families' },
  { key: 'mileage', label: 'Mileage rates' },
] as const;
type TabKey = (typeof tabs)[number]['key'];

export const catalogueLoader = (queryClient: QueryClient) => async () => {
  try {
    await queryClient.ensureQueryData(familiesQuery());
  } catch (e) {
    if (isApiError(e, 401)) throw e;
  }
  return null;
};

/** The manufacturer admin's catalogue: families, models with terms and readings, parts, repair codes. */
export function CatalogueRoute() {
  const [params, setParams] = useSearchParams();
  const tab: TabKey = tabs.some((t) => t.key === params.get('tab')) ? (params.get('tab') as TabKey) : 'repair-codes';
  return (
    <div className="space-y-5">
      <title>Catalogue · Fieldproof</title>
      <div>
        <h1 className="text-2xl font-semibold text-ink-900">Catalogue</h1>
        <p className="text-sm text-ink-600">Changes are recorded in the audit log. Nothing a claim points at is deleted: retire it instead.</p>
      </div>
      <div role="tablist" aria-label="Catalogue sections" className="flex flex-wrap gap-1 border-b border-ink-200">
        {tabs.map((t) => (
          <button
            key={t.key}
            role="tab"
            type="button"
            aria-selected={tab === t.key}
            onClick={() => setParams({ tab: t.key })}
            className={cx('-mb-px border-b-2 px-3 py-2 text-sm font-medium', tab === t.key ? 'border-ink-700 text-ink-900' : 'border-transparent text-ink-600 hover:text-ink-900')}
          >
            {t.label}
          </button>
        ))}
      </div>
      {tab === 'repair-codes' && <RepairCodesPanel />}
      {tab === 'parts' && <PartsPanel />}
      {tab === 'models' && <ModelsPanel />}
      {tab === 'families' && <FamiliesPanel />}
      {tab === 'mileage' && <MileageRatesPanel />}
    </div>
  );
}
