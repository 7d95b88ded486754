import { and, asc, desc, eq, gt, isNull, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import type { Db } from '../../db/client';
import { invitations, organisations, users } from '../../db/schema/index';
import { abilityToSql } from '../../lib/casl-to-sql';
import type { Action, AppAbility } from '@shared/permissions/ability';
import type { InvitationListItem } from '@shared/schemas/admin';
import type { Invitation } from '../../db/schema/users';

export const invitationColumns = { organisationId: invitations.organisationId, role: invitations.role };

export function invitationScope(ability: AppAbility, action: Action): SQL {
  return abilityToSql(ability, action, 'Invitation', invitationColumns);
}

export function invitationStatus(inv: Pick<Invitation, 'acceptedAt' | 'revokedAt' | 'expiresAt'>, nowIso: string): InvitationListItem['status'] {
  if (inv.acceptedAt) return 'accepted';
  if (inv.revokedAt) return 'revoked';
  return inv.expiresAt <= nowIso ? 'expired' : 'pending';
}

const inviter = alias(users, 'inviter');

function listSelect(db: Db) {
  return db
    .select({
      id: invitations.id,
      email: invitations.email,
      role: invitations.role,
      organisationId: invitations.organisationId,
      organisationName: organisations.name,
      invitedBy: invitations.invitedBy,
      invitedByName: inviter.name,
      createdAt: invitations.createdAt,
      expiresAt: invitations.expiresAt,
      acceptedAt: invitations.acceptedAt,
      revokedAt: invitations.revokedAt,
    })
    .from(invitations)
    .innerJoin(organisations, eq(organisations.id, invitations.organisationId))
    .leftJoin(inviter, eq(inviter.id, invitations.invitedBy));
}

type ListRow = Awaited<ReturnType<ReturnType<typeof listSelect>['all']>>[number];
const toItem = (nowIso: string) => ({ acceptedAt, revokedAt, ...r }: ListRow): InvitationListItem => ({
  ...r,
  status: invitationStatus({ acceptedAt, revokedAt, expiresAt: r.expiresAt }, nowIso),
});

/**
 * Open invitations (neither accepted nor revoked; expired ones included so they can be resent)
 * of one organisation that the caller may read, newest first.
 */
export function listOpenInvitations(db: Db, ability: AppAbility, organisationId: string, nowIso: string): InvitationListItem[] {
  return listSelect(db)
    .where(and(eq(invitations.organisationId, organisationId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), invitationScope(ability, 'read')))
    .orderBy(desc(invitations.createdAt))
    .all()
    .map(toItem(nowIso));
}

export function getInvitationItem(db: Db, id: string, nowIso: string): InvitationListItem | undefined {
  const row = listSelect(db).where(eq(invitations.id, id)).get();
  return row ? toItem(nowIso)(row) : undefined;
}

export function findVisibleInvitation(db: Db, ability: AppAbility, action: Action, id: string): Invitation | undefined {
  return db
    .select()
    .from(invitations)
    .where(and(eq(invitations.id, id), invitationScope(ability, action)))
    .get();
}

export function findInvitationByTokenHash(db: Db, tokenHash: string) {
  return db
    .select({ invitation: invitations, organisationName: organisations.name, organisationActive: organisations.active })
    .from(invitations)
    .innerJoin(organisations, eq(organisations.id, invitations.organisationId))
    .where(eq(invitations.tokenHash, tokenHash))
    .get();
}

/** A pending (unexpired, unanswered) invitation to this address in this organisation (invitations_email_idx). */
export function findPendingInvitationByEmail(db: Db, organisationId: string, email: string, nowIso: string): Invitation | undefined {
  return db
    .select()
    .from(invitations)
    .where(and(eq(invitations.email, email), eq(invitations.organisationId, organisationId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, nowIso)))
    .orderBy(asc(invitations.createdAt))
    .get();
}

export function findUserByEmail(db: Db, email: string) {
  return db.select({ id: users.id, organisationId: users.organisationId }).from(users).where(eq(users.email, email)).get();
}
