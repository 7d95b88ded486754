import { sqliteTable, text, integer, index, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { organisations } from './organisations';
import { productFamilies } from './catalog';

export const roles = ['technician', 'agency_admin', 'reviewer', 'accountant', 'manufacturer_admin'] as const;
export type Role = (typeof roles)[number];

export const users = sqliteTable(
  'users',
  {
    id: text('id').primaryKey(),
    organisationId: text('organisation_id')
      .notNull()
      .references(() => organisations.id),
    role: text('role', { enum: roles }).notNull(),
    email: text('email').notNull(),
    name: text('name').notNull(),
    passwordHash: text('password_hash'),
    active: integer('active', { mode: 'boolean' }).notNull().default(true),
    /** Bumped on sign-out, password change, deactivation and role change: ends every session at once. */
    sessionVersion: integer('session_version').notNull().default(1),
    lastSignInAt: text('last_sign_in_at'),
    createdAt: text('created_at').notNull(),
    updatedAt: text('updated_at').notNull(),
  },
  (t) => [uniqueIndex('users_email_uq').on(t.email), index('users_org_idx').on(t.organisationId, t.role)],
);

export const invitations = sqliteTable(
  'invitations',
  {
    id: text('id').primaryKey(),
    organisationId: text('organisation_id')
      .notNull()
      .references(() => organisations.id),
    email: text('email').notNull(),
    role: text('role', { enum: roles }).notNull(),
    tokenHash: text('token_hash').notNull(),
    invitedBy: text('invited_by').references(() => users.id),
    expiresAt: text('expires_at').notNull(),
    acceptedAt: text('accepted_at'),
    revokedAt: text('revoked_at'),
    createdAt: text('created_at').notNull(),
  },
  (t) => [uniqueIndex('invitations_token_uq').on(t.tokenHash), index('invitations_org_idx').on(t.organisationId), index('invitations_email_idx').on(t.email)],
);

export const passwordResets = sqliteTable(
  'password_resets',
  {
    id: text('id').primaryKey(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id),
    tokenHash: text('token_hash').notNull(),
    expiresAt: text('expires_at').notNull(),
    usedAt: text('used_at'),
    createdAt: text('created_at').notNull(),
  },
  (t) => [uniqueIndex('password_resets_token_uq').on(t.tokenHash), index('password_resets_user_idx').on(t.userId)],
);

export const certifications = sqliteTable(
  'certifications',
  {
    id: text('id').primaryKey(),
    organisationId: text('organisation_id')
      .notNull()
      .references(() => organisations.id),
    userId: text('user_id')
      .notNull()
      .references(() => users.id),
    familyId: text('family_id')
      .notNull()
      .references(() => productFamilies.id),
    certificateNumber: text('certificate_number').notNull(),
    validFrom: text('valid_from').notNull(),
    validTo: text('valid_to').notNull(),
    attachmentId: text('attachment_id'),
    createdAt: text('created_at').notNull(),
    /** Set when the agency admin withdraws the certificate; a revoked one no longer counts anywhere. */
    revokedAt: text('revoked_at'),
    revokedBy: text('revoked_by').references(() => users.id),
    revokeReason: text('revoke_reason'),
  },
  (t) => [index('certifications_user_idx').on(t.userId, t.familyId), index('certifications_org_idx').on(t.organisationId)],
);

export type User = typeof users.$inferSelect;
export type NewUser = typeof users.$inferInsert;
export type Invitation = typeof invitations.$inferSelect;
export type Certification = typeof certifications.$inferSelect;
