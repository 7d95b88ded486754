import { createReadStream } from 'node:fs';
import { createHash } from 'node:crypto';
import { stat } from 'node:fs/promises';
import { availableParallelism } from 'node:os';
import { pipeline } from 'node:stream/promises';
import sharp from 'sharp';
import { PayloadTooLargeError, UnsupportedMediaTypeError } from '../errors';
import { checkFileType, type AllowedType } from './file-check';
import { readPhotoMetadata, noMetadata, type PhotoMetadata } from './exif';
import { perceptualHash } from './hashes';
import { THUMBNAIL_SIZE } from './thumbnail';

// libvips' operation cache would keep decoded pixels of recent uploads in memory: uploads are
// never decoded twice, so it buys nothing and costs tens of MB per large photo.
sharp.cache(false);

async function sha256OfFile(path: string): Promise<string> {
  const h = createHash('sha256');
  await pipeline(createReadStream(path, { highWaterMark: 1 << 20 }), h);
  return h.digest('hex');
}

/**
 * At most one file per core is decoded at a time in this process: more in parallel would only
 * queue for the CPU while each held its decoder's buffers, so memory would grow with the number
 * of uploads in flight instead of staying flat.
 */
const slots = { free: Math.max(1, availableParallelism()), waiting: [] as Array<() => void> };
async function inSlot<T>(fn: () => Promise<T>): Promise<T> {
  if (slots.free > 0) slots.free--;
  else await new Promise<void>((resolve) => slots.waiting.push(resolve));
  try {
    return await fn();
  } finally {
    const next = slots.waiting.shift();
    if (next) next();
    else slots.free++;
  }
}

/** Decoding bombs stop here: 100 megapixels covers every phone camera's full-size photo. */
export const MAX_IMAGE_PIXELS = 100_000_000;

export interface IntakeResult {
  type: AllowedType;
  sizeBytes: number;
  sha256: string;
  perceptualHash: string | null;
  /** Upright pixel size (after the EXIF orientation is applied). */
  width: number | null;
  height: number | null;
  metadata: PhotoMetadata;
  /** A small upright JPEG without metadata; null when the image cannot be decoded here (HEIC). */
  thumbnail: Buffer | null;
  timingsMs: { type: number; hashes: number; exif: number; thumbnail: number; total: number };
}

function isPixelLimit(e: unknown): boolean {
  return /pixel limit/i.test((e as Error)?.message ?? '');
}

/**
 * Everything the server learns from one file before anything is stored: type by magic bytes
 * (agreeing with the name), SHA-256, EXIF capture time and GPS, an auto-rotated thumbnail with
 * metadata stripped, and the perceptual hash of the same pixels. Everything is read from the
 * file on disk (a Buffer, from tests and the bench, is written to a temporary file first). Throws a 4xx error for a file
 * that is refused.
 */
export async function intakeFile(input: string | Buffer, name: string): Promise<IntakeResult> {
  if (Buffer.isBuffer(input)) {
    const { bufferToTempFile, removeFile } = await import('../storage/upload-temp');
    const { tmpdir } = await import('node:os');
    const path = await bufferToTempFile(tmpdir(), input);
    try {
      return await intakeFile(path, name);
    } finally {
      await removeFile(path);
    }
  }
  const path = input;
  return inSlot(() => intakePath(path, name));
}

async function intakePath(path: string, name: string): Promise<IntakeResult> {
  const t0 = performance.now();
  const { size } = await stat(path);
  const type = await checkFileType(path, size, name);
  const t1 = performance.now();
  const sha256 = await sha256OfFile(path);
  let metadata: PhotoMetadata = { ...noMetadata };
  let thumbnail: Buffer | null = null;
  let phash: string | null = null;
  let width: number | null = null;
  let height: number | null = null;
  let tExif = 0;
  let tThumb = 0;
  let tHash = performance.now() - t1;

  if (type.isImage) {
    const e0 = performance.now();
    metadata = await readPhotoMetadata(path);
    tExif = performance.now() - e0;
    const th0 = performance.now();
    try {
      const { data, info } = await sharp(path, { limitInputPixels: MAX_IMAGE_PIXELS, failOn: 'truncated' })
        .rotate()
        .resize(THUMBNAIL_SIZE, THUMBNAIL_SIZE, { fit: 'inside', withoutEnlargement: true })
        .removeAlpha()
        .raw()
        .toBuffer({ resolveWithObject: true });
      const raw = { raw: { width: info.width, height: info.height, channels: info.channels } } as const;
      thumbnail = await sharp(data, raw).jpeg({ quality: 78 }).toBuffer();
      tThumb = performance.now() - th0;
      const h0 = performance.now();
      phash = await perceptualHash(data, raw);
      tHash += performance.now() - h0;
      const meta = await sharp(path, { limitInputPixels: MAX_IMAGE_PIXELS }).metadata();
      const turned = (meta.orientation ?? 1) >= 5;
      width = (turned ? meta.height : meta.width) ?? null;
      height = (turned ? meta.width : meta.height) ?? null;
    } catch (e) {
      if (isPixelLimit(e)) throw new PayloadTooLargeError(`"${name}" has more than ${MAX_IMAGE_PIXELS / 1_000_000} megapixels.`);
      if (type.kind !== 'heic') {
        throw new UnsupportedMediaTypeError(`"${name}" looks like a ${type.kind.toUpperCase()} image but could not be read as one (damaged or incomplete).`);
      }
      // A HEIC this build of the image library cannot decode: kept, shown with a placeholder.
      thumbnail = null;
      tThumb = performance.now() - th0;
    }
  }
  return {
    type,
    sizeBytes: size,
    sha256,
    perceptualHash: phash,
    width,
    height,
    metadata,
    thumbnail,
    timingsMs: { type: t1 - t0, hashes: tHash, exif: tExif, thumbnail: tThumb, total: performance.now() - t0 },
  };
}
