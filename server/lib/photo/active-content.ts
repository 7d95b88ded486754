/**
 * Finds content a browser or a PDF viewer would run, hidden inside an otherwise valid file (a
 * polyglot): markup in JPEG/PNG/WebP/HEIC metadata (UTF-8 or UTF-16), data after the image's end,
 * archives glued to a photo, a HEIC whose boxes do not add up, PDF scripts, actions and embedded
 * files (names and strings decoded first), HTML in a CSV. Files are read from disk a segment or a
 * chunk at a time, so a large upload is never held whole in memory (PDFs are the exception: they
 * are parsed whole by pdf-lib). Compressed pixel data is scanned only where it must be (a HEIC's
 * media box) and then with longer patterns, so random bytes cannot match by chance.
 */
import { open, type FileHandle } from 'node:fs/promises';
import { constants as zlibConstants, inflateSync } from 'node:zlib';
import { PDFArray, PDFDict, PDFDocument, PDFHexString, PDFName, PDFRawStream, PDFRef, PDFString, type PDFObject } from 'pdf-lib';

export interface ActiveContentFinding {
  /** A short stable reason code, e.g. `pdf_javascript`, `jpeg_data_after_end`. */
  code: string;
  reason: string;
}

export type ScannedKind = 'jpg' | 'png' | 'webp' | 'heic' | 'pdf' | 'csv';

/** Markup a browser would run, in metadata text (OWASP File Upload Cheat Sheet: polyglots). */
const MARKUP =
  /<script|<html|<!doctype\s+html|<svg[\s>/]|<iframe|<frame[\s>]|<body[\s>]|<object[\s>]|<embed[\s>]|<meta[\s>]|<img[\s/>]|<a\s+href|<link[\s>]|<style[\s>]|<form[\s>]|<base[\s>]|<\?php|javascript:|vbscript:|\bon(?:error|load|click|mouseover|focus|begin)\s*=/i;
/** The same, with longer patterns, for compressed media data where short ones would match by chance. */
const MARKUP_STRICT = /<script[\s>]|<html[\s>]|<!doctype\s+html|<iframe[\s>]|<body[\s>]|javascript:|onerror\s*=|<\?php|<svg\s[^>]{0,200}xmlns/i;
const ZIP_LOCAL = Buffer.from([0x50, 0x4b, 0x03, 0x04]);
const CHUNK = 1 << 20;
const OVERLAP = 256;
/** A metadata segment or chunk larger than this is refused rather than read. */
const MAX_METADATA_BYTES = 16 * 1024 * 1024;

/** Text views of bytes: as read (UTF-8 and Latin-1 agree on ASCII markup), and UTF-16 LE/BE with the zero bytes dropped. */
function textViews(buf: Buffer): string[] {
  const views = [buf.toString('latin1')];
  if (buf.includes(0)) {
    const out = Buffer.allocUnsafe(buf.length);
    let n = 0;
    for (let i = 0; i < buf.length; i++) if (buf[i] !== 0) out[n++] = buf[i];
    views.push(out.toString('latin1', 0, n));
  }
  return views;
}

export function hasMarkup(buf: Buffer, pattern: RegExp = MARKUP): boolean {
  return textViews(buf).some((t) => pattern.test(t));
}

/**
 * A ZIP local file header that is plausibly real (PKWARE APPNOTE 4.3.7): the signature, a
 * version needed below 10.0, method stored/deflate/other known, a file name length of 1 to 1024.
 * Loose enough for any archive a tool writes, strict enough not to match compressed pixels.
 */
export function hasZipHeader(buf: Buffer, loose = false): boolean {
  let i = buf.indexOf(ZIP_LOCAL);
  while (i !== -1) {
    if (loose) return true;
    if (i + 30 <= buf.length) {
      const version = buf.readUInt16LE(i + 4);
      const method = buf.readUInt16LE(i + 8);
      const nameLen = buf.readUInt16LE(i + 26);
      if (version <= 100 && [0, 8, 9, 12, 14, 93, 95, 98].includes(method) && nameLen >= 1 && nameLen <= 1024) return true;
    }
    i = buf.indexOf(ZIP_LOCAL, i + 1);
  }
  return false;
}

