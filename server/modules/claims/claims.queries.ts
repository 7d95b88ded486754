import { and, asc, desc, eq, gt, gte, inArray, isNotNull, isNull, lt, lte, or, sql, type Column, type SQL } from 'drizzle-orm';
import { alias, QueryBuilder, SQLiteSyncDialect } from 'drizzle-orm/sqlite-core';
import { subject } from '@casl/ability';
import type { Statement } from 'better-sqlite3';
import type { Db } from '../../db/client';
import {
  attachments,
  claimEvents,
  claimLaborLines,
  claimPartLines,
  claimReadings,
  claimTravel,
  claims,
  comments,
  models,
  organisations,
  parts,
  productFamilies,
  repairCodes,
  sites,
  units,
  users,
  type Claim,
} from '../../db/schema/index';
import { unitTermsOf } from '../admin/catalog.queries';
import { abilityToSql } from '../../lib/casl-to-sql';
import { allowancesOn, pricesOn } from '../admin/catalog.queries';
import { ValidationError } from '../../lib/errors';
import type { Action, AppAbility } from '@shared/permissions/ability';
import { MANUFACTURER_ONLY_FLAGS, flagsForViewer, seesEveryAgency } from '../attachments/attachments.flags';
import type { ClaimDetail, ClaimListItem, ClaimListQuery } from '@shared/schemas/claim';

/** The only claim columns a CASL rule may constrain. */
export const claimScopeColumns = { agencyId: claims.agencyId, technicianId: claims.technicianId, state: claims.state, id: claims.id };

/** The user's CASL rules for (action, Claim) as one SQL condition. */
export function claimScope(ability: AppAbility, action: Action = 'read'): SQL {
  return abilityToSql(ability, action, 'Claim', claimScopeColumns);
}

/** A plain claim row (or its scope fields) tagged for CASL checks; a copy, so the row itself stays untagged. */
export function claimSubject<T extends { agencyId: string; technicianId: string; state: string }>(row: T) {
  return subject('Claim', { ...row });
}

/** One claim row the user may read, or undefined (the caller answers 404). */
export function findReadableClaim(db: Db, ability: AppAbility, id: string): Claim | undefined {
  return db
    .select()
    .from(claims)
    .where(and(eq(claims.id, id), claimScope(ability)))
    .get();
}

// ---- list ----------------------------------------------------------------------------------

type SortKey = ClaimListQuery['sort'];
type SortValue = string | number | null;

/**
 * The sort columns, sorted bare so their indexes give the order. SQLite puts NULL first
 * ascending and last descending; the keyset condition below follows that.
 */
const sortColumn: Record<SortKey, Column> = {
  createdAt: claims.createdAt,
  submittedAt: claims.submittedAt,
  repairDate: claims.repairDate,
  number: claims.number,
  claimedTotalCents: claims.claimedTotalCents,
  state: claims.state,
};
const sortExpr = Object.fromEntries(Object.entries(sortColumn).map(([k, c]) => [k, sql`${c}`])) as Record<SortKey, SQL>;
const nullableSort = new Set<SortKey>(['submittedAt', 'repairDate']);
const numericSort = new Set<SortKey>(['claimedTotalCents']);

interface Cursor {
  sort: SortKey;
  dir: 'asc' | 'desc';
  value: SortValue;
  id: string;
}

/** Opaque cursor: base64url of JSON [sort, dir, last sort value, last id]. */
export function encodeCursor(c: Cursor): string {
  return Buffer.from(JSON.stringify([c.sort, c.dir, c.value, c.id]), 'utf8').toString('base64url');
}

