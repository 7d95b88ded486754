import { createHmac, randomBytes } from 'node:crypto';
import type { CookieOptions } from 'express';
import { SignJWT, jwtVerify } from 'jose';
import type { AppDeps } from '../../lib/deps';
import { auditSignIn } from './sign-in-audit';
import { TooManyRequestsError } from '../../lib/errors';
import type { RateCheck, RateRule, RateTier } from '../../lib/rate-store';

const MINUTE = 60_000;
const DAY = 24 * 60 * MINUTE;
const YEAR = 365 * DAY;

/**
 * Online-guessing limits (NIST SP 800-63B-4 §3.2.2; OWASP "Slow down online guessing attacks
 * with device cookies"). Tests and deployments may override any of them per app.
 */
export interface SignInLimits {
  /** Failed sign-ins per e-mail address from clients without that account's device cookie (known or unknown account alike). */
  account: RateTier[];
  /** Failed sign-ins per client address from clients without a device cookie, across accounts. */
  address: RateTier[];
  /** Failed sign-ins per trusted device cookie: its own allowance, untouched by an attacker's failures. */
  device: RateTier[];
  /** Consecutive failures per account that are processed at all (NIST's limit: at most 100). */
  consecutive: number;
  /** Of those, how many clients without a device cookie may use up; the rest stay for trusted devices. */
  consecutiveUntrusted: number;
}

export const defaultSignInLimits: SignInLimits = {
  account: [
    { limit: 5, windowMs: 15 * MINUTE },
    { limit: 20, windowMs: DAY },
  ],
  address: [
    { limit: 100, windowMs: 15 * MINUTE },
    { limit: 1000, windowMs: DAY },
  ],
  device: [
    { limit: 5, windowMs: 15 * MINUTE },
    { limit: 20, windowMs: DAY },
  ],
  consecutive: 100,
  consecutiveUntrusted: 90,
};

export const THROTTLED_MESSAGE = 'Too many sign-in attempts. Wait a while and try again, or reset your password.';

export const DEVICE_COOKIE_PREFIX = 'fp_device_';
const DEVICE_AUDIENCE = 'fieldproof-device';
const DEVICE_ISSUER = 'fieldproof';
export const DEVICE_COOKIE_MAX_AGE_MS = YEAR;

export interface DeviceCookie {
  name: string;
  value: string;
  options: CookieOptions;
}

export interface Admission {
  email: string;
  trusted: boolean;
  checks: RateCheck[];
}

/**
 * Decides, before a password is compared, whether this attempt may be processed, and records
 * the outcome after. A client that holds a valid device cookie for the account (left by an
 * earlier successful sign-in in that browser) is a trusted device with its own small allowance;
 * every other client shares the account's untrusted allowance and its address's allowance. So a
 * flood of guesses locks out untrusted clients for that account, never the owner's devices.
 * At most `consecutive` failures in a row are processed per account; untrusted clients may use
 * only `consecutiveUntrusted` of them. After that only a successful sign-in from a trusted device
 * or a password reset (proof of the mailbox) opens the account again.
 */
