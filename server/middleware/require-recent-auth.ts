import type { Request, RequestHandler } from 'express';
import type { Clock } from '../lib/clock';
import { AppError, UnauthenticatedError } from '../lib/errors';

/** A sensitive change needs a sign-in, second factor or step-up within this many seconds. */
export const STEP_UP_SECONDS = 5 * 60;

export class StepUpRequiredError extends AppError {
  constructor() {
    super(401, 'step_up_required', 'Confirm it is you: enter your password or a code from your authenticator, then try again.');
  }
}

/**
 * Step-up (NIST SP 800-63B-4 re-authentication; OWASP ASVS 5.0 7.5): the session must have proved
 * who the user is within the last 5 minutes, else 401 `step_up_required` and the client asks for
 * the password or a code and retries. `when` limits it to the requests that change what matters
 * (a role in a user update, a price in a part update); without it every request needs it.
 */
export function requireRecentAuth(clock: Clock, when?: (req: Request) => boolean): RequestHandler {
  return (req, _res, next) => {
    if (!req.ctx) throw new UnauthenticatedError();
    if (when && !when(req)) return next();
    const now = Math.floor(clock.now().getTime() / 1000);
    const at = req.ctx.authTime;
    if (typeof at !== 'number' || now - at > STEP_UP_SECONDS || at > now + 60) throw new StepUpRequiredError();
    next();
  };
}

/** True when the JSON body carries any of these fields (the middleware runs before the body is parsed by the route). */
export const bodyHas =
  (...fields: string[]) =>
  (req: Request): boolean => {
    const b = req.body as Record<string, unknown> | undefined;
    return !!b && typeof b === 'object' && fields.some((f) => Object.prototype.hasOwnProperty.call(b, f) && b[f] !== undefined);
  };
