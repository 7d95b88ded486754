import { Router } from 'express';
import type { AppDeps } from '../../lib/deps';
import { requireCtx } from '../../lib/context';
import { requireUser } from '../../middleware/authenticate';
import { limitUnitLookups } from '../../middleware/rate-limit';
import { parseQuery } from '../../middleware/validate';
import { unitLookupQuerySchema } from '@shared/schemas/unit';
import { createUnitsService } from './units.service';

/** /api/units/:serial?on=YYYY-MM-DD: the unit, its model, its coverage on that date, its prior claims. */
export function unitsRouter(deps: AppDeps): Router {
  const service = createUnitsService(deps);
  const r = Router();
  r.use(requireUser);
  // Serial numbers are guessable: look-ups are throttled per user (429 with Retry-After).
  r.get('/:serial', limitUnitLookups(deps), (req, res) => {
    const q = parseQuery(unitLookupQuerySchema, req.query);
    res.json(service.lookup(requireCtx(req), String(req.params.serial), q.on));
  });
  return r;
}