export function createSignInThrottle(deps: AppDeps, overrides: Partial<SignInLimits> = {}) {
  const l: SignInLimits = { ...defaultSignInLimits, ...overrides };
  const { rates, clock, db, env } = deps;
  const rule = (name: string, tiers: RateTier[]): RateRule => ({ name, tiers });
  const rules = {
    account: rule('signin.account.untrusted', l.account),
    address: rule('signin.address.untrusted', l.address),
    device: rule('signin.device', l.device),
    // The same counter (name and window), two ceilings.
    consecutiveAll: rule('signin.consecutive', [{ limit: l.consecutive, windowMs: YEAR }]),
    consecutiveUntrusted: rule('signin.consecutive', [{ limit: Math.min(l.consecutiveUntrusted, l.consecutive), windowMs: YEAR }]),
  };
  const keyMaterial = createHmac('sha256', env.SESSION_SECRET).update('fieldproof device cookie v1').digest();
  const cookieName = (userId: string) => DEVICE_COOKIE_PREFIX + createHmac('sha256', keyMaterial).update(`name:${userId}`).digest('base64url').slice(0, 16);
  const secure = deps.secureCookies;

  /** The nonce of a valid device cookie for this account in the request, or null. */
  async function trustedDevice(cookies: Record<string, unknown> | undefined, userId: string | null): Promise<string | null> {
    if (!userId || !cookies) return null;
    const value = cookies[cookieName(userId)];
    if (typeof value !== 'string' || value.length > 1024) return null;
    try {
      const { payload } = await jwtVerify(value, keyMaterial, {
        algorithms: ['HS256'],
        issuer: DEVICE_ISSUER,
        audience: DEVICE_AUDIENCE,
        subject: userId,
        currentDate: clock.now(),
        requiredClaims: ['sub', 'jti', 'exp'],
      });
      return typeof payload.jti === 'string' ? payload.jti : null;
    } catch {
      return null;
    }
  }

  function refusalReason(checks: RateCheck[]): string {
    for (const c of checks) {
      if (rates.peek(c).allowed) continue;
      if (c.rule === rules.address) return 'throttled_address';
      if (c.rule === rules.device) return 'throttled_device';
      if (c.rule === rules.account) return 'throttled_account';
      return 'consecutive_failures';
    }
    return 'throttled';
  }

  return {
    rules,

    /**
     * Reserves the attempt (before the password is compared, so parallel bursts cannot slip
     * past), or throws 429 with Retry-After. The same answer for known and unknown accounts.
     */
    async admit(input: { email: string; account: { id: string; organisationId: string } | null; cookies?: Record<string, unknown>; ip: string; emailDigest: string }): Promise<Admission> {
      const { email, account, ip } = input;
      const device = await trustedDevice(input.cookies, account?.id ?? null);
      const checks: RateCheck[] = device
        ? [
            { rule: rules.device, key: device },
            { rule: rules.consecutiveAll, key: email },
          ]
        : [
            { rule: rules.address, key: ip },
            { rule: rules.account, key: email },
            { rule: rules.consecutiveUntrusted, key: email },
          ];
      const d = rates.consume(checks);
      if (!d.allowed) {
        // Repeats of this row within a minute collapse into one row with a count.
        auditSignIn(db, clock, account, 'denied', ip, { reason: refusalReason(checks), trustedDevice: !!device, ...(account ? {} : { emailDigest: input.emailDigest }) });
        throw new TooManyRequestsError(d.retryAfterSec, THROTTLED_MESSAGE);
      }
      return { email, trusted: !!device, checks };
    },

    /**
     * After the password check. A success gives the reserved attempt back (address, device) and
     * ends the run of consecutive failures. A success from an untrusted client also clears the
     * account's untrusted failures (that client knew the password); one from a trusted device
     * leaves them, so an attacker who is locked out stays locked out while the owner signs in.
     */
    settle(a: Admission, success: boolean): void {
      if (!success) return;
      rates.refund(a.checks.filter((c) => c.rule === rules.address || c.rule === rules.device));
      rates.reset(rules.consecutiveAll, a.email);
      if (!a.trusted) rates.reset(rules.account, a.email);
    },

    /** A password reset proves control of the mailbox: the account's failures no longer hold it. */
    clearAccount(email: string): void {
      rates.reset(rules.consecutiveAll, email);
      rates.reset(rules.account, email);
    },

    /** A fresh signed device cookie for the account (HttpOnly, SameSite=Strict, Secure in production, one year). */
    async deviceCookie(userId: string): Promise<DeviceCookie> {
      const now = Math.floor(clock.now().getTime() / 1000);
      const value = await new SignJWT({})
        .setProtectedHeader({ alg: 'HS256', typ: 'JWT' })
        .setSubject(userId)
        .setJti(randomBytes(16).toString('base64url'))
        .setIssuer(DEVICE_ISSUER)
        .setAudience(DEVICE_AUDIENCE)
        .setIssuedAt(now)
        .setExpirationTime(now + DEVICE_COOKIE_MAX_AGE_MS / 1000)
        .sign(keyMaterial);
      return { name: cookieName(userId), value, options: { httpOnly: true, sameSite: 'strict', secure, path: '/api/auth', maxAge: DEVICE_COOKIE_MAX_AGE_MS } };
    },
  };
}
