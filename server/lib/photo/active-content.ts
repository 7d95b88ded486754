/**
 * Finds markup a browser would run hidden inside an otherwise valid file (a polyglot): HTML or
 * SVG in JPEG/PNG/WebP/HEIC metadata or appended after the image, an archive glued to a photo,
 * scripts and launch actions in a PDF, HTML in a CSV. Only the parts of an image that are not
 * compressed pixel data are scanned, so random pixel bytes cannot match by chance.
 */

const MARKUP = /<script|<html|<!doctype\s+html|<svg[\s>/]|<iframe|<body[\s>]|<object[\s>]|<embed[\s>]|<meta[\s>]|javascript:/i;
const PDF_ACTIVE = /\/JavaScript\b|\/JS[\s(<[/]|\/Launch\b|\/EmbeddedFile\b|\/XFA\b/;
const ZIP_LOCAL = Buffer.from([0x50, 0x4b, 0x03, 0x04]);

export interface ActiveContentFinding {
  reason: string;
}

function markup(buf: Buffer, start = 0, end = buf.length): boolean {
  if (end <= start) return false;
  return MARKUP.test(buf.toString('latin1', start, end));
}

/** JPEG: every segment before the first scan, and whatever follows the last end-of-image. */
function scanJpeg(buf: Buffer): ActiveContentFinding | null {
  let i = 2;
  let firstScan = -1;
  while (i + 4 <= buf.length) {
    if (buf[i] !== 0xff) break; // unusual layout: scanned whole below
    const marker = buf[i + 1];
    if (marker === 0xff) {
      i += 1;
      continue;
    }
    if (marker === 0xd8 || marker === 0x01 || (marker >= 0xd0 && marker <= 0xd7)) {
      i += 2;
      continue;
    }
    if (marker === 0xd9) break;
    const len = buf.readUInt16BE(i + 2);
    if (len < 2 || i + 2 + len > buf.length) return { reason: 'The JPEG is truncated or its structure is broken.' };
    if (marker === 0xda) {
      firstScan = i;
      break;
    }
    i += 2 + len;
  }
  const headerEnd = firstScan === -1 ? buf.length : firstScan;
  if (markup(buf, 0, headerEnd)) return { reason: 'The JPEG carries HTML or script in its metadata.' };
  const eoi = buf.lastIndexOf(Buffer.from([0xff, 0xd9]));
  if (eoi !== -1 && eoi + 2 < buf.length) {
    const trailer = buf.subarray(eoi + 2);
    if (markup(trailer)) return { reason: 'The JPEG has HTML or script appended after the image.' };
    if (trailer.indexOf(ZIP_LOCAL) !== -1) return { reason: 'The JPEG has an archive appended after the image.' };
  }
  return null;
}

/** PNG: every chunk but the compressed image data, and anything after the last chunk. */
function scanPng(buf: Buffer): ActiveContentFinding | null {
  let i = 8;
  let sawEnd = false;
  while (i + 12 <= buf.length) {
    const len = buf.readUInt32BE(i);
    const type = buf.toString('latin1', i + 4, i + 8);
    if (i + 12 + len > buf.length) return { reason: 'The PNG structure is broken.' };
    if (type !== 'IDAT' && markup(buf, i + 8, i + 8 + len)) return { reason: 'The PNG carries HTML or script in a text chunk.' };
    i += 12 + len;
    if (type === 'IEND') {
      sawEnd = true;
      break;
    }
  }
  if (!sawEnd) return { reason: 'The PNG structure is broken.' };
  if (i < buf.length) {
    if (markup(buf, i)) return { reason: 'The PNG has HTML or script appended after the image.' };
    if (buf.indexOf(ZIP_LOCAL, i) !== -1) return { reason: 'The PNG has an archive appended after the image.' };
  }
  return null;
}

/** WebP (RIFF): every chunk but the image bitstreams, and anything after the RIFF size. */
function scanWebp(buf: Buffer): ActiveContentFinding | null {
  if (buf.length < 12) return { reason: 'The WebP structure is broken.' };
  const riffEnd = Math.min(buf.length, 8 + buf.readUInt32LE(4));
  let i = 12;
  while (i + 8 <= riffEnd) {
    const type = buf.toString('latin1', i, i + 4);
    const len = buf.readUInt32LE(i + 4);
    if (i + 8 + len > riffEnd) return { reason: 'The WebP structure is broken.' };
    if (!['VP8 ', 'VP8L', 'ALPH', 'ANMF'].includes(type) && markup(buf, i + 8, i + 8 + len)) {
      return { reason: 'The WebP carries HTML or script in its metadata.' };
    }
    i += 8 + len + (len % 2);
  }
  if (riffEnd < buf.length && (markup(buf, riffEnd) || buf.indexOf(ZIP_LOCAL, riffEnd) !== -1)) {
    return { reason: 'The WebP has data appended after the image.' };
  }
  return null;
}

/** ISO base media (HEIC/HEIF): the top-level boxes must add up; all but the media data are scanned. */
export function scanIsoBoxes(buf: Buffer): ActiveContentFinding | null {
  let i = 0;
  const types: string[] = [];
  while (i < buf.length) {
    if (i + 8 > buf.length) return { reason: 'The HEIC structure is broken.' };
    let size = buf.readUInt32BE(i);
    const type = buf.toString('latin1', i + 4, i + 8);
    let header = 8;
    if (size === 1) {
      if (i + 16 > buf.length) return { reason: 'The HEIC structure is broken.' };
      const big = buf.readBigUInt64BE(i + 8);
      if (big > BigInt(buf.length)) return { reason: 'The HEIC structure is broken.' };
      size = Number(big);
      header = 16;
    } else if (size === 0) {
      size = buf.length - i;
    }
    if (size < header || i + size > buf.length || !/^[\x20-\x7e]{4}$/.test(type)) return { reason: 'The HEIC structure is broken.' };
    if (type !== 'mdat' && markup(buf, i + header, i + size)) return { reason: 'The HEIC carries HTML or script in its metadata.' };
    types.push(type);
    i += size;
  }
  if (types[0] !== 'ftyp' || !types.includes('meta')) return { reason: 'The HEIC structure is broken (no image metadata box).' };
  return null;
}

function scanPdf(buf: Buffer): ActiveContentFinding | null {
  const text = buf.toString('latin1');
  if (PDF_ACTIVE.test(text)) return { reason: 'The PDF contains scripts, launch actions or embedded files.' };
  if (MARKUP.test(text)) return { reason: 'The PDF also contains HTML.' };
  return null;
}

export function findActiveContent(kind: 'jpg' | 'png' | 'webp' | 'heic' | 'pdf' | 'csv', buf: Buffer): ActiveContentFinding | null {
  switch (kind) {
    case 'jpg':
      return scanJpeg(buf);
    case 'png':
      return scanPng(buf);
    case 'webp':
      return scanWebp(buf);
    case 'heic':
      return scanIsoBoxes(buf);
    case 'pdf':
      return scanPdf(buf);
    case 'csv':
      return markup(buf) ? { reason: 'The CSV contains HTML or script.' } : null;
  }
}
