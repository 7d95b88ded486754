import { and, eq, gt, isNull } from 'drizzle-orm';
import { subject } from '@casl/ability';
import { tx, type Db } from '../../db/client';
import { invitations, organisations, users } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { writeAudit } from '../../lib/audit';
import { AppError, ConflictError, ForbiddenError, NotFoundError, TooManyRequestsError, ValidationError } from '../../lib/errors';
import { hashToken, newId, newToken } from '../../lib/ids';
import { enqueueMail } from '../../lib/mail/outbox';
import { checkPassword } from '../../lib/password-policy';
import { hashPassword } from '../../lib/passwords';
import { AttemptLimiter } from '../../middleware/rate-limit';
import { roleLabels, type Role } from '@shared/permissions/ability';
import { INVITATION_TTL_DAYS, type AcceptInvitationBody, type InvitationListItem, type InvitationPreview } from '@shared/schemas/admin';
import { findInvitationByTokenHash, findPendingInvitationByEmail, findUserByEmail, findVisibleInvitation, getInvitationItem, invitationStatus, listOpenInvitations } from './invitations.queries';

const DAY_MS = 24 * 60 * 60 * 1000;

export class InvalidInvitationError extends AppError {
  constructor(message: string) {
    super(400, 'invalid_invitation', message);
  }
}

export const emailTakenMessage = 'This e-mail address already has a Fieldproof account. Change that account instead of inviting it again.';
export const invitationPendingMessage = 'A pending invitation to this e-mail address already exists. Resend it instead, or revoke it first.';

export interface InviteTarget {
  organisationId: string;
  role: Role;
  email: string;
}

export type InvitationsService = ReturnType<typeof createInvitationsService>;

