import { Router } from 'express';
import { eq } from 'drizzle-orm';
import type { AppDeps } from '../../lib/deps';
import { parts, repairCodes } from '../../db/schema/index';
import { requireCtx } from '../../lib/context';
import { ForbiddenError, NotFoundError } from '../../lib/errors';
import { requireUser } from '../../middleware/authenticate';
import { parseBody, parseQuery } from '../../middleware/validate';
import { bodyHas, requireRecentAuth } from '../../middleware/require-recent-auth';
import { clientAddress } from '../../middleware/rate-limit';
import {
  createAgencySchema,
  createFamilySchema,
  createModelSchema,
  createPartSchema,
  createReadingSpecSchema,
  createRepairCodeSchema,
  createTermsSchema,
  inviteAgencyAdminSchema,
  inviteBodySchema,
  updateAgencySchema,
  updateFamilySchema,
  updateModelSchema,
  updatePartSchema,
  updateReadingSpecSchema,
  updateRepairCodeSchema,
  updateTermsSchema,
  updateUserSchema,
} from '@shared/schemas/admin';
import { createInvitationsService } from '../invitations/invitations.service';
import { createUsersService, requireUserAdmin, roleRefusal, scopeRoles } from '../agency/users.service';
import { createCatalogService } from './catalog.service';
import { createAgenciesService } from './agencies.service';
import { allowanceHistory, priceHistory } from './catalog.queries';
import { createApprovalLimitsService } from './approval-limits.service';
import { approvalLimitSchema } from '@shared/schemas/approval-limits';
import { createMileageRateSchema, endMileageRateSchema, mileageRatesQuerySchema } from '@shared/schemas/mileage-rates';
import { createMileageRatesService } from './mileage-rates.service';