class FileReader {
  constructor(
    private readonly fh: FileHandle,
    readonly size: number,
  ) {}

  async read(pos: number, len: number): Promise<Buffer> {
    const n = Math.max(0, Math.min(len, this.size - pos));
    const b = Buffer.alloc(n);
    let got = 0;
    while (got < n) {
      const { bytesRead } = await this.fh.read(b, got, n - got, pos + got);
      if (!bytesRead) break;
      got += bytesRead;
    }
    return got === n ? b : b.subarray(0, got);
  }

  /** [start, end) in chunks that overlap a little, so a pattern across a boundary is seen. */
  async *chunks(start: number, end: number): AsyncGenerator<Buffer> {
    for (let p = start; p < end; p += CHUNK) yield this.read(p, Math.min(CHUNK + OVERLAP, end - p));
  }
}

const broken = (what: string, detail = 'its structure is broken'): ActiveContentFinding => ({ code: `${what.toLowerCase()}_broken`, reason: `The ${what} is damaged: ${detail}.` });

/** Whatever follows an image's end: zero padding passes; anything else is refused. */
async function trailer(r: FileReader, from: number, what: string, after: string): Promise<ActiveContentFinding | null> {
  let zip = false;
  let html = false;
  let data = false;
  for await (const c of r.chunks(from, r.size)) {
    if (!data && c.some((b) => b !== 0)) data = true;
    if (hasZipHeader(c, true)) zip = true;
    if (hasMarkup(c)) html = true;
    if (zip && html) break;
  }
  const tag = what.toLowerCase();
  if (zip) return { code: `${tag}_archive_appended`, reason: `The ${what} has an archive appended after the image.` };
  if (html) return { code: `${tag}_markup_appended`, reason: `The ${what} has HTML or script appended after the image.` };
  if (data) return { code: `${tag}_data_after_end`, reason: `The ${what} has data appended after the image (${after}).` };
  return null;
}

function metadataFinding(what: string, seg: Buffer, where: string): ActiveContentFinding | null {
  if (hasMarkup(seg)) return { code: `${what.toLowerCase()}_markup_in_metadata`, reason: `The ${what} carries HTML or script in ${where}.` };
  if (hasZipHeader(seg)) return { code: `${what.toLowerCase()}_archive_in_metadata`, reason: `The ${what} carries an archive in ${where}.` };
  return null;
}

/**
 * One JPEG stream from its SOI (ITU-T T.81 Annex B): every marker segment is read and scanned;
 * entropy-coded data is skipped marker by marker (stuffed 0xFF00 and RSTn are data) until EOI.
 * Returns the offset just after EOI, or a finding.
 */
async function walkJpeg(r: FileReader, start: number): Promise<number | ActiveContentFinding> {
  const soi = await r.read(start, 2);
  if (soi.length < 2 || soi[0] !== 0xff || soi[1] !== 0xd8) return broken('JPEG');
  let i = start + 2;
  for (;;) {
    const h = await r.read(i, 4);
    if (h.length < 2) return broken('JPEG', 'it is truncated (it ends before its end-of-image marker)');
    if (h[0] !== 0xff) return broken('JPEG');
    const marker = h[1];
    if (marker === 0xff) {
      i += 1;
      continue;
    }
    if (marker === 0xd9) return i + 2;
    if (marker === 0x01 || (marker >= 0xd0 && marker <= 0xd7)) {
      i += 2;
      continue;
    }
    if (h.length < 4) return broken('JPEG', 'it is truncated (it ends before its end-of-image marker)');
    const len = h.readUInt16BE(2);
    if (len < 2 || i + 2 + len > r.size) return broken('JPEG', 'it is truncated or a segment overruns the file');
    const seg = await r.read(i + 4, len - 2);
    const where = marker === 0xfe ? 'a comment (COM) segment' : marker >= 0xe0 && marker <= 0xef ? `an APP${marker - 0xe0} segment` : 'its metadata';
    const f = metadataFinding('JPEG', seg, `its metadata (${where})`);
    if (f) return f;
    i += 2 + len;
    if (marker === 0xda) {
      const next = await skipEntropy(r, i);
      if (next < 0) return broken('JPEG', 'it is truncated (it ends before its end-of-image marker)');
      i = next;
    }
  }
}

