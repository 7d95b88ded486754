import { Router, type Request } from 'express';
import type { AppDeps } from '../../lib/deps';
import { requireCtx } from '../../lib/context';
import { requireUser } from '../../middleware/authenticate';
import { parseBody } from '../../middleware/validate';
import { receiptSchema, shipmentSchema, waiverSchema } from '@shared/schemas/payment';
import { createPartReturnsService } from './part-returns.service';

/** /api/claims/:id/part-returns: HTTP only; the rules live in the service. */
export function partReturnsRouter(deps: AppDeps): Router {
  const service = createPartReturnsService(deps);
  const r = Router();
  const actor = (req: Request) => ({ ctx: requireCtx(req), ip: req.ip ?? null });
  const base = '/claims/:id/part-returns';

  r.get(base, requireUser, (req, res) => {
    res.json(service.get(actor(req), String(req.params.id)));
  });
  r.post(`${base}/:lineId/shipment`, requireUser, (req, res) => {
    res.json(service.ship(actor(req), String(req.params.id), String(req.params.lineId), parseBody(shipmentSchema, req.body)));
  });
  r.post(`${base}/:lineId/receipt`, requireUser, (req, res) => {
    res.json(service.receive(actor(req), String(req.params.id), String(req.params.lineId), parseBody(receiptSchema, req.body)));
  });
  r.post(`${base}/:lineId/waiver`, requireUser, (req, res) => {
    res.json(service.waive(actor(req), String(req.params.id), String(req.params.lineId), parseBody(waiverSchema, req.body)));
  });
  return r;
}