export function decodeCursor(raw: string, sort: SortKey, dir: 'asc' | 'desc'): Cursor {
  const bad = () => new ValidationError('Some filters are not valid.', { cursor: 'This page link is no longer valid; start from the first page.' });
  let parsed: unknown;
  try {
    if (!/^[A-Za-z0-9_-]+$/.test(raw)) throw bad();
    parsed = JSON.parse(Buffer.from(raw, 'base64url').toString('utf8'));
  } catch {
    throw bad();
  }
  if (!Array.isArray(parsed) || parsed.length !== 4) throw bad();
  const [s, d, value, id] = parsed as unknown[];
  if (s !== sort || d !== dir || typeof id !== 'string' || id.length === 0 || id.length > 64) throw bad();
  const okValue =
    value === null ? nullableSort.has(sort) : numericSort.has(sort) ? typeof value === 'number' && Number.isSafeInteger(value) : typeof value === 'string' && value.length <= 64;
  if (!okValue) throw bad();
  return { sort, dir, value: value as SortValue, id };
}

function escapeLike(s: string): string {
  return s.replace(/[\\%_]/g, (m) => `\\${m}`);
}

const technician = alias(users, 'technician');
const listReviewer = alias(users, 'list_reviewer');

export const listItemColumns = {
  id: claims.id,
  number: claims.number,
  state: claims.state,
  agencyId: claims.agencyId,
  agencyName: organisations.name,
  technicianId: claims.technicianId,
  technicianName: technician.name,
  serial: units.serial,
  modelNumber: models.modelNumber,
  siteName: sites.name,
  failureDate: claims.failureDate,
  repairDate: claims.repairDate,
  submittedAt: claims.submittedAt,
  createdAt: claims.createdAt,
  claimedTotalCents: claims.claimedTotalCents,
  approvedTotalCents: claims.approvedTotalCents,
  currency: claims.currency,
  flags: claims.flags,
  reviewerName: listReviewer.name,
};

/** Filters of the list (never the scope): ANDed with the scope, so they only narrow. */
function listFilters(q: ClaimListQuery): SQL[] {
  const where: SQL[] = [];
  if (q.state) where.push(eq(claims.state, q.state));
  if (q.agency) where.push(eq(claims.agencyId, q.agency));
  if (q.from) where.push(gte(claims.repairDate, q.from));
  if (q.to) where.push(lte(claims.repairDate, q.to));
  if (q.states) where.push(inArray(claims.state, q.states));
  if (q.flag) where.push(sql`exists (select 1 from json_each(${claims.flags}) where json_each.value = ${q.flag})`);
  if (q.model) where.push(sql`${claims.unitId} in (select ${units.id} from ${units} where ${units.modelId} = ${q.model})`);
  if (q.minCents !== undefined) where.push(gte(claims.claimedTotalCents, q.minCents));
  if (q.maxCents !== undefined) where.push(lte(claims.claimedTotalCents, q.maxCents));
  if (q.q) {
    const like = `%${escapeLike(q.q)}%`;
    where.push(sql`(${claims.number} like ${like} escape '\\' or ${claims.unitId} in (select ${units.id} from ${units} where ${units.serial} like ${like} escape '\\'))`);
  }
  return where;
}

/** Rows after the cursor (value, id) in the order (column dir, id dir), NULLs first ascending, last descending. */
function afterCursor(col: Column, v: SortValue, id: string, dir: 'asc' | 'desc'): SQL {
  if (dir === 'desc') {
    if (v === null) return and(isNull(col), lt(claims.id, id)) as SQL;
    return or(lt(col, v), and(eq(col, v), lt(claims.id, id)), isNull(col)) as SQL;
  }
  if (v === null) return or(and(isNull(col), gt(claims.id, id)), isNotNull(col)) as SQL;
  return or(gt(col, v), and(eq(col, v), gt(claims.id, id))) as SQL;
}

/** True when the user's read rules for claims name no agency, technician or claim id. */
function spansAgencies(ability: AppAbility): boolean {
  const rules = ability.rulesFor('read', 'Claim');
  return (
    rules.length > 0 &&
    rules.every((r) => {
      const cond = (r.conditions ?? {}) as Record<string, unknown>;
      return !r.inverted && !('agencyId' in cond) && !('technicianId' in cond) && !('id' in cond);
    })
  );
}

export interface ClaimListPage {
  items: ClaimListItem[];
  nextCursor: string | null;
  total: number;
}

