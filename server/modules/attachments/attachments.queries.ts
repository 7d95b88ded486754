import { and, eq, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { attachments, claims, users, type Attachment } from '../../db/schema/index';
import { abilityToSql } from '../../lib/casl-to-sql';
import type { AppAbility } from '@shared/permissions/ability';
import { claimScope } from '../claims/claims.queries';

/** The only attachment columns a CASL rule may constrain. */
export const attachmentScopeColumns = { organisationId: attachments.organisationId, uploadedBy: attachments.uploadedBy, claimId: attachments.claimId };

export function attachmentScope(ability: AppAbility) {
  return abilityToSql(ability, 'read', 'Attachment', attachmentScopeColumns);
}

/**
 * One attachment the user may read: its claim must pass the same read check as the claim
 * itself, and the attachment its own rule. Anything else is undefined (the caller answers 404).
 */
export function findReadableAttachment(db: Db, ability: AppAbility, id: string): Attachment | undefined {
  const row = db
    .select({ a: attachments })
    .from(attachments)
    .innerJoin(claims, eq(claims.id, attachments.claimId))
    .where(and(eq(attachments.id, id), claimScope(ability, 'read'), attachmentScope(ability)))
    .get();
  return row?.a;
}

export interface AttachmentListRow extends Attachment {
  uploadedByName: string | null;
}

/** The attachments of one claim the user may read (the claim check is the caller's). */
export function listReadableAttachments(db: Db, ability: AppAbility, claimId: string): AttachmentListRow[] {
  return db
    .select({ a: attachments, uploadedByName: users.name })
    .from(attachments)
    .innerJoin(claims, eq(claims.id, attachments.claimId))
    .leftJoin(users, eq(users.id, attachments.uploadedBy))
    .where(and(eq(attachments.claimId, claimId), claimScope(ability, 'read'), attachmentScope(ability)))
    .orderBy(attachments.createdAt, attachments.id)
    .all()
    .map((r) => ({ ...r.a, uploadedByName: r.uploadedByName }));
}

export interface UsageTotals {
  files: number;
  bytes: number;
}

export function claimUsage(db: Db, claimId: string): UsageTotals {
  const r = db
    .select({ files: sql<number>`count(*)`, bytes: sql<number>`coalesce(sum(${attachments.sizeBytes}), 0)` })
    .from(attachments)
    .where(eq(attachments.claimId, claimId))
    .get();
  return { files: Number(r?.files ?? 0), bytes: Number(r?.bytes ?? 0) };
}

export function organisationUsage(db: Db, organisationId: string): UsageTotals {
  const r = db
    .select({ files: sql<number>`count(*)`, bytes: sql<number>`coalesce(sum(${attachments.sizeBytes}), 0)` })
    .from(attachments)
    .where(eq(attachments.organisationId, organisationId))
    .get();
  return { files: Number(r?.files ?? 0), bytes: Number(r?.bytes ?? 0) };
}
