import { Router, type Request, type Response } from 'express';
import { eq } from 'drizzle-orm';
import { users } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import { requireCtx } from '../../lib/context';
import { UnauthenticatedError } from '../../lib/errors';
import {
  CHALLENGE_COOKIE,
  ChallengeTokens,
  PENDING_COOKIE,
  PENDING_SECONDS,
  clearPendingCookie,
  setPendingCookie,
  setSessionCookie,
  type PendingClaims,
} from '../../lib/session';
import { requireUser } from '../../middleware/authenticate';
import { requireRecentAuth } from '../../middleware/require-recent-auth';
import { parseBody } from '../../middleware/validate';
import { clientAddress } from '../../middleware/rate-limit';
import { findAccountById } from '../auth/auth.queries';
import type { AuthService } from '../auth/auth.service';
import {
  organisationSecuritySchema,
  passkeyBodySchema,
  passkeyRegisterBodySchema,
  recoveryBodySchema,
  stepUpBodySchema,
  totpBodySchema,
} from '@shared/schemas/second-factor';
import { InvalidSecondFactorError, type FactorAccount, type SecondFactorService } from './second-factor.service';

const PENDING_EXPIRED = 'Your sign-in took too long or was already used. Sign in again with your password.';

/**
 * /api/auth/second-factor/* (the step between a right password and a session) and
 * /api/auth/step-up. HTTP only; the rules are in the second-factor service.
 */
export function secondFactorAuthRouter(deps: AppDeps, auth: AuthService, sf: SecondFactorService): Router {
  const r = Router();
  const nowSeconds = () => Math.floor(deps.clock.now().getTime() / 1000);

  /** The pending sign-in behind the cookie, checked against the account as it is now. */
  async function pending(req: Request, purpose?: PendingClaims['pu']): Promise<{ claims: PendingClaims; account: FactorAccount }> {
    const token = req.cookies?.[PENDING_COOKIE];
    const claims = typeof token === 'string' ? await deps.tokens.verifyPending(token, nowSeconds()) : null;
    const account = claims ? findAccountById(deps.db, claims.sub) : undefined;
    const sv = claims ? deps.db.select({ sv: users.sessionVersion }).from(users).where(eq(users.id, claims.sub)).get()?.sv : undefined;
    if (!claims || !account || !account.active || !account.organisationActive || sv !== claims.sv || (purpose && claims.pu !== purpose)) {
      throw new UnauthenticatedError(PENDING_EXPIRED);
    }
    return { claims, account };
  }

  async function finish(req: Request, res: Response, userId: string, factor: string, extra: Record<string, unknown> = {}) {
    const { token, me } = await auth.startSession(userId, clientAddress(req), factor);
    clearPendingCookie(res, deps.secureCookies);
    setSessionCookie(res, token, deps.secureCookies);
    res.status(200).json({ ...me, ...extra });
  }

  r.post('/second-factor/totp', async (req, res) => {
    const { account } = await pending(req, 'verify');
    const body = parseBody(totpBodySchema, req.body);
    sf.checkTotp(account, body.code, clientAddress(req));
    await finish(req, res, account.id, 'totp');
  });

  r.post('/second-factor/recovery', async (req, res) => {
    const { account } = await pending(req, 'verify');
    const body = parseBody(recoveryBodySchema, req.body);
    sf.useRecoveryCode(account, body.code, clientAddress(req));
    await finish(req, res, account.id, 'recovery');
  });

  r.post('/second-factor/passkey/options', async (req, res) => {
    const { claims, account } = await pending(req, 'verify');
    const options = await sf.passkeyAuthenticationOptions(account.id);
    // The challenge travels in the (re-signed) pending token: nothing to keep on the server.
    setPendingCookie(res, await deps.tokens.issuePending({ sub: claims.sub, sv: claims.sv, pu: claims.pu, ch: options.challenge }, Math.min(nowSeconds(), claims.exp - PENDING_SECONDS + 60)), deps.secureCookies);
    res.json(options);
  });

  r.post('/second-factor/passkey', async (req, res) => {
    const { claims, account } = await pending(req, 'verify');
    const body = parseBody(passkeyBodySchema, req.body);
    if (!claims.ch) throw new InvalidSecondFactorError('Ask for the passkey again.');
    await sf.checkPasskey(account, body.response, claims.ch, clientAddress(req));
    await finish(req, res, account.id, 'passkey');
  });

  /** An account that must have a factor but has none sets up an authenticator app before its first session. */
  r.post('/second-factor/enrol/totp', async (req, res) => {
    const { account } = await pending(req, 'enrol');
    res.json(await sf.startTotp(account));
  });

  r.post('/second-factor/enrol/totp/confirm', async (req, res) => {
    const { account } = await pending(req, 'enrol');
    const body = parseBody(totpBodySchema, req.body);
    const { recoveryCodes } = sf.confirmTotp(account, body.code, clientAddress(req));
    await finish(req, res, account.id, 'totp', { recoveryCodes: recoveryCodes ?? [] });
  });

  /** Step-up: the password or a code again; the session's last-authentication time moves to now. */
  r.post('/step-up', requireUser, async (req, res) => {
    const ctx = requireCtx(req);
    const body = parseBody(stepUpBodySchema, req.body);
    const account = { ...ctx.user };
    if ('password' in body) {
      const g = sf.guesses.take(account.id);
      if (!g.ok) throw new InvalidSecondFactorError('Too many wrong attempts. Wait a while and try again.');
      const ok = await auth.checkPassword(account.id, body.password);
      auth.auditStepUp(account, clientAddress(req), 'password', ok);
      if (!ok) throw new InvalidSecondFactorError('That password is not right.', 'password');
      sf.guesses.reset(account.id);
    } else {
      sf.checkTotp(account, body.code, clientAddress(req), 'auth.step_up');
    }
    const sv = deps.db.select({ sv: users.sessionVersion }).from(users).where(eq(users.id, account.id)).get()?.sv ?? 0;
    const now = nowSeconds();
    setSessionCookie(res, await deps.tokens.issue(account.id, sv, ctx.signInTime ?? now, now, account.role, now), deps.secureCookies);
    res.status(204).end();
  });

  return r;
}

