import { createHash } from 'node:crypto';
import phash from 'sharp-phash';
import type { SharpOptions } from 'sharp';

export const sha256Hex = (buf: Buffer): string => createHash('sha256').update(buf).digest('hex');

/**
 * The 64-bit DCT perceptual hash (sharp-phash) as 16 hex digits. It is taken from the
 * auto-rotated, downscaled pixels the thumbnail is made from, so every photo is hashed the
 * same way whatever its size or encoding.
 */
export async function perceptualHash(input: Buffer, options?: SharpOptions): Promise<string> {
  const bits = await phash(input, options);
  let hex = '';
  for (let i = 0; i < bits.length; i += 4) hex += parseInt(bits.slice(i, i + 4), 2).toString(16);
  return hex;
}

const POP = [0, 1, 1, 2, 1, 2, 2, 3, 1, 2, 2, 3, 2, 3, 3, 4];

/** Number of differing bits between two hex hashes of the same length. */
export function hammingDistance(a: string, b: string): number {
  if (a.length !== b.length) throw new Error('hashes of different lengths');
  let d = 0;
  for (let i = 0; i < a.length; i++) d += POP[parseInt(a[i], 16) ^ parseInt(b[i], 16)];
  return d;
}
