import { useSearchParams } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { isApiError } from '@/lib/api-client';
import { agenciesQuery } from '@/features/admin/api/get-agencies';
import { AgenciesPanel } from '@/features/admin/components/agencies-panel';

export const agenciesLoader = (queryClient: QueryClient) => async () => {
  try {
    await queryClient.ensureQueryData(agenciesQuery());
  } catch (e) {
    if (isApiError(e, 401)) throw e;
  }
  return null;
};

/** Service agencies and their contract terms, for the manufacturer admin. */
export function AgenciesRoute() {
  const [params, setParams] = useSearchParams();
  const selected = params.get('agency');
  return (
    <div className="space-y-5">
      <title>Service agencies · Fieldproof</title>
      <div>
        <h1 className="text-2xl font-semibold text-ink-900">Service agencies</h1>
        <p className="text-sm text-ink-600">Each agency's contract terms run in periods that never overlap; a claim is valued with the terms in force on its repair date.</p>
      </div>
      <AgenciesPanel selectedId={selected} onSelect={(id) => setParams(id ? { agency: id } : {})} />
    </div>
  );
}
