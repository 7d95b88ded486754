/**
 * GET /api/home: what needs this person's action now, per role. Every claim count and list is
 * read through the user's claim scope, so a card never counts what the user may not see.
 */
import { and, eq, gte, inArray, isNull, lte, sql, type SQL } from 'drizzle-orm';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { todayFor } from '../../lib/business-day';
import { certifications, claimPartLines, claims, models, organisations, parts, paymentRunItems, paymentRuns, repairCodes, users } from '../../db/schema/index';
import { addDays } from '@shared/calculations/dates';
import { filingWindow } from '@shared/calculations/filing-window';
import { termsOn } from '../admin/agencies.queries';
import type { ClaimState } from '@shared/schemas/claim';
import type { HomeCard, HomeResponse } from '@shared/schemas/home';
import { countClaimsWhere, listClaimsWhere } from '../claims/claims.queries';
import { overdueReturns, returnsSettled } from '../part-returns/part-returns.queries';
import { PART_RETURN_OVERDUE_DAYS } from '@shared/schemas/payment';

const ITEMS = 5;

export function createHomeService(deps: AppDeps) {
  const { db } = deps;

  function claimCard(
    ctx: RequestContext,
    c: { key: string; label: string; hint: string; where: SQL; href: string; tone: HomeCard['tone']; order?: 'oldest_submitted' | 'oldest_created' | 'oldest_decided'; amount?: HomeCard['amount'] },
  ): HomeCard {
    return {
      key: c.key,
      label: c.label,
      hint: c.hint,
      count: countClaimsWhere(db, ctx.ability, c.where),
      items: listClaimsWhere(db, ctx.ability, c.where, { order: c.order ?? 'oldest_created', limit: ITEMS }),
      href: c.href,
      tone: c.tone,
      kind: 'queue',
      amount: c.amount ?? 'allowed',
    };
  }

  /** Drafts carry their filing window on the agency's today (at most ITEMS primary-key reads). */
  function withFiling(ctx: RequestContext, card: HomeCard): HomeCard {
    const today = todayFor(deps.db, deps.clock, ctx.user.organisationId);
    return {
      ...card,
      items: card.items.map((item) => {
        const terms = item.repairDate ? termsOn(db, item.agencyId, item.repairDate) : undefined;
        if (!item.repairDate || !terms) return { ...item, filing: null };
        const w = filingWindow(item.repairDate, terms.filingWindowDays, today);
        return { ...item, filing: { lastDay: w.lastDay, daysLeft: w.daysLeft, late: w.late } };
      }),
    };
  }

  const inState = (s: ClaimState) => eq(claims.state, s);
  const countCard = (key: string, label: string, hint: string, count: number, href: string, tone: HomeCard['tone'] = 'info'): HomeCard => ({ key, label, hint, count, items: [], href, tone, kind: 'count', amount: 'allowed' });

  /** Approved claims with a part still to come back. */
  const awaitingReturn = sql`exists (select 1 from ${claimPartLines} where ${claimPartLines.claimId} = ${claims.id} and ${claimPartLines.returnStatus} in ('awaiting', 'shipped'))`;

  /** A notice of approved claims whose required part returns are overdue, when there are any. */
  function overdueNotice(ctx: RequestContext, notices: HomeResponse['notices']) {
    const n = countClaimsWhere(db, ctx.ability, overdueReturns(db, deps.clock.now()));
    if (n > 0) {
      notices.push({
        key: 'part_returns_overdue',
        message: `${n} approved claim${n === 1 ? ' has' : 's have'} a part return overdue (not settled ${PART_RETURN_OVERDUE_DAYS} days after approval).`,
        href: '/claims?state=approved',
        tone: 'warning',
      });
    }
  }

  function home(ctx: RequestContext): HomeResponse {
    const { user } = ctx;
    const notices: HomeResponse['notices'] = [];
    let cards: HomeCard[] = [];
    switch (user.role) {
      case 'technician':
        cards = [
          claimCard(ctx, { key: 'my_returned', label: 'Returned to you', hint: 'Read the reviewer’s reason, fix and resubmit', where: inState('returned'), href: '/claims?state=returned', tone: 'warning' }),
          withFiling(ctx, claimCard(ctx, { key: 'my_drafts', label: 'Your drafts', hint: 'Finish and submit', where: inState('draft'), href: '/claims?state=draft', tone: 'action' })),
          claimCard(ctx, { key: 'my_waiting', label: 'With the reviewer', hint: 'Nothing to do until the reviewer decides', where: inArray(claims.state, ['submitted', 'in_review']), href: '/claims?state=submitted', tone: 'info', order: 'oldest_submitted' }),
        ];
        break;
      case 'agency_admin': {
        cards = [
          claimCard(ctx, { key: 'agency_returned', label: 'Returned claims', hint: 'Fix and resubmit', where: inState('returned'), href: '/claims?state=returned', tone: 'warning' }),
          withFiling(ctx, claimCard(ctx, { key: 'agency_drafts', label: 'Drafts', hint: 'Finish and submit', where: inState('draft'), href: '/claims?state=draft', tone: 'action' })),
          claimCard(ctx, { key: 'agency_approved', label: 'Approved, awaiting payment', hint: 'Paid in the manufacturer’s next payment run', where: inState('approved'), href: '/claims?state=approved', tone: 'info', order: 'oldest_decided', amount: 'approved' }),
          claimCard(ctx, { key: 'agency_part_returns', label: 'Parts to return', hint: 'Ship the failed parts back so the claims can be paid', where: and(inState('approved'), awaitingReturn) as SQL, href: '/claims?state=approved', tone: 'action', order: 'oldest_decided', amount: 'approved' }),
        ];
        const t = todayFor(deps.db, deps.clock, ctx.user.organisationId);
        const soon = db
          .select({ n: sql<number>`count(*)` })
          .from(certifications)
          .where(and(eq(certifications.organisationId, user.organisationId), isNull(certifications.revokedAt), gte(certifications.validTo, t), lte(certifications.validTo, addDays(t, 30))))
          .get();
        if (soon && soon.n > 0) {
          notices.push({ key: 'certifications_expiring', message: `${soon.n} technician certification${soon.n === 1 ? '' : 's'} expire within 30 days.`, href: '/users', tone: 'warning' });
        }
        overdueNotice(ctx, notices);
        break;
      }
      case 'reviewer':
        cards = [
          claimCard(ctx, { key: 'review_queue', label: 'Waiting for review', hint: 'Oldest first: start a review to take the claim', where: inState('submitted'), href: '/claims?state=submitted', tone: 'action', order: 'oldest_submitted' }),
          claimCard(ctx, { key: 'my_reviews', label: 'Your reviews in progress', hint: 'Approve, return or deny', where: and(inState('in_review'), eq(claims.reviewerId, user.id)) as SQL, href: '/claims?state=in_review', tone: 'action', order: 'oldest_submitted' }),
          claimCard(ctx, { key: 'returned_to_agency', label: 'Returned to agencies', hint: 'Waiting for the agency to resubmit', where: inState('returned'), href: '/claims?state=returned', tone: 'info' }),
        ];
        overdueNotice(ctx, notices);
        break;
      case 'accountant': {
        const notInRun = sql`not exists (select 1 from ${paymentRunItems} where ${paymentRunItems.claimId} = ${claims.id} and ${paymentRunItems.active} = 1)`;
        const openRuns = db.select({ n: sql<number>`count(*)` }).from(paymentRuns).where(eq(paymentRuns.state, 'open')).get()?.n ?? 0;
        cards = [
          claimCard(ctx, { key: 'ready_to_pay', label: 'Approved, ready to pay', hint: 'Put them in a payment run', where: and(inState('approved'), notInRun, returnsSettled) as SQL, href: '/payment-runs', tone: 'action', order: 'oldest_decided', amount: 'approved' }),
          countCard('open_runs', 'Open payment runs', 'Mark them paid once the remittance is sent', openRuns, '/payment-runs', openRuns > 0 ? 'action' : 'info'),
        ];
        break;
      }
      case 'manufacturer_admin': {
        const n = (table: typeof models | typeof parts | typeof repairCodes) => db.select({ n: sql<number>`count(*)` }).from(table).where(eq(table.active, true)).get()?.n ?? 0;
        const agencies = db.select({ n: sql<number>`count(*)` }).from(organisations).where(and(eq(organisations.kind, 'agency'), eq(organisations.active, true))).get()?.n ?? 0;
        const people = db.select({ n: sql<number>`count(*)` }).from(users).where(and(eq(users.organisationId, user.organisationId), eq(users.active, true))).get()?.n ?? 0;
        cards = [
          countCard('catalog_models', 'Models in the catalogue', 'Warranty terms and reading specifications', n(models), '/catalogue'),
          countCard('catalog_parts', 'Parts', 'List prices and return rules', n(parts), '/catalogue'),
          countCard('catalog_repair_codes', 'Repair codes', 'Labor-time allowances and required evidence', n(repairCodes), '/catalogue'),
          countCard('agencies', 'Service agencies', 'Contract terms and their users', agencies, '/agencies'),
          countCard('manufacturer_users', 'Manufacturer users', 'Reviewers, accountants and admins', people, '/users'),
        ];
        break;
      }
    }
    return { role: user.role, cards, notices };
  }

  return { home };
}
