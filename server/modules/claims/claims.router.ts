import { Router } from 'express';
import type { AppDeps } from '../../lib/deps';
import { requireCtx } from '../../lib/context';
import { requireUser } from '../../middleware/authenticate';
import { parseBody, parseQuery } from '../../middleware/validate';
import { claimListQuerySchema, createClaimSchema, updateClaimSchema } from '@shared/schemas/claim';
import { adjustmentsSchema, commentSchema, takeOverSchema, transitionSchema } from '@shared/workflow/workflow-schemas';
import { createClaimsService } from './claims.service';

/** /api/claims: HTTP only; the rules live in the service. */
export function claimsRouter(deps: AppDeps): Router {
  const service = createClaimsService(deps);
  const r = Router();
  r.use(requireUser);
  const actor = (req: Parameters<typeof requireCtx>[0]) => ({ ctx: requireCtx(req), ip: req.ip ?? null });

  r.get('/', (req, res) => {
    res.json(service.list(actor(req), parseQuery(claimListQuerySchema, req.query)));
  });

  r.post('/', (req, res) => {
    res.status(201).json(service.create(actor(req), parseBody(createClaimSchema, req.body)));
  });

  r.get('/:id', (req, res) => {
    res.json(service.get(actor(req), req.params.id));
  });

  r.get('/:id/unit-claims', (req, res) => {
    res.json(service.unitClaims(actor(req), req.params.id));
  });

  r.get('/:id/changes', (req, res) => {
    res.json(service.submissionChanges(actor(req), req.params.id));
  });

  r.patch('/:id', (req, res) => {
    res.json(service.update(actor(req), req.params.id, parseBody(updateClaimSchema, req.body)));
  });

  r.post('/:id/transitions', (req, res) => {
    res.json(service.transition(actor(req), req.params.id, parseBody(transitionSchema, req.body)));
  });

  r.post('/:id/adjustments', (req, res) => {
    res.json(service.adjust(actor(req), req.params.id, parseBody(adjustmentsSchema, req.body)));
  });

  r.post('/:id/take-over', (req, res) => {
    res.json(service.takeOver(actor(req), req.params.id, parseBody(takeOverSchema, req.body)));
  });

  r.get('/:id/valuation', (req, res) => {
    res.json(service.valuation(actor(req), req.params.id));
  });

  r.get('/:id/valuation-input', (req, res) => {
    res.json(service.valuationBasis(actor(req), req.params.id));
  });

  r.post('/:id/comments', (req, res) => {
    res.status(201).json(service.comment(actor(req), req.params.id, parseBody(commentSchema, req.body)));
  });

  return r;
}
