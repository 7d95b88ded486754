import type { RequestHandler } from 'express';
import { eq } from 'drizzle-orm';
import type { Db } from '../db/client';
import { users, organisations } from '../db/schema/index';
import { defineAbilityFor, type SessionUser } from '@shared/permissions/ability';
import { SESSION_COOKIE, clearSessionCookie, setSessionCookie, type SessionTokens } from '../lib/session';
import type { Clock } from '../lib/clock';
import { UnauthenticatedError } from '../lib/errors';

/**
 * Reads the session cookie, verifies the token, and checks the user's current session version
 * and active flag on every request, so sign-out, password change, deactivation and role change
 * end sessions at once. Re-issues the cookie (sliding 30-minute idle limit, 12-hour cap).
 */
export function authenticate(deps: { db: Db; tokens: SessionTokens; clock: Clock; secureCookies: boolean }): RequestHandler {
  return async (req, res, next) => {
    const token = req.cookies?.[SESSION_COOKIE];
    if (typeof token !== 'string' || token.length === 0) return next();
    const now = Math.floor(deps.clock.now().getTime() / 1000);
    const claims = await deps.tokens.verify(token, now);
    const row = claims
      ? deps.db
          .select({
            id: users.id,
            email: users.email,
            name: users.name,
            role: users.role,
            active: users.active,
            sessionVersion: users.sessionVersion,
            organisationId: users.organisationId,
            organisationKind: organisations.kind,
            organisationActive: organisations.active,
          })
          .from(users)
          .innerJoin(organisations, eq(organisations.id, users.organisationId))
          .where(eq(users.id, claims.sub))
          .get()
      : undefined;
    if (!claims || !row || !row.active || !row.organisationActive || row.sessionVersion !== claims.sv || row.role !== claims.ro) {
      clearSessionCookie(res, deps.secureCookies);
      return next();
    }
    const user: SessionUser = {
      id: row.id,
      email: row.email,
      name: row.name,
      role: row.role,
      organisationId: row.organisationId,
      organisationKind: row.organisationKind,
    };
    req.ctx = { user, ability: defineAbilityFor(user), authTime: claims.la, signInTime: claims.at };
    if (now - claims.iat >= 60) {
      // The re-issued token keeps both times: sliding the idle limit is not a new authentication.
      setSessionCookie(res, await deps.tokens.issue(row.id, row.sessionVersion, claims.at, now, row.role, claims.la), deps.secureCookies);
    }
    next();
  };
}

/** Every API route but sign-in, reset and invitation acceptance sits behind this. */
export const requireUser: RequestHandler = (req, _res, next) => {
  if (!req.ctx) throw new UnauthenticatedError();
  next();
};
