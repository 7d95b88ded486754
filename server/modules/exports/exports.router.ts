import { Router, type Request } from 'express';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { stringify } from 'csv-stringify';
import type { AppDeps } from '../../lib/deps';
import { requireCtx } from '../../lib/context';
import { requireUser } from '../../middleware/authenticate';
import { parseQuery } from '../../middleware/validate';
import { paidClaimsExportQuerySchema } from '@shared/schemas/payment';
import { createExportsService } from './exports.service';
import { csvOptions, paidClaimRecord, type PaidClaimRow } from './paid-claims.csv';

function* records(rows: Iterable<PaidClaimRow>): Generator<string[]> {
  for (const r of rows) yield paidClaimRecord(r);
}

/**
 * /api/exports: GET /paid-claims.csv?from=&to=&agency= streams the CSV. The database iterator
 * feeds csv-stringify through a pull stream (Readable.from) piped to the response: a row is
 * read only when the socket has taken the ones before it, so memory stays flat whatever the
 * size of the export. X-Total-Rows tells the client how many records to expect.
 */
export function exportsRouter(deps: AppDeps): Router {
  const service = createExportsService(deps);
  const r = Router();
  r.use(requireUser);
  const actor = (req: Request) => ({ ctx: requireCtx(req), ip: req.ip ?? null });

  r.get('/paid-claims.csv', async (req, res) => {
    const prepared = service.prepare(actor(req), parseQuery(paidClaimsExportQuerySchema, req.query));
    const cursor = prepared.open();
    try {
      res.status(200);
      res.setHeader('Content-Type', 'text/csv; charset=utf-8');
      res.setHeader('Content-Disposition', `attachment; filename="${prepared.filename}"`);
      res.setHeader('X-Total-Rows', String(cursor.total));
      await pipeline(Readable.from(records(cursor.rows), { objectMode: true, highWaterMark: 64 }), stringify(csvOptions), res);
    } catch (e) {
      // A client that goes away mid-download only ends the export; anything else before the
      // first byte is an ordinary error answer.
      const code = (e as { code?: string }).code;
      if (code === 'ERR_STREAM_PREMATURE_CLOSE' || req.destroyed) return;
      if (!res.headersSent) {
        res.removeHeader('Content-Disposition');
        res.removeHeader('X-Total-Rows');
        throw e;
      }
      res.destroy(e as Error);
    } finally {
      cursor.close();
    }
  });

  return r;
}
