import { useQuery } from '@tanstack/react-query';
import type { SubmissionChanges } from '@shared/schemas/claim-history';
import { api } from '@/lib/api-client';
import { claimKeys } from './claim-keys';

/** What changed between the claim's last two submissions. */
export function getSubmissionChanges(id: string, signal?: AbortSignal): Promise<SubmissionChanges> {
  return api.get<SubmissionChanges>(`/api/claims/${encodeURIComponent(id)}/changes`, undefined, signal);
}

export function useSubmissionChanges(id: string, enabled: boolean) {
  return useQuery({ queryKey: claimKeys.changes(id), queryFn: ({ signal }) => getSubmissionChanges(id, signal), enabled });
}
