import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ApprovalLimitInput, ApprovalLimitRow } from '@shared/schemas/approval-limits';
import { api } from '@/lib/api-client';
import { approvalLimitsQuery } from './get-approval-limits';
import { enc } from './admin-keys';

/** PATCH /api/admin/approval-limits/:userId: a reviewer's limit in cents, or null for none. */
export function setApprovalLimit(userId: string, body: ApprovalLimitInput): Promise<ApprovalLimitRow> {
  return api.patch<ApprovalLimitRow>(`/api/admin/approval-limits/${enc(userId)}`, body);
}

export function useSetApprovalLimit() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ userId, body }: { userId: string; body: ApprovalLimitInput }) => setApprovalLimit(userId, body),
    onSettled: () => void queryClient.invalidateQueries({ queryKey: approvalLimitsQuery().queryKey }),
  });
}
