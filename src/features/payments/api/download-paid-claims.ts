import { ApiError, buildUrl } from '@/lib/api-client';

export interface ExportFilters {
  from?: string;
  to?: string;
  agency?: string;
}

export interface ExportProgress {
  bytes: number;
  /** Records received so far (the header row not counted). */
  rows: number;
  /** From the X-Total-Rows header, when the server sent it. */
  totalRows: number | null;
}

export interface DownloadedExport {
  filename: string;
  blob: Blob;
  rows: number;
  bytes: number;
}

const CR = 0x0d;
const LF = 0x0a;

/** Counts CRLF record ends across chunks (a CR may end one chunk and its LF start the next). */
export function createRecordCounter() {
  let lastWasCr = false;
  let ends = 0;
  return {
    push(chunk: Uint8Array) {
      for (let i = 0; i < chunk.length; i++) {
        const b = chunk[i];
        if (b === LF && lastWasCr) ends++;
        lastWasCr = b === CR;
      }
    },
    /** Records after the header line. */
    get rows() {
      return Math.max(0, ends - 1);
    },
  };
}

function filenameFrom(disposition: string | null): string {
  const m = /filename="([^"]+)"/.exec(disposition ?? '');
  return m ? m[1] : 'paid-claims.csv';
}

async function errorFrom(res: Response): Promise<ApiError> {
  try {
    const body = (await res.json()) as { error?: { code?: string; message?: string; fields?: Record<string, string> } };
    if (body?.error?.message) return new ApiError({ status: res.status, code: body.error.code ?? `http_${res.status}`, message: body.error.message, fields: body.error.fields });
  } catch {
    // not JSON
  }
  return new ApiError({ status: res.status, code: `http_${res.status}`, message: 'The export could not be downloaded. Try again in a moment.' });
}

/**
 * Reads the streamed CSV byte by byte as it arrives, reporting bytes and records received,
 * and returns it as a Blob to save. Abort with the signal.
 */
export async function downloadPaidClaims(filters: ExportFilters, opts: { onProgress?: (p: ExportProgress) => void; signal?: AbortSignal } = {}): Promise<DownloadedExport> {
  let res: Response;
  try {
    res = await globalThis.fetch(buildUrl('/api/exports/paid-claims.csv', { ...filters }), { credentials: 'same-origin', signal: opts.signal, headers: { Accept: 'text/csv' } });
  } catch (e) {
    if (e instanceof DOMException && e.name === 'AbortError') throw e;
    throw new ApiError({ status: 0, code: 'network_error', message: 'Fieldproof could not be reached. Check the connection and try again.' });
  }
  if (!res.ok) throw await errorFrom(res);
  const totalHeader = res.headers.get('X-Total-Rows');
  const totalRows = totalHeader !== null && /^\d+$/.test(totalHeader) ? Number(totalHeader) : null;
  const filename = filenameFrom(res.headers.get('Content-Disposition'));
  const chunks: Uint8Array[] = [];
  const counter = createRecordCounter();
  let bytes = 0;
  if (res.body) {
    const reader = res.body.getReader();
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      chunks.push(value);
      bytes += value.byteLength;
      counter.push(value);
      opts.onProgress?.({ bytes, rows: counter.rows, totalRows });
    }
  }
  opts.onProgress?.({ bytes, rows: counter.rows, totalRows });
  return { filename, blob: new Blob(chunks as BlobPart[], { type: 'text/csv;charset=utf-8' }), rows: counter.rows, bytes };
}

/** Saves a Blob through a temporary download link. */
export function saveBlob(blob: Blob, filename: string): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = filename;
  a.rel = 'noopener';
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
