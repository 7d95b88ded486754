/** Request contracts of the workflow endpoints, shared by the client forms and the server. */
import { z } from 'zod';
import { claimActions } from './claim-machine';
import { multiLine, oneLine } from '../schemas/text';
import type { ClaimAction } from '../permissions/ability';

const version = z.number('Send the version you saw.').int().min(1);

/** POST /api/claims/:id/transitions. Reason and comment are checked per move by the machine's guards. */
export const transitionSchema = z.strictObject({
  type: z.enum(claimActions as [ClaimAction, ...ClaimAction[]], 'Unknown move.'),
  version,
  reason: oneLine({ max: 60, min: 0, label: 'The reason' }).nullable().optional(),
  comment: multiLine({ max: 4000, min: 0, label: 'The comment' }).nullable().optional(),
});
export type TransitionInput = z.infer<typeof transitionSchema>;

/** POST /api/claims/:id/comments */
export const commentSchema = z.strictObject({
  body: multiLine({ max: 4000, label: 'The comment', required: 'Write a comment.' }),
});
export type CommentInput = z.infer<typeof commentSchema>;

const reason = oneLine({ max: 500, min: 0, label: 'The reason' }).nullable();
/** A code from the reason list; needed when a line is approved above what the agency entered. */
const reasonCode = z.string().max(60).nullable().optional();

/**
 * POST /api/claims/:id/adjustments: a reviewer's line decisions while the claim is in review.
 * A line is adjusted with a value and a reason; sending both as null clears the adjustment.
 */
export const adjustmentsSchema = z.strictObject({
  version,
  laborLines: z
    .array(
      z.strictObject({
        id: z.string().min(1),
        approvedHours: z.number().min(0).max(24).nullable().optional(),
        approvedAmountCents: z.number().int().min(0).max(10_000_000).nullable().optional(),
        reason,
        reasonCode,
      }),
    )
    .max(20)
    .optional(),
  partLines: z
    .array(
      z.strictObject({
        id: z.string().min(1),
        approvedQuantity: z.number().int().min(0).max(99).nullable().optional(),
        approvedAmountCents: z.number().int().min(0).max(10_000_000).nullable().optional(),
        reason,
        reasonCode,
      }),
    )
    .max(40)
    .optional(),
  /** The whole trip (distance and time) approved as one amount. */
  travel: z.strictObject({ approvedAmountCents: z.number().int().min(0).max(10_000_000).nullable(), reason, reasonCode }).optional(),
});
export type AdjustmentsInput = z.infer<typeof adjustmentsSchema>;

/** POST /api/claims/:id/take-over: a reviewer takes a claim in review from another reviewer. */
export const takeOverSchema = z.strictObject({
  version,
  reason: oneLine({ max: 500, min: 3, label: 'The reason', required: 'Say why you take the claim over; the other reviewer reads it.' }),
});
export type TakeOverInput = z.infer<typeof takeOverSchema>;