/** /api/admin: the manufacturer admin's catalogue, agencies and contract terms, and manufacturer users. */
export function adminRouter(deps: AppDeps): Router {
  const catalog = createCatalogService(deps);
  const invitations = createInvitationsService(deps);
  const agencies = createAgenciesService(deps, invitations);
  const usersService = createUsersService(deps);
  const limits = createApprovalLimitsService(deps);
  const mileage = createMileageRatesService(deps);
  const r = Router();
  r.use(requireUser);
  // Everything here is the manufacturer admin's: refuse others before reading any body.
  r.use((req, _res, next) => {
    const ctx = requireCtx(req);
    if (ctx.user.organisationKind !== 'manufacturer' || !ctx.ability.can('update', 'Catalog') || !ctx.ability.can('create', 'Agency')) {
      throw new ForbiddenError('Only a manufacturer admin may do this.');
    }
    next();
  });
  const ip = clientAddress;
  // Prices, allowances, contract terms and roles: a sign-in or second factor within the last 5 minutes.
  const stepUp = requireRecentAuth(deps.clock);
  const stepUpFor = (...fields: string[]) => requireRecentAuth(deps.clock, bodyHas(...fields));

  // ---------------------------------------------------------------- catalogue
  r.get('/families', (req, res) => {
    res.json({ items: catalog.listFamilies(requireCtx(req)) });
  });
  r.post('/families', (req, res) => {
    const ctx = requireCtx(req);
    res.status(201).json(catalog.createFamily(ctx, parseBody(createFamilySchema, req.body), ip(req)));
  });
  r.patch('/families/:id', (req, res) => {
    const ctx = requireCtx(req);
    res.json(catalog.updateFamily(ctx, req.params.id, parseBody(updateFamilySchema, req.body), ip(req)));
  });

  r.get('/models', (req, res) => {
    res.json({ items: catalog.listModels(requireCtx(req)) });
  });
  r.post('/models', (req, res) => {
    const ctx = requireCtx(req);
    res.status(201).json(catalog.createModel(ctx, parseBody(createModelSchema, req.body), ip(req)));
  });
  r.patch('/models/:id', (req, res) => {
    const ctx = requireCtx(req);
    res.json(catalog.updateModel(ctx, req.params.id, parseBody(updateModelSchema, req.body), ip(req)));
  });
  r.post('/models/:id/reading-specs', (req, res) => {
    const ctx = requireCtx(req);
    res.status(201).json(catalog.createReadingSpec(ctx, req.params.id, parseBody(createReadingSpecSchema, req.body), ip(req)));
  });
  r.patch('/models/:id/reading-specs/:specId', (req, res) => {
    const ctx = requireCtx(req);
    res.json(catalog.updateReadingSpec(ctx, req.params.id, req.params.specId, parseBody(updateReadingSpecSchema, req.body), ip(req)));
  });
  r.delete('/models/:id/reading-specs/:specId', (req, res) => {
    catalog.deleteReadingSpec(requireCtx(req), req.params.id, req.params.specId, ip(req));
    res.status(204).end();
  });

  r.get('/parts', (req, res) => {
    res.json({ items: catalog.listParts(requireCtx(req)) });
  });
  r.post('/parts', (req, res) => {
    const ctx = requireCtx(req);
    res.status(201).json(catalog.createPart(ctx, parseBody(createPartSchema, req.body), ip(req)));
  });
  r.patch('/parts/:id', stepUpFor('listPriceCents', 'priceEffectiveFrom'), (req, res) => {
    const ctx = requireCtx(req);
    res.json(catalog.updatePart(ctx, String(req.params.id), parseBody(updatePartSchema, req.body), ip(req)));
  });
  r.get('/parts/:id/prices', (req, res) => {
    const ctx = requireCtx(req);
    catalog.listFamilies(ctx); // same guard as every catalogue read
    if (!deps.db.select({ id: parts.id }).from(parts).where(eq(parts.id, req.params.id)).get()) throw new NotFoundError('No such part.');
    res.json({ items: priceHistory(deps.db, req.params.id) });
  });

  r.get('/repair-codes', (req, res) => {
    res.json({ items: catalog.listRepairCodes(requireCtx(req)) });
  });
  r.post('/repair-codes', (req, res) => {
    const ctx = requireCtx(req);
    res.status(201).json(catalog.createRepairCode(ctx, parseBody(createRepairCodeSchema, req.body), ip(req)));
  });
  r.patch('/repair-codes/:id', stepUpFor('allowedHours', 'allowanceEffectiveFrom'), (req, res) => {
    const ctx = requireCtx(req);
    res.json(catalog.updateRepairCode(ctx, String(req.params.id), parseBody(updateRepairCodeSchema, req.body), ip(req)));
  });
  r.get('/repair-codes/:id/allowances', (req, res) => {
    const ctx = requireCtx(req);
    catalog.listFamilies(ctx);
    if (!deps.db.select({ id: repairCodes.id }).from(repairCodes).where(eq(repairCodes.id, req.params.id)).get()) throw new NotFoundError('No such repair code.');
    res.json({ items: allowanceHistory(deps.db, req.params.id) });
  });

  // ---------------------------------------------------------------- mileage rates (money rules: step-up on writes)
  r.get('/mileage-rates', (req, res) => {
    res.json(mileage.list(requireCtx(req), parseQuery(mileageRatesQuerySchema, req.query)));
  });
  r.post('/mileage-rates', stepUp, (req, res) => {
    const ctx = requireCtx(req);
    res.status(201).json(mileage.create(ctx, parseBody(createMileageRateSchema, req.body), ip(req)));
  });
  r.patch('/mileage-rates/:id', stepUp, (req, res) => {
    const ctx = requireCtx(req);
    res.json(mileage.end(ctx, String(req.params.id), parseBody(endMileageRateSchema, req.body), ip(req)));
  });

  // ---------------------------------------------------------------- agencies and contract terms
  r.get('/agencies', (req, res) => {
    res.json({ items: agencies.list(requireCtx(req)) });
  });
  r.post('/agencies', (req, res) => {
    const ctx = requireCtx(req);
    res.status(201).json(agencies.create(ctx, parseBody(createAgencySchema, req.body), ip(req)));
  });
  r.get('/agencies/:id', (req, res) => {
    res.json(agencies.get(requireCtx(req), req.params.id));
  });
  r.patch('/agencies/:id', (req, res) => {
    const ctx = requireCtx(req);
    res.json(agencies.update(ctx, req.params.id, parseBody(updateAgencySchema, req.body), ip(req)));
  });
  r.post('/agencies/:id/admin-invitation', (req, res) => {
    const ctx = requireCtx(req);
    const body = parseBody(inviteAgencyAdminSchema, req.body);
    res.status(201).json(agencies.inviteAdmin(ctx, req.params.id, body.email, ip(req)));
  });
  r.get('/agencies/:id/terms', (req, res) => {
    res.json({ items: agencies.listTerms(requireCtx(req), req.params.id) });
  });
  r.post('/agencies/:id/terms', stepUp, (req, res) => {
    const ctx = requireCtx(req);
    res.status(201).json(agencies.createTerms(ctx, String(req.params.id), parseBody(createTermsSchema, req.body), ip(req)));
  });
  r.patch('/agencies/:id/terms/:termsId', stepUp, (req, res) => {
    const ctx = requireCtx(req);
    res.json(agencies.updateTerms(ctx, String(req.params.id), String(req.params.termsId), parseBody(updateTermsSchema, req.body), ip(req)));
  });

  // ---------------------------------------------------------------- manufacturer users
  r.get('/users', (req, res) => {
    res.json({ items: usersService.list(requireCtx(req), 'manufacturer') });
  });
  r.post('/users', (req, res) => {
    const ctx = requireCtx(req);
    requireUserAdmin(ctx, 'manufacturer');
    const body = parseBody(inviteBodySchema, req.body);
    if (!scopeRoles.manufacturer.includes(body.role)) throw roleRefusal('manufacturer');
    res.status(201).json(invitations.invite(ctx, { organisationId: ctx.user.organisationId, role: body.role, email: body.email }, ip(req)));
  });
  r.patch('/users/:id', stepUpFor('role'), (req, res) => {
    const ctx = requireCtx(req);
    requireUserAdmin(ctx, 'manufacturer');
    res.json(usersService.update(ctx, 'manufacturer', String(req.params.id), parseBody(updateUserSchema, req.body), ip(req)));
  });

  // ---------------------------------------------------------------- reviewers' approval limits
  r.get('/approval-limits', (req, res) => {
    res.json({ items: limits.list(requireCtx(req)) });
  });
  r.patch('/approval-limits/:userId', (req, res) => {
    const ctx = requireCtx(req);
    res.json(limits.set(ctx, req.params.userId, parseBody(approvalLimitSchema, req.body), ip(req)));
  });

  return r;
}
