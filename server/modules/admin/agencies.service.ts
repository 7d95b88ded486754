import { and, eq, isNull, sql } from 'drizzle-orm';
import { tx, type Db } from '../../db/client';
import { agencyTerms, organisations } from '../../db/schema/index';
import type { AgencyTerms } from '../../db/schema/organisations';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { writeAudit } from '../../lib/audit';
import { AppError, ConflictError, ForbiddenError, NotFoundError, ValidationError } from '../../lib/errors';
import { newId } from '../../lib/ids';
import { todayFor } from '../../lib/business-day';
import { reversedRangeMessage } from '@shared/schemas/messages';
import { addDays } from '@shared/calculations/dates';
import type { AgencyDetail, AgencyListItem, ContractTermsItem, UpdateAgencyBody, UpdateTermsBody } from '@shared/schemas/admin';
import { createAgencySchema, createTermsSchema } from '@shared/schemas/admin';
import type { z } from 'zod';
import { resolveAddress } from '../agency/postal-code.service';
import { checkAgencyName, isNameKeyConflict, nameTakenMessage, updateOrganisationProfile } from '../agency/agency.service';
import { countOtherActive } from '../agency/agency.queries';
import type { InvitationsService } from '../invitations/invitations.service';
import { getAgencyDetail, getTerms, listAgencies, listTerms, overlappingTerms } from './agencies.queries';

type CreateAgency = z.infer<typeof createAgencySchema>;
type CreateTerms = z.infer<typeof createTermsSchema>;

const period = (t: { effectiveFrom: string; effectiveTo: string | null }) => (t.effectiveTo ? `${t.effectiveFrom} to ${t.effectiveTo}` : `${t.effectiveFrom} with no end date`);

function overlapError(other: AgencyTerms): AppError {
  const message = `These dates overlap the contract terms in force from ${period(other)}. Terms of one agency cannot overlap: ${
    other.effectiveTo ? 'choose dates outside that period' : 'end those terms first (or tick "end the terms before this")'
  }.`;
  return new AppError(409, 'terms_overlap', message, { effectiveFrom: message });
}

