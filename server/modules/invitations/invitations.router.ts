import { Router } from 'express';
import type { AppDeps } from '../../lib/deps';
import { requireCtx } from '../../lib/context';
import { requireUser } from '../../middleware/authenticate';
import { parseBody } from '../../middleware/validate';
import { clientAddress } from '../../middleware/rate-limit';
import { acceptInvitationSchema, inviteBodySchema, previewInvitationSchema } from '@shared/schemas/admin';
import { requireUserAdmin, roleRefusal, scopeRoles, type UserScope } from '../agency/users.service';
import { createInvitationsService } from './invitations.service';

/**
 * /api/invitations: admins invite people to their own organisation, resend and revoke; the
 * invitee (signed out) previews and accepts with the one-time token from the e-mail.
 */
export function invitationsRouter(deps: AppDeps): Router {
  const service = createInvitationsService(deps);
  const r = Router();

  r.post('/preview', (req, res) => {
    const body = parseBody(previewInvitationSchema, req.body);
    res.json(service.preview(body.token, clientAddress(req)));
  });

  r.post('/accept', (req, res) => {
    const body = parseBody(acceptInvitationSchema, req.body);
    res.status(201).json(service.accept(body, clientAddress(req)));
  });

  r.use(requireUser);

  r.get('/', (req, res) => {
    res.json({ items: service.listOpen(requireCtx(req)) });
  });

  r.post('/', (req, res) => {
    const ctx = requireCtx(req);
    const scope: UserScope = ctx.user.organisationKind;
    requireUserAdmin(ctx, scope);
    const body = parseBody(inviteBodySchema, req.body);
    if (!scopeRoles[scope].includes(body.role)) throw roleRefusal(scope);
    res.status(201).json(service.invite(ctx, { organisationId: ctx.user.organisationId, role: body.role, email: body.email }, clientAddress(req)));
  });

  r.post('/:id/resend', (req, res) => {
    res.json(service.resend(requireCtx(req), req.params.id, clientAddress(req)));
  });

  r.post('/:id/revoke', (req, res) => {
    res.json(service.revoke(requireCtx(req), req.params.id, clientAddress(req)));
  });

  r.delete('/:id', (req, res) => {
    res.json(service.revoke(requireCtx(req), req.params.id, clientAddress(req)));
  });

  return r;
}
