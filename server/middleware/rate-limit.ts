import type { Request, RequestHandler } from 'express';
import { ipKeyGenerator } from 'express-rate-limit';
import type { Clock } from '../lib/clock';
import { TooManyRequestsError } from '../lib/errors';

/** One limit: at most `limit` counted attempts per key in a fixed window of `windowMs`. */
export interface LimitTier {
  limit: number;
  windowMs: number;
}

interface Window {
  count: number;
  resetAt: number;
}

export type TakeResult = { ok: true } | { ok: false; retryAfterSeconds: number; firstRefusal: boolean };

/**
 * A small in-memory attempt limiter on the app's clock (so tests can move time), with one or
 * more tiers per key (e.g. 5 per 15 minutes and 20 per day). `take` reserves an attempt before
 * the work is done, so concurrent requests cannot slip past the limit; `refund` gives it back
 * (an attempt that should not count, such as a successful sign-in) and `reset` forgets the key.
 * State lives in the instance: each app builds its own limiters, nothing is shared.
 */
export class AttemptLimiter {
  private windows = new Map<string, Window[]>();
  private refused = new Set<string>();
  private ops = 0;

  constructor(
    private readonly tiers: LimitTier[],
    private readonly clock: Clock,
    /** Keys kept at most; the oldest are dropped first when an attack fills the map. */
    private readonly maxKeys = 100_000,
  ) {
    if (tiers.length === 0) throw new Error('AttemptLimiter needs at least one tier');
  }

  private current(key: string, now: number): Window[] {
    let w = this.windows.get(key);
    if (!w) {
      w = this.tiers.map((t) => ({ count: 0, resetAt: now + t.windowMs }));
      this.windows.set(key, w);
    } else {
      let renewed = false;
      w.forEach((win, i) => {
        if (now >= win.resetAt) {
          win.count = 0;
          win.resetAt = now + this.tiers[i].windowMs;
          renewed = true;
        }
      });
      if (renewed) this.refused.delete(key);
    }
    return w;
  }

  /** Seconds until the key may try again, or 0 when it may try now. */
  retryAfter(key: string): number {
    const now = this.clock.now().getTime();
    const w = this.windows.get(key);
    if (!w) return 0;
    let until = 0;
    w.forEach((win, i) => {
      if (now < win.resetAt && win.count >= this.tiers[i].limit) until = Math.max(until, win.resetAt);
    });
    return until === 0 ? 0 : Math.max(1, Math.ceil((until - now) / 1000));
  }

  /** Counts one attempt, or refuses it (without counting) when any tier is full. */
  take(key: string): TakeResult {
    const now = this.clock.now().getTime();
    this.sweep(now);
    const w = this.current(key, now);
    const full = w.some((win, i) => win.count >= this.tiers[i].limit);
    if (full) {
      const firstRefusal = !this.refused.has(key);
      this.refused.add(key);
      return { ok: false, retryAfterSeconds: this.retryAfter(key), firstRefusal };
    }
    for (const win of w) win.count++;
    return { ok: true };
  }

  /** Gives back one attempt taken with `take`. */
  refund(key: string): void {
    const w = this.windows.get(key);
    if (w) for (const win of w) win.count = Math.max(0, win.count - 1);
  }

  reset(key: string): void {
    this.windows.delete(key);
    this.refused.delete(key);
  }

  clear(): void {
    this.windows.clear();
    this.refused.clear();
  }

  get size(): number {
    return this.windows.size;
  }

  private sweep(now: number): void {
    if (++this.ops % 1000 !== 0 && this.windows.size < this.maxKeys) return;
    for (const [key, w] of this.windows) {
      if (w.every((win) => now >= win.resetAt)) {
        this.windows.delete(key);
        this.refused.delete(key);
      }
    }
    // Still full: drop the oldest keys (Map keeps insertion order).
    for (const key of this.windows.keys()) {
      if (this.windows.size < this.maxKeys) break;
      this.windows.delete(key);
      this.refused.delete(key);
    }
  }
}

/**
 * The client address as a limiter key: IPv4 as is, IPv6 grouped by its /56 network (one host
 * usually holds many addresses of its prefix). `req.ip` honours the app's trust-proxy setting.
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

/** Middleware: counts every request per client address and answers 429 with Retry-After when full. */
export function limitByAddress(limiter: AttemptLimiter, message?: string): RequestHandler {
  return (req, _res, next) => {
    const r = limiter.take(clientAddress(req));
    if (!r.ok) throw new TooManyRequestsError(r.retryAfterSeconds, message);
    next();
  };
}
