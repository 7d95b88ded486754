import { createHash } from 'node:crypto';
import type { Statement } from 'better-sqlite3';
import type { Db } from '../db/client';
import type { Clock } from './clock';

/** At most `limit` counted attempts per key in a fixed window of `windowMs`, starting at the first attempt. */
export interface RateTier {
  limit: number;
  windowMs: number;
}

/** A named limit with one or more tiers (e.g. 5 per 15 minutes and 20 a day). */
export interface RateRule {
  name: string;
  tiers: RateTier[];
}

/** One rule applied to one subject (an account, a device, an address, a user). */
export interface RateCheck {
  rule: RateRule;
  key: string;
}

export interface RateDecision {
  allowed: boolean;
  /** Seconds until the fullest refusing window ends; 0 when allowed. */
  retryAfterSec: number;
}

/**
 * Rate-limit counters in SQLite (table `rate_counters`), on the app clock so tests can move
 * time. One row per (rule, subject, window length); a window that has ended is reset in place,
 * and ended rows are pruned now and then. Because the counters are rows, they survive a restart
 * and every process on the same database shares them: `consume` runs in one BEGIN IMMEDIATE
 * transaction, so two processes cannot both take the last attempt.
 *
 * The store keeps only a digest of the rule name and subject: no e-mail address (of a real or
 * an unknown account) is written here. Counter commits run with `synchronous = NORMAL`: a
 * power cut may forget the last few increments, never a money write (those commit with FULL,
 * which also syncs everything before them).
 */
export class RateStore {
  private readonly select: Statement<[string, number], { count: number; expires_at: number }>;
  private readonly upsert: Statement<[string, number, number, number, number, number]>;
  private readonly decrement: Statement<[number, string, number]>;
  private readonly remove: Statement<[string]>;
  private readonly prune: Statement<[number]>;
  private ops = 0;

  constructor(
    private readonly db: Db,
    private readonly clock: Clock,
  ) {
    const c = db.$client;
    this.select = c.prepare('SELECT count, expires_at FROM rate_counters WHERE key = ? AND window_ms = ?');
    this.upsert = c.prepare(
      `INSERT INTO rate_counters (key, window_ms, count, expires_at) VALUES (?, ?, 1, ?)
       ON CONFLICT (key, window_ms) DO UPDATE SET
         count = CASE WHEN expires_at <= ? THEN 1 ELSE count + 1 END,
         expires_at = CASE WHEN expires_at <= ? THEN ? ELSE expires_at END`,
    );
    this.decrement = c.prepare('UPDATE rate_counters SET count = max(0, count - 1) WHERE expires_at > ? AND key = ? AND window_ms = ?');
    this.remove = c.prepare('DELETE FROM rate_counters WHERE key = ?');
    this.prune = c.prepare('DELETE FROM rate_counters WHERE rowid IN (SELECT rowid FROM rate_counters WHERE expires_at <= ? LIMIT 500)');
  }

  /** The row key: a digest of rule name and subject (fixed size, no personal data). */
  static keyOf(rule: RateRule, key: string): string {
    return createHash('sha256').update(`${rule.name}\u0000${key}`).digest('base64url').slice(0, 32);
  }

  /**
   * Counts one attempt against every check, or none of them: when any tier of any check is
   * full, nothing is counted and the answer says how long to wait.
   */
  consume(checks: RateCheck | RateCheck[]): RateDecision {
    const list = Array.isArray(checks) ? checks : [checks];
    const now = this.clock.now().getTime();
    const decision = this.write(() => {
      const refused = this.evaluate(list, now);
      if (refused) return refused;
      for (const { rule, key } of list) {
        const k = RateStore.keyOf(rule, key);
        for (const t of rule.tiers) this.upsert.run(k, t.windowMs, now + t.windowMs, now, now, now + t.windowMs);
      }
      return { allowed: true, retryAfterSec: 0 };
    });
    if (++this.ops % 200 === 0) this.write(() => this.prune.run(now));
    return decision;
  }

  /** Whether `consume` would be allowed now, without counting. */
  peek(checks: RateCheck | RateCheck[]): RateDecision {
    const list = Array.isArray(checks) ? checks : [checks];
    return this.evaluate(list, this.clock.now().getTime()) ?? { allowed: true, retryAfterSec: 0 };
  }

  /** Gives back one attempt counted by `consume` (one that should not count, such as a successful sign-in). */
  refund(checks: RateCheck | RateCheck[]): void {
    const list = Array.isArray(checks) ? checks : [checks];
    const now = this.clock.now().getTime();
    this.write(() => {
      for (const { rule, key } of list) {
        const k = RateStore.keyOf(rule, key);
        for (const t of rule.tiers) this.decrement.run(now, k, t.windowMs);
      }
    });
  }

  /** Forgets every window of the subject under this rule name. */
  reset(rule: RateRule, key: string): void {
    const k = RateStore.keyOf(rule, key);
    this.write(() => this.remove.run(k));
  }

  private evaluate(list: RateCheck[], now: number): RateDecision | null {
    let until = 0;
    for (const { rule, key } of list) {
      const k = RateStore.keyOf(rule, key);
      for (const t of rule.tiers) {
        const row = this.select.get(k, t.windowMs);
        if (row && row.expires_at > now && row.count >= t.limit) until = Math.max(until, row.expires_at);
      }
    }
    return until === 0 ? null : { allowed: false, retryAfterSec: Math.max(1, Math.ceil((until - now) / 1000)) };
  }

  /** One immediate transaction (or a savepoint when the caller already holds one). */
  private write<T>(fn: () => T): T {
    const c = this.db.$client;
    if (c.inTransaction) return c.transaction(fn)();
    const level = c.pragma('synchronous', { simple: true }) as number;
    if (level > 1) c.pragma('synchronous = NORMAL');
    try {
      return c.transaction(fn).immediate();
    } finally {
      if (level > 1) c.pragma(`synchronous = ${level}`);
    }
  }
}
