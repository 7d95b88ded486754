import { and, eq, ne } from 'drizzle-orm';
import { subject } from '@casl/ability';
import { tx, type Db } from '../../db/client';
import { attachments, certifications, organisations, productFamilies, users } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { writeAudit } from '../../lib/audit';
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from '../../lib/errors';
import { newId } from '../../lib/ids';
import { todayFor } from '../../lib/business-day';
import { reversedRangeMessage } from '@shared/schemas/messages';
import type {
  AgencyProfile,
  CertificationItem,
  CreateCertificationBody,
  RevokeCertificationBody,
  UpdateAgencyProfileBody,
  UpdateCertificationBody,
} from '@shared/schemas/admin';
import { expiringCertifications, findVisibleCertification, getAgencyProfile, getCertificationItem, listCertifications, notRevoked } from './agency.queries';
import { resolveAddress } from './postal-code.service';
import { nameKey } from '@shared/schemas/text';

function requireAgency(ctx: RequestContext): void {
  if (ctx.user.organisationKind !== 'agency') throw new ForbiddenError('This is for service agencies.');
}

/** The certificate PDF must be one this agency uploaded through the evidence path. */
function checkAttachment(t: Db, organisationId: string, attachmentId: string | null | undefined): void {
  if (!attachmentId) return;
  const a = t.select({ organisationId: attachments.organisationId, contentType: attachments.contentType }).from(attachments).where(eq(attachments.id, attachmentId)).get();
  if (!a || a.organisationId !== organisationId) throw new ValidationError('Some fields need attention.', { attachmentId: 'Upload the certificate again: that file was not found.' });
  if (a.contentType !== 'application/pdf') throw new ValidationError('Some fields need attention.', { attachmentId: 'The certificate must be a PDF.' });
}

function checkFamily(t: Db, familyId: string): void {
  const f = t.select({ active: productFamilies.active }).from(productFamilies).where(eq(productFamilies.id, familyId)).get();
  if (!f) throw new ValidationError('Some fields need attention.', { familyId: 'Choose a product family from the list.' });
}

export type AgencyService = ReturnType<typeof createAgencyService>;

