import { sqliteTable, text, integer, index, primaryKey } from 'drizzle-orm/sqlite-core';

/**
 * Idempotency keys of unsafe requests (the IETF HTTP API draft "The Idempotency-Key HTTP Header
 * Field"): one row per user and key, with the fingerprint of the first request and, once it
 * has answered, its status and JSON body so a retry is answered the same.
 */
export const idempotencyKeys = sqliteTable(
  'idempotency_keys',
  {
    userId: text('user_id').notNull(),
    key: text('key').notNull(),
    method: text('method').notNull(),
    path: text('path').notNull(),
    /** SHA-256 of method, path and the JSON body. */
    fingerprint: text('fingerprint').notNull(),
    status: text('status', { enum: ['pending', 'done'] }).notNull(),
    responseStatus: integer('response_status'),
    responseBody: text('response_body'),
    createdAt: text('created_at').notNull(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.key] }), index('idempotency_keys_created_idx').on(t.createdAt)],
);

export type IdempotencyKeyRow = typeof idempotencyKeys.$inferSelect;
