import { attachmentRoleLabels, type ClaimDetail } from '@shared/schemas/claim';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { formatBytes, formatDateTime } from '@/lib/format';

export function ClaimAttachments({ claim }: { claim: ClaimDetail }) {
  return (
    <Card aria-labelledby="claim-attachments">
      <CardHeader id="claim-attachments" title="Evidence" description={claim.attachments.length ? `${claim.attachments.length} file${claim.attachments.length === 1 ? '' : 's'}` : undefined} />
      <CardBody>
        {claim.attachments.length === 0 ? (
          <p className="text-sm text-ink-600">No photos or documents attached.</p>
        ) : (
          <ul className="grid gap-3 sm:grid-cols-2">
            {claim.attachments.map((a) => (
              <li key={a.id} className="flex gap-3 rounded-md border border-ink-100 p-2">
                {a.hasThumbnail ? (
                  <img src={`/api/attachments/${encodeURIComponent(a.id)}/thumbnail`} alt="" loading="lazy" className="size-16 shrink-0 rounded object-cover" />
                ) : (
                  <span aria-hidden="true" className="flex size-16 shrink-0 items-center justify-center rounded bg-ink-50 text-xs font-semibold uppercase text-ink-600">
                    {a.contentType.split('/')[1]?.slice(0, 4) ?? 'file'}
                  </span>
                )}
                <div className="min-w-0 text-sm">
                  <p className="font-medium text-ink-900">{attachmentRoleLabels[a.role] ?? a.role}</p>
                  <a href={`/api/attachments/${encodeURIComponent(a.id)}`} target="_blank" rel="noreferrer" className="block truncate text-ink-700 underline underline-offset-2">
                    {a.originalName}
                    <span className="sr-only"> (opens in a new tab)</span>
                  </a>
                  <p className="text-xs text-ink-600">
                    {formatBytes(a.sizeBytes)} · {formatDateTime(a.createdAt)}
                  </p>
                </div>
              </li>
            ))}
          </ul>
        )}
      </CardBody>
    </Card>
  );
}
