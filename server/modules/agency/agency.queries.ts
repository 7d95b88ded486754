import { aliasedTable, and, asc, eq, gte, inArray, isNull, lte, sql, type SQL } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { certifications, organisations, productFamilies, users } from '../../db/schema/index';
import { abilityToSql } from '../../lib/casl-to-sql';
import type { Action, AppAbility } from '@shared/permissions/ability';
import { addDays, daysBetween } from '@shared/calculations/dates';
import {
  CERTIFICATION_WARNING_DAYS,
  type AgencyProfile,
  type CertificationItem,
  type CertificationState,
  type CertificationSummary,
  type UserCertificationBrief,
  type UserListItem,
} from '@shared/schemas/admin';

/** Columns the CASL rules for users may constrain. */
export const userColumns = { organisationId: users.organisationId, id: users.id };
export const certificationColumns = { organisationId: certifications.organisationId, userId: certifications.userId };

export function userScope(ability: AppAbility, action: Action): SQL {
  return abilityToSql(ability, action, 'User', userColumns);
}

/** A user the caller may act on, or undefined (answered as 404). */
export function findVisibleUser(db: Db, ability: AppAbility, action: Action, id: string) {
  return db
    .select()
    .from(users)
    .where(and(eq(users.id, id), userScope(ability, action)))
    .get();
}

/** valid / expiring (within 30 days) / expired / not yet valid, on `today`. */
export function certificationState(validFrom: string, validTo: string, today: string, warningDays = CERTIFICATION_WARNING_DAYS): CertificationState {
  if (today < validFrom) return 'not_yet_valid';
  if (today > validTo) return 'expired';
  return daysBetween(today, validTo) <= warningDays ? 'expiring' : 'valid';
}

interface CertRow {
  userId: string;
  familyId: string;
  familyCode: string;
  familyName: string;
  validFrom: string;
  validTo: string;
}

/**
 * Per family, the certificate that matters today: the one in force that runs longest, else the
 * latest one (expired or not yet valid). The summary is the worst state across families.
 */
export function summariseCertifications(rows: CertRow[], today: string): { summary: CertificationSummary; families: UserCertificationBrief[] } {
  const byFamily = new Map<string, CertRow[]>();
  for (const r of rows) byFamily.set(r.familyId, [...(byFamily.get(r.familyId) ?? []), r]);
  const families: UserCertificationBrief[] = [];
  for (const list of byFamily.values()) {
    const current = list.filter((r) => r.validFrom <= today && today <= r.validTo).sort((a, b) => b.validTo.localeCompare(a.validTo))[0];
    const pick = current ?? [...list].sort((a, b) => b.validTo.localeCompare(a.validTo))[0];
    const state = certificationState(pick.validFrom, pick.validTo, today);
    families.push({ familyId: pick.familyId, familyCode: pick.familyCode, familyName: pick.familyName, validTo: pick.validTo, state, daysLeft: daysBetween(today, pick.validTo) });
  }
  families.sort((a, b) => a.familyCode.localeCompare(b.familyCode));
  const states = new Set(families.map((f) => f.state));
  const summary: CertificationSummary = families.length === 0 ? 'none' : states.has('expired') ? 'expired' : states.has('expiring') ? 'expiring' : 'valid';
  return { summary, families };
}

/** The users of one organisation that the caller may read, with their certification state. */
export function listUsers(db: Db, ability: AppAbility, organisationId: string, today: string): UserListItem[] {
  const rows = db
    .select({
      id: users.id,
      name: users.name,
      email: users.email,
      role: users.role,
      active: users.active,
      lastSignInAt: users.lastSignInAt,
      createdAt: users.createdAt,
    })
    .from(users)
    .where(and(eq(users.organisationId, organisationId), userScope(ability, 'read')))
    .orderBy(asc(users.name))
    .all();
  const certs = rows.length
    ? db
        .select({
          userId: certifications.userId,
          familyId: certifications.familyId,
          familyCode: productFamilies.code,
          familyName: productFamilies.name,
          validFrom: certifications.validFrom,
          validTo: certifications.validTo,
        })
        .from(certifications)
        .innerJoin(productFamilies, eq(productFamilies.id, certifications.familyId))
        .where(and(eq(certifications.organisationId, organisationId), inArray(certifications.userId, rows.map((r) => r.id)), isNull(certifications.revokedAt)))
        .all()
    : [];
  return rows.map((u) => ({ ...u, certification: summariseCertifications(certs.filter((c) => c.userId === u.id), today) }));
}

/** A certificate that has not been revoked: the only kind that counts. */
export const notRevoked = isNull(certifications.revokedAt);
const revoker = aliasedTable(users, 'revoker');

const certificationSelect = {
  id: certifications.id,
  userId: certifications.userId,
  userName: users.name,
  familyId: certifications.familyId,
  familyCode: productFamilies.code,
  familyName: productFamilies.name,
  certificateNumber: certifications.certificateNumber,
  validFrom: certifications.validFrom,
  validTo: certifications.validTo,
  attachmentId: certifications.attachmentId,
  createdAt: certifications.createdAt,
  revokedAt: certifications.revokedAt,
  revokedByName: revoker.name,
  revokeReason: certifications.revokeReason,
};

