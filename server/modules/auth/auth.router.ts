import { Router } from 'express';
import type { AppDeps } from '../../lib/deps';
import { clearPendingCookie, clearSessionCookie, setPendingCookie, setSessionCookie } from '../../lib/session';
import type { SecondFactorService } from '../second-factor/second-factor.service';
import { secondFactorAuthRouter } from '../second-factor/second-factor.router';
import { UnauthenticatedError } from '../../lib/errors';
import { requireCtx } from '../../lib/context';
import { requireUser } from '../../middleware/authenticate';
import { parseBody } from '../../middleware/validate';
import { clientAddress } from '../../middleware/rate-limit';
import { passwordResetConfirmSchema, passwordResetRequestSchema, signInBodySchema } from '@shared/schemas/user';
import { createAuthService, RESET_REQUESTED_MESSAGE, type AuthLimits } from './auth.service';

/**
 * /api/auth: sign-in, sign-out, me, password reset. HTTP only; the rules are in the service.
 * The limiters are built here, per router, over the app's SQLite rate store (deps.rates).
 */
export function authRouter(deps: AppDeps, options: { limits?: Partial<AuthLimits>; secondFactor?: SecondFactorService } = {}): Router {
  const service = createAuthService(deps, options.limits, options.secondFactor);
  const r = Router();

  r.post('/sign-in', async (req, res) => {
    const body = parseBody(signInBodySchema, req.body);
    const result = await service.signIn(body, clientAddress(req), req.cookies);
    res.cookie(result.device.name, result.device.value, result.device.options);
    if (result.kind === 'pending') {
      // No session yet: the old one (if any) ends, and the second-factor step has 5 minutes.
      clearSessionCookie(res, deps.secureCookies);
      setPendingCookie(res, result.pending, deps.secureCookies);
      res.status(200).json(result.challenge);
      return;
    }
    clearPendingCookie(res, deps.secureCookies);
    setSessionCookie(res, result.token, deps.secureCookies);
    res.status(200).json(result.me);
  });

  if (options.secondFactor) r.use(secondFactorAuthRouter(deps, service, options.secondFactor));

  r.post('/sign-out', (req, res) => {
    if (req.ctx) service.signOut(req.ctx.user, clientAddress(req));
    clearSessionCookie(res, deps.secureCookies);
    res.status(204).end();
  });

  r.get('/me', requireUser, (req, res) => {
    const ctx = requireCtx(req);
    const me = service.me(ctx.user, ctx.ability);
    if (!me) throw new UnauthenticatedError();
    res.json(me);
  });

  r.post('/password-reset', (req, res) => {
    const body = parseBody(passwordResetRequestSchema, req.body);
    const { sendAfterCommit } = service.requestReset(body.email, clientAddress(req));
    if (sendAfterCommit) deps.outbox.kick();
    res.status(202).json({ message: RESET_REQUESTED_MESSAGE });
  });

  r.post('/password-reset/confirm', (req, res) => {
    const body = parseBody(passwordResetConfirmSchema, req.body);
    service.confirmReset(body, clientAddress(req));
    clearSessionCookie(res, deps.secureCookies);
    res.status(204).end();
  });

  return r;
}