/** The offset of the next marker after entropy-coded data, or -1 at the end of the file. */
async function skipEntropy(r: FileReader, from: number): Promise<number> {
  let pos = from;
  while (pos < r.size) {
    const c = await r.read(pos, CHUNK + 1);
    if (c.length < 2) return -1;
    let p = c.indexOf(0xff);
    while (p !== -1 && p < c.length - 1) {
      const m = c[p + 1];
      if (m !== 0x00 && m !== 0xff && !(m >= 0xd0 && m <= 0xd7)) return pos + p;
      p = c.indexOf(0xff, p + 1);
    }
    pos += c.length - 1;
    if (c.length < CHUNK + 1) return -1;
  }
  return -1;
}

/**
 * JPEG: the image, then only further complete JPEG streams (the multi-picture layout phones use
 * for gain maps and depth maps, CIPA DC-007), each scanned the same way; then nothing but zeros.
 */
async function scanJpeg(r: FileReader): Promise<ActiveContentFinding | null> {
  let end = await walkJpeg(r, 0);
  for (;;) {
    if (typeof end !== 'number') return end;
    if (end >= r.size) return null;
    const h = await r.read(end, 3);
    if (h.length === 3 && h[0] === 0xff && h[1] === 0xd8 && h[2] === 0xff) {
      end = await walkJpeg(r, end);
      continue;
    }
    return trailer(r, end, 'JPEG', 'after its end-of-image marker');
  }
}

function inflateText(data: Buffer): Buffer | null {
  try {
    return inflateSync(data, { maxOutputLength: MAX_METADATA_BYTES, finishFlush: zlibConstants.Z_SYNC_FLUSH });
  } catch {
    return null;
  }
}

/** PNG (ISO/IEC 15948): every chunk but image data is scanned, zTXt and compressed iTXt inflated; nothing after IEND. */
async function scanPng(r: FileReader): Promise<ActiveContentFinding | null> {
  let i = 8;
  for (;;) {
    const h = await r.read(i, 8);
    if (h.length < 8) return broken('PNG', 'it ends before its IEND chunk');
    const len = h.readUInt32BE(0);
    const type = h.toString('latin1', 4, 8);
    if (i + 12 + len > r.size) return broken('PNG', `the ${JSON.stringify(type)} chunk overruns the file`);
    if (type !== 'IDAT' && type !== 'fdAT') {
      if (len > MAX_METADATA_BYTES) return { code: 'png_metadata_too_large', reason: `The PNG has a ${type} chunk of more than 16 MB.` };
      const data = await r.read(i + 8, len);
      let text: Buffer | null = data;
      if (type === 'zTXt') {
        const z = data.indexOf(0);
        text = z === -1 ? null : inflateText(data.subarray(z + 2));
      } else if (type === 'iTXt') {
        const z = data.indexOf(0);
        if (z !== -1 && data[z + 1] === 1) {
          const lang = data.indexOf(0, z + 3);
          const kw = lang === -1 ? -1 : data.indexOf(0, lang + 1);
          text = kw === -1 ? null : inflateText(data.subarray(kw + 1));
        }
      }
      if (text === null) return { code: 'png_broken', reason: `The PNG is damaged: its compressed ${type} text chunk cannot be read.` };
      const where = type === 'tEXt' || type === 'zTXt' || type === 'iTXt' ? `a text chunk (${type})` : `a ${type} chunk`;
      const f = metadataFinding('PNG', data, where) ?? (text !== data ? metadataFinding('PNG', text, where) : null);
      if (f) return f;
    }
    i += 12 + len;
    if (type === 'IEND') break;
  }
  return i < r.size ? trailer(r, i, 'PNG', 'after its IEND chunk') : null;
}

