import { sqliteTable, text, integer, index, primaryKey } from 'drizzle-orm/sqlite-core';

/**
 * Rate-limit counters (server/lib/rate-store.ts): one row per key and window length, on the
 * app clock. The key is a digest of the rule name and the subject (account, device, address),
 * never the raw e-mail. Expired rows are reset in place or pruned by `expires_at`.
 */
export const rateCounters = sqliteTable(
  'rate_counters',
  {
    key: text('key').notNull(),
    windowMs: integer('window_ms').notNull(),
    count: integer('count').notNull(),
    /** Epoch milliseconds when this window ends. */
    expiresAt: integer('expires_at').notNull(),
  },
  (t) => [primaryKey({ columns: [t.key, t.windowMs] }), index('rate_counters_expires_idx').on(t.expiresAt)],
);

/**
 * Repeated identical refusals within one minute (server/lib/audit.ts): the first one is written
 * to audit_log at once, the rest only counted here; when the minute is over, one summary row
 * with the count goes to audit_log and this row is removed. audit_log itself stays append-only.
 */
export const auditRepeats = sqliteTable(
  'audit_repeats',
  {
    key: text('key').notNull(),
    /** Minutes since the epoch (UTC) of the bucket. */
    minute: integer('minute').notNull(),
    count: integer('count').notNull(),
    /** The audit_log row written at the first occurrence. */
    firstId: text('first_id').notNull(),
    lastAt: text('last_at').notNull(),
    /** The entry as first written, for the summary row. */
    entry: text('entry', { mode: 'json' }).$type<Record<string, unknown>>().notNull(),
  },
  (t) => [primaryKey({ columns: [t.key, t.minute] }), index('audit_repeats_minute_idx').on(t.minute)],
);