export function createAgencyService(deps: AppDeps) {
  const { db, clock } = deps;

  return {
    // ------------------------------------------------------------------ certifications
    // An exact duplicate (same person, family, certificate number and validity) is refused:
    // it would only double the row the expiry notices and the claim check read.

    listCertifications(ctx: RequestContext, filters: { userId?: string }): CertificationItem[] {
      requireAgency(ctx);
      if (!ctx.ability.can('read', 'Certification')) throw new ForbiddenError();
      return listCertifications(db, ctx.ability, filters, todayFor(db, clock, ctx.user.organisationId));
    },

    expiring(ctx: RequestContext): CertificationItem[] {
      requireAgency(ctx);
      if (!ctx.ability.can('read', 'Certification')) throw new ForbiddenError();
      const own = ctx.ability.can('create', 'Certification') ? null : ctx.user.id;
      return expiringCertifications(db, ctx.user.organisationId, todayFor(db, clock, ctx.user.organisationId)).filter((c) => own === null || c.userId === own);
    },

    createCertification(ctx: RequestContext, body: CreateCertificationBody, ip: string): CertificationItem {
      requireAgency(ctx);
      const org = ctx.user.organisationId;
      if (!ctx.ability.can('create', subject('Certification', { organisationId: org, userId: body.userId }))) throw new ForbiddenError('Only an agency admin records certifications.');
      const id = newId();
      tx(db, (t) => {
        const person = t.select({ id: users.id }).from(users).where(and(eq(users.id, body.userId), eq(users.organisationId, org))).get();
        if (!person) throw new ValidationError('Some fields need attention.', { userId: 'Choose a technician of this agency.' });
        checkFamily(t, body.familyId);
        checkAttachment(t, org, body.attachmentId);
        refuseDuplicate(t, { userId: body.userId, familyId: body.familyId, certificateNumber: body.certificateNumber, validFrom: body.validFrom, validTo: body.validTo });
        t.insert(certifications)
          .values({
            id,
            organisationId: org,
            userId: body.userId,
            familyId: body.familyId,
            certificateNumber: body.certificateNumber,
            validFrom: body.validFrom,
            validTo: body.validTo,
            attachmentId: body.attachmentId ?? null,
            createdAt: clock.now().toISOString(),
          })
          .run();
        writeAudit(t, clock, {
          actorId: ctx.user.id,
          organisationId: org,
          action: 'certification.create',
          recordType: 'Certification',
          recordId: id,
          outcome: 'success',
          ip,
          detail: { userId: body.userId, familyId: body.familyId, validFrom: body.validFrom, validTo: body.validTo },
        });
      });
      return getCertificationItem(db, id, todayFor(db, clock, ctx.user.organisationId)) as CertificationItem;
    },

    updateCertification(ctx: RequestContext, id: string, body: UpdateCertificationBody, ip: string): CertificationItem {
      requireAgency(ctx);
      tx(db, (t) => {
        const row = findVisibleCertification(t, ctx.ability, 'update', id);
        if (!row) throw new NotFoundError('No such certification.');
        if (row.revokedAt) throw new ConflictError('This certificate was revoked and can no longer be changed; record a new one instead.', 'certification_revoked');
        const next = {
          familyId: body.familyId ?? row.familyId,
          certificateNumber: body.certificateNumber ?? row.certificateNumber,
          validFrom: body.validFrom ?? row.validFrom,
          validTo: body.validTo ?? row.validTo,
          attachmentId: body.attachmentId !== undefined ? body.attachmentId : row.attachmentId,
        };
        if (next.validTo < next.validFrom) throw new ValidationError('Some fields need attention.', { validTo: reversedRangeMessage('end of validity', next.validTo, 'start of validity', next.validFrom) });
        if (body.familyId) checkFamily(t, body.familyId);
        if (body.attachmentId) checkAttachment(t, row.organisationId, body.attachmentId);
        refuseDuplicate(t, { userId: row.userId, ...next }, id);
        t.update(certifications).set(next).where(eq(certifications.id, id)).run();
        const changed: Record<string, unknown> = {};
        for (const k of Object.keys(next) as (keyof typeof next)[]) if (next[k] !== row[k]) changed[k] = { from: row[k], to: next[k] };
        writeAudit(t, clock, { actorId: ctx.user.id, organisationId: row.organisationId, action: 'certification.update', recordType: 'Certification', recordId: id, outcome: 'success', ip, detail: changed });
      });
      return getCertificationItem(db, id, todayFor(db, clock, ctx.user.organisationId)) as CertificationItem;
    },

    /** Withdraws a certificate (kept for the record, with who, when and why); it stops counting at once. */
    revokeCertification(ctx: RequestContext, id: string, body: RevokeCertificationBody, ip: string): CertificationItem {
      requireAgency(ctx);
      tx(db, (t) => {
        const row = findVisibleCertification(t, ctx.ability, 'update', id);
        if (!row) throw new NotFoundError('No such certification.');
        if (row.revokedAt) throw new ConflictError('This certificate is already revoked.', 'certification_revoked');
        const at = clock.now().toISOString();
        t.update(certifications).set({ revokedAt: at, revokedBy: ctx.user.id, revokeReason: body.reason }).where(eq(certifications.id, id)).run();
        writeAudit(t, clock, {
          actorId: ctx.user.id,
          organisationId: row.organisationId,
          action: 'certification.revoke',
          recordType: 'Certification',
          recordId: id,
          outcome: 'success',
          ip,
          detail: { userId: row.userId, familyId: row.familyId, certificateNumber: row.certificateNumber, reason: body.reason },
        });
      });
      return getCertificationItem(db, id, todayFor(db, clock, ctx.user.organisationId)) as CertificationItem;
    },

    // ------------------------------------------------------------------ profile

    getProfile(ctx: RequestContext): AgencyProfile {
      requireAgency(ctx);
      if (!ctx.ability.can('read', subject('Agency', { id: ctx.user.organisationId }))) throw new ForbiddenError('Only an agency admin sees the agency profile.');
      const p = getAgencyProfile(db, ctx.user.organisationId);
      if (!p) throw new NotFoundError('No such agency.');
      return p;
    },

    updateProfile(ctx: RequestContext, body: UpdateAgencyProfileBody, ip: string): AgencyProfile {
      requireAgency(ctx);
      const org = ctx.user.organisationId;
      if (!ctx.ability.can('update', subject('Agency', { id: org }))) throw new ForbiddenError('Only an agency admin edits the agency profile.');
      tx(db, (t) => updateOrganisationProfile(t, deps, org, body, { actorId: ctx.user.id, ip }));
      return getAgencyProfile(db, org) as AgencyProfile;
    },
  };
}