export function createInvitationsService(deps: AppDeps) {
  const { db, clock, env } = deps;
  /** Failed acceptances per client address: a token cannot be guessed at speed. */
  const acceptLimiter = new AttemptLimiter(deps.rates, 'invitation.accept.address', [{ limit: 30, windowMs: 15 * 60_000 }]);
  const nowIso = () => clock.now().toISOString();
  const link = (token: string) => `${env.PUBLIC_URL.replace(/\/$/, '')}/accept-invitation?token=${encodeURIComponent(token)}`;

  function mailInvitation(t: Db, ctx: RequestContext, to: string, organisationName: string, role: Role, token: string, expiresAt: string): void {
    enqueueMail(t, clock, {
      to: [to],
      subject: `Your invitation to ${organisationName} on Fieldproof`,
      text: [
        `${ctx.user.name} invited you to join ${organisationName} on Fieldproof as ${roleLabels[role].toLowerCase()}.`,
        '',
        'Open this link to set your name and password. It works once, and only until',
        `${expiresAt.slice(0, 16).replace('T', ' ')} UTC:`,
        '',
        link(token),
        '',
        'If you did not expect this invitation, you can ignore this e-mail.',
      ].join('\n'),
    });
  }

  /**
   * A pending invitation to this address in the same organisation is refused (the inviter sees it
   * in the list). Pending invitations of other organisations and accounts are never mentioned.
   */
  function refusePending(t: Db, organisationId: string, email: string, exceptInvitationId?: string): void {
    const pending = findPendingInvitationByEmail(t, organisationId, email, nowIso());
    if (pending && pending.id !== exceptInvitationId) throw new AppError(409, 'invitation_pending', invitationPendingMessage, { email: invitationPendingMessage });
  }

  /** The mail an address's owner gets when someone tries to invite an address that already has an account. */
  function mailAttempt(t: Db, ctx: RequestContext, to: string, organisationName: string, role: Role): void {
    enqueueMail(t, clock, {
      to: [to],
      subject: 'Someone tried to invite this address to Fieldproof',
      text: [
        `${ctx.user.name} tried to invite ${to} to join ${organisationName} on Fieldproof as ${roleLabels[role].toLowerCase()}.`,
        '',
        'This address already has a Fieldproof account, so no invitation was created and no link was sent.',
        'They were not told that the address has an account, nor anything about it.',
        '',
        'An address belongs to one account. If you do want to join them, ask them to invite another address of yours.',
        'If you did not expect this, you can ignore this e-mail.',
      ].join('\n'),
    });
  }

  /**
   * Writes an invitation, its audit row and its mail, inside the caller's transaction. The token
   * leaves only in the mail; the row keeps its SHA-256. Kick the outbox after the commit.
   *
   * An address that already has an account (in any organisation) gets the same row and the same
   * answer, so the inviter cannot tell; but its token is never sent, so no link exists, and the
   * address's owner is told by mail instead.
   */
  function inviteIn(t: Db, ctx: RequestContext, target: InviteTarget, ip: string): string {
    if (!ctx.ability.can('create', subject('Invitation', { organisationId: target.organisationId, role: target.role }))) {
      throw new ForbiddenError('You may not invite people to that organisation with that role.');
    }
    const org = t.select({ name: organisations.name, active: organisations.active }).from(organisations).where(eq(organisations.id, target.organisationId)).get();
    if (!org) throw new NotFoundError('No such organisation.');
    refusePending(t, target.organisationId, target.email);
    const taken = findUserByEmail(t, target.email) !== undefined;
    const id = newId();
    const { token, hash } = newToken();
    const now = clock.now();
    const expiresAt = new Date(now.getTime() + INVITATION_TTL_DAYS * DAY_MS).toISOString();
    t.insert(invitations)
      .values({ id, organisationId: target.organisationId, email: target.email, role: target.role, tokenHash: hash, invitedBy: ctx.user.id, expiresAt, createdAt: now.toISOString() })
      .run();
    writeAudit(t, clock, {
      actorId: ctx.user.id,
      organisationId: target.organisationId,
      action: 'invitation.create',
      recordType: 'Invitation',
      recordId: id,
      outcome: 'success',
      ip,
      detail: { email: target.email, role: target.role, expiresAt, ...(taken ? { addressHasAccount: true } : {}) },
    });
    if (taken) mailAttempt(t, ctx, target.email, org.name, target.role);
    else mailInvitation(t, ctx, target.email, org.name, target.role, token, expiresAt);
    return id;
  }

  return {
    inviteIn,

    /** Invites to the caller's own organisation (roles are checked by the caller's route). */
    invite(ctx: RequestContext, target: InviteTarget, ip: string): InvitationListItem {
      const id = tx(db, (t) => inviteIn(t, ctx, target, ip));
      deps.outbox.kick();
      return getInvitationItem(db, id, nowIso()) as InvitationListItem;
    },

    listOpen(ctx: RequestContext, organisationId = ctx.user.organisationId): InvitationListItem[] {
      if (!ctx.ability.can('read', 'Invitation')) throw new ForbiddenError('Only an admin sees invitations.');
      return listOpenInvitations(db, ctx.ability, organisationId, nowIso());
    },

    /** A new token and a new 7-day expiry; the old link stops working at once. */
    resend(ctx: RequestContext, id: string, ip: string): InvitationListItem {
      tx(db, (t) => {
        const inv = findVisibleInvitation(t, ctx.ability, 'update', id);
        if (!inv) throw new NotFoundError('No such invitation.');
        const status = invitationStatus(inv, nowIso());
        if (status === 'accepted') throw new ConflictError('This invitation was already accepted.', 'invitation_accepted');
        if (status === 'revoked') throw new ConflictError('This invitation was revoked. Send a new one instead.', 'invitation_revoked');
        refusePending(t, inv.organisationId, inv.email, inv.id);
        const org = t.select({ name: organisations.name }).from(organisations).where(eq(organisations.id, inv.organisationId)).get();
        const taken = findUserByEmail(t, inv.email) !== undefined;
        const { token, hash } = newToken();
        const expiresAt = new Date(clock.now().getTime() + INVITATION_TTL_DAYS * DAY_MS).toISOString();
        t.update(invitations).set({ tokenHash: hash, expiresAt }).where(eq(invitations.id, inv.id)).run();
        writeAudit(t, clock, { actorId: ctx.user.id, organisationId: inv.organisationId, action: 'invitation.resend', recordType: 'Invitation', recordId: inv.id, outcome: 'success', ip, detail: { expiresAt } });
        if (taken) mailAttempt(t, ctx, inv.email, org?.name ?? 'Fieldproof', inv.role);
        else mailInvitation(t, ctx, inv.email, org?.name ?? 'Fieldproof', inv.role, token, expiresAt);
      });
      deps.outbox.kick();
      return getInvitationItem(db, id, nowIso()) as InvitationListItem;
    },

    revoke(ctx: RequestContext, id: string, ip: string): InvitationListItem {
      tx(db, (t) => {
        const inv = findVisibleInvitation(t, ctx.ability, 'delete', id);
        if (!inv) throw new NotFoundError('No such invitation.');
        if (inv.acceptedAt) throw new ConflictError('This invitation was already accepted; deactivate the user instead.', 'invitation_accepted');
        if (inv.revokedAt) return;
        t.update(invitations).set({ revokedAt: nowIso() }).where(eq(invitations.id, inv.id)).run();
        writeAudit(t, clock, { actorId: ctx.user.id, organisationId: inv.organisationId, action: 'invitation.revoke', recordType: 'Invitation', recordId: inv.id, outcome: 'success', ip });
      });
      return getInvitationItem(db, id, nowIso()) as InvitationListItem;
    },

    /** What the accept page shows before the invitee sets a password. */
    preview(token: string, ip: string): InvitationPreview {
      const found = usable(token, ip);
      acceptLimiter.refund(ip);
      return { email: found.invitation.email, role: found.invitation.role, organisationName: found.organisationName, expiresAt: found.invitation.expiresAt };
    },

    /**
     * Signed out: sets the name and password and creates the user. The invitation is marked
     * accepted by a conditional UPDATE in the same transaction, so a token works exactly once.
     */
    accept(body: AcceptInvitationBody, ip: string): { email: string } {
      const found = usable(body.token, ip);
      const inv = found.invitation;
      const problem = checkPassword(body.password, [inv.email, body.name, found.organisationName]);
      if (problem) throw new ValidationError('Choose another password.', { password: problem });
      const passwordHash = hashPassword(body.password, env.PASSWORD_PEPPER, env.BCRYPT_COST);
      const now = nowIso();
      const userId = newId();
      tx(db, (t) => {
        const claimed = t
          .update(invitations)
          .set({ acceptedAt: now })
          .where(and(eq(invitations.id, inv.id), eq(invitations.tokenHash, hashToken(body.token)), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, now)))
          .run();
        if (claimed.changes !== 1) throw new InvalidInvitationError('This invitation has already been used.');
        if (findUserByEmail(t, inv.email)) throw new AppError(409, 'email_taken', emailTakenMessage);
        t.insert(users)
          .values({ id: userId, organisationId: inv.organisationId, role: inv.role, email: inv.email, name: body.name, passwordHash, active: true, sessionVersion: 1, createdAt: now, updatedAt: now })
          .run();
        writeAudit(t, clock, { actorId: userId, organisationId: inv.organisationId, action: 'invitation.accept', recordType: 'Invitation', recordId: inv.id, outcome: 'success', ip, detail: { userId, role: inv.role } });
      });
      acceptLimiter.refund(ip);
      return { email: inv.email };
    },
  };

  /** The invitation behind a token, or a clear 400. Every look-up counts against the address. */
  function usable(token: string, ip: string) {
    const r = acceptLimiter.take(ip);
    if (!r.ok) throw new TooManyRequestsError(r.retryAfterSeconds, 'Too many invitation attempts from this address. Try again later.');
    const found = findInvitationByTokenHash(db, hashToken(token));
    if (!found) {
      writeAudit(db, clock, { action: 'invitation.accept', outcome: 'failure', ip, detail: { reason: 'unknown_token' } });
      throw new InvalidInvitationError('This invitation link is not valid. It may have been replaced by a newer one: use the latest e-mail, or ask for a new invitation.');
    }
    const inv = found.invitation;
    const status = invitationStatus(inv, nowIso());
    const fail = (reason: string, message: string): never => {
      writeAudit(db, clock, { organisationId: inv.organisationId, action: 'invitation.accept', recordType: 'Invitation', recordId: inv.id, outcome: 'failure', ip, detail: { reason } });
      throw new InvalidInvitationError(message);
    };
    if (status === 'accepted') fail('used', 'This invitation has already been used. Sign in with the e-mail address it was sent to.');
    if (status === 'revoked') fail('revoked', 'This invitation was withdrawn. Ask your administrator for a new one.');
    if (status === 'expired') fail('expired', 'This invitation has expired. Ask your administrator to send it again.');
    if (!found.organisationActive) fail('organisation_inactive', 'This organisation is no longer active on Fieldproof.');
    return found;
  }
}
