import type { ReactNode } from 'react';
import { useWatch, type UseFormReturn } from 'react-hook-form';
import { attachmentRoleLabels, type AttachmentRole, type ClaimDetail } from '@shared/schemas/claim';
import type { CatalogRepairCode } from '@shared/schemas/catalog';
import { fieldDomId, type ClaimFormValues } from '../form-model';
import { FormSection } from './form-section';
import type { ReturnInfo } from './reviewer-note';

const label = (role: string) => attachmentRoleLabels[role as AttachmentRole] ?? role.replace(/_/g, ' ');

/** The evidence the chosen repair codes ask for, what is attached, and the upload (when given). */
export function EvidenceSection({
  form,
  claim,
  repairCodes,
  uploader,
  note,
}: {
  form: UseFormReturn<ClaimFormValues>;
  claim: Pick<ClaimDetail, 'attachments'>;
  repairCodes: readonly CatalogRepairCode[];
  uploader?: ReactNode;
  note?: ReturnInfo | null;
}) {
  const lines = useWatch({ control: form.control, name: 'laborLines' }) ?? [];
  const byId = new Map(repairCodes.map((c) => [c.id, c]));
  const needed = new Map<string, string[]>();
  for (const l of lines) {
    const rc = byId.get(l?.repairCodeId ?? '');
    for (const role of rc?.requiredEvidence ?? []) needed.set(role, [...new Set([...(needed.get(role) ?? []), rc!.code])]);
  }
  const present = new Map<string, number>();
  for (const a of claim.attachments) present.set(a.role, (present.get(a.role) ?? 0) + 1);
  return (
    <FormSection id="section-evidence" title="Evidence" description="Photos and documents the repair codes ask for." note={note}>
      {needed.size === 0 ? (
        <p className="text-sm text-ink-600">Choose the repair codes first; the evidence they require is listed here.</p>
      ) : (
        <ul className="space-y-1.5 text-sm" aria-label="Evidence required">
          {[...needed].map(([role, codes]) => {
            const have = present.get(role) ?? 0;
            return (
              <li key={role} id={fieldDomId(`attachments.${role}`)} tabIndex={-1} className="flex items-start gap-2">
                <span aria-hidden="true" className={have ? 'text-emerald-700' : 'text-red-700'}>
                  {have ? '✓' : '✗'}
                </span>
                <span>
                  <span className="font-medium">{label(role)}</span> <span className="text-ink-600">for {codes.join(', ')}</span>
                  <span className="sr-only">{have ? ': attached' : ': missing'}</span>
                  {have > 0 && <span className="text-ink-600"> · {have} attached</span>}
                </span>
              </li>
            );
          })}
        </ul>
      )}
      {uploader}
    </FormSection>
  );
}
