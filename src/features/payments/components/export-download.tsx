import { useId, useRef, useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Field } from '@/components/ui/field';
import { Input, Select } from '@/components/ui/input';
import { errorMessage } from '@/lib/api-client';
import { formatBytes, plural } from '@/lib/format';
import { downloadPaidClaims, saveBlob, type ExportFilters, type ExportProgress } from '../api/download-paid-claims';

type Status = { kind: 'idle' } | { kind: 'running'; progress: ExportProgress } | { kind: 'done'; rows: number; bytes: number; filename: string } | { kind: 'error'; message: string };

/**
 * The paid-claims CSV with optional date range (payment date) and, for the accountant, an
 * agency. The download is read as a stream, so a large export shows bytes and rows as they
 * arrive (and a bar when the server sent the row count), then saves as a file.
 */
export function ExportDownload({ agencies }: { agencies?: { id: string; name: string }[] | null }) {
  const [filters, setFilters] = useState<ExportFilters>({});
  const [status, setStatus] = useState<Status>({ kind: 'idle' });
  const abort = useRef<AbortController | null>(null);
  const statusId = useId();

  async function start() {
    abort.current?.abort();
    const controller = new AbortController();
    abort.current = controller;
    setStatus({ kind: 'running', progress: { bytes: 0, rows: 0, totalRows: null } });
    let last = 0;
    try {
      const result = await downloadPaidClaims(filters, {
        signal: controller.signal,
        onProgress: (p) => {
          // A repaint every 100 ms is enough for the eye and keeps a fast download fast.
          const now = performance.now();
          if (now - last < 100) return;
          last = now;
          setStatus({ kind: 'running', progress: p });
        },
      });
      saveBlob(result.blob, result.filename);
      setStatus({ kind: 'done', rows: result.rows, bytes: result.bytes, filename: result.filename });
    } catch (e) {
      if (e instanceof DOMException && e.name === 'AbortError') setStatus({ kind: 'idle' });
      else setStatus({ kind: 'error', message: errorMessage(e) });
    } finally {
      if (abort.current === controller) abort.current = null;
    }
  }

  const set = (k: keyof ExportFilters) => (e: { target: { value: string } }) => setFilters((f) => ({ ...f, [k]: e.target.value || undefined }));
  const running = status.kind === 'running';

  return (
    <Card aria-labelledby="paid-claims-export">
      <CardHeader id="paid-claims-export" title="Paid-claims export" description="CSV for the ledger: one row per paid claim, filtered by payment date." />
      <CardBody className="space-y-4">
        <div className="grid gap-3 sm:grid-cols-3">
          <Field label="Paid from">{(p) => <Input type="date" {...p} value={filters.from ?? ''} onChange={set('from')} disabled={running} />}</Field>
          <Field label="Paid to">{(p) => <Input type="date" {...p} value={filters.to ?? ''} onChange={set('to')} disabled={running} />}</Field>
          {agencies && (
            <Field label="Service agency">
              {(p) => (
                <Select {...p} value={filters.agency ?? ''} onChange={set('agency')} disabled={running}>
                  <option value="">Every agency</option>
                  {agencies.map((a) => (
                    <option key={a.id} value={a.id}>
                      {a.name}
                    </option>
                  ))}
                </Select>
              )}
            </Field>
          )}
        </div>
        <div className="flex flex-wrap items-center gap-3">
          <Button onClick={() => void start()} pending={running} aria-describedby={statusId}>
            Download CSV
          </Button>
          {running && (
            <Button variant="ghost" onClick={() => abort.current?.abort()}>
              Cancel
            </Button>
          )}
        </div>
        <div id={statusId} aria-live="polite" className="text-sm text-ink-700">
          {status.kind === 'running' && (
            <div className="space-y-1">
              {status.progress.totalRows !== null && status.progress.totalRows > 0 ? (
                <progress className="h-2 w-full" max={status.progress.totalRows} value={status.progress.rows} aria-label="Export progress" />
              ) : (
                <progress className="h-2 w-full" aria-label="Export progress" />
              )}
              <p data-testid="export-progress">
                Receiving: {status.progress.rows.toLocaleString('en-US')}
                {status.progress.totalRows !== null ? ` of ${status.progress.totalRows.toLocaleString('en-US')}` : ''} rows · {formatBytes(status.progress.bytes)}
              </p>
            </div>
          )}
          {status.kind === 'done' && (
            <p data-testid="export-done">
              Saved {status.filename}: {plural(status.rows, 'row')}, {formatBytes(status.bytes)}.
            </p>
          )}
        </div>
        {status.kind === 'error' && (
          <Alert tone="error" title="The export failed">
            {status.message}
          </Alert>
        )}
      </CardBody>
    </Card>
  );
}