export const nameTakenMessage = 'Another service agency already uses this name (names are compared ignoring case and spaces). Choose a name that tells yours apart.';
export const manufacturerNameMessage = 'This is the manufacturer’s name. A service agency cannot use it.';

/**
 * Refuses an agency name that another organisation holds, compared by nameKey (NFKC, case and
 * spaces ignored): another agency's name, or any manufacturer's. 400 with the message on `name`.
 */
export function checkAgencyName(t: Db, name: string, exceptId?: string): string {
  const key = nameKey(name);
  const holder = t
    .select({ kind: organisations.kind })
    .from(organisations)
    .where(exceptId ? and(eq(organisations.nameKey, key), ne(organisations.id, exceptId)) : eq(organisations.nameKey, key))
    .get();
  if (holder) throw new ValidationError('Some fields need attention.', { name: holder.kind === 'manufacturer' ? manufacturerNameMessage : nameTakenMessage });
  return key;
}

/** The unique index on name_key is the last word when two writers race past the check. */
export function isNameKeyConflict(e: unknown): boolean {
  return e instanceof Error && (e as { code?: string }).code === 'SQLITE_CONSTRAINT_UNIQUE' && e.message.includes('organisations.name_key');
}

/** Writes a profile change of an agency (by its admin or the manufacturer) with its audit row. */
export function updateOrganisationProfile(
  t: Db,
  deps: Pick<AppDeps, 'clock'>,
  organisationId: string,
  body: UpdateAgencyProfileBody & { active?: boolean },
  who: { actorId: string; ip: string },
): void {
  const current = t.select().from(organisations).where(and(eq(organisations.id, organisationId), eq(organisations.kind, 'agency'))).get();
  if (!current) throw new NotFoundError('No such agency.');
  const address = resolveAddress(current, body);
  const name = body.name ?? current.name;
  const next = {
    name,
    nameKey: name === current.name ? current.nameKey : checkAgencyName(t, name, organisationId),
    contactEmail: body.contactEmail !== undefined ? body.contactEmail : current.contactEmail,
    addressLine: body.addressLine !== undefined ? body.addressLine : current.addressLine,
    timeZone: body.timeZone ?? current.timeZone,
    active: body.active ?? current.active,
    ...address,
  };
  const changed: Record<string, unknown> = {};
  for (const k of Object.keys(next) as (keyof typeof next)[]) if (next[k] !== current[k]) changed[k] = { from: current[k], to: next[k] };
  if (Object.keys(changed).length === 0) return;
  try {
    t.update(organisations)
      .set({ ...next, updatedAt: deps.clock.now().toISOString() })
      .where(eq(organisations.id, organisationId))
      .run();
  } catch (e) {
    if (isNameKeyConflict(e)) throw new ValidationError('Some fields need attention.', { name: nameTakenMessage });
    throw e;
  }
  writeAudit(t, deps.clock, { actorId: who.actorId, organisationId, action: 'agency.update', recordType: 'Agency', recordId: organisationId, outcome: 'success', ip: who.ip, detail: changed });
}

/** 409 when the person already holds this very certificate (same family, number and validity). */
function refuseDuplicate(t: Db, c: { userId: string; familyId: string; certificateNumber: string; validFrom: string; validTo: string }, exceptId?: string): void {
  const same = t
    .select({ id: certifications.id })
    .from(certifications)
    .where(
      and(
        eq(certifications.userId, c.userId),
        eq(certifications.familyId, c.familyId),
        eq(certifications.certificateNumber, c.certificateNumber),
        eq(certifications.validFrom, c.validFrom),
        eq(certifications.validTo, c.validTo),
        notRevoked,
        exceptId ? ne(certifications.id, exceptId) : undefined,
      ),
    )
    .get();
  if (same) throw new ConflictError(`This technician already holds certificate ${c.certificateNumber} for this product family, valid ${c.validFrom} to ${c.validTo}.`, 'duplicate_certification');
}
