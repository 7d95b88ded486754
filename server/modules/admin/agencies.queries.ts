import { and, asc, eq, gte, isNull, lte, ne, or, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { agencyTerms, organisations, users } from '../../db/schema/index';
import type { AgencyTerms } from '../../db/schema/organisations';
import type { AgencyDetail, AgencyListItem, ContractTermsItem } from '@shared/schemas/admin';
import { getAgencyProfile } from '../agency/agency.queries';
import { listOpenInvitations } from '../invitations/invitations.queries';
import type { AppAbility } from '@shared/permissions/ability';

const OPEN_END = '9999-12-31';

/**
 * The contract terms of an agency in force on `date` (YYYY-MM-DD), both ends inclusive, or
 * undefined when none are. Overlaps are refused on write, so at most one row matches.
 */
export function termsOn(db: Db, agencyId: string, date: string): AgencyTerms | undefined {
  return db
    .select()
    .from(agencyTerms)
    .where(and(eq(agencyTerms.agencyId, agencyId), lte(agencyTerms.effectiveFrom, date), or(isNull(agencyTerms.effectiveTo), gte(agencyTerms.effectiveTo, date))))
    .get();
}

/** Terms of the agency whose period meets [from, to] (to null: open-ended), other than `exceptId`. */
export function overlappingTerms(db: Db, agencyId: string, from: string, to: string | null, exceptId?: string): AgencyTerms | undefined {
  return db
    .select()
    .from(agencyTerms)
    .where(
      and(
        eq(agencyTerms.agencyId, agencyId),
        lte(agencyTerms.effectiveFrom, to ?? OPEN_END),
        gte(sql`coalesce(${agencyTerms.effectiveTo}, ${OPEN_END})`, from),
        exceptId ? ne(agencyTerms.id, exceptId) : undefined,
      ),
    )
    .get();
}

export function listTerms(db: Db, agencyId: string): ContractTermsItem[] {
  return db.select().from(agencyTerms).where(eq(agencyTerms.agencyId, agencyId)).orderBy(asc(agencyTerms.effectiveFrom)).all();
}

export function getTerms(db: Db, agencyId: string, termsId: string): AgencyTerms | undefined {
  return db
    .select()
    .from(agencyTerms)
    .where(and(eq(agencyTerms.id, termsId), eq(agencyTerms.agencyId, agencyId)))
    .get();
}

function counts(db: Db, agencyId: string) {
  const row = db
    .select({
      userCount: sql<number>`count(*)`,
      activeAdminCount: sql<number>`coalesce(sum(case when ${users.role} = 'agency_admin' and ${users.active} = 1 then 1 else 0 end), 0)`,
    })
    .from(users)
    .where(eq(users.organisationId, agencyId))
    .get();
  return { userCount: row?.userCount ?? 0, activeAdminCount: row?.activeAdminCount ?? 0 };
}

/** An agency as the manufacturer admin sees it; invitations are those the caller's rules let it read. */
export function getAgencyListItem(db: Db, ability: AppAbility, agencyId: string, today: string, nowIso: string): AgencyListItem | undefined {
  const profile = getAgencyProfile(db, agencyId);
  if (!profile) return undefined;
  return { ...profile, ...counts(db, agencyId), pendingInvitations: listOpenInvitations(db, ability, agencyId, nowIso), currentTerms: termsOn(db, agencyId, today) ?? null };
}

export function listAgencies(db: Db, ability: AppAbility, today: string, nowIso: string): AgencyListItem[] {
  const ids = db.select({ id: organisations.id }).from(organisations).where(eq(organisations.kind, 'agency')).orderBy(asc(organisations.name)).all();
  return ids.map((r) => getAgencyListItem(db, ability, r.id, today, nowIso) as AgencyListItem);
}

export function getAgencyDetail(db: Db, ability: AppAbility, agencyId: string, today: string, nowIso: string): AgencyDetail | undefined {
  const item = getAgencyListItem(db, ability, agencyId, today, nowIso);
  return item ? { ...item, terms: listTerms(db, agencyId) } : undefined;
}