/**
 * One page of the claims the user may read: the scope from the user's CASL rules, the filters,
 * a keyset cursor on (sort value, id), joined names in the same statement; and the total under
 * the same scope and filters.
 */
export function listClaims(db: Db, ability: AppAbility, q: ClaimListQuery): ClaimListPage {
  const scope = claimScope(ability);
  const filters = listFilters(q);
  // A flag only the manufacturer sees matches nothing for anyone else (the list agrees with the detail).
  if (q.flag && MANUFACTURER_ONLY_FLAGS.includes(q.flag) && !seesEveryAgency(ability)) filters.push(sql`0 = 1`);
  // A scope that spans every agency (manufacturer roles) keeps most rows: say so to the planner,
  // so it walks the sort column's index instead of gathering the scope's rows and sorting them.
  const broad = !q.state && !q.states && !q.agency && spansAgencies(ability);
  const where = [broad ? sql`likelihood((${scope}), 0.9)` : scope, ...filters];
  if (q.cursor) {
    const c = decodeCursor(q.cursor, q.sort, q.dir);
    where.push(afterCursor(sortColumn[q.sort], c.value, c.id, q.dir));
  }
  const w = dialect.sqlToQuery(and(...where) as SQL);
  const order = `${sortSql(q.sort)} ${q.dir}, "claims"."id" ${q.dir}`;
  // Two steps in one statement: the page's ids from the claims table alone (index order, early
  // stop), then the names joined for those rows only.
  const pageSql = `${listSelectSql(q.sort)} where "claims"."id" in (select "claims"."id" from "claims" where ${w.sql} order by ${order} limit ?) order by ${order}`;
  const rows = cachedRaw(db, pageSql).all(...w.params, q.limit + 1) as unknown[][];

  // the count walks the scope's covering index, unless a text search reads the rows anyway
  const c = dialect.sqlToQuery(and(broad && q.q ? where[0] : scope, ...filters) as SQL);
  const countSql = `select count(*) from "claims" where ${c.sql}`;
  const countRow = cachedRaw(db, countSql).get(...c.params) as [number] | undefined;

  const more = rows.length > q.limit;
  const page = more ? rows.slice(0, q.limit) : rows;
  const items = page.map((r) => toListItem(r, ability));
  const last = page[page.length - 1];
  return {
    items,
    nextCursor: more && last ? encodeCursor({ sort: q.sort, dir: q.dir, value: last[LIST_KEYS.length] as SortValue, id: last[0] as string }) : null,
    total: countRow?.[0] ?? 0,
  };
}

const dialect = new SQLiteSyncDialect();
const selectSqlBySort = new Map<SortKey, string>();
const sortSqlByKey = new Map<SortKey, string>();

/** The select list and joins of the page (built once per sort key by the query builder). */
function listSelectSql(sort: SortKey): string {
  let text = selectSqlBySort.get(sort);
  if (!text) {
    text = new QueryBuilder()
      .select({ ...listItemColumns, sortValue: sortExpr[sort] })
      .from(claims)
      .innerJoin(organisations, eq(organisations.id, claims.agencyId))
      .innerJoin(technician, eq(technician.id, claims.technicianId))
      .leftJoin(units, eq(units.id, claims.unitId))
      .leftJoin(models, eq(models.id, units.modelId))
      .leftJoin(sites, eq(sites.id, claims.siteId))
      .leftJoin(listReviewer, eq(listReviewer.id, claims.reviewerId))
      .toSQL().sql;
    selectSqlBySort.set(sort, text);
  }
  return text;
}

function sortSql(sort: SortKey): string {
  let text = sortSqlByKey.get(sort);
  if (!text) sortSqlByKey.set(sort, (text = dialect.sqlToQuery(sortExpr[sort]).sql));
  return text;
}

/**
 * Prepared statements of the list, by SQL text. The text depends only on the shape of the
 * user's rules, the filters present, the sort and the cursor, so there are few of them; the
 * values are bound. Preparing a six-table join costs more than running it, so the hot path
 * prepares once, and reads rows as arrays (mapped below) rather than through the ORM's mapper.
 */
