import { useId, useRef, useState } from 'react';
import { useDropzone } from 'react-dropzone';
import { attachmentRoleLabels, attachmentRoles, type AttachmentRole } from '@shared/schemas/claim';
import { Button } from '@/components/ui/button';
import { Select } from '@/components/ui/input';
import { Badge } from '@/components/ui/badge';
import { cx } from '@/lib/cx';
import { formatBytes } from '@/lib/format';
import { useUploadQueue, type UploadItem } from '../hooks/use-upload-queue';

/** What the server accepts (it checks the bytes; this only filters the picker). */
const ACCEPT = {
  'image/jpeg': ['.jpg', '.jpeg'],
  'image/png': ['.png'],
  'image/webp': ['.webp'],
  'image/heic': ['.heic', '.heif'],
  'application/pdf': ['.pdf'],
  'text/csv': ['.csv'],
};

function ProgressBar({ value, label, failed }: { value: number; label: string; failed: boolean }) {
  const pct = Math.round(value * 100);
  return (
    <div role="progressbar" aria-label={label} aria-valuemin={0} aria-valuemax={100} aria-valuenow={pct} className="h-2 w-full overflow-hidden rounded-full bg-ink-100">
      <div className={cx('h-full rounded-full transition-[width]', failed ? 'bg-red-600' : pct === 100 ? 'bg-emerald-600' : 'bg-ink-600')} style={{ width: `${pct}%` }} />
    </div>
  );
}

function QueueRow({ item, onRetry, onRole, onRemove }: { item: UploadItem; onRetry: () => void; onRole: (r: AttachmentRole) => void; onRemove: () => void }) {
  const roleId = useId();
  const editable = item.status === 'failed' || item.status === 'queued';
  const status =
    item.status === 'done' ? <Badge tone="green">{item.asReadings ? 'Imported' : 'Uploaded'}</Badge> : item.status === 'failed' ? <Badge tone="red">Failed</Badge> : item.status === 'uploading' ? <Badge tone="blue">{Math.round(item.progress * 100)} %</Badge> : <Badge>Waiting</Badge>;
  return (
    <li className="space-y-1.5 rounded-md border border-ink-100 p-2" data-testid="upload-row">
      <div className="flex flex-wrap items-center gap-2">
        <span className="min-w-0 flex-1 truncate text-sm font-medium text-ink-900" title={item.file.name}>
          {item.file.name}
        </span>
        <span className="text-xs text-ink-600">{formatBytes(item.file.size)}</span>
        {status}
      </div>
      <ProgressBar value={item.progress} failed={item.status === 'failed'} label={`Upload of ${item.file.name}`} />
      <div className="flex flex-wrap items-center gap-2 text-sm">
        <label htmlFor={roleId} className="text-ink-700">
          Role
        </label>
        <div className="w-56 max-w-full">
          <Select id={roleId} value={item.role} disabled={!editable || item.asReadings} onChange={(e) => onRole(e.target.value as AttachmentRole)} className="min-h-9 py-1 text-sm">
            {attachmentRoles.map((r) => (
              <option key={r} value={r}>
                {attachmentRoleLabels[r]}
              </option>
            ))}
          </Select>
        </div>
        {item.status === 'failed' && (
          <>
            <Button size="sm" variant="secondary" onClick={onRetry}>
              Retry
            </Button>
            <Button size="sm" variant="ghost" onClick={onRemove}>
              Remove
            </Button>
          </>
        )}
      </div>
      {item.error && (
        <p role="alert" className="text-sm text-red-800">
          {item.error}
        </p>
      )}
      {item.csvErrors.length > 0 && (
        <ul className="list-disc pl-5 text-sm text-red-800" aria-label={`Problems in ${item.file.name}`}>
          {item.csvErrors.map((e) => (
            <li key={`${e.line}-${e.message}`}>
              Line {e.line}: {e.message}
            </li>
          ))}
        </ul>
      )}
      {item.flags.length > 0 && (
        <ul className="text-sm text-brass-700">
          {item.flags.map((f) => (
            <li key={f.code + f.message}>{f.message}</li>
          ))}
        </ul>
      )}
    </li>
  );
}

/**
 * Adds evidence to an editable claim: drag and drop or pick several files, or take a photo with
 * the phone's camera; each file gets its role, a progress bar and a retry. A CSV is imported as
 * a readings sheet: every bad row is listed with its line, and nothing is imported until it is clean.
 */
