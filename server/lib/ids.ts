import { randomBytes, randomUUID, createHash } from 'node:crypto';

export const newId = (): string => randomUUID();
/** A URL-safe one-time token and the hash that is stored in its place. */
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}
export const hashToken = (token: string): string => createHash('sha256').update(token).digest('hex');