const statementCache = new WeakMap<object, Map<string, Statement>>();
const STATEMENT_CACHE_SIZE = 256;

function cachedRaw(db: Db, text: string): Statement {
  let cache = statementCache.get(db.$client);
  if (!cache) statementCache.set(db.$client, (cache = new Map()));
  let stmt = cache.get(text);
  if (!stmt) {
    stmt = db.$client.prepare(text).raw(true);
    if (cache.size >= STATEMENT_CACHE_SIZE) cache.delete(cache.keys().next().value as string);
    cache.set(text, stmt);
  }
  return stmt;
}

/** Keys of listItemColumns in select order (the order of the row arrays). */
const LIST_KEYS = Object.keys(listItemColumns) as (keyof ClaimListItem)[];
const FLAGS_INDEX = LIST_KEYS.indexOf('flags');

function toListItem(row: unknown[], ability: AppAbility): ClaimListItem {
  const item: Record<string, unknown> = {};
  for (let i = 0; i < LIST_KEYS.length; i++) item[LIST_KEYS[i]] = row[i];
  const flags = row[FLAGS_INDEX];
  item.flags = flagsForViewer(ability, typeof flags === 'string' ? (JSON.parse(flags) as string[]) : []);
  return item as unknown as ClaimListItem;
}

/** Scoped list rows for a given extra condition (home page, unit history), newest or oldest first. */
export function listClaimsWhere(db: Db, ability: AppAbility, extra: SQL | undefined, opts: { order: 'oldest_submitted' | 'oldest_created' | 'newest_repair' | 'oldest_decided'; limit: number }): ClaimListItem[] {
  const orderBy =
    opts.order === 'oldest_submitted'
      ? [asc(claims.submittedAt), asc(claims.id)]
      : opts.order === 'oldest_created'
        ? [asc(claims.createdAt), asc(claims.id)]
        : opts.order === 'oldest_decided'
          ? [asc(claims.decidedAt), asc(claims.id)]
          : [desc(claims.repairDate), desc(claims.id)];
  return db
    .select(listItemColumns)
    .from(claims)
    .innerJoin(organisations, eq(organisations.id, claims.agencyId))
    .innerJoin(technician, eq(technician.id, claims.technicianId))
    .leftJoin(units, eq(units.id, claims.unitId))
    .leftJoin(models, eq(models.id, units.modelId))
    .leftJoin(sites, eq(sites.id, claims.siteId))
    .leftJoin(listReviewer, eq(listReviewer.id, claims.reviewerId))
    .where(extra ? and(claimScope(ability), extra) : claimScope(ability))
    .orderBy(...orderBy)
    .limit(opts.limit)
    .all()
    .map((item) => ({ ...item, flags: flagsForViewer(ability, item.flags) })) as ClaimListItem[];
}

export function countClaimsWhere(db: Db, ability: AppAbility, extra: SQL | undefined): number {
  const row = db
    .select({ n: sql<number>`count(*)` })
    .from(claims)
    .where(extra ? and(claimScope(ability), extra) : claimScope(ability))
    .get();
  return row?.n ?? 0;
}

// ---- detail --------------------------------------------------------------------------------

export type ClaimDetailData = Omit<ClaimDetail, 'allowedActions'>;

