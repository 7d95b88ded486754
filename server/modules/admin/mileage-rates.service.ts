import { and, asc, eq, sql } from 'drizzle-orm';
import { tx, type Db } from '../../db/client';
import { mileageRates, organisations } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { writeAudit } from '../../lib/audit';
import { AppError, ForbiddenError, NotFoundError, ValidationError } from '../../lib/errors';
import { newId } from '../../lib/ids';
import { todayFor } from '../../lib/business-day';
import { addDays, compareDates } from '@shared/calculations/dates';
import { findOverlap } from '@shared/calculations/mileage';
import type { CreateMileageRateBody, EndMileageRateBody, MileageRateGap, MileageRateItem, MileageRatesList } from '@shared/schemas/mileage-rates';

/** Claims still to be valued or decided: a missing rate blocks them. */
const OPEN_STATES = sql`('draft', 'submitted', 'in_review', 'returned')`;
const FAR = '9999-12-31';

const fieldError = (field: string, message: string) => new ValidationError('Some fields need attention.', { [field]: message });

const cents = (tenths: number) => `${Math.floor(tenths / 10)}${tenths % 10 ? `.${tenths % 10}` : ''} cents`;
const period = (r: Pick<MileageRateItem, 'effectiveFrom' | 'effectiveTo'>) => `${r.effectiveFrom} to ${r.effectiveTo ?? 'until further notice'}`;

function toItem(r: typeof mileageRates.$inferSelect): MileageRateItem {
  return { id: r.id, currency: r.currency, unit: r.unit, effectiveFrom: r.effectiveFrom, effectiveTo: r.effectiveTo, rateTenthCents: r.rateTenthCents, source: r.source };
}

/** A change that takes effect before today changes claims already repaired: it needs a reason. */
function requirePastReason(date: string, today: string, reason: string | null | undefined, what: string): string | null {
  if (date >= today) return null;
  if (!reason || reason.trim() === '') throw fieldError('reason', `The ${what} is in the past (${date}): give a reason, because it changes what repairs already made are worth.`);
  return reason.trim();
}

/**
 * Periods of one currency never share a day (the valuation picks the rate by currency and
 * repair date), whatever the distance unit. 409 naming the period already in force.
 */
function refuseOverlap(rows: MileageRateItem[], candidate: MileageRateItem, field: string): void {
  const pair = findOverlap(rows.filter((r) => r.currency === candidate.currency && r.id !== candidate.id).concat(candidate));
  if (!pair) return;
  const other = pair[0].id === candidate.id ? pair[1] : pair[0];
  const message = `This period overlaps the ${other.currency} rate of ${cents(other.rateTenthCents)} per ${other.unit} in force ${period(other)}. End that rate first or choose other dates.`;
  throw new AppError(409, 'overlap', message, { [field]: message });
}

/**
 * Open claims of `currency` repaired from..to (inclusive): a range of claims(repair_date), forced
 * (without it SQLite reads every open claim through claims(state, created_at)). Gaps are short
 * or in the future, so the range is small.
 */
function openClaimsRepaired(db: Db, currency: string, from: string, to: string | null): number {
  const row = db.get(
    sql`select count(*) as n from claims c indexed by claims_repair_date_idx where c.repair_date >= ${from} and c.repair_date <= ${to ?? FAR} and c.currency = ${currency} and c.state in ${OPEN_STATES}`,
  ) as { n: number };
  return row.n;
}

/** Open claims of agencies paid in `currency` (claims(agency_id, state) per agency). */
function openClaimsOfCurrency(db: Db, currency: string): number {
  const row = db.get(
    sql`select count(*) as n from organisations o join claims c on c.agency_id = o.id and c.state in ${OPEN_STATES} where o.kind = 'agency' and o.currency = ${currency} and c.currency = ${currency}`,
  ) as { n: number };
  return row.n;
}

/** The gaps of each currency: before its first rate (only when open claims fall there), between periods, after the last end. */
export function mileageRateGaps(db: Db, rows: MileageRateItem[], agencyCurrencies: string[], today: string): { gaps: MileageRateGap[]; noRateToday: string[] } {
  const gaps: MileageRateGap[] = [];
  const noRateToday: string[] = [];
  const currencies = [...new Set([...rows.map((r) => r.currency), ...agencyCurrencies])].sort();
  for (const currency of currencies) {
    const own = rows.filter((r) => r.currency === currency).sort((a, b) => compareDates(a.effectiveFrom, b.effectiveFrom));
    if (!own.some((r) => r.effectiveFrom <= today && (r.effectiveTo === null || r.effectiveTo >= today))) noRateToday.push(currency);
    if (own.length === 0) {
      gaps.push({ currency, from: '0001-01-01', to: null, openClaims: openClaimsOfCurrency(db, currency) });
      continue;
    }
    const before = openClaimsRepaired(db, currency, '0001-01-01', addDays(own[0].effectiveFrom, -1));
    if (before > 0) gaps.push({ currency, from: '0001-01-01', to: addDays(own[0].effectiveFrom, -1), openClaims: before });
    for (let i = 0; i < own.length; i++) {
      const end = own[i].effectiveTo;
      if (end === null) break;
      const next = own[i + 1];
      const gapFrom = addDays(end, 1);
      if (next && next.effectiveFrom <= gapFrom) continue;
      const gapTo = next ? addDays(next.effectiveFrom, -1) : null;
      gaps.push({ currency, from: gapFrom, to: gapTo, openClaims: openClaimsRepaired(db, currency, gapFrom, gapTo) });
    }
  }
  return { gaps, noRateToday };
}

