import { readFile } from 'node:fs/promises';
import { fileTypeFromFile } from 'file-type';
import { parse } from 'csv-parse/sync';
import { AppError, UnsupportedMediaTypeError, ValidationError } from '../errors';
import type { ActiveContentFinding } from './active-content';
import { findActiveContent } from './active-content';
import { extensionOf } from './file-name';

export type FileKind = 'jpg' | 'png' | 'webp' | 'heic' | 'pdf' | 'csv';

export interface AllowedType {
  kind: FileKind;
  /** The extension the stored object gets. */
  ext: string;
  contentType: string;
  isImage: boolean;
}

/** The allow-list: what a claim may carry, and the extensions each kind may be named with. */
export const ALLOWED: Record<FileKind, { extensions: string[]; contentType: string; label: string; isImage: boolean }> = {
  jpg: { extensions: ['jpg', 'jpeg'], contentType: 'image/jpeg', label: 'JPEG photo', isImage: true },
  png: { extensions: ['png'], contentType: 'image/png', label: 'PNG image', isImage: true },
  webp: { extensions: ['webp'], contentType: 'image/webp', label: 'WebP image', isImage: true },
  heic: { extensions: ['heic', 'heif'], contentType: 'image/heic', label: 'HEIC photo', isImage: true },
  pdf: { extensions: ['pdf'], contentType: 'application/pdf', label: 'PDF document', isImage: false },
  csv: { extensions: ['csv'], contentType: 'text/csv; charset=utf-8', label: 'CSV readings sheet', isImage: false },
};

const ACCEPTED_TEXT = 'Accepted: JPEG, PNG, WebP or HEIC photos, PDF documents and CSV readings sheets.';

function kindForExtension(ext: string): FileKind | null {
  for (const [k, v] of Object.entries(ALLOWED)) if (v.extensions.includes(ext)) return k as FileKind;
  return null;
}

function kindForDetected(ext: string, mime: string): FileKind | null {
  if (ext === 'jpg' && mime === 'image/jpeg') return 'jpg';
  if (ext === 'png' && mime === 'image/png') return 'png';
  if (ext === 'webp' && mime === 'image/webp') return 'webp';
  if (ext === 'heic' && (mime === 'image/heic' || mime === 'image/heif')) return 'heic';
  if (ext === 'pdf' && mime === 'application/pdf') return 'pdf';
  return null;
}

/**
 * A CSV is text, which magic bytes cannot identify: it is accepted only when it is valid UTF-8
 * without control characters and parses strictly as CSV (RFC 4180: balanced quotes, the same
 * number of fields on every record).
 */
export function checkStrictCsv(buf: Buffer): string {
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true, ignoreBOM: false }).decode(buf);
  } catch {
    throw new UnsupportedMediaTypeError('The CSV is not valid UTF-8 text. Save it as "CSV UTF-8" and try again.');
  }
  if (/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/.test(text)) {
    throw new UnsupportedMediaTypeError('The CSV contains binary or control characters, so it is not a plain CSV file.');
  }
  try {
    const rows = parse(text, { bom: true, skip_empty_lines: true, relax_quotes: false, relax_column_count: false }) as string[][];
    if (rows.length === 0) throw new UnsupportedMediaTypeError('The CSV has no rows.');
  } catch (e) {
    if (e instanceof AppError) throw e;
    const err = e as { message?: string; lines?: number };
    const where = typeof err.lines === 'number' ? ` (line ${err.lines})` : '';
    throw new UnsupportedMediaTypeError(`The file is not a well-formed CSV${where}: ${(err.message ?? '').replace(/^Invalid Record Length: /, '')}`.slice(0, 300));
  }
  return text;
}

/** 415 with a stable reason code in `fields.reason` (e.g. `pdf_javascript`, `jpeg_data_after_end`). */
export class ActiveContentError extends AppError {
  constructor(name: string, finding: ActiveContentFinding) {
    super(415, 'active_content', `"${name}" was refused: ${finding.reason}`, { reason: finding.code });
  }
}

/**
 * Decides what the file at `path` is from its bytes, never from the client's Content-Type, and
 * requires the name's extension to agree. Throws 400 for an empty file, 415 for anything not
 * allowed. The file is read from disk in pieces (a CSV, small, is read whole).
 */
export async function checkFileType(path: string, size: number, name: string): Promise<AllowedType> {
  if (size === 0) throw new ValidationError(`"${name}" is empty (0 bytes).`, { files: 'The file is empty.' });
  const ext = extensionOf(name);
  const claimed = kindForExtension(ext);
  if (!claimed) {
    throw new UnsupportedMediaTypeError(`"${name}": files ending in ${ext ? `.${ext}` : 'no extension'} are not accepted. ${ACCEPTED_TEXT}`);
  }
  const detected = await fileTypeFromFile(path);
  let kind: FileKind;
  if (claimed === 'csv') {
    if (detected) {
      throw new UnsupportedMediaTypeError(`"${name}" is named .csv but its content is ${detected.mime}.`);
    }
    checkStrictCsv(await readFile(path));
    kind = 'csv';
  } else {
    const actual = detected ? kindForDetected(detected.ext, detected.mime) : null;
    if (!actual) {
      const what = detected ? detected.mime : 'not a recognised binary format (it may be text, HTML or SVG)';
      throw new UnsupportedMediaTypeError(`"${name}" is named as a ${ALLOWED[claimed].label}, but its content is ${what}. ${ACCEPTED_TEXT}`);
    }
    if (actual !== claimed) {
      throw new UnsupportedMediaTypeError(`"${name}" is named as a ${ALLOWED[claimed].label}, but its content is a ${ALLOWED[actual].label}. Rename it with the right extension.`);
    }
    kind = actual;
  }
  const finding = await findActiveContent(kind, path);
  if (finding) throw new ActiveContentError(name, finding);
  const a = ALLOWED[kind];
  return { kind, ext: kind, contentType: a.contentType, isImage: a.isImage };
}
