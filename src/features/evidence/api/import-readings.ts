import type { ClaimReadingsReport, CsvImportError } from '@shared/schemas/evidence';
import { ApiError } from '@/lib/api-client';
import { sendMultipart } from './send-multipart';

export interface ImportReadingsResult {
  imported: number;
  attachmentIds: string[];
  version: number | null;
  report: ClaimReadingsReport;
}

/** The bad rows of a refused readings sheet, each with its line number. */
export function csvErrorsOf(e: unknown): CsvImportError[] {
  if (!(e instanceof ApiError) || e.code !== 'csv_invalid') return [];
  const body = (e as ApiError & { body?: { errors?: CsvImportError[] } }).body;
  return Array.isArray(body?.errors) ? body.errors : [];
}

/** POST /api/claims/:id/readings/import: the sheet is checked whole; nothing is imported unless it is clean. */
export async function importReadings(input: { claimId: string; file: File; onProgress?: (f: number) => void; signal?: AbortSignal }) {
  const form = new FormData();
  form.append('file', input.file, input.file.name);
  const r = await sendMultipart<ImportReadingsResult>(`/api/claims/${encodeURIComponent(input.claimId)}/readings/import`, form, { onProgress: input.onProgress, signal: input.signal });
  return r.body;
}