/** The manufacturer admin's mileage rates: list with gaps, add a period, end a period. */
export function createMileageRatesService(deps: AppDeps) {
  const { db, clock } = deps;
  const now = () => clock.now().toISOString();

  function guard(ctx: RequestContext, action: 'read' | 'update'): void {
    if (ctx.user.organisationKind !== 'manufacturer' || !ctx.ability.can(action, 'Catalog') || !ctx.ability.can('update', 'Catalog')) {
      throw new ForbiddenError('Only a manufacturer admin maintains the mileage rates.');
    }
  }
  const all = (t: Db) => t.select().from(mileageRates).orderBy(asc(mileageRates.currency), asc(mileageRates.effectiveFrom)).all().map(toItem);
  const audit = (t: Db, ctx: RequestContext, action: string, id: string, ip: string, detail: Record<string, unknown>) =>
    writeAudit(t, clock, { actorId: ctx.user.id, organisationId: ctx.user.organisationId, action, recordType: 'MileageRate', recordId: id, outcome: 'success', ip, detail });

  return {
    list(ctx: RequestContext, filter: { currency?: string; unit?: 'mi' | 'km' }): MileageRatesList {
      guard(ctx, 'read');
      const today = todayFor(db, clock, ctx.user.organisationId);
      const rows = all(db);
      const agencyCurrencies = db.selectDistinct({ c: organisations.currency }).from(organisations).where(eq(organisations.kind, 'agency')).all().map((r) => r.c);
      const { gaps, noRateToday } = mileageRateGaps(db, rows, agencyCurrencies, today);
      const items = rows.filter((r) => (!filter.currency || r.currency === filter.currency) && (!filter.unit || r.unit === filter.unit));
      return { items, today, noRateToday, gaps: gaps.filter((g) => !filter.currency || g.currency === filter.currency) };
    },

    create(ctx: RequestContext, body: CreateMileageRateBody, ip: string): MileageRateItem {
      guard(ctx, 'update');
      const today = todayFor(db, clock, ctx.user.organisationId);
      const why = requirePastReason(body.effectiveFrom, today, body.reason, 'first day of this rate');
      const item: MileageRateItem = {
        id: newId(),
        currency: body.currency,
        unit: body.unit,
        effectiveFrom: body.effectiveFrom,
        effectiveTo: body.effectiveTo ?? null,
        rateTenthCents: body.rateCents,
        source: body.source,
      };
      tx(db, (t) => {
        refuseOverlap(all(t), item, 'effectiveFrom');
        t.insert(mileageRates).values({ ...item, createdBy: ctx.user.id, createdAt: now() }).run();
        audit(t, ctx, 'catalog.mileage_rate.create', item.id, ip, { ...item, ...(why ? { reason: why, repairedOpenClaims: openClaimsRepaired(t, item.currency, item.effectiveFrom, item.effectiveTo && item.effectiveTo < today ? item.effectiveTo : today) } : {}) });
      });
      return item;
    },

    /** Sets the last day a rate is in force. Ending it before today needs a reason. */
    end(ctx: RequestContext, id: string, body: EndMileageRateBody, ip: string): MileageRateItem {
      guard(ctx, 'update');
      const today = todayFor(db, clock, ctx.user.organisationId);
      return tx(db, (t) => {
        const row = t.select().from(mileageRates).where(eq(mileageRates.id, id)).get();
        if (!row) throw new NotFoundError('No such mileage rate.');
        if (body.effectiveTo < row.effectiveFrom) throw fieldError('effectiveTo', `The last day (${body.effectiveTo}) is before the first day of this rate (${row.effectiveFrom}).`);
        const why = requirePastReason(body.effectiveTo, today, body.reason, 'last day of this rate');
        const next: MileageRateItem = { ...toItem(row), effectiveTo: body.effectiveTo };
        refuseOverlap(all(t), next, 'effectiveTo');
        t.update(mileageRates).set({ effectiveTo: body.effectiveTo }).where(and(eq(mileageRates.id, id))).run();
        audit(t, ctx, 'catalog.mileage_rate.end', id, ip, { effectiveTo: { from: row.effectiveTo, to: body.effectiveTo }, ...(why ? { reason: why } : {}) });
        return next;
      });
    },
  };
}
