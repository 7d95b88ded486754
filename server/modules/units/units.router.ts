import { Router } from 'express';
import type { AppDeps } from '../../lib/deps';
import { requireCtx } from '../../lib/context';
import { requireUser } from '../../middleware/authenticate';
import { parseQuery } from '../../middleware/validate';
import { unitLookupQuerySchema } from '@shared/schemas/unit';
import { createUnitsService } from './units.service';

/** /api/units/:serial?on=YYYY-MM-DD: the unit, its model, its coverage on that date, its prior claims. */
export function unitsRouter(deps: AppDeps): Router {
  const service = createUnitsService(deps);
  const r = Router();
  r.use(requireUser);
  r.get('/:serial', (req, res) => {
    const q = parseQuery(unitLookupQuerySchema, req.query);
    res.json(service.lookup(requireCtx(req), req.params.serial, q.on));
  });
  return r;
}
