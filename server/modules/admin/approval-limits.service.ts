/**
 * Approval limits: per reviewer of the manufacturer, the approved total (in cents) above which
 * a second reviewer must confirm the approval. A reviewer without a limit approves alone.
 */
import { and, asc, eq } from 'drizzle-orm';
import { tx } from '../../db/client';
import { approvalLimits, users } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { writeAudit } from '../../lib/audit';
import { NotFoundError } from '../../lib/errors';
import type { ApprovalLimitInput, ApprovalLimitRow } from '@shared/schemas/approval-limits';

export function createApprovalLimitsService(deps: AppDeps) {
  const { db, clock } = deps;

  function list(ctx: RequestContext): ApprovalLimitRow[] {
    return db
      .select({ userId: users.id, name: users.name, email: users.email, limitCents: approvalLimits.limitCents })
      .from(users)
      .leftJoin(approvalLimits, eq(approvalLimits.userId, users.id))
      .where(and(eq(users.organisationId, ctx.user.organisationId), eq(users.role, 'reviewer')))
      .orderBy(asc(users.name))
      .all();
  }

  function set(ctx: RequestContext, userId: string, body: ApprovalLimitInput, ip: string | null): ApprovalLimitRow {
    const reviewer = db
      .select({ id: users.id, name: users.name, email: users.email })
      .from(users)
      .where(and(eq(users.id, userId), eq(users.organisationId, ctx.user.organisationId), eq(users.role, 'reviewer')))
      .get();
    if (!reviewer) throw new NotFoundError('No reviewer of your organisation with that id.');
    tx(db, (t) => {
      const now = clock.now().toISOString();
      if (body.limitCents === null) t.delete(approvalLimits).where(eq(approvalLimits.userId, userId)).run();
      else
        t.insert(approvalLimits)
          .values({ userId, organisationId: ctx.user.organisationId, limitCents: body.limitCents, updatedAt: now, updatedBy: ctx.user.id })
          .onConflictDoUpdate({ target: approvalLimits.userId, set: { limitCents: body.limitCents, updatedAt: now, updatedBy: ctx.user.id } })
          .run();
      writeAudit(t, clock, { actorId: ctx.user.id, organisationId: ctx.user.organisationId, action: 'approval_limit.set', recordType: 'user', recordId: userId, outcome: 'success', ip, detail: { limitCents: body.limitCents } });
    });
    return { userId, name: reviewer.name, email: reviewer.email, limitCents: body.limitCents };
  }

  return { list, set };
}
