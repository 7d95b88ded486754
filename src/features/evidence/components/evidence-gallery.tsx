import { cx } from '@/lib/cx';
import { EvidenceItemActions, type EvidenceManage } from './evidence-item-actions';
import { useEffect, useRef, useState } from 'react';
import { attachmentRoleLabels } from '@shared/schemas/claim';
import type { AttachmentView, EvidenceFlagView } from '@shared/schemas/evidence';
import { evidenceFlagLabels } from '@shared/schemas/evidence';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { DescriptionList } from '@/components/ui/description-list';
import { formatBytes, formatDateTime } from '@/lib/format';

/** Browsers show these inline; HEIC, PDF and CSV open as downloads. */
const viewable = (a: AttachmentView) => ['image/jpeg', 'image/png', 'image/webp'].includes(a.contentType);

function takenText(a: AttachmentView): string {
  if (!a.takenAtRaw) return 'Not recorded';
  const [d, t] = a.takenAtRaw.split(' ');
  return `${d.replace(/:/g, '-')} ${t ?? ''}${a.takenAtOffset ? ` (UTC${a.takenAtOffset})` : ' (no offset recorded)'}`;
}

function Lightbox({ attachment, flags, onClose }: { attachment: AttachmentView; flags: EvidenceFlagView[]; onClose: () => void }) {
  const ref = useRef<HTMLDialogElement>(null);
  useEffect(() => {
    // Opened once mounted; unmounting removes the dialog, which ends the modal state.
    const d = ref.current;
    if (d && !d.open) d.showModal?.();
  }, []);
  return (
    <dialog ref={ref} onClose={onClose} aria-labelledby="lightbox-title" className="m-auto max-h-[95vh] w-[min(64rem,95vw)] overflow-auto rounded-lg p-0 backdrop:bg-ink-900/70">
      <div className="flex items-center justify-between gap-2 border-b border-ink-100 px-4 py-2">
        <h2 id="lightbox-title" className="truncate text-base font-semibold text-ink-900">
          {attachmentRoleLabels[attachment.role]}: {attachment.originalName}
        </h2>
        <Button size="sm" variant="ghost" onClick={() => ref.current?.close()} aria-label="Close">
          ✕
        </Button>
      </div>
      <div className="grid gap-4 p-4 md:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <div className="flex items-center justify-center bg-ink-50">
          {viewable(attachment) ? (
            <img src={attachment.previewUrl} alt={`${attachmentRoleLabels[attachment.role]} photo ${attachment.originalName}`} className="max-h-[75vh] w-auto object-contain" />
          ) : (
            <img src={attachment.thumbnailUrl} alt={`Preview of ${attachment.originalName}`} className="max-h-[60vh] w-auto object-contain" />
          )}
        </div>
        <div className="space-y-3 text-sm">
          <DescriptionList
            items={[
              { label: 'Type', value: `${attachment.contentType.split(';')[0]}, ${formatBytes(attachment.sizeBytes)}` },
              ...(attachment.width && attachment.height ? [{ label: 'Size', value: `${attachment.width} × ${attachment.height} px` }] : []),
              ...(attachment.kind === 'photo' ? [{ label: 'Taken', value: takenText(attachment) }] : []),
              ...(attachment.kind === 'photo' ? [{ label: 'Position', value: attachment.gps ? `${attachment.gps.latitude.toFixed(5)}, ${attachment.gps.longitude.toFixed(5)}` : 'Not recorded' }] : []),
              { label: 'Uploaded', value: `${formatDateTime(attachment.createdAt)}${attachment.uploadedByName ? ` by ${attachment.uploadedByName}` : ''}` },
              { label: 'SHA-256', value: <code className="break-all text-xs">{attachment.sha256}</code> },
            ]}
          />
          {flags.length > 0 && (
            <ul className="space-y-1" aria-label="Checks on this file">
              {flags.map((f) => (
                <li key={f.code + f.message} className="rounded border border-brass-300 bg-brass-50 px-2 py-1">
                  <Badge tone="brass">{evidenceFlagLabels[f.code]}</Badge> <span className="text-ink-800">{f.message}</span>
                </li>
              ))}
            </ul>
          )}
          <a href={attachment.url} download={attachment.originalName} className="inline-block text-ink-700 underline underline-offset-2">
            Download the original
          </a>
        </div>
      </div>
    </dialog>
  );
}

/** Thumbnails of the claim's evidence; one opens the full image with its metadata and checks. */
export function EvidenceGallery({ attachments, flags, claimId, manage }: { attachments: AttachmentView[]; flags: EvidenceFlagView[]; claimId?: string; manage?: EvidenceManage | null }) {
  const [openId, setOpenId] = useState<string | null>(null);
  const open = attachments.find((a) => a.id === openId) ?? null;
  if (attachments.length === 0) return <p className="text-sm text-ink-600">No photos or documents attached yet.</p>;
  // the spoken name holds every word shown on the button (role, file name, flags), after the verb
  const openLabel = (a: (typeof attachments)[number], mine: typeof flags) =>
    [
      `Open ${attachmentRoleLabels[a.role]}: ${a.originalName}`,
      ...(a.retractedAt ? [`Retracted by the agency: ${a.retractionReason ?? ''}`] : []),
      ...new Set(mine.map((f) => evidenceFlagLabels[f.code])),
    ].join(' ');
  return (
    <>
      <ul className="grid grid-cols-2 gap-3 sm:grid-cols-3 lg:grid-cols-4" aria-label="Evidence gallery">
        {attachments.map((a) => {
          const mine = flags.filter((f) => f.attachmentId === a.id);
          return (
            <li key={a.id} className={cx('overflow-hidden rounded-md border border-ink-100 bg-white', a.retractedAt && 'opacity-70')}>
              <button type="button" onClick={() => setOpenId(a.id)} className="block w-full text-left focus-visible:outline-2 focus-visible:outline-ink-600" aria-label={openLabel(a, mine)}>
                <img src={a.thumbnailUrl} alt="" loading="lazy" className="aspect-[4/3] w-full bg-ink-50 object-cover" />
                <span className="block space-y-0.5 p-2">
                  <span className="block text-sm font-medium text-ink-900">{attachmentRoleLabels[a.role]}</span>
                  <span className="block truncate text-xs text-ink-600">{a.originalName}</span>
                  {a.retractedAt && (
                    <span className="block text-xs text-red-800">
                      <span className="font-semibold">Retracted by the agency:</span> {a.retractionReason}
                    </span>
                  )}
                  {mine.length > 0 && (
                    <span className="flex flex-wrap gap-1">
                      {[...new Set(mine.map((f) => f.code))].map((c) => (
                        <span key={c} className="rounded-full bg-brass-100 px-2 py-0.5 text-xs font-semibold text-brass-700 ring-1 ring-inset ring-brass-300">
                          {evidenceFlagLabels[c]}
                        </span>
                      ))}
                    </span>
                  )}
                </span>
              </button>
              {manage && claimId && <EvidenceItemActions claimId={claimId} attachment={a} manage={manage} />}
            </li>
          );
        })}
      </ul>
      {open && <Lightbox attachment={open} flags={flags.filter((f) => f.attachmentId === open.id)} onClose={() => setOpenId(null)} />}
    </>
  );
}