/** WebP (RIFF, RFC 9649): every chunk but image bitstreams (EXIF, XMP, ICC...) is scanned; nothing beyond the RIFF size. */
async function scanWebp(r: FileReader): Promise<ActiveContentFinding | null> {
  const h = await r.read(0, 12);
  if (h.length < 12) return broken('WebP');
  const riffEnd = 8 + h.readUInt32LE(4);
  if (riffEnd > r.size) return broken('WebP', 'its RIFF size is larger than the file');
  let i = 12;
  while (i + 8 <= riffEnd) {
    const c = await r.read(i, 8);
    const type = c.toString('latin1', 0, 4);
    const len = c.readUInt32LE(4);
    if (i + 8 + len > riffEnd) return broken('WebP', `the ${JSON.stringify(type)} chunk overruns the file`);
    if (!['VP8 ', 'VP8L', 'ALPH', 'ANMF'].includes(type)) {
      if (len > MAX_METADATA_BYTES) return { code: 'webp_metadata_too_large', reason: `The WebP has a ${type.trim()} chunk of more than 16 MB.` };
      const f = metadataFinding('WebP', await r.read(i + 8, len), `its metadata (${type.trim()} chunk)`);
      if (f) return f;
    }
    i += 8 + len + (len % 2);
  }
  if (i < riffEnd - 1) return broken('WebP');
  return riffEnd < r.size ? trailer(r, riffEnd, 'WebP', 'beyond its RIFF size') : null;
}

/** Top-level boxes a HEIF image file may have (ISO/IEC 14496-12 and 23008-12). */
const HEIF_TOP_BOXES = new Set(['ftyp', 'meta', 'mdat', 'moov', 'free', 'skip', 'wide', 'pdin', 'uuid', 'idat']);

/**
 * HEIC/HEIF (ISO base media file format): the top-level boxes must tile the file exactly, be of
 * known types, start with ftyp and include meta; no box may hold HTML or a ZIP archive.
 */
async function scanIsoBoxes(r: FileReader): Promise<ActiveContentFinding | null> {
  let i = 0;
  const types: string[] = [];
  while (i < r.size) {
    const h = await r.read(i, 16);
    if (h.length < 8) return broken('HEIC', 'its boxes do not fill the file exactly');
    let size = h.readUInt32BE(0);
    const type = h.toString('latin1', 4, 8);
    let header = 8;
    if (size === 1) {
      if (h.length < 16) return broken('HEIC');
      const big = h.readBigUInt64BE(8);
      if (big > BigInt(r.size)) return broken('HEIC', `the ${JSON.stringify(type)} box overruns the file`);
      size = Number(big);
      header = 16;
    } else if (size === 0) {
      size = r.size - i;
    }
    if (!/^[\x20-\x7e]{4}$/.test(type)) return broken('HEIC');
    if (!HEIF_TOP_BOXES.has(type)) return { code: 'heic_unknown_box', reason: `The HEIC has an unknown top-level box ${JSON.stringify(type)}.` };
    if (size < header || i + size > r.size) return broken('HEIC', `the ${JSON.stringify(type)} box overruns the file`);
    const strict = type === 'mdat' || type === 'idat';
    for await (const c of r.chunks(i + header, i + size)) {
      if (hasMarkup(c, strict ? MARKUP_STRICT : MARKUP)) return { code: 'heic_markup', reason: `The HEIC carries HTML or script in its ${type} box.` };
      if (hasZipHeader(c)) return { code: 'heic_archive', reason: `The HEIC carries a ZIP archive in its ${type} box.` };
    }
    types.push(type);
    i += size;
  }
  if (types[0] !== 'ftyp' || !types.includes('meta')) return broken('HEIC', 'it has no image metadata box');
  return null;
}

