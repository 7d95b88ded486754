import bcrypt from 'bcryptjs';
import { createHmac, randomBytes } from 'node:crypto';

/**
 * bcrypt reads only the first 72 bytes, so the password is first reduced to
 * base64(HMAC-SHA-384(password, pepper)) (64 ASCII bytes): long passwords are verified whole.
 */
export function prehash(password: string, pepper: string): string {
  return createHmac('sha384', pepper).update(password.normalize('NFKC'), 'utf8').digest('base64');
}

export function hashPassword(password: string, pepper: string, cost = 10): string {
  return bcrypt.hashSync(prehash(password, pepper), cost);
}

export async function verifyPassword(password: string, hash: string, pepper: string): Promise<boolean> {
  return bcrypt.compare(prehash(password, pepper), hash);
}

/** A real hash of a random secret, compared when the account is unknown so timing matches. */
const dummyHashes = new Map<string, string>();
export function dummyPasswordHash(pepper: string, cost = 10): string {
  // Keyed by pepper and cost: one process may hold apps with different settings (tests).
  const key = `${cost}:${pepper}`;
  let hash = dummyHashes.get(key);
  if (!hash) {
    hash = hashPassword('no-such-account-' + randomBytes(16).toString('hex'), pepper, cost);
    dummyHashes.set(key, hash);
  }
  return hash;
}
