import { eq } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { organisations, passwordResets, users } from '../../db/schema/index';

/** The account behind an e-mail address, with what sign-in needs to decide (no tenant scope: pre-auth). */
export function findAccountByEmail(db: Db, email: string) {
  return db
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      role: users.role,
      passwordHash: users.passwordHash,
      active: users.active,
      sessionVersion: users.sessionVersion,
      organisationId: users.organisationId,
      organisationName: organisations.name,
      organisationKind: organisations.kind,
      organisationTimeZone: organisations.timeZone,
      organisationActive: organisations.active,
    })
    .from(users)
    .innerJoin(organisations, eq(organisations.id, users.organisationId))
    .where(eq(users.email, email))
    .get();
}
export type AccountRow = NonNullable<ReturnType<typeof findAccountByEmail>>;

export function findAccountById(db: Db, id: string) {
  return db
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      role: users.role,
      active: users.active,
      organisationId: users.organisationId,
      organisationName: organisations.name,
      organisationKind: organisations.kind,
      organisationTimeZone: organisations.timeZone,
      organisationActive: organisations.active,
    })
    .from(users)
    .innerJoin(organisations, eq(organisations.id, users.organisationId))
    .where(eq(users.id, id))
    .get();
}

export function findResetByTokenHash(db: Db, tokenHash: string) {
  return db.select().from(passwordResets).where(eq(passwordResets.tokenHash, tokenHash)).get();
}

