import { SignJWT, jwtVerify, errors as joseErrors } from 'jose';
import type { Response, CookieOptions } from 'express';

export const SESSION_COOKIE = 'fp_session';
export const ISSUER = 'fieldproof';
export const AUDIENCE = 'fieldproof-web';
export const ALGORITHM = 'HS256';
export const IDLE_SECONDS = 30 * 60;
export const ABSOLUTE_SECONDS = 12 * 60 * 60;

export interface SessionClaims {
  sub: string;
  /** The user's session version when the token was issued. */
  sv: number;
  /** When the user signed in (seconds): the 12-hour absolute limit counts from here. */
  at: number;
  /** The role the session was issued for: a role change ends the session even if the version was not bumped. */
  ro: string;
  /** When the user last proved who they are (sign-in or step-up, seconds): step-up checks count from here. */
  la: number;
  iat: number;
  exp: number;
}

/** The short-lived state between a correct password and the second factor: not a session. */
export const PENDING_COOKIE = 'fp_pending';
export const PENDING_AUDIENCE = 'fieldproof-second-factor';
export const PENDING_SECONDS = 5 * 60;
export interface PendingClaims {
  sub: string;
  sv: number;
  /** 'verify': a factor is enrolled; 'enrol': the account must enrol one before it gets a session. */
  pu: 'verify' | 'enrol';
  /** A WebAuthn challenge issued to this pending sign-in, if any. */
  ch?: string;
  exp: number;
}

export class SessionTokens {
  private key: Uint8Array;
  constructor(secret: string) {
    this.key = new TextEncoder().encode(secret);
  }

  async issue(userId: string, sessionVersion: number, authTime: number, nowSeconds: number, role: string, lastAuth: number = authTime): Promise<string> {
    const exp = Math.min(nowSeconds + IDLE_SECONDS, authTime + ABSOLUTE_SECONDS);
    return new SignJWT({ sv: sessionVersion, at: authTime, ro: role, la: lastAuth })
      .setProtectedHeader({ alg: ALGORITHM, typ: 'JWT' })
      .setSubject(userId)
      .setIssuer(ISSUER)
      .setAudience(AUDIENCE)
      .setIssuedAt(nowSeconds)
      .setExpirationTime(exp)
      .sign(this.key);
  }

  /** Verifies signature, algorithm allow-list, issuer, audience and expiry; null when anything is off. */
  async verify(token: string, nowSeconds: number): Promise<SessionClaims | null> {
    try {
      const { payload } = await jwtVerify(token, this.key, {
        algorithms: [ALGORITHM],
        issuer: ISSUER,
        audience: AUDIENCE,
        currentDate: new Date(nowSeconds * 1000),
        requiredClaims: ['sub', 'exp', 'iat'],
      });
      const { sub, sv, at, ro, la, iat, exp } = payload as Partial<SessionClaims>;
      if (typeof sub !== 'string' || typeof sv !== 'number' || typeof at !== 'number' || typeof ro !== 'string' || typeof iat !== 'number' || typeof exp !== 'number') return null;
      if (nowSeconds >= at + ABSOLUTE_SECONDS) return null;
      return { sub, sv, at, ro, la: typeof la === 'number' ? la : at, iat, exp };
    } catch (e) {
      if (e instanceof joseErrors.JOSEError || e instanceof TypeError) return null;
      return null;
    }
  }

  /** The pending-second-factor token: own audience, so it can never pass as a session (and the reverse). */
  async issuePending(claims: Omit<PendingClaims, 'exp'>, nowSeconds: number): Promise<string> {
    const body: Record<string, unknown> = { sv: claims.sv, pu: claims.pu };
    if (claims.ch) body.ch = claims.ch;
    return new SignJWT(body)
      .setProtectedHeader({ alg: ALGORITHM, typ: 'JWT' })
      .setSubject(claims.sub)
      .setIssuer(ISSUER)
      .setAudience(PENDING_AUDIENCE)
      .setIssuedAt(nowSeconds)
      .setExpirationTime(nowSeconds + PENDING_SECONDS)
      .sign(this.key);
  }

  async verifyPending(token: string, nowSeconds: number): Promise<PendingClaims | null> {
    try {
      const { payload } = await jwtVerify(token, this.key, {
        algorithms: [ALGORITHM],
        issuer: ISSUER,
        audience: PENDING_AUDIENCE,
        currentDate: new Date(nowSeconds * 1000),
        requiredClaims: ['sub', 'exp', 'iat'],
      });
      const { sub, sv, pu, ch, exp } = payload as Partial<PendingClaims>;
      if (typeof sub !== 'string' || typeof sv !== 'number' || (pu !== 'verify' && pu !== 'enrol') || typeof exp !== 'number') return null;
      if (ch !== undefined && typeof ch !== 'string') return null;
      return { sub, sv, pu, ch, exp };
    } catch {
      return null;
    }
  }
}

export function cookieOptions(secure: boolean): CookieOptions {
  return { httpOnly: true, sameSite: 'lax', secure, path: '/', maxAge: IDLE_SECONDS * 1000 };
}

export function setSessionCookie(res: Response, token: string, secure: boolean): void {
  res.cookie(SESSION_COOKIE, token, cookieOptions(secure));
}

export function clearSessionCookie(res: Response, secure: boolean): void {
  const { maxAge: _m, ...rest } = cookieOptions(secure);
  res.clearCookie(SESSION_COOKIE, rest);
}

/** A WebAuthn registration challenge for a signed-in user, bound to the user and short-lived. */
export const CHALLENGE_COOKIE = 'fp_webauthn';
const CHALLENGE_AUDIENCE = 'fieldproof-webauthn';

export class ChallengeTokens {
  private key: Uint8Array;
  constructor(secret: string) {
    this.key = new TextEncoder().encode(`${secret}:webauthn-challenge`);
  }
  async issue(userId: string, challenge: string, nowSeconds: number): Promise<string> {
    return new SignJWT({ ch: challenge })
      .setProtectedHeader({ alg: ALGORITHM, typ: 'JWT' })
      .setSubject(userId)
      .setIssuer(ISSUER)
      .setAudience(CHALLENGE_AUDIENCE)
      .setIssuedAt(nowSeconds)
      .setExpirationTime(nowSeconds + PENDING_SECONDS)
      .sign(this.key);
  }
  async verify(token: string, userId: string, nowSeconds: number): Promise<string | null> {
    try {
      const { payload } = await jwtVerify(token, this.key, { algorithms: [ALGORITHM], issuer: ISSUER, audience: CHALLENGE_AUDIENCE, currentDate: new Date(nowSeconds * 1000) });
      return payload.sub === userId && typeof payload.ch === 'string' ? payload.ch : null;
    } catch {
      return null;
    }
  }
}

export function setPendingCookie(res: Response, token: string, secure: boolean): void {
  res.cookie(PENDING_COOKIE, token, { httpOnly: true, sameSite: 'strict', secure, path: '/api/auth', maxAge: PENDING_SECONDS * 1000 });
}

export function clearPendingCookie(res: Response, secure: boolean): void {
  res.clearCookie(PENDING_COOKIE, { httpOnly: true, sameSite: 'strict', secure, path: '/api/auth' });
}