/** Agencies and their contract terms, as the manufacturer admin keeps them. */
export function createAgenciesService(deps: AppDeps, invitations: InvitationsService) {
  const { db, clock } = deps;
  const nowIso = () => clock.now().toISOString();

  function guard(ctx: RequestContext, subject: 'Agency' | 'ContractTerms', action: 'read' | 'create' | 'update'): void {
    if (ctx.user.organisationKind !== 'manufacturer' || !ctx.ability.can('create', subject) || !ctx.ability.can(action, subject)) {
      throw new ForbiddenError('Only a manufacturer admin manages agencies and their contract terms.');
    }
  }
  function audit(t: Db, ctx: RequestContext, action: string, recordType: string, recordId: string, ip: string, detail: Record<string, unknown>): void {
    writeAudit(t, clock, { actorId: ctx.user.id, organisationId: ctx.user.organisationId, action, recordType, recordId, outcome: 'success', ip, detail });
  }
  function requireAgency(t: Db, id: string) {
    const row = t.select().from(organisations).where(and(eq(organisations.id, id), eq(organisations.kind, 'agency'))).get();
    if (!row) throw new NotFoundError('No such agency.');
    return row;
  }
  const detail = (ctx: RequestContext, id: string) => getAgencyDetail(db, ctx.ability, id, todayFor(db, clock, ctx.user.organisationId), nowIso()) as AgencyDetail;

  return {
    list(ctx: RequestContext): AgencyListItem[] {
      guard(ctx, 'Agency', 'read');
      return listAgencies(db, ctx.ability, todayFor(db, clock, ctx.user.organisationId), nowIso());
    },

    get(ctx: RequestContext, id: string): AgencyDetail {
      guard(ctx, 'Agency', 'read');
      const d = getAgencyDetail(db, ctx.ability, id, todayFor(db, clock, ctx.user.organisationId), nowIso());
      if (!d) throw new NotFoundError('No such agency.');
      return d;
    },

    /** The agency and the invitation of its first admin, in one transaction. */
    create(ctx: RequestContext, body: CreateAgency, ip: string): AgencyDetail {
      guard(ctx, 'Agency', 'create');
      const id = newId();
      const write = () => tx(db, (t) => {
        const key = checkAgencyName(t, body.name);
        const address = resolveAddress(
          { postalCode: null, city: null, region: null, country: 'US', latitude: null, longitude: null },
          { postalCode: body.postalCode, city: body.city, region: body.region, latitude: body.latitude ?? null, longitude: body.longitude ?? null },
        );
        const now = nowIso();
        t.insert(organisations)
          .values({ id, kind: 'agency', name: body.name, nameKey: key, contactEmail: body.contactEmail, addressLine: body.addressLine, timeZone: body.timeZone, ...address, active: true, createdAt: now, updatedAt: now })
          .run();
        audit(t, ctx, 'agency.create', 'Agency', id, ip, { name: body.name, postalCode: address.postalCode, adminEmail: body.adminEmail });
        invitations.inviteIn(t, ctx, { organisationId: id, role: 'agency_admin', email: body.adminEmail }, ip);
      });
      try {
        write();
      } catch (e) {
        if (isNameKeyConflict(e)) throw new ValidationError('Some fields need attention.', { name: nameTakenMessage });
        throw e;
      }
      deps.outbox.kick();
      return detail(ctx, id);
    },

    update(ctx: RequestContext, id: string, body: UpdateAgencyBody, ip: string): AgencyDetail {
      guard(ctx, 'Agency', 'update');
      tx(db, (t) => {
        requireAgency(t, id);
        updateOrganisationProfile(t, deps, id, body, { actorId: ctx.user.id, ip });
      });
      return detail(ctx, id);
    },

    /** Invites an admin to an agency that has no active admin (its first, or a replacement). */
    inviteAdmin(ctx: RequestContext, id: string, email: string, ip: string): AgencyDetail {
      guard(ctx, 'Agency', 'update');
      tx(db, (t) => {
        requireAgency(t, id);
        if (countOtherActive(t, id, 'agency_admin', '') > 0) {
          throw new ConflictError('This agency already has an active agency admin, who invites the agency’s own people.', 'has_admin');
        }
        invitations.inviteIn(t, ctx, { organisationId: id, role: 'agency_admin', email }, ip);
      });
      deps.outbox.kick();
      return detail(ctx, id);
    },

    listTerms(ctx: RequestContext, agencyId: string): ContractTermsItem[] {
      guard(ctx, 'ContractTerms', 'read');
      requireAgency(db, agencyId);
      return listTerms(db, agencyId);
    },

    /**
     * New terms for a period. Periods of one agency never overlap; with closePrevious the
     * open-ended terms that started earlier end the day before the new ones start.
     */
    createTerms(ctx: RequestContext, agencyId: string, body: CreateTerms, ip: string): ContractTermsItem {
      guard(ctx, 'ContractTerms', 'create');
      const id = newId();
      tx(db, (t) => {
        requireAgency(t, agencyId);
        const { closePrevious, ...fields } = body;
        if (closePrevious) {
          const open = t
            .select()
            .from(agencyTerms)
            .where(and(eq(agencyTerms.agencyId, agencyId), isNull(agencyTerms.effectiveTo), sql`${agencyTerms.effectiveFrom} < ${fields.effectiveFrom}`))
            .get();
          if (open) {
            const end = addDays(fields.effectiveFrom, -1);
            t.update(agencyTerms).set({ effectiveTo: end }).where(eq(agencyTerms.id, open.id)).run();
            audit(t, ctx, 'contract_terms.update', 'ContractTerms', open.id, ip, { agencyId, effectiveTo: { from: null, to: end } });
          }
        }
        const other = overlappingTerms(t, agencyId, fields.effectiveFrom, fields.effectiveTo);
        if (other) throw overlapError(other);
        t.insert(agencyTerms)
          .values({ id, agencyId, ...fields, createdAt: nowIso() })
          .run();
        audit(t, ctx, 'contract_terms.create', 'ContractTerms', id, ip, { agencyId, ...fields });
      });
      return getTerms(db, agencyId, id) as ContractTermsItem;
    },

    updateTerms(ctx: RequestContext, agencyId: string, termsId: string, body: UpdateTermsBody, ip: string): ContractTermsItem {
      guard(ctx, 'ContractTerms', 'update');
      tx(db, (t) => {
        requireAgency(t, agencyId);
        const row = getTerms(t, agencyId, termsId);
        if (!row) throw new NotFoundError('No such contract terms.');
        // terms whose period has ended are history: claims were valued with them
        const day = todayFor(t, clock, ctx.user.organisationId);
        if (row.effectiveTo !== null && row.effectiveTo < day) {
          throw new ConflictError(`These contract terms ended on ${row.effectiveTo} and are read-only; record new terms instead.`, 'terms_expired');
        }
        const next = { ...row, ...Object.fromEntries(Object.entries(body).filter(([, v]) => v !== undefined)) } as AgencyTerms;
        if (next.effectiveTo !== null && next.effectiveTo < next.effectiveFrom) {
          throw new AppError(400, 'validation_failed', 'Some fields need attention.', { effectiveTo: reversedRangeMessage('end date', next.effectiveTo, 'start date', next.effectiveFrom) });
        }
        const other = overlappingTerms(t, agencyId, next.effectiveFrom, next.effectiveTo, termsId);
        if (other) throw overlapError(other);
        const changes: Record<string, unknown> = {};
        for (const [k, v] of Object.entries(body)) if (v !== undefined && row[k as keyof AgencyTerms] !== v) changes[k] = { from: row[k as keyof AgencyTerms], to: v };
        if (Object.keys(changes).length === 0) return;
        t.update(agencyTerms).set(body).where(eq(agencyTerms.id, termsId)).run();
        audit(t, ctx, 'contract_terms.update', 'ContractTerms', termsId, ip, { agencyId, ...changes });
      });
      return getTerms(db, agencyId, termsId) as ContractTermsItem;
    },
  };
}

export type AgenciesService = ReturnType<typeof createAgenciesService>;