// PDF (ISO 32000-1): actions and keys a viewer would run or open, refused wherever they appear.
const PDF_ACTIONS = new Set(['JavaScript', 'Launch', 'SubmitForm', 'ImportData', 'URI', 'GoToR', 'GoToE', 'RichMediaExecute', 'Rendition', 'Sound', 'Movie']);
const PDF_KEYS = new Set(['JavaScript', 'JS', 'EmbeddedFile', 'EmbeddedFiles', 'EF', 'XFA', 'RichMedia', 'RichMediaContent', 'URI', 'Launch', 'SubmitForm']);
const PDF_NAMES = new Set(['JavaScript', 'EmbeddedFile', 'EmbeddedFiles', 'RichMedia', 'FileAttachment', 'Launch', 'SubmitForm', 'URI', 'ImportData', 'XFA']);
const PDF_BYTES = /\/(JavaScript|JS|Launch|SubmitForm|ImportData|URI|EmbeddedFiles?|EF|XFA|RichMedia\w*|GoToE|GoToR|OpenAction|AA)(?![A-Za-z0-9#])/g;

/** PDF names may spell any byte as #xx (ISO 32000-1 7.3.5), in either case. */
export function decodePdfNames(text: string): string {
  return text.replace(/#([0-9A-Fa-f]{2})/g, (_, hex: string) => String.fromCharCode(parseInt(hex, 16)));
}

const nameOf = (n: PDFName): string => decodePdfNames(n.decodeText());

function pdfActive(what: string, code: string): ActiveContentFinding {
  return { code, reason: `The PDF contains active content a viewer could run (scripts, launch actions or embedded files, links, forms): ${what}.` };
}

/** Byte scan of the file and of every inflated stream (object streams hold dictionaries too). */
function scanPdfBytes(buf: Buffer): ActiveContentFinding | null {
  const texts: string[] = [buf.toString('latin1')];
  const raw = texts[0];
  const re = /stream\r?\n/g;
  let m: RegExpExecArray | null;
  let inflated = 0;
  while ((m = re.exec(raw)) !== null) {
    const start = m.index + m[0].length;
    const end = raw.indexOf('endstream', start);
    if (end === -1) break;
    const out = inflateText(buf.subarray(start, end));
    if (out && out.length > 0) {
      inflated += out.length;
      if (inflated > 64 * 1024 * 1024) return { code: 'pdf_too_complex', reason: 'The PDF inflates to more than 64 MB of content.' };
      texts.push(out.toString('latin1'));
    }
    re.lastIndex = end;
  }
  const refused = new Set(['JavaScript', 'JS', 'Launch', 'SubmitForm', 'ImportData', 'URI', 'EmbeddedFile', 'EmbeddedFiles', 'EF', 'XFA', 'GoToE', 'GoToR']);
  for (const [n, t] of texts.entries()) {
    const d = decodePdfNames(t);
    for (const hit of d.matchAll(PDF_BYTES)) {
      const name = hit[1];
      if (refused.has(name) || name.startsWith('RichMedia')) return pdfActive(`/${name}`, `pdf_${name.toLowerCase()}`);
    }
    // Inflated streams may be raw pixels: only the longer patterns there.
    if ((n === 0 ? MARKUP : MARKUP_STRICT).test(d)) return { code: 'pdf_markup', reason: 'The PDF also contains HTML or script markup.' };
  }
  return null;
}

function pdfStringBytes(o: PDFString | PDFHexString): Buffer {
  try {
    return Buffer.from(o.decodeText(), 'utf8');
  } catch {
    return Buffer.from(o.asString(), 'latin1');
  }
}

/** Walks every object pdf-lib parsed (object streams included), names and strings decoded. */
function scanPdfObjects(doc: PDFDocument): ActiveContentFinding | null {
  const ctx = doc.context;
  const actionOf = (o: PDFObject | undefined): string | null => {
    const v = o instanceof PDFRef ? ctx.lookup(o) : o;
    if (!(v instanceof PDFDict)) return null;
    const s = v.get(PDFName.of('S'));
    return s instanceof PDFName ? nameOf(s) : null;
  };
  const visit = (o: PDFObject | undefined, depth: number): ActiveContentFinding | null => {
    if (!o || depth > 64) return null;
    if (o instanceof PDFRawStream) return visit(o.dict, depth + 1);
    if (o instanceof PDFName) {
      const n = nameOf(o);
      return PDF_NAMES.has(n) ? pdfActive(`/${n}`, `pdf_${n.toLowerCase()}`) : null;
    }
    if (o instanceof PDFString || o instanceof PDFHexString) {
      return hasMarkup(pdfStringBytes(o)) ? { code: 'pdf_markup', reason: 'The PDF has HTML or script in a text string.' } : null;
    }
    if (o instanceof PDFArray) {
      for (const e of o.asArray()) {
        const f = visit(e, depth + 1);
        if (f) return f;
      }
      return null;
    }
    if (o instanceof PDFDict) {
      for (const [k, v] of o.entries()) {
        const key = nameOf(k);
        if (key === 'OpenAction' || key === 'AA') {
          const triggers = key === 'AA' ? (ctx.lookup(v) instanceof PDFDict ? [...(ctx.lookup(v) as PDFDict).values()] : []) : [v];
          for (const t of triggers) {
            const a = actionOf(t);
            if (a && PDF_ACTIONS.has(a)) return pdfActive(`/${key} that runs a /${a} action`, key === 'AA' ? 'pdf_additional_action' : 'pdf_open_action');
          }
        }
        if (key === 'S' && v instanceof PDFName && PDF_ACTIONS.has(nameOf(v))) return pdfActive(`a /${nameOf(v)} action`, `pdf_${nameOf(v).toLowerCase()}`);
        if (PDF_KEYS.has(key)) return pdfActive(`/${key}`, `pdf_${key.toLowerCase()}`);
        const f = visit(v, depth + 1);
        if (f) return f;
      }
    }
    return null;
  };
  if (ctx.trailerInfo.Encrypt) return { code: 'pdf_encrypted', reason: 'The PDF is encrypted, so its content cannot be checked. Save or print it as an unprotected PDF.' };
  for (const [, obj] of ctx.enumerateIndirectObjects()) {
    const f = visit(obj, 0);
    if (f) return f;
  }
  return null;
}

async function scanPdf(r: FileReader): Promise<ActiveContentFinding | null> {
  const buf = await r.read(0, r.size);
  let doc: PDFDocument;
  try {
    doc = await PDFDocument.load(buf, { ignoreEncryption: true, updateMetadata: false, throwOnInvalidObject: false });
  } catch {
    return scanPdfBytes(buf) ?? { code: 'pdf_unreadable', reason: 'The PDF could not be read as a PDF document (damaged or not a PDF).' };
  }
  return scanPdfObjects(doc) ?? scanPdfBytes(buf);
}

async function scanCsv(r: FileReader): Promise<ActiveContentFinding | null> {
  for await (const c of r.chunks(0, r.size)) if (hasMarkup(c)) return { code: 'csv_markup', reason: 'The CSV contains HTML or script.' };
  return null;
}

/** Scans the file at `path` for the kind its magic bytes showed; null when nothing was found. */
export async function findActiveContent(kind: ScannedKind, path: string): Promise<ActiveContentFinding | null> {
  const fh = await open(path, 'r');
  try {
    const r = new FileReader(fh, (await fh.stat()).size);
    switch (kind) {
      case 'jpg':
        return await scanJpeg(r);
      case 'png':
        return await scanPng(r);
      case 'webp':
        return await scanWebp(r);
      case 'heic':
        return await scanIsoBoxes(r);
      case 'pdf':
        return await scanPdf(r);
      case 'csv':
        return await scanCsv(r);
    }
  } finally {
    await fh.close();
  }
}
