import { z } from 'zod';
import { attachmentRoles, type AttachmentRole } from './claim';
import { oneLine } from './text';

/** PATCH /api/attachments/:id: relabel a piece of evidence while its claim is a draft or returned. */
export const relabelAttachmentSchema = z.strictObject({
  role: z.enum(attachmentRoles as unknown as [AttachmentRole, ...AttachmentRole[]], 'Choose what the file shows from the list.'),
});
export type RelabelAttachmentInput = z.infer<typeof relabelAttachmentSchema>;

/** POST /api/attachments/:id/retraction: withdraw a piece of evidence of a filed claim, with a reason the reviewer reads. */
export const retractAttachmentSchema = z.strictObject({
  reason: oneLine({ max: 500, min: 3, label: 'The reason', required: 'Say why the file is retracted; the reviewer reads it.' }),
});
export type RetractAttachmentInput = z.infer<typeof retractAttachmentSchema>;
