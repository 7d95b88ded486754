import { afterEach, describe, expect, it, vi } from 'vitest';
import { createRecordCounter, downloadPaidClaims } from './download-paid-claims';

const enc = new TextEncoder();

/** A streamed CSV answer delivered in the given chunks (RFC 4180 records end in CRLF). */
function streamed(chunks: string[], headers: Record<string, string>): Response {
  const body = new ReadableStream<Uint8Array>({
    start(controller) {
      for (const c of chunks) controller.enqueue(enc.encode(c));
      controller.close();
    },
  });
  return new Response(body, { status: 200, headers });
}

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('the record counter', () => {
  it('counts CRLF record ends, also when CR and LF fall in different chunks, not bare LFs', () => {
    const c = createRecordCounter();
    c.push(enc.encode('h1,h2\r'));
    c.push(enc.encode('\na,"line\nbreak"\r\nb,c\r'));
    expect(c.rows).toBe(1);
    c.push(enc.encode('\n'));
    expect(c.rows).toBe(2);
  });
});

describe('downloadPaidClaims', () => {
  it('reads the stream chunk by chunk, reporting bytes and rows, and returns the whole file', async () => {
    const chunks = ['claim_number,total_approved\r\nFP-1,1', '0.00\r\nFP-2,"2', '0.00"\r', '\nFP-3,30.00\r\n'];
    const fetchMock = vi.fn(async (_url: string) => streamed(chunks, { 'Content-Type': 'text/csv; charset=utf-8', 'Content-Disposition': 'attachment; filename="paid-claims-2026-06-15.csv"', 'X-Total-Rows': '3' }));
    vi.stubGlobal('fetch', fetchMock);
    const seen: Array<{ bytes: number; rows: number; totalRows: number | null }> = [];
    const result = await downloadPaidClaims({ from: '2026-06-01', agency: '' }, { onProgress: (p) => seen.push({ ...p }) });
    expect(fetchMock.mock.calls[0][0]).toBe('/api/exports/paid-claims.csv?from=2026-06-01');
    expect(result.filename).toBe('paid-claims-2026-06-15.csv');
    expect(result.rows).toBe(3);
    const text = chunks.join('');
    expect(result.bytes).toBe(enc.encode(text).length);
    expect(await result.blob.text()).toBe(text);
    // Progress grows with every chunk and ends at the totals.
    expect(seen.map((p) => p.rows)).toEqual([0, 1, 1, 3, 3]);
    expect(seen.every((p) => p.totalRows === 3)).toBe(true);
    expect(seen[seen.length - 1].bytes).toBe(result.bytes);
  });

  it('turns an error answer into an ApiError with the server’s message', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => new Response(JSON.stringify({ error: { code: 'not_found', message: 'No service agency with that id.' } }), { status: 404, headers: { 'Content-Type': 'application/json' } })));
    await expect(downloadPaidClaims({ agency: 'x' })).rejects.toMatchObject({ status: 404, message: 'No service agency with that id.' });
  });
});
