/** Who hears about each move of a claim, and what they read. Written to the outbox in the move's transaction. */
import { and, eq, inArray } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { organisations, users, type Claim } from '../../db/schema/index';
import type { Clock } from '../../lib/clock';
import { enqueueMail } from '../../lib/mail/outbox';
import { formatCents } from '@shared/calculations/money';
import { reasonLabel } from '@shared/workflow/reason-codes';
import type { ClaimAction } from '@shared/permissions/ability';

/** Active warranty reviewers of the manufacturer. */
export function reviewerAddresses(t: Db): string[] {
  return t
    .select({ email: users.email })
    .from(users)
    .innerJoin(organisations, eq(organisations.id, users.organisationId))
    .where(and(eq(users.role, 'reviewer'), eq(users.active, true), eq(organisations.kind, 'manufacturer'), eq(organisations.active, true)))
    .all()
    .map((u) => u.email);
}

/** The claim's technician and the agency's admins, when active. */
export function agencyAddresses(t: Db, claim: Pick<Claim, 'agencyId' | 'technicianId'>): string[] {
  const admins = t
    .select({ email: users.email })
    .from(users)
    .where(and(eq(users.organisationId, claim.agencyId), eq(users.role, 'agency_admin'), eq(users.active, true)))
    .all();
  const tech = t
    .select({ email: users.email })
    .from(users)
    .where(and(eq(users.id, claim.technicianId), eq(users.active, true), inArray(users.role, ['technician', 'agency_admin'])))
    .all();
  return [...tech, ...admins].map((u) => u.email);
}

export interface MoveMail {
  claim: Claim;
  action: ClaimAction;
  agencyName: string;
  actorName: string;
  reason?: string | null;
  comment?: string | null;
  approvedTotalCents?: number | null;
  publicUrl: string;
}

export function claimLink(publicUrl: string, claimId: string): string {
  return `${publicUrl.replace(/\/+$/, '')}/claims/${claimId}`;
}

/** Queues the mail of one move; moves without a mail (start review, withdraw, pay) queue nothing. */
export function queueMoveMail(t: Db, clock: Clock, m: MoveMail): void {
  const link = claimLink(m.publicUrl, m.claim.id);
  const n = m.claim.number;
  const why = m.reason ? `Reason: ${reasonLabel(m.reason)}\n` : '';
  const note = m.comment ? `Comment from ${m.actorName}:\n${m.comment}\n` : '';
  switch (m.action) {
    case 'submit': {
      const again = m.claim.state === 'returned' ? 'resubmitted' : 'submitted';
      enqueueMail(t, clock, {
        to: reviewerAddresses(t),
        subject: `Claim ${n} ${again} by ${m.agencyName}`,
        text: `${m.agencyName} has ${again} warranty claim ${n}. It is waiting in the review queue.\n\nOpen the claim: ${link}\n`,
      });
      return;
    }
    case 'return':
      enqueueMail(t, clock, {
        to: agencyAddresses(t, m.claim),
        subject: `Claim ${n} was returned for changes`,
        text: `The warranty reviewer returned claim ${n}. Fix what is asked and submit it again; it keeps its number.\n\n${why}${note}\nOpen the claim: ${link}\n`,
      });
      return;
    case 'deny':
      enqueueMail(t, clock, {
        to: agencyAddresses(t, m.claim),
        subject: `Claim ${n} was denied`,
        text: `The warranty reviewer denied claim ${n}.\n\n${why}${note}\nOpen the claim: ${link}\n`,
      });
      return;
    case 'approve': {
      const amount = m.approvedTotalCents !== null && m.approvedTotalCents !== undefined ? formatCents(m.approvedTotalCents, m.claim.currency) : '';
      enqueueMail(t, clock, {
        to: agencyAddresses(t, m.claim),
        subject: `Claim ${n} was approved${amount ? ` for ${amount}` : ''}`,
        text: `The warranty reviewer approved claim ${n}${amount ? ` for ${amount}` : ''}. It will be paid in a payment run.\n\nOpen the claim: ${link}\n`,
      });
      return;
    }
    default:
      return;
  }
}

/** Tells the reviewer who held a review that another reviewer took the claim over, and why. */
export function queueReviewHandMail(t: Db, clock: Clock, m: { to: string; claim: Claim; takerName: string; reason: string; publicUrl: string }): void {
  enqueueMail(t, clock, {
    to: [m.to],
    subject: `Claim ${m.claim.number} was taken over by ${m.takerName}`,
    text: `${m.takerName} took over the review of claim ${m.claim.number} from you.\n\nReason: ${m.reason}\n\nOpen the claim: ${claimLink(m.publicUrl, m.claim.id)}\n`,
  });
}
