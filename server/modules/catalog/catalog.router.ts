import { Router, type Request } from 'express';
import type { AppDeps } from '../../lib/deps';
import { requireCtx } from '../../lib/context';
import { ForbiddenError } from '../../lib/errors';
import { requireUser } from '../../middleware/authenticate';
import { parseQuery } from '../../middleware/validate';
import { catalogQuerySchema } from '@shared/schemas/catalog';
import { listModels, listParts, listRepairCodes, type CatalogFilter } from './catalog.queries';

/**
 * /api/catalog: models, parts and repair codes, read by every role allowed to read the
 * catalogue. Inactive entries are listed only to those who manage it.
 */
export function catalogRouter(deps: AppDeps): Router {
  const r = Router();
  r.use(requireUser);
  const filter = (req: Request): CatalogFilter => {
    const { ability } = requireCtx(req);
    if (!ability.can('read', 'Catalog')) throw new ForbiddenError('You may not read the catalogue.');
    const q = parseQuery(catalogQuerySchema, req.query);
    return { family: q.family, includeInactive: ability.can('manage', 'Catalog') };
  };
  r.get('/models', (req, res) => {
    res.json({ items: listModels(deps.db, filter(req)) });
  });
  r.get('/parts', (req, res) => {
    res.json({ items: listParts(deps.db, filter(req)) });
  });
  r.get('/repair-codes', (req, res) => {
    res.json({ items: listRepairCodes(deps.db, filter(req)) });
  });
  return r;
}
