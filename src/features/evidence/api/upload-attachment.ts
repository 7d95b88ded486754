import type { AttachmentRole } from '@shared/schemas/claim';
import type { AttachmentView, EvidenceFlagView } from '@shared/schemas/evidence';
import { sendMultipart } from './send-multipart';

export interface UploadAttachmentResult {
  attachments: AttachmentView[];
  flags: EvidenceFlagView[];
}

/** POST /api/claims/:id/attachments with one file and its role, reporting progress. */
export async function uploadAttachment(input: { claimId: string; file: File; role: AttachmentRole; onProgress?: (f: number) => void; signal?: AbortSignal }) {
  const form = new FormData();
  form.append('role', input.role);
  form.append('files', input.file, input.file.name);
  const r = await sendMultipart<UploadAttachmentResult>(`/api/claims/${encodeURIComponent(input.claimId)}/attachments`, form, { onProgress: input.onProgress, signal: input.signal });
  return r.body;
}
