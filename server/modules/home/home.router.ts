import { Router } from 'express';
import type { AppDeps } from '../../lib/deps';
import { requireCtx } from '../../lib/context';
import { requireUser } from '../../middleware/authenticate';
import { createHomeService } from './home.service';

/** /api/home: the signed-in person's queues. */
export function homeRouter(deps: AppDeps): Router {
  const service = createHomeService(deps);
  const r = Router();
  r.get('/', requireUser, (req, res) => {
    res.json(service.home(requireCtx(req)));
  });
  return r;
}
