import { sqliteTable, text, integer, index } from 'drizzle-orm/sqlite-core';

/** Mail written in the same transaction as the change that causes it, sent after commit. */
export const outbox = sqliteTable(
  'outbox',
  {
    id: text('id').primaryKey(),
    to: text('to', { mode: 'json' }).$type<string[]>().notNull(),
    subject: text('subject').notNull(),
    text: text('text').notNull(),
    html: text('html'),
    /** JSON array of { filename, contentType, content (utf8 text) }. */
    attachments: text('attachments', { mode: 'json' }).$type<{ filename: string; contentType: string; content: string }[]>(),
    status: text('status', { enum: ['pending', 'sending', 'sent', 'failed'] }).notNull().default('pending'),
    attempts: integer('attempts').notNull().default(0),
    nextAttemptAt: text('next_attempt_at').notNull(),
    lastError: text('last_error'),
    sentAt: text('sent_at'),
    createdAt: text('created_at').notNull(),
  },
  (t) => [index('outbox_status_idx').on(t.status, t.nextAttemptAt)],
);

/** Security audit log: append-only (triggers refuse UPDATE and DELETE). */
export const auditLog = sqliteTable(
  'audit_log',
  {
    id: text('id').primaryKey(),
    at: text('at').notNull(),
    actorId: text('actor_id'),
    organisationId: text('organisation_id'),
    action: text('action').notNull(),
    recordType: text('record_type'),
    recordId: text('record_id'),
    outcome: text('outcome', { enum: ['success', 'failure', 'denied'] }).notNull(),
    ip: text('ip'),
    detail: text('detail', { mode: 'json' }).$type<Record<string, unknown>>(),
  },
  (t) => [index('audit_log_at_idx').on(t.at), index('audit_log_record_idx').on(t.recordType, t.recordId)],
);

export type OutboxMail = typeof outbox.$inferSelect;
export type AuditRow = typeof auditLog.$inferSelect;
