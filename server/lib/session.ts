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
  iat: number;
  exp: number;
}

export class SessionTokens {
  private key: Uint8Array;
  constructor(secret: string) {
    this.key = new TextEncoder().encode(secret);
  }

  async issue(userId: string, sessionVersion: number, authTime: number, nowSeconds: number, role: string): Promise<string> {
    const exp = Math.min(nowSeconds + IDLE_SECONDS, authTime + ABSOLUTE_SECONDS);
    return new SignJWT({ sv: sessionVersion, at: authTime, ro: role })
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
      const { sub, sv, at, ro, iat, exp } = payload as Partial<SessionClaims>;
      if (typeof sub !== 'string' || typeof sv !== 'number' || typeof at !== 'number' || typeof ro !== 'string' || typeof iat !== 'number' || typeof exp !== 'number') return null;
      if (nowSeconds >= at + ABSOLUTE_SECONDS) return null;
      return { sub, sv, at, ro, iat, exp };
    } catch (e) {
      if (e instanceof joseErrors.JOSEError || e instanceof TypeError) return null;
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
