import { Router } from 'express';
import { asc, eq } from 'drizzle-orm';
import { productFamilies } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import { requireCtx, type RequestContext } from '../../lib/context';
import { ForbiddenError, NotFoundError } from '../../lib/errors';
import { requireUser } from '../../middleware/authenticate';
import { parseBody, parseQuery } from '../../middleware/validate';
import { clientAddress } from '../../middleware/rate-limit';
import { bodyHas, requireRecentAuth } from '../../middleware/require-recent-auth';
import {
  certificationListQuerySchema,
  createCertificationSchema,
  inviteBodySchema,
  postalCodeSchema,
  revokeCertificationSchema,
  updateAgencyProfileSchema,
  updateCertificationSchema,
  updateUserSchema,
} from '@shared/schemas/admin';
import { createInvitationsService } from '../invitations/invitations.service';
import { createUsersService, requireUserAdmin, roleRefusal, scopeRoles } from './users.service';
import { createAgencyService } from './agency.service';
import { lookupPostalCode } from './postal-code.service';

function mayWrite(ctx: RequestContext, action: 'create' | 'update'): void {
  if (ctx.user.organisationKind !== 'agency' || !ctx.ability.can(action, 'Certification')) throw new ForbiddenError('Only an agency admin records certifications.');
}

/** /api/agency: the agency admin's users, certifications and profile. HTTP only. */
export function agencyRouter(deps: AppDeps): Router {
  const usersService = createUsersService(deps);
  const invitations = createInvitationsService(deps);
  const agency = createAgencyService(deps);
  const r = Router();
  r.use(requireUser);

  r.get('/users', (req, res) => {
    res.json({ items: usersService.list(requireCtx(req), 'agency') });
  });

  /** Adding a user is inviting them: they set their own name and password. */
  r.post('/users', (req, res) => {
    const ctx = requireCtx(req);
    requireUserAdmin(ctx, 'agency');
    const body = parseBody(inviteBodySchema, req.body);
    if (!scopeRoles.agency.includes(body.role)) throw roleRefusal('agency');
    res.status(201).json(invitations.invite(ctx, { organisationId: ctx.user.organisationId, role: body.role, email: body.email }, clientAddress(req)));
  });

  // A role change needs a sign-in or second factor within the last 5 minutes.
  r.patch('/users/:id', requireRecentAuth(deps.clock, (req) => requireCtx(req).user.role === 'agency_admin' && bodyHas('role')(req)), (req, res) => {
    const ctx = requireCtx(req);
    requireUserAdmin(ctx, 'agency');
    const body = parseBody(updateUserSchema, req.body);
    res.json(usersService.update(ctx, 'agency', String(req.params.id), body, clientAddress(req)));
  });

  r.get('/certifications', (req, res) => {
    const q = parseQuery(certificationListQuerySchema, req.query);
    res.json({ items: agency.listCertifications(requireCtx(req), q) });
  });

  r.get('/certifications/expiring', (req, res) => {
    res.json({ items: agency.expiring(requireCtx(req)) });
  });

  r.post('/certifications', (req, res) => {
    mayWrite(requireCtx(req), 'create');
    const body = parseBody(createCertificationSchema, req.body);
    res.status(201).json(agency.createCertification(requireCtx(req), body, clientAddress(req)));
  });

  r.patch('/certifications/:id', (req, res) => {
    mayWrite(requireCtx(req), 'update');
    const body = parseBody(updateCertificationSchema, req.body);
    res.json(agency.updateCertification(requireCtx(req), req.params.id, body, clientAddress(req)));
  });

  /** Revoking keeps the certificate on file, marked revoked with the reason; it no longer counts. */
  r.post('/certifications/:id/revocation', (req, res) => {
    mayWrite(requireCtx(req), 'update');
    const body = parseBody(revokeCertificationSchema, req.body);
    res.json(agency.revokeCertification(requireCtx(req), req.params.id, body, clientAddress(req)));
  });

  /** Product families to certify technicians for (the catalogue's active ones). */
  r.get('/families', (req, res) => {
    const ctx = requireCtx(req);
    if (ctx.user.organisationKind !== 'agency' || !ctx.ability.can('read', 'Catalog')) throw new ForbiddenError();
    const items = deps.db
      .select({ id: productFamilies.id, code: productFamilies.code, name: productFamilies.name })
      .from(productFamilies)
      .where(eq(productFamilies.active, true))
      .orderBy(asc(productFamilies.code))
      .all();
    res.json({ items });
  });

  r.get('/profile', (req, res) => {
    res.json(agency.getProfile(requireCtx(req)));
  });

  r.patch('/profile', (req, res) => {
    const ctx = requireCtx(req);
    if (ctx.user.organisationKind !== 'agency' || !ctx.ability.can('update', 'Agency')) throw new ForbiddenError('Only an agency admin edits the agency profile.');
    const body = parseBody(updateAgencyProfileSchema, req.body);
    res.json(agency.updateProfile(requireCtx(req), body, clientAddress(req)));
  });

  return r;
}

/** /api/postal-codes/:code: the offline postal-code lookup behind address forms. */
export function postalCodesRouter(): Router {
  const r = Router();
  r.use(requireUser);
  r.get('/:code', (req, res) => {
    const code = parseBody(postalCodeSchema, req.params.code);
    const hit = lookupPostalCode(code);
    if (!hit) throw new NotFoundError('This postal code is not in the lookup table. Enter the coordinates by hand.');
    res.json(hit);
  });
  return r;
}
