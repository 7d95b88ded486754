import exifr from 'exifr';

export interface PhotoMetadata {
  /** The capture time exactly as written in the file, e.g. "2026:03:05 14:22:10". */
  takenAtRaw: string | null;
  /** Its UTC offset as written (EXIF OffsetTime*), e.g. "-08:00"; null when the camera wrote none. */
  takenAtOffset: string | null;
  /** The instant in UTC, only when the offset is known; never guessed from the server's zone. */
  takenAtUtc: string | null;
  gpsLatitude: number | null;
  gpsLongitude: number | null;
}

const RAW = /^(\d{4}):(\d{2}):(\d{2}) (\d{2}):(\d{2}):(\d{2})/;
const OFFSET = /^([+-])(\d{2}):(\d{2})$/;

export const noMetadata: PhotoMetadata = { takenAtRaw: null, takenAtOffset: null, takenAtUtc: null, gpsLatitude: null, gpsLongitude: null };

/** The instant of an EXIF wall-clock time at its offset, as an ISO UTC string; null if invalid. */
export function exifTimeToUtc(raw: string, offset: string): string | null {
  const m = RAW.exec(raw);
  const o = OFFSET.exec(offset);
  if (!m || !o) return null;
  const [, y, mo, d, h, mi, s] = m.map(Number);
  const sign = o[1] === '-' ? -1 : 1;
  const offMin = sign * (Number(o[2]) * 60 + Number(o[3]));
  if (Number(o[2]) > 14 || Number(o[3]) > 59) return null;
  const local = Date.UTC(y, mo - 1, d, h, mi, s);
  const check = new Date(local);
  if (check.getUTCFullYear() !== y || check.getUTCMonth() !== mo - 1 || check.getUTCDate() !== d || h > 23 || mi > 59 || s > 59) return null;
  return new Date(local - offMin * 60_000).toISOString();
}

/** The calendar date (YYYY-MM-DD) of the wall-clock capture time, where the photo was taken. */
export function exifLocalDate(raw: string | null): string | null {
  const m = raw ? RAW.exec(raw) : null;
  return m ? `${m[1]}-${m[2]}-${m[3]}` : null;
}

function str(v: unknown): string | null {
  return typeof v === 'string' && v.trim() !== '' ? v.trim().replace(/\0+$/, '') : null;
}

/**
 * Reads the capture time and GPS position. exifr would build dates in the server's local time,
 * so values are read unrevived (`reviveValues: false`) and the raw string and offset are kept.
 * Unreadable metadata is no metadata, never an error.
 */
export async function readPhotoMetadata(input: Buffer | string): Promise<PhotoMetadata> {
  let e: Record<string, unknown> | undefined;
  try {
    e = await exifr.parse(input, {
      tiff: true,
      exif: true,
      gps: true,
      ifd1: false,
      xmp: false,
      icc: false,
      iptc: false,
      jfif: false,
      ihdr: false,
      interop: false,
      reviveValues: false,
      translateValues: false,
      mergeOutput: true,
    });
  } catch {
    return { ...noMetadata };
  }
  if (!e) return { ...noMetadata };
  const pairs: Array<[unknown, unknown]> = [
    [e.DateTimeOriginal, e.OffsetTimeOriginal],
    [e.CreateDate, e.OffsetTimeDigitized],
    [e.ModifyDate, e.OffsetTime],
  ];
  let takenAtRaw: string | null = null;
  let takenAtOffset: string | null = null;
  for (const [t, o] of pairs) {
    const raw = str(t);
    if (raw && RAW.test(raw)) {
      takenAtRaw = raw;
      const off = str(o);
      takenAtOffset = off && OFFSET.test(off) ? off : null;
      break;
    }
  }
  const takenAtUtc = takenAtRaw && takenAtOffset ? exifTimeToUtc(takenAtRaw, takenAtOffset) : null;
  let lat = typeof e.latitude === 'number' && Number.isFinite(e.latitude) ? e.latitude : null;
  let lon = typeof e.longitude === 'number' && Number.isFinite(e.longitude) ? e.longitude : null;
  if (lat === null || lon === null || Math.abs(lat) > 90 || Math.abs(lon) > 180 || (lat === 0 && lon === 0)) {
    lat = null;
    lon = null;
  }
  return { takenAtRaw, takenAtOffset, takenAtUtc, gpsLatitude: lat, gpsLongitude: lon };
}