export function EvidenceUploader({ claimId, onImported, maxFileBytes = 15 * 1024 * 1024 }: { claimId: string; onImported?: () => void; maxFileBytes?: number }) {
  const [role, setRole] = useState<AttachmentRole>('unit_overall');
  const queue = useUploadQueue(claimId, { onImported });
  const camera = useRef<HTMLInputElement>(null);
  const roleId = useId();
  const [refused, setRefused] = useState<string[]>([]);
  const { getRootProps, getInputProps, isDragActive, open } = useDropzone({
    accept: ACCEPT,
    multiple: true,
    noClick: true,
    maxSize: maxFileBytes,
    onDrop: (accepted, rejections) => {
      if (accepted.length) queue.add(accepted, role);
      setRefused(rejections.map((r) => `${r.file.name}: ${r.errors[0]?.code === 'file-too-large' ? `larger than ${formatBytes(maxFileBytes)}` : 'not a photo, PDF or CSV'}`));
    },
  });
  const done = queue.items.filter((x) => x.status === 'done').length;
  return (
    <div className="space-y-3" aria-label="Add evidence">
      <div className="flex flex-wrap items-end gap-3">
        <div className="w-64 max-w-full">
          <label htmlFor={roleId} className="block text-sm font-medium text-ink-800">
            What are you adding?
          </label>
          <Select id={roleId} value={role} onChange={(e) => setRole(e.target.value as AttachmentRole)} className="mt-1">
            {attachmentRoles.map((r) => (
              <option key={r} value={r}>
                {attachmentRoleLabels[r]}
              </option>
            ))}
          </Select>
        </div>
        <Button variant="secondary" onClick={() => camera.current?.click()}>
          <svg aria-hidden="true" viewBox="0 0 20 20" className="size-5" fill="currentColor">
            <path d="M7 3 5.6 5H3a1 1 0 0 0-1 1v10a1 1 0 0 0 1 1h14a1 1 0 0 0 1-1V6a1 1 0 0 0-1-1h-2.6L13 3H7Zm3 4a4 4 0 1 1 0 8 4 4 0 0 1 0-8Zm0 2a2 2 0 1 0 0 4 2 2 0 0 0 0-4Z" />
          </svg>
          Take a photo
        </Button>
        <input
          ref={camera}
          type="file"
          accept="image/*"
          capture="environment"
          className="sr-only"
          tabIndex={-1}
          aria-hidden="true"
          data-testid="camera-input"
          onChange={(e) => {
            const files = [...(e.target.files ?? [])];
            if (files.length) queue.add(files, role);
            e.target.value = '';
          }}
        />
      </div>
      <div
        {...getRootProps({
          className: cx('rounded-lg border-2 border-dashed px-4 py-6 text-center text-sm', isDragActive ? 'border-ink-600 bg-ink-50' : 'border-ink-200 bg-white'),
        })}
      >
        <input {...getInputProps({ 'aria-label': 'Choose files to attach' })} data-testid="evidence-input" />
        <p className="text-ink-800">{isDragActive ? 'Drop the files to attach them.' : 'Drag photos, PDF documents or a readings CSV here.'}</p>
        <p className="mt-1 text-xs text-ink-600">JPEG, PNG, WebP or HEIC photos, PDF, CSV; up to {formatBytes(maxFileBytes)} each.</p>
        <Button variant="secondary" size="sm" className="mt-3" onClick={open}>
          Choose files
        </Button>
      </div>
      {refused.length > 0 && (
        <ul role="alert" className="list-disc pl-5 text-sm text-red-800">
          {refused.map((r) => (
            <li key={r}>{r}</li>
          ))}
        </ul>
      )}
      {queue.items.length > 0 && (
        <>
          <ul className="space-y-2" aria-label="Uploads">
            {queue.items.map((item) => (
              <QueueRow key={item.key} item={item} onRetry={() => queue.retry(item.key)} onRole={(r) => queue.setRole(item.key, r)} onRemove={() => queue.remove(item.key)} />
            ))}
          </ul>
          {done > 0 && (
            <Button size="sm" variant="ghost" onClick={queue.clearDone}>
              Clear finished uploads
            </Button>
          )}
        </>
      )}
    </div>
  );
}
