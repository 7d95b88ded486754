import type { Request, RequestHandler } from 'express';
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

/** The loopback names a demo answers to besides PUBLIC_URL's host (as URL.hostname spells them). */
export const LOOPBACK_NAMES = ['localhost', '127.0.0.1', '[::1]'] as const;

/**
 * The host name of a Host header, lower-cased, without port or trailing dot; null when the header
 * is missing or is not a plain host[:port] (userinfo, paths and spaces are refused, not parsed).
 */
export function hostnameOf(host: string | undefined): string | null {
  if (!host) return null;
  const m = /^(\[[0-9a-f:.]+\]|[a-z0-9_-]+(?:\.[a-z0-9_-]+)*\.?)(?::(\d{1,5}))?$/i.exec(host);
  if (!m) return null;
  return m[1].toLowerCase().replace(/\.$/, '');
}

export interface SiteNames {
  /** Host names the server answers for: PUBLIC_URL's, plus the loopback names in demo mode. */
  hostnames: ReadonlySet<string>;
  /** Origins a write may come from: PUBLIC_URL's, plus the loopback origins on PORT in demo mode. */
  origins: ReadonlySet<string>;
}

/** Built from the configuration alone, never from a request. */
export function siteNames(opts: { publicUrl: string; port: number; demo: boolean }): SiteNames {
  const pub = new URL(opts.publicUrl);
  const hostnames = new Set([pub.hostname.toLowerCase()]);
  const origins = new Set([pub.origin]);
  if (opts.demo) {
    for (const name of LOOPBACK_NAMES) {
      hostnames.add(name);
      origins.add(new URL(`http://${name}:${opts.port}`).origin);
    }
  }
  return { hostnames, origins };
}

/**
 * Host allow-list (DNS rebinding, OWASP ASVS 5.0 13.4.x; RFC 9110 15.5.20 421 Misdirected
 * Request): a request naming any other host is answered 421 before a route, the static client or
 * the mailbox runs. The Host header is read as sent, never X-Forwarded-Host: a proxy in front must
 * pass the original Host on.
 */
export function hostAllowList(names: SiteNames): RequestHandler {
  return (req, res, next) => {
    const hostname = hostnameOf(req.get('host'));
    if (hostname !== null && names.hostnames.has(hostname)) return next();
    res.status(421).json({ error: { code: 'misdirected_request', message: 'This server does not answer for that host name.' } });
  };
}

/**
 * CSRF (OWASP CSRF Prevention Cheat Sheet: Origin verification and Fetch Metadata): an unsafe
 * method needs an Origin from the configured list; without Origin, a Sec-Fetch-Site other than
 * same-origin is refused. A request with neither header is not from a browser (browsers send
 * Origin on every POST, PUT, PATCH and DELETE) and passes. API writes must also be JSON (or
 * multipart for uploads), which a cross-site form cannot send without CORS.
 */
export function csrfGuard(allowedOrigins: ReadonlySet<string>): RequestHandler {
  return (req, _res, next) => {
    if (!unsafe.has(req.method)) return next();
    const site = req.get('sec-fetch-site');
    const origin = req.get('origin');
    if (origin !== undefined) {
      if (!allowedOrigins.has(origin)) throw new ForbiddenError('Cross-site request refused.');
      if (site !== undefined && site !== 'same-origin' && site !== 'none') throw new ForbiddenError('Cross-site request refused.');
    } else if (site !== undefined && site !== 'same-origin') {
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

const isLoopbackAddress = (a: string | undefined) => a !== undefined && (a === '::1' || /^(::ffff:)?127\.\d{1,3}\.\d{1,3}\.\d{1,3}$/i.test(a));

/**
 * A request made on this machine: its socket comes from a loopback address (the socket itself, not
 * X-Forwarded-For, whatever TRUST_PROXY says), it names a loopback host (a DNS-rebound page names
 * its own), and no proxy forwarded it.
 */
export function isLocalRequest(req: Request): boolean {
  if (!isLoopbackAddress(req.socket.remoteAddress)) return false;
  const hostname = hostnameOf(req.get('host'));
  if (hostname === null || !(LOOPBACK_NAMES as readonly string[]).includes(hostname)) return false;
  return req.get('x-forwarded-for') === undefined && req.get('forwarded') === undefined && req.get('x-real-ip') === undefined;
}

/** The mailbox's page and API, however the path is spelled: /dev, /api/dev and below, any case, %-escapes, doubled slashes. */
export function isMailboxPath(path: string): boolean {
  let p = path;
  try {
    p = decodeURIComponent(path);
  } catch {
    /* keep it raw */
  }
  p = p.toLowerCase().replace(/\/{2,}/g, '/');
  return /^\/(api\/)?dev(\/|$)/.test(p);
}

/**
 * The demo's mailbox shows every mail, reset links included: it answers only local requests while
 * the local sink is in use, and is absent (404, as for any unknown route) for everyone else and
 * in deployment mode.
 */
export function localMailboxOnly(opts: { enabled: boolean }): RequestHandler {
  return (req, res, next) => {
    if (!isMailboxPath(req.path)) return next();
    if (opts.enabled && isLocalRequest(req)) return next();
    const api = /^\/api(\/|$)/i.test(req.path);
    res.status(404).json({ error: { code: 'not_found', message: api ? 'No such API route.' : 'No such page.' } });
  };
}

/** Signed-in API answers are never cached. */
export const noStore: RequestHandler = (_req, res, next) => {
  res.setHeader('Cache-Control', 'no-store');
  next();
};
