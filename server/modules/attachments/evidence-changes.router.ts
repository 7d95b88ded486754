import { Router } from 'express';
import type { AppDeps } from '../../lib/deps';
import { requireCtx } from '../../lib/context';
import { NotFoundError } from '../../lib/errors';
import { requireUser } from '../../middleware/authenticate';
import { parseBody } from '../../middleware/validate';
import { clientAddress } from '../../middleware/rate-limit';
import { storageFor } from '../../lib/storage/create-storage';
import type { Storage } from '../../lib/storage/storage';
import { relabelAttachmentSchema, retractAttachmentSchema } from '@shared/schemas/evidence-changes';
import { createEvidenceChangesService } from './evidence-changes.service';

const ROUTE_ID = /^[A-Za-z0-9_-]{1,64}$/;

/** Relabel, delete and retract evidence already attached to a claim. */
export function evidenceChangesRouter(deps: AppDeps, opts: { storage?: Storage } = {}): Router {
  const service = createEvidenceChangesService(deps, opts.storage ?? storageFor(deps.env));
  const r = Router();
  r.use('/attachments/:id', requireUser, (req, _res, next) => {
    if (!ROUTE_ID.test(String(req.params.id))) throw new NotFoundError('No such attachment.');
    next();
  });
  r.patch('/attachments/:id', (req, res) => {
    res.json(service.relabel(requireCtx(req), String(req.params.id), parseBody(relabelAttachmentSchema, req.body), clientAddress(req)));
  });
  r.delete('/attachments/:id', async (req, res) => {
    await service.remove(requireCtx(req), String(req.params.id), clientAddress(req));
    res.status(204).end();
  });
  r.post('/attachments/:id/retraction', (req, res) => {
    res.json(service.retract(requireCtx(req), String(req.params.id), parseBody(retractAttachmentSchema, req.body), clientAddress(req)));
  });
  return r;
}
