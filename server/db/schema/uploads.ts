import { sqliteTable, text, index } from 'drizzle-orm/sqlite-core';

/**
 * One row per upload in progress: a lease that expires unless its request renews it, so the
 * per-user limit on concurrent uploads holds across processes sharing the database, and a
 * process that dies leaves no lease behind for longer than one lease period.
 */
export const uploadLeases = sqliteTable(
  'upload_leases',
  {
    id: text('id').primaryKey(),
    userId: text('user_id').notNull(),
    expiresAt: text('expires_at').notNull(),
    createdAt: text('created_at').notNull(),
  },
  (t) => [index('upload_leases_user_idx').on(t.userId, t.expiresAt)],
);

export type UploadLease = typeof uploadLeases.$inferSelect;
