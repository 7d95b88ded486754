import type { RequestHandler } from 'express';
import helmet from 'helmet';
import { AppError, ForbiddenError } from '../lib/errors';

export function securityHeaders(opts: { dev: boolean }): RequestHandler {
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        scriptSrc: opts.dev ? ["'self'", "'unsafe-inline'"] : ["'self'"],
        styleSrc: ["'self'", "'unsafe-inline'"],
        imgSrc: ["'self'", 'data:', 'blob:'],
        fontSrc: ["'self'", 'data:'],
        connectSrc: opts.dev ? ["'self'", 'ws:', 'wss:'] : ["'self'"],
        objectSrc: ["'none'"],
        baseUri: ["'self'"],
        formAction: ["'self'"],
        frameAncestors: ["'none'"],
      },
    },
    referrerPolicy: { policy: 'no-referrer' },
    crossOriginEmbedderPolicy: false,
    strictTransportSecurity: opts.dev ? false : undefined,
  });
}

const unsafe = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/**
 * CSRF: unsafe methods must come from this site (Sec-Fetch-Site / Origin) and API writes
 * must be JSON (or multipart for uploads), which a cross-site form cannot send without CORS.
 */
export function csrfGuard(publicOrigin: string): RequestHandler {
  return (req, _res, next) => {
    if (!unsafe.has(req.method)) return next();
    const site = req.get('sec-fetch-site');
    if (site && site !== 'same-origin' && site !== 'none') throw new ForbiddenError('Cross-site request refused.');
    const origin = req.get('origin');
    if (origin && origin !== 'null') {
      const host = req.get('host');
      let ok = origin === publicOrigin;
      try {
        ok = ok || (host !== undefined && new URL(origin).host === host);
      } catch {
        ok = false;
      }
      if (!ok) throw new ForbiddenError('Cross-site request refused.');
    } else if (origin === 'null') {
      throw new ForbiddenError('Cross-site request refused.');
    }
    const length = Number(req.get('content-length') ?? 0);
    const hasBody = length > 0 || req.get('transfer-encoding') !== undefined;
    if (hasBody && !req.is('application/json') && !req.is('multipart/form-data')) {
      throw new AppError(415, 'unsupported_media_type', 'Send the request body as application/json.');
    }
    next();
  };
}

/** Signed-in API answers are never cached. */
export const noStore: RequestHandler = (_req, res, next) => {
  res.setHeader('Cache-Control', 'no-store');
  next();
};
