import { Router, type RequestHandler } from 'express';
import multer, { MulterError } from 'multer';
import type { AppDeps } from '../../lib/deps';
import { requireCtx } from '../../lib/context';
import { requireUser } from '../../middleware/authenticate';
import { clientAddress, limitUploads } from '../../middleware/rate-limit';
import { NotFoundError, PayloadTooLargeError, UnsupportedMediaTypeError, ValidationError } from '../../lib/errors';
import { storageFor } from '../../lib/storage/create-storage';
import type { Storage } from '../../lib/storage/storage';
import { checkOriginalName, extensionOf } from '../../lib/photo/file-name';
import { findReadableClaim } from '../claims/claims.queries';
import { createAttachmentsService, type UploadLimits } from '../attachments/attachments.service';
import { isMalformedMultipart } from '../attachments/attachments.router';
import { claimReadingsReport, createReadingsService, CsvImportRefused } from './readings.service';

/** A readings sheet is small: 1 MB is thousands of rows more than a sheet has. */
export const MAX_SHEET_BYTES = 1024 * 1024;

const ROUTE_ID = /^[A-Za-z0-9-]{1,64}$/;

export function readingsRouter(deps: AppDeps, opts: { storage?: Storage; limits?: UploadLimits } = {}): Router {
  const storage = opts.storage ?? storageFor(deps.env);
  const attachments = createAttachmentsService(deps, storage, opts.limits);
  const service = createReadingsService(deps, attachments);
  const r = Router();
  const parser = multer({
    storage: multer.memoryStorage(),
    preservePath: true,
    defParamCharset: 'utf8',
    limits: { fileSize: MAX_SHEET_BYTES, files: 1, fields: 4, parts: 5, fieldNameSize: 40, fieldSize: 200, headerPairs: 20 },
    fileFilter(_req, file, cb) {
      try {
        if (file.fieldname !== 'file') throw new ValidationError('Send the readings sheet in the field "file".', { file: 'Unexpected file field.' });
        const name = checkOriginalName(file.originalname);
        if (extensionOf(name) !== 'csv') throw new UnsupportedMediaTypeError('A readings sheet must be a .csv file with the columns key, phase, value, unit.');
        cb(null, true);
      } catch (e) {
        cb(e as Error);
      }
    },
  }).any();

  const validId: RequestHandler = (req, _res, next) => {
    if (!ROUTE_ID.test(String(req.params.id))) throw new NotFoundError();
    next();
  };

  r.get('/claims/:id/readings', requireUser, validId, (req, res) => {
    const ctx = requireCtx(req);
    const claim = findReadableClaim(deps.db, ctx.ability, String(req.params.id));
    if (!claim) throw new NotFoundError('No such claim.');
    res.json(claimReadingsReport(deps.db, claim));
  });

  // limitUploads: upload requests per user and minute (429 with Retry-After).
  r.post('/claims/:id/readings/import', requireUser, limitUploads(deps), validId, async (req, res) => {
    const ctx = requireCtx(req);
    const claimId = String(req.params.id);
    const ip = clientAddress(req);
    try {
      attachments.uploadableClaim(ctx, claimId, 'update');
      if (!req.is('multipart/form-data')) throw new UnsupportedMediaTypeError('Send the readings sheet as multipart/form-data in the field "file".');
      const files = await new Promise<Express.Multer.File[]>((resolve, reject) =>
        parser(req, res, (err?: unknown) => {
          if (!err) return resolve((req.files as Express.Multer.File[] | undefined) ?? []);
          if (isMalformedMultipart(err)) return reject(new ValidationError('The upload is malformed: a part header could not be read.'));
          if (err instanceof MulterError) {
            if (err.code === 'LIMIT_FILE_SIZE') return reject(new PayloadTooLargeError('A readings sheet may be at most 1 MB.'));
            if (err.code === 'LIMIT_FILE_COUNT') return reject(new PayloadTooLargeError('Import one readings sheet at a time.'));
            return reject(new ValidationError('The upload could not be read.'));
          }
          reject(err);
        }),
      );
      if (files.length !== 1) throw new ValidationError('Attach the readings sheet in the field "file".', { file: 'No file was sent.' });
      const keep = String((req.body as Record<string, unknown>)?.keepSheet ?? 'true') !== 'false';
      const result = await service.importCsv(ctx, claimId, { originalName: checkOriginalName(files[0].originalname), buffer: files[0].buffer }, ip, keep);
      res.status(200).json(result);
    } catch (e) {
      attachments.auditFailure(ctx, claimId, e, ip, 'readings.import');
      if (!req.readableEnded) req.resume();
      if (e instanceof CsvImportRefused) {
        res.status(400).json({ error: { code: e.code, message: e.message, fields: e.fields }, errors: e.errors });
        return;
      }
      throw e;
    }
  });

  return r;
}
