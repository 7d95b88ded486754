import { z } from 'zod';

/** PATCH /api/admin/approval-limits/:userId: a reviewer's approval limit in cents, or null for none. */
export const approvalLimitSchema = z.strictObject({
  limitCents: z.number('Enter the limit in cents, or leave it empty for no limit.').int('Enter whole cents.').min(0, 'The limit cannot be negative.').max(1_000_000_000, 'Enter at most 10,000,000.00.').nullable(),
});
export type ApprovalLimitInput = z.infer<typeof approvalLimitSchema>;

/** One reviewer of the manufacturer and the limit above which a second reviewer confirms an approval. */
export interface ApprovalLimitRow {
  userId: string;
  name: string;
  email: string;
  limitCents: number | null;
}
