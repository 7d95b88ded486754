/** A random key for the Idempotency-Key header; getRandomValues also works outside secure contexts. */
export function newIdempotencyKey(): string {
  if (typeof globalThis.crypto?.randomUUID === 'function' && globalThis.isSecureContext !== false) return globalThis.crypto.randomUUID();
  const bytes = new Uint8Array(16);
  globalThis.crypto.getRandomValues(bytes);
  return Array.from(bytes, (b) => b.toString(16).padStart(2, '0')).join('');
}
