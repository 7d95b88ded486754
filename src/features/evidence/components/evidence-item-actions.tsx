import { useState } from 'react';
import { attachmentRoleLabels, attachmentRoles, type AttachmentRole } from '@shared/schemas/claim';
import type { AttachmentView } from '@shared/schemas/evidence';
import { Button } from '@/components/ui/button';
import { Input, Select } from '@/components/ui/input';
import { errorMessage, isApiError } from '@/lib/api-client';
import { useDeleteAttachment } from '../api/delete-attachment';
import { useRelabelAttachment } from '../api/relabel-attachment';
import { useRetractAttachment } from '../api/retract-attachment';

/** What the agency may do with a file: relabel or remove it while the claim is editable, retract it with a reason once filed. */
export type EvidenceManage = 'edit' | 'retract';

export function EvidenceItemActions({ claimId, attachment, manage }: { claimId: string; attachment: AttachmentView; manage: EvidenceManage }) {
  const relabel = useRelabelAttachment(claimId);
  const remove = useDeleteAttachment(claimId);
  const retract = useRetractAttachment(claimId);
  const [retracting, setRetracting] = useState(false);
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | undefined>();
  const idBase = `evidence-${attachment.id}`;
  if (attachment.retractedAt) return null;

  if (manage === 'edit') {
    return (
      <div className="space-y-2 border-t border-ink-100 p-2">
        <label htmlFor={`${idBase}-role`} className="sr-only">
          What {attachment.originalName} shows
        </label>
        <Select
          id={`${idBase}-role`}
          value={attachment.role}
          disabled={relabel.isPending}
          onChange={(e) => relabel.mutate({ id: attachment.id, body: { role: e.target.value as AttachmentRole } }, { onError: (err) => setError(errorMessage(err)) })}
          className="min-h-9 w-full text-sm"
        >
          {attachmentRoles.map((r) => (
            <option key={r} value={r}>
              {attachmentRoleLabels[r]}
            </option>
          ))}
        </Select>
        <Button size="sm" variant="ghost" pending={remove.isPending} onClick={() => remove.mutate(attachment.id, { onError: (err) => setError(errorMessage(err)) })}>
          Remove {attachment.originalName}
        </Button>
        {error && <p className="text-xs font-medium text-red-800">{error}</p>}
      </div>
    );
  }

  const submit = () => {
    if (reason.trim().length < 3) {
      setError('Say why the file is retracted; the reviewer reads it.');
      return;
    }
    setError(undefined);
    retract.mutate({ id: attachment.id, body: { reason: reason.trim() } }, { onError: (err) => setError(isApiError(err, 400) ? (err.fields?.reason ?? err.message) : errorMessage(err)) });
  };
  return (
    <div className="space-y-2 border-t border-ink-100 p-2">
      {retracting ? (
        <>
          <label htmlFor={`${idBase}-reason`} className="block text-xs font-medium text-ink-800">
            Why retract {attachment.originalName}?
          </label>
          <Input id={`${idBase}-reason`} value={reason} maxLength={500} onChange={(e) => setReason(e.target.value)} aria-invalid={error ? true : undefined} className="text-sm" />
          <div className="flex flex-wrap gap-2">
            <Button size="sm" pending={retract.isPending} onClick={submit}>
              Retract
            </Button>
            <Button size="sm" variant="ghost" onClick={() => setRetracting(false)}>
              Cancel
            </Button>
          </div>
        </>
      ) : (
        <Button size="sm" variant="ghost" onClick={() => setRetracting(true)}>
          Retract {attachment.originalName}
        </Button>
      )}
      {error && <p className="text-xs font-medium text-red-800">{error}</p>}
    </div>
  );
}
