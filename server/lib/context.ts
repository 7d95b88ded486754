import type { Request } from 'express';
import type { AppAbility, SessionUser } from '@shared/permissions/ability';
import { UnauthenticatedError } from './errors';

export interface RequestContext {
  user: SessionUser;
  ability: AppAbility;
  /** When the session last proved who the user is (sign-in, second factor or step-up), UNIX seconds. */
  authTime?: number;
  /** When this session signed in, UNIX seconds. */
  signInTime?: number;
}

declare module 'express-serve-static-core' {
  interface Request {
    ctx?: RequestContext;
  }
}

export function requireCtx(req: Request): RequestContext {
  if (!req.ctx) throw new UnauthenticatedError();
  return req.ctx;
}
