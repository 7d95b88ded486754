/**
 * Changes to evidence already attached: while the claim is a draft or returned the agency may
 * relabel a file or delete it (the file goes after the commit); once filed, a removal is a
 * retraction with a reason: the file stays, marked retracted, and the reviewer reads why.
 * Kept apart from the upload path on purpose.
 */
import { subject } from '@casl/ability';
import { eq } from 'drizzle-orm';
import { tx } from '../../db/client';
import { attachments, claimEvents, type Attachment, type Claim } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import type { Storage } from '../../lib/storage/storage';
import { writeAudit } from '../../lib/audit';
import { newId } from '../../lib/ids';
import { ConflictError, ForbiddenError, NotFoundError } from '../../lib/errors';
import type { RelabelAttachmentInput, RetractAttachmentInput } from '@shared/schemas/evidence-changes';
import { findReadableClaim } from '../claims/claims.queries';
import { findReadableAttachment } from './attachments.queries';
import { refreshPhotoFlags, roleLabel, toView } from './attachments.service';

const EDITABLE = new Set<Claim['state']>(['draft', 'returned']);
const FILED = new Set<Claim['state']>(['submitted', 'in_review']);

export function createEvidenceChangesService(deps: AppDeps, storage: Storage) {
  const { db, clock } = deps;

  function audit(ctx: RequestContext, action: string, id: string, outcome: 'success' | 'denied', ip: string | null, detail: Record<string, unknown>) {
    writeAudit(db, clock, { actorId: ctx.user.id, organisationId: ctx.user.organisationId, action, recordType: 'attachment', recordId: id.slice(0, 64), outcome, ip, detail });
  }

  /** The attachment and its claim when this user may change the claim's evidence at all; 404 or 403 otherwise (audited). */
  function target(ctx: RequestContext, action: string, id: string, ip: string | null): { a: Attachment; claim: Claim } {
    const a = findReadableAttachment(db, ctx.ability, id);
    const claim = a?.claimId ? findReadableClaim(db, ctx.ability, a.claimId) : undefined;
    if (!a || !claim) {
      audit(ctx, action, id, 'denied', ip, { status: 404 });
      throw new NotFoundError('No such attachment.');
    }
    // whoever may add evidence to the claim while it is editable may change it
    if (!ctx.ability.can('upload', subject('Claim', { ...claim, state: 'draft' } as Record<string, unknown>))) {
      audit(ctx, action, id, 'denied', ip, { status: 403 });
      throw new ForbiddenError('Only the agency that filed the claim changes its evidence.');
    }
    return { a, claim };
  }

  function editable(ctx: RequestContext, action: string, a: Attachment, claim: Claim, ip: string | null) {
    if (EDITABLE.has(claim.state) && a.retractedAt === null) return;
    audit(ctx, action, a.id, 'denied', ip, { status: 409, state: claim.state });
    throw FILED.has(claim.state)
      ? new ConflictError('The claim is filed: retract the file with a reason instead; the reviewer sees the retraction.', 'retract_instead')
      : new ConflictError('Evidence changes only while the claim is a draft or returned to the agency.', 'not_editable');
  }

  function relabel(ctx: RequestContext, id: string, body: RelabelAttachmentInput, ip: string | null) {
    const { a, claim } = target(ctx, 'attachment.relabel', id, ip);
    editable(ctx, 'attachment.relabel', a, claim, ip);
    const row = tx(db, (t) => {
      t.update(attachments).set({ role: body.role }).where(eq(attachments.id, a.id)).run();
      writeAudit(t, clock, { actorId: ctx.user.id, organisationId: ctx.user.organisationId, action: 'attachment.relabel', recordType: 'attachment', recordId: a.id, outcome: 'success', ip, detail: { claimId: claim.id, from: a.role, to: body.role } });
      return t.select().from(attachments).where(eq(attachments.id, a.id)).get()!;
    });
    return toView(row);
  }

  async function remove(ctx: RequestContext, id: string, ip: string | null): Promise<void> {
    const { a, claim } = target(ctx, 'attachment.delete', id, ip);
    editable(ctx, 'attachment.delete', a, claim, ip);
    tx(db, (t) => {
      t.delete(attachments).where(eq(attachments.id, a.id)).run();
      refreshPhotoFlags(t, claim.id);
      writeAudit(t, clock, { actorId: ctx.user.id, organisationId: ctx.user.organisationId, action: 'attachment.delete', recordType: 'attachment', recordId: a.id, outcome: 'success', ip, detail: { claimId: claim.id, role: a.role, sha256: a.sha256 } });
    });
    // after the commit: a failed delete leaves a file without a row, which the start-up sweep removes
    for (const key of [a.storageKey, a.thumbnailKey]) {
      if (key) await storage.delete(key).catch(() => undefined);
    }
  }

  function retract(ctx: RequestContext, id: string, body: RetractAttachmentInput, ip: string | null) {
    const { a, claim } = target(ctx, 'attachment.retract', id, ip);
    if (EDITABLE.has(claim.state)) {
      audit(ctx, 'attachment.retract', a.id, 'denied', ip, { status: 409, state: claim.state });
      throw new ConflictError('The claim can still be edited: delete the file instead.', 'delete_instead');
    }
    if (!FILED.has(claim.state)) {
      audit(ctx, 'attachment.retract', a.id, 'denied', ip, { status: 409, state: claim.state });
      throw new ConflictError('The claim is decided: its evidence can no longer be retracted.', 'not_retractable');
    }
    if (a.retractedAt !== null) throw new ConflictError('This file is already retracted.', 'already_retracted');
    const reason = body.reason.trim();
    const row = tx(db, (t) => {
      const now = clock.now().toISOString();
      t.update(attachments).set({ retractedAt: now, retractedBy: ctx.user.id, retractionReason: reason }).where(eq(attachments.id, a.id)).run();
      t.insert(claimEvents)
        .values({ id: newId(), claimId: claim.id, actorId: ctx.user.id, organisationId: ctx.user.organisationId, type: 'evidence_retracted', fromState: claim.state, toState: claim.state, comment: `${roleLabel(a.role)} ${a.originalName} retracted: ${reason}`.slice(0, 4000), at: now })
        .run();
      writeAudit(t, clock, { actorId: ctx.user.id, organisationId: ctx.user.organisationId, action: 'attachment.retract', recordType: 'attachment', recordId: a.id, outcome: 'success', ip, detail: { claimId: claim.id, reason } });
      return t.select().from(attachments).where(eq(attachments.id, a.id)).get()!;
    });
    return toView(row);
  }

  return { relabel, remove, retract };
}
