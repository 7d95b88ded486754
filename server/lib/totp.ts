import { authenticator, totp } from 'otplib';

/**
 * TOTP (RFC 6238) for authenticator apps: SHA-1, 6 digits, 30-second steps, as every common
 * authenticator app expects. otplib computes the codes; this file adds the window and the
 * replay rule (RFC 6238 §5.2: a code is accepted once; one step of clock drift either way).
 */
export const TOTP_STEP_SECONDS = 30;
export const TOTP_ISSUER = 'Fieldproof';

/** A new 160-bit secret (RFC 4226 §4 recommends 160 bits), base32. */
export function newTotpSecret(): string {
  return authenticator.generateSecret(20);
}

export function totpStep(nowMs: number): number {
  return Math.floor(nowMs / 1000 / TOTP_STEP_SECONDS);
}

/** The code of a given step (for the demo command and the tests' sign-in helpers). */
export function totpCodeAt(secret: string, nowMs: number): string {
  return authenticator.clone({ epoch: nowMs }).generate(secret);
}

/**
 * The step of the accepted code, or null. A code of a step at or before `lastUsedStep` is refused
 * even when it is otherwise right, so a code seen over a shoulder cannot be replayed.
 */
export function verifyTotp(secret: string, code: string, nowMs: number, lastUsedStep: number | null): number | null {
  const clean = code.replace(/\s+/g, '');
  if (!/^\d{6}$/.test(clean)) return null;
  const delta = authenticator.clone({ epoch: nowMs, window: 1 }).checkDelta(clean, secret);
  if (delta === null) return null;
  const step = totpStep(nowMs) + delta;
  if (lastUsedStep !== null && step <= lastUsedStep) return null;
  return step;
}

export function totpUri(secret: string, account: string): string {
  return authenticator.keyuri(account, TOTP_ISSUER, secret);
}

/**
 * A TOTP code with any of RFC 6238's hash functions and lengths, from a raw key (the form the
 * RFC's test vectors use); the sign-in itself uses the app defaults above.
 */
export function totpCodeRaw(key: Buffer, nowMs: number, algorithm: 'sha1' | 'sha256' | 'sha512', digits: number): string {
  type Options = NonNullable<Parameters<typeof totp.clone>[0]>;
  return totp.clone({ epoch: nowMs, step: TOTP_STEP_SECONDS, algorithm: algorithm as Options['algorithm'], digits, encoding: 'hex' as Options['encoding'] }).generate(key.toString('hex'));
}
