import { sqliteTable, text, integer, index, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { users } from './users';

/**
 * One TOTP authenticator per user (RFC 6238). `confirmedAt` is null while the user is enrolling
 * (secret shown, first code not yet typed). `lastUsedStep` is the 30-second step of the last code
 * accepted: a code is accepted once only (RFC 6238 §5.2).
 */
export const totpCredentials = sqliteTable('totp_credentials', {
  userId: text('user_id')
    .primaryKey()
    .references(() => users.id),
  /** Base32 (RFC 4648) secret, 160 bits from the CSPRNG. */
  secret: text('secret').notNull(),
  confirmedAt: text('confirmed_at'),
  lastUsedStep: integer('last_used_step'),
  createdAt: text('created_at').notNull(),
});

/** Single-use recovery codes: only HMAC-SHA-256(code, pepper) is stored. */
export const recoveryCodes = sqliteTable(
  'recovery_codes',
  {
    id: text('id').primaryKey(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id),
    codeHash: text('code_hash').notNull(),
    usedAt: text('used_at'),
    createdAt: text('created_at').notNull(),
  },
  (t) => [uniqueIndex('recovery_codes_hash_uq').on(t.codeHash), index('recovery_codes_user_idx').on(t.userId)],
);

/** WebAuthn credentials (passkeys) a user registered. `id` is the credential id, base64url. */
export const passkeys = sqliteTable(
  'passkeys',
  {
    id: text('id').primaryKey(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id),
    /** COSE public key, base64url. */
    publicKey: text('public_key').notNull(),
    counter: integer('counter').notNull().default(0),
    transports: text('transports'),
    name: text('name').notNull(),
    createdAt: text('created_at').notNull(),
    lastUsedAt: text('last_used_at'),
  },
  (t) => [index('passkeys_user_idx').on(t.userId)],
);

export type TotpCredential = typeof totpCredentials.$inferSelect;
export type Passkey = typeof passkeys.$inferSelect;
