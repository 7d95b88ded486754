import sharp from 'sharp';
import type { FileKind } from './file-check';

export const THUMBNAIL_SIZE = 480;

const placeholderText: Record<'heic' | 'pdf' | 'csv' | 'image', [string, string]> = {
  heic: ['HEIC photo', 'No preview here: download to view'],
  pdf: ['PDF document', 'Download to view'],
  csv: ['Readings sheet (CSV)', 'Download to view'],
  image: ['Image', 'No preview available'],
};

const cache = new Map<string, Promise<Buffer>>();

function escapeXml(s: string): string {
  return s.replace(/[<>&"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

/**
 * A generated PNG shown where no thumbnail can be made (a HEIC this build cannot decode, a PDF,
 * a CSV): an icon and two plain lines, never an error page.
 */
export function placeholderThumbnail(kind: FileKind | 'image'): Promise<Buffer> {
  const key = kind === 'heic' || kind === 'pdf' || kind === 'csv' ? kind : 'image';
  let p = cache.get(key);
  if (!p) {
    const [title, sub] = placeholderText[key];
    const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="480" height="360" viewBox="0 0 480 360">
  <rect width="480" height="360" fill="#eef1f4"/>
  <rect x="190" y="70" width="100" height="124" rx="10" fill="#ffffff" stroke="#5b6b7a" stroke-width="6"/>
  <path d="M262 70 v30 h28" fill="none" stroke="#5b6b7a" stroke-width="6"/>
  <rect x="210" y="120" width="60" height="8" fill="#9aa7b3"/><rect x="210" y="140" width="60" height="8" fill="#9aa7b3"/><rect x="210" y="160" width="40" height="8" fill="#9aa7b3"/>
  <text x="240" y="244" font-family="DejaVu Sans, Noto Sans, sans-serif" font-size="30" font-weight="bold" text-anchor="middle" fill="#1f2d3a">${escapeXml(title)}</text>
  <text x="240" y="284" font-family="DejaVu Sans, Noto Sans, sans-serif" font-size="20" text-anchor="middle" fill="#3d4c5a">${escapeXml(sub)}</text>
</svg>`;
    p = sharp(Buffer.from(svg)).png().toBuffer();
    cache.set(key, p);
  }
  return p;
}

export const PLACEHOLDER_CONTENT_TYPE = 'image/png';
