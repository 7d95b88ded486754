import type { Request, RequestHandler } from 'express';
import { ipKeyGenerator } from 'express-rate-limit';
import type { Db } from '../db/client';
import type { Env } from '../env';
import { writeAudit } from '../lib/audit';
import type { Clock } from '../lib/clock';
import { TooManyRequestsError } from '../lib/errors';
import type { RateRule, RateStore, RateTier } from '../lib/rate-store';

/** One limit: at most `limit` counted attempts per key in a fixed window of `windowMs`. */
export type LimitTier = RateTier;

export type TakeResult = { ok: true } | { ok: false; retryAfterSeconds: number };

/**
 * A named attempt limiter over the SQLite rate store (so it survives a restart and is shared by
 * every process on the database), with one or more tiers per key (e.g. 5 per 15 minutes and 20
 * per day). `take` reserves an attempt before the work is done, so concurrent requests cannot
 * slip past the limit; `refund` gives it back (an attempt that should not count, such as a
 * successful sign-in) and `reset` forgets the key.
 */
export class AttemptLimiter {
  readonly rule: RateRule;
  constructor(
    private readonly store: RateStore,
    name: string,
    tiers: LimitTier[],
  ) {
    if (tiers.length === 0) throw new Error('AttemptLimiter needs at least one tier');
    this.rule = { name, tiers };
  }

  take(key: string): TakeResult {
    const d = this.store.consume({ rule: this.rule, key });
    return d.allowed ? { ok: true } : { ok: false, retryAfterSeconds: d.retryAfterSec };
  }

  /** Seconds until the key may try again, or 0 when it may try now. */
  retryAfter(key: string): number {
    return this.store.peek({ rule: this.rule, key }).retryAfterSec;
  }

  refund(key: string): void {
    this.store.refund({ rule: this.rule, key });
  }

  reset(key: string): void {
    this.store.reset(this.rule, key);
  }
}

/**
 * The client address as a limiter key: IPv4 as is, IPv6 grouped by its /56 network (one host
 * usually holds many addresses of its prefix). `req.ip` honours the app's trust-proxy setting:
 * with TRUST_PROXY=false it is the socket's peer, and a forwarded-for header is ignored.
 */
export function clientAddress(req: Request): string {
  const ip = req.ip ?? req.socket.remoteAddress ?? 'unknown';
  const v4 = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(ip);
  if (v4) return v4[1];
  try {
    return ipKeyGenerator(ip, 56);
  } catch {
    return ip;
  }
}

/**
 * Middleware: counts each request of the signed-in user against `rule` and answers 429 with
 * Retry-After when it is full. The refusal is audited; repeats within a minute collapse into one
 * row with a count (see writeAudit). Requests without a session pass (the route's own
 * requireUser answers 401).
 */
export function limitPerUser(deps: { rates: RateStore; db: Db; clock: Clock }, rule: RateRule, opts: { action: string; message: string; when?: (req: Request) => boolean }): RequestHandler {
  return (req, _res, next) => {
    const user = req.ctx?.user;
    if (!user || (opts.when && !opts.when(req))) return next();
    const d = deps.rates.consume({ rule, key: user.id });
    if (d.allowed) return next();
    writeAudit(deps.db, deps.clock, {
      actorId: user.id,
      organisationId: user.organisationId,
      action: opts.action,
      recordType: 'rate_limit',
      recordId: rule.name,
      outcome: 'denied',
      ip: clientAddress(req),
      detail: { code: 'too_many_requests', status: 429 },
    });
    throw new TooManyRequestsError(d.retryAfterSec, opts.message);
  };
}

const MINUTE_MS = 60_000;

/** The per-user rules of the API, from the configuration. */
export function userRateRules(env: Pick<Env, 'RATE_WRITES_PER_MINUTE' | 'RATE_UPLOADS_PER_MINUTE' | 'RATE_UNIT_LOOKUPS_PER_MINUTE'>) {
  return {
    writes: { name: 'user.writes', tiers: [{ limit: env.RATE_WRITES_PER_MINUTE, windowMs: MINUTE_MS }] } satisfies RateRule,
    uploads: { name: 'user.uploads', tiers: [{ limit: env.RATE_UPLOADS_PER_MINUTE, windowMs: MINUTE_MS }] } satisfies RateRule,
    unitLookups: { name: 'user.unit_lookups', tiers: [{ limit: env.RATE_UNIT_LOOKUPS_PER_MINUTE, windowMs: MINUTE_MS }] } satisfies RateRule,
  };
}

const UNSAFE = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/**
 * Per-account write rate: every unsafe API request of a signed-in user counts (sign-in and
 * sign-out under /auth do not, so nobody is kept from leaving). Mounted after authenticate.
 */
export function limitWrites(deps: { rates: RateStore; db: Db; clock: Clock; env: Env }): RequestHandler {
  return limitPerUser(deps, userRateRules(deps.env).writes, {
    action: 'api.write',
    message: 'Too many changes in a short time. Wait a moment and try again.',
    when: (req) => UNSAFE.has(req.method) && !req.path.startsWith('/auth/'),
  });
}

/** Upload requests per user and minute; put it on the upload routes after requireUser. */
export function limitUploads(deps: { rates: RateStore; db: Db; clock: Clock; env: Env }): RequestHandler {
  return limitPerUser(deps, userRateRules(deps.env).uploads, { action: 'attachment.upload', message: 'Too many uploads in a minute. Wait a moment and try again.' });
}

/** Serial-number look-ups per user and minute (serial numbers are guessable). */
export function limitUnitLookups(deps: { rates: RateStore; db: Db; clock: Clock; env: Env }): RequestHandler {
  return limitPerUser(deps, userRateRules(deps.env).unitLookups, { action: 'unit.lookup', message: 'Too many unit look-ups in a minute. Wait a moment and try again.' });
}