/** /api/account/security: the signed-in user's own factors, and the organisation's setting. */
export function accountSecurityRouter(deps: AppDeps, sf: SecondFactorService): Router {
  const r = Router();
  const challenges = new ChallengeTokens(deps.env.SESSION_SECRET);
  const nowSeconds = () => Math.floor(deps.clock.now().getTime() / 1000);
  const stepUp = requireRecentAuth(deps.clock);
  const me = (req: Request) => requireCtx(req).user;
  const challengeCookie = { httpOnly: true, sameSite: 'strict' as const, secure: deps.secureCookies, path: '/api/account/security' };
  r.use(requireUser);

  r.get('/', (req, res) => {
    res.json(sf.status(me(req)));
  });

  r.post('/totp', async (req, res) => {
    res.json(await sf.startTotp(me(req)));
  });
  r.post('/totp/confirm', (req, res) => {
    const body = parseBody(totpBodySchema, req.body);
    res.json({ recoveryCodes: sf.confirmTotp(me(req), body.code, clientAddress(req)).recoveryCodes ?? [] });
  });
  r.delete('/totp', stepUp, (req, res) => {
    sf.removeTotp(me(req), clientAddress(req));
    res.status(204).end();
  });

  r.post('/recovery-codes', stepUp, (req, res) => {
    res.json({ recoveryCodes: sf.regenerateRecoveryCodes(me(req), clientAddress(req)) });
  });

  r.post('/passkeys/options', async (req, res) => {
    const user = me(req);
    const options = await sf.passkeyRegistrationOptions(user);
    res.cookie(CHALLENGE_COOKIE, await challenges.issue(user.id, options.challenge, nowSeconds()), { ...challengeCookie, maxAge: PENDING_SECONDS * 1000 });
    res.json(options);
  });
  r.post('/passkeys', async (req, res) => {
    const user = me(req);
    const body = parseBody(passkeyRegisterBodySchema, req.body);
    const token = req.cookies?.[CHALLENGE_COOKIE];
    const challenge = typeof token === 'string' ? await challenges.verify(token, user.id, nowSeconds()) : null;
    if (!challenge) throw new InvalidSecondFactorError('Start adding the passkey again.');
    res.clearCookie(CHALLENGE_COOKIE, challengeCookie);
    const created = await sf.registerPasskey(user, body.response, challenge, body.name, clientAddress(req));
    res.status(201).json({ id: created.id, recoveryCodes: created.recoveryCodes ?? [] });
  });
  r.delete('/passkeys/:id', stepUp, (req, res) => {
    sf.removePasskey(me(req), String(req.params.id), clientAddress(req));
    res.status(204).end();
  });

  r.put('/organisation', stepUp, (req, res) => {
    const body = parseBody(organisationSecuritySchema, req.body);
    res.json(sf.setOrganisationRequirement(me(req), body.requireSecondFactor, clientAddress(req)));
  });

  return r;
}
