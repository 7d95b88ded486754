import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ApprovalLimitRow } from '@shared/schemas/approval-limits';
import { api } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

/** GET /api/admin/approval-limits: the reviewers of the manufacturer and their approval limits. */
export async function getApprovalLimits(signal?: AbortSignal): Promise<ApprovalLimitRow[]> {
  const body = await api.get<{ items: ApprovalLimitRow[] }>('/api/admin/approval-limits', undefined, signal);
  return body.items;
}

export const approvalLimitsQuery = () => queryOptions({ queryKey: [...adminKeys.all, 'approval-limits'] as const, queryFn: ({ signal }) => getApprovalLimits(signal) });

export function useApprovalLimits(enabled = true) {
  return useQuery({ ...approvalLimitsQuery(), enabled });
}