type CertificationSelectRow = Omit<CertificationItem, 'state' | 'daysLeft'>;
const withState = (today: string) => (r: CertificationSelectRow): CertificationItem => ({
  ...r,
  state: certificationState(r.validFrom, r.validTo, today),
  daysLeft: daysBetween(today, r.validTo),
});

/** Certifications the caller may read, optionally of one user, newest end date first. */
export function listCertifications(db: Db, ability: AppAbility, filters: { userId?: string }, today: string): CertificationItem[] {
  const where = [abilityToSql(ability, 'read', 'Certification', certificationColumns)];
  if (filters.userId) where.push(eq(certifications.userId, filters.userId));
  return db
    .select(certificationSelect)
    .from(certifications)
    .innerJoin(users, eq(users.id, certifications.userId))
    .innerJoin(productFamilies, eq(productFamilies.id, certifications.familyId))
    .leftJoin(revoker, eq(revoker.id, certifications.revokedBy))
    .where(and(...where))
    .orderBy(asc(users.name), asc(productFamilies.code), sql`${certifications.validTo} desc`)
    .all()
    .map(withState(today));
}

export function findVisibleCertification(db: Db, ability: AppAbility, action: Action, id: string) {
  return db
    .select()
    .from(certifications)
    .where(and(eq(certifications.id, id), abilityToSql(ability, action, 'Certification', certificationColumns)))
    .get();
}

export function getCertificationItem(db: Db, id: string, today: string): CertificationItem | undefined {
  const row = db
    .select(certificationSelect)
    .from(certifications)
    .innerJoin(users, eq(users.id, certifications.userId))
    .innerJoin(productFamilies, eq(productFamilies.id, certifications.familyId))
    .leftJoin(revoker, eq(revoker.id, certifications.revokedBy))
    .where(eq(certifications.id, id))
    .get();
  return row ? withState(today)(row) : undefined;
}

/**
 * Certificates of an agency's active users that are in force today and end within `days`
 * (30 by default), unless a later certificate for the same person and family is already on
 * file. For the home page's notices and the users page's warnings. Soonest first.
 */
export function expiringCertifications(db: Db, organisationId: string, today: string, days = CERTIFICATION_WARNING_DAYS): CertificationItem[] {
  return db
    .select(certificationSelect)
    .from(certifications)
    .innerJoin(users, eq(users.id, certifications.userId))
    .innerJoin(productFamilies, eq(productFamilies.id, certifications.familyId))
    .leftJoin(revoker, eq(revoker.id, certifications.revokedBy))
    .where(
      and(
        eq(certifications.organisationId, organisationId),
        eq(users.active, true),
        notRevoked,
        lte(certifications.validFrom, today),
        gte(certifications.validTo, today),
        lte(certifications.validTo, addDays(today, days)),
        sql`not exists (select 1 from certifications as later where later.user_id = ${certifications.userId} and later.family_id = ${certifications.familyId} and later.valid_to > ${certifications.validTo} and later.revoked_at is null)`,
      ),
    )
    .orderBy(asc(certifications.validTo), asc(users.name))
    .all()
    .map(withState(today));
}

/** True when the technician holds a certificate for the family in force on the date (inclusive). */
export function isCertified(db: Db, userId: string, familyId: string, date: string): boolean {
  const row = db
    .select({ id: certifications.id })
    .from(certifications)
    .where(and(eq(certifications.userId, userId), eq(certifications.familyId, familyId), lte(certifications.validFrom, date), gte(certifications.validTo, date), notRevoked))
    .get();
  return row !== undefined;
}

/** The certificates of one technician as the valuation reads them (every family, every period). */
export function certificationsOfTechnician(db: Db, userId: string) {
  return db
    .select({ familyId: certifications.familyId, familyCode: productFamilies.code, validFrom: certifications.validFrom, validTo: certifications.validTo })
    .from(certifications)
    .innerJoin(productFamilies, eq(productFamilies.id, certifications.familyId))
    .where(and(eq(certifications.userId, userId), notRevoked))
    .all();
}

export function getAgencyProfile(db: Db, organisationId: string): AgencyProfile | undefined {
  return db
    .select({
      id: organisations.id,
      name: organisations.name,
      contactEmail: organisations.contactEmail,
      addressLine: organisations.addressLine,
      city: organisations.city,
      region: organisations.region,
      postalCode: organisations.postalCode,
      country: organisations.country,
      latitude: organisations.latitude,
      longitude: organisations.longitude,
      timeZone: organisations.timeZone,
      active: organisations.active,
      updatedAt: organisations.updatedAt,
    })
    .from(organisations)
    .where(and(eq(organisations.id, organisationId), eq(organisations.kind, 'agency')))
    .get();
}

/** Active users of the organisation holding the role, other than `exceptId`. */
export function countOtherActive(db: Db, organisationId: string, role: string, exceptId: string): number {
  const row = db
    .select({ n: sql<number>`count(*)` })
    .from(users)
    .where(and(eq(users.organisationId, organisationId), eq(users.role, role as never), eq(users.active, true), sql`${users.id} <> ${exceptId}`))
    .get();
  return row?.n ?? 0;
}
