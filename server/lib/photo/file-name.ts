import { ValidationError } from '../errors';

export const MAX_NAME_LENGTH = 200;

/**
 * The client's file name, kept only as data (shown in the gallery, offered back in
 * Content-Disposition). A name that tries to be a path or carries control characters is
 * refused outright rather than silently cleaned, so the technician sees what was wrong.
 */
export function checkOriginalName(raw: unknown): string {
  if (typeof raw !== 'string' || raw.length === 0) throw new ValidationError('Each file needs a name.', { files: 'A file arrived without a name.' });
  if (raw.includes('\0')) throw new ValidationError('File names may not contain NUL characters.', { files: 'The file name contains a NUL character.' });
  if (/[\r\n]/.test(raw)) throw new ValidationError('File names may not contain line breaks.', { files: 'The file name contains a line break (CR or LF).' });
  // Other C0 and C1 control characters, DEL, and bidirectional overrides that disguise extensions.
  if (/[\u0001-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/.test(raw)) {
    throw new ValidationError('File names may not contain control characters.', { files: 'The file name contains a control character.' });
  }
  if (/[/\\]/.test(raw) || raw.split(/[/\\]/).includes('..')) {
    throw new ValidationError('File names may not contain a path (/, \\ or ..).', { files: 'The file name contains a path.' });
  }
  const name = raw.normalize('NFC').trim();
  if (name === '' || name === '.' || name === '..') throw new ValidationError('Each file needs a name.', { files: 'The file name is empty.' });
  if (name.length > MAX_NAME_LENGTH) throw new ValidationError(`File names may be at most ${MAX_NAME_LENGTH} characters.`, { files: 'The file name is too long.' });
  return name;
}

/** The extension of a checked name, lower case without the dot ('' when none). */
export function extensionOf(name: string): string {
  const i = name.lastIndexOf('.');
  return i > 0 ? name.slice(i + 1).toLowerCase() : '';
}

/**
 * Content-Disposition per RFC 6266: an ASCII fallback `filename` (quotes and non-ASCII
 * replaced) and the exact name as `filename*` in UTF-8 percent-encoding (RFC 8187).
 */
export function contentDisposition(name: string, type: 'attachment' | 'inline' = 'attachment'): string {
  const fallback = name.replace(/[^\x20-\x7e]/g, '_').replace(/["\\%]/g, '_') || 'file';
  const encoded = encodeURIComponent(name).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
  return `${type}; filename="${fallback}"; filename*=UTF-8''${encoded}`;
}