/** Everything the claim page shows, for a row already known to be readable. */
export function loadClaimDetail(db: Db, row: Claim): ClaimDetailData {
  const reviewer = alias(users, 'reviewer');
  const head = db
    .select({
      agencyName: organisations.name,
      technicianName: technician.name,
      reviewerName: reviewer.name,
    })
    .from(claims)
    .innerJoin(organisations, eq(organisations.id, claims.agencyId))
    .innerJoin(technician, eq(technician.id, claims.technicianId))
    .leftJoin(reviewer, eq(reviewer.id, claims.reviewerId))
    .where(eq(claims.id, row.id))
    .get();

  const unit = row.unitId
    ? db
        .select({
          id: units.id,
          serial: units.serial,
          revision: units.revision,
          shipDate: units.shipDate,
          installDate: units.installDate,
          registeredOn: units.registeredOn,
          modelId: models.id,
          modelNumber: models.modelNumber,
          modelName: models.name,
          familyId: productFamilies.id,
          familyName: productFamilies.name,
        })
        .from(units)
        .innerJoin(models, eq(models.id, units.modelId))
        .innerJoin(productFamilies, eq(productFamilies.id, models.familyId))
        .where(eq(units.id, row.unitId))
        .get()
    : undefined;

  const site = row.siteId
    ? db
        .select({
          id: sites.id,
          name: sites.name,
          addressLine: sites.addressLine,
          city: sites.city,
          region: sites.region,
          postalCode: sites.postalCode,
          latitude: sites.latitude,
          longitude: sites.longitude,
        })
        .from(sites)
        .where(eq(sites.id, row.siteId))
        .get()
    : undefined;

  const laborLines = db
    .select({
      id: claimLaborLines.id,
      position: claimLaborLines.position,
      repairCodeId: claimLaborLines.repairCodeId,
      repairCode: repairCodes.code,
      description: repairCodes.description,
      allowedHours: repairCodes.allowedHours,
      hoursWorked: claimLaborLines.hoursWorked,
      overtime: claimLaborLines.overtime,
      note: claimLaborLines.note,
      approvedHours: claimLaborLines.approvedHours,
      adjustmentReason: claimLaborLines.adjustmentReason,
      approvedAmountCents: claimLaborLines.approvedAmountCents,
    })
    .from(claimLaborLines)
    .innerJoin(repairCodes, eq(repairCodes.id, claimLaborLines.repairCodeId))
    .where(eq(claimLaborLines.claimId, row.id))
    .orderBy(asc(claimLaborLines.position))
    .all();
  if (row.repairDate && laborLines.length > 0) {
    // the allowance in force on the repair date, as the valuation uses it
    const hours = allowancesOn(db, [...new Set(laborLines.map((l) => l.repairCodeId))], row.repairDate);
    for (const l of laborLines) l.allowedHours = hours.get(l.repairCodeId) ?? l.allowedHours;
  }

  const travel = db
    .select({
      roundTripMiles: claimTravel.roundTripMiles,
      travelHours: claimTravel.travelHours,
      approvedAmountCents: claimTravel.approvedAmountCents,
      adjustmentReason: claimTravel.adjustmentReason,
    })
    .from(claimTravel)
    .where(eq(claimTravel.claimId, row.id))
    .get();

  const partLines = db
    .select({
      id: claimPartLines.id,
      position: claimPartLines.position,
      partId: claimPartLines.partId,
      partNumber: parts.partNumber,
      description: parts.description,
      listPriceCents: parts.listPriceCents,
      returnRequired: parts.returnRequired,
      quantity: claimPartLines.quantity,
      approvedQuantity: claimPartLines.approvedQuantity,
      approvedAmountCents: claimPartLines.approvedAmountCents,
      adjustmentReason: claimPartLines.adjustmentReason,
      returnStatus: claimPartLines.returnStatus,
      carrier: claimPartLines.carrier,
      trackingNumber: claimPartLines.trackingNumber,
      receivedCondition: claimPartLines.receivedCondition,
    })
    .from(claimPartLines)
    .innerJoin(parts, eq(parts.id, claimPartLines.partId))
    .where(eq(claimPartLines.claimId, row.id))
    .orderBy(asc(claimPartLines.position))
    .all();
  if (row.repairDate && partLines.length > 0) {
    const prices = pricesOn(db, [...new Set(partLines.map((p) => p.partId))], row.repairDate);
    for (const p of partLines) p.listPriceCents = prices.get(p.partId) ?? p.listPriceCents;
  }

  const readings = db
    .select({ id: claimReadings.id, key: claimReadings.key, phase: claimReadings.phase, value: claimReadings.value, unit: claimReadings.unit })
    .from(claimReadings)
    .where(eq(claimReadings.claimId, row.id))
    .orderBy(asc(claimReadings.key), desc(claimReadings.phase))
    .all();

  const files = db
    .select({
      id: attachments.id,
      role: attachments.role,
      originalName: attachments.originalName,
      contentType: attachments.contentType,
      sizeBytes: attachments.sizeBytes,
      createdAt: attachments.createdAt,
      thumbnailKey: attachments.thumbnailKey,
      retractedAt: attachments.retractedAt,
      retractionReason: attachments.retractionReason,
    })
    .from(attachments)
    .where(eq(attachments.claimId, row.id))
    .orderBy(asc(attachments.createdAt))
    .all()
    .map(({ thumbnailKey, ...a }) => ({ ...a, hasThumbnail: thumbnailKey !== null }));

  const actor = alias(users, 'actor');
  const events = db
    .select({
      id: claimEvents.id,
      type: claimEvents.type,
      fromState: claimEvents.fromState,
      toState: claimEvents.toState,
      reason: claimEvents.reason,
      comment: claimEvents.comment,
      at: claimEvents.at,
      actorName: actor.name,
    })
    .from(claimEvents)
    .leftJoin(actor, eq(actor.id, claimEvents.actorId))
    .where(eq(claimEvents.claimId, row.id))
    .orderBy(asc(claimEvents.at), asc(sql`${claimEvents}.rowid`))
    .all();

  const author = alias(users, 'author');
  const authorOrg = alias(organisations, 'author_org');
  const commentRows = db
    .select({ id: comments.id, body: comments.body, createdAt: comments.createdAt, authorName: author.name, authorOrganisation: authorOrg.name })
    .from(comments)
    .innerJoin(author, eq(author.id, comments.authorId))
    .innerJoin(authorOrg, eq(authorOrg.id, author.organisationId))
    .where(eq(comments.claimId, row.id))
    .orderBy(asc(comments.createdAt), asc(sql`${comments}.rowid`))
    .all();

  return {
    id: row.id,
    number: row.number,
    state: row.state,
    agencyId: row.agencyId,
    agencyName: head?.agencyName ?? '',
    technicianId: row.technicianId,
    technicianName: head?.technicianName ?? '',
    serial: unit?.serial ?? null,
    modelNumber: unit?.modelNumber ?? null,
    siteName: site?.name ?? null,
    failureDate: row.failureDate,
    repairDate: row.repairDate,
    submittedAt: row.submittedAt,
    createdAt: row.createdAt,
    claimedTotalCents: row.claimedTotalCents,
    approvedTotalCents: row.approvedTotalCents,
    currency: row.currency,
    flags: row.flags,
    version: row.version,
    complaint: row.complaint,
    cause: row.cause,
    correction: row.correction,
    preAuthorization: row.preAuthorization,
    resubmissionCount: row.resubmissionCount,
    firstSubmittedAt: row.firstSubmittedAt,
    decidedAt: row.decidedAt,
    paidAt: row.paidAt,
    reviewerName: head?.reviewerName ?? null,
    decidedByName: [...events].reverse().find((e) => e.type === 'approve' || e.type === 'deny')?.actorName ?? null,
    firstApproval: row.firstApprovedBy
      ? {
          byName: db.select({ name: users.name }).from(users).where(eq(users.id, row.firstApprovedBy)).get()?.name ?? '',
          byYou: false,
          at: row.firstApprovedAt ?? '',
          approvedTotalCents: row.firstApprovedCents ?? 0,
        }
      : null,
    heldByYou: false,
    unit: unit
      ? {
          id: unit.id,
          serial: unit.serial,
          revision: unit.revision,
          shipDate: unit.shipDate,
          installDate: unit.installDate,
          model: { id: unit.modelId, modelNumber: unit.modelNumber, name: unit.modelName, familyId: unit.familyId, familyName: unit.familyName },
          terms: unitTermsOf(db, unit),
        }
      : null,
    site: site ?? null,
    laborLines,
    travel: travel ?? null,
    partLines,
    readings,
    attachments: files,
    events,
    comments: commentRows,
  };
}
