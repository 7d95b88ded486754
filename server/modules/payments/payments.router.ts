import { Router, type Request } from 'express';
import type { AppDeps } from '../../lib/deps';
import { requireCtx } from '../../lib/context';
import { requireUser } from '../../middleware/authenticate';
import { parseBody, parseQuery } from '../../middleware/validate';
import { requireRecentAuth } from '../../middleware/require-recent-auth';
import { createPaymentRunSchema, markPaidSchema, paymentRunListQuerySchema } from '@shared/schemas/payment';
import { createPaymentsService } from './payments.service';

/** /api/payment-runs: HTTP only; the rules live in the service. */
export function paymentsRouter(deps: AppDeps): Router {
  const service = createPaymentsService(deps);
  const r = Router();
  r.use(requireUser);
  const actor = (req: Request) => ({ ctx: requireCtx(req), ip: req.ip ?? null });
  // Money leaves the manufacturer: a sign-in or second factor within the last 5 minutes, for the roles that may pay at all.
  const stepUp = requireRecentAuth(deps.clock, (req) => requireCtx(req).ability.can('update', 'PaymentRun'));

  r.get('/ready', (req, res) => {
    res.json(service.ready(actor(req)));
  });
  r.get('/', (req, res) => {
    res.json(service.list(actor(req), parseQuery(paymentRunListQuerySchema, req.query)));
  });
  r.post('/', (req, res) => {
    res.status(201).json(service.create(actor(req), parseBody(createPaymentRunSchema, req.body)));
  });
  r.get('/:id', (req, res) => {
    res.json(service.get(actor(req), String(req.params.id)));
  });
  r.post('/:id/paid', stepUp, (req, res) => {
    res.json(service.markPaid(actor(req), String(req.params.id), parseBody(markPaidSchema, req.body)));
  });
  r.post('/:id/void', stepUp, (req, res) => {
    res.json(service.void(actor(req), String(req.params.id)));
  });
  return r;
}
