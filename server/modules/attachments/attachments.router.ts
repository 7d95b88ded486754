import { Router, type Request, type RequestHandler, type Response } from 'express';
import multer, { MulterError } from 'multer';
import sharp from 'sharp';
import type { AppDeps } from '../../lib/deps';
import { requireCtx } from '../../lib/context';
import { requireUser } from '../../middleware/authenticate';
import { clientAddress, limitUploads } from '../../middleware/rate-limit';
import { NotFoundError, PayloadTooLargeError, UnsupportedMediaTypeError, ValidationError } from '../../lib/errors';
import { writeAudit } from '../../lib/audit';
import { storageFor } from '../../lib/storage/create-storage';
import { removeTempFiles, tempFileStorage, uploadTempDir } from '../../lib/storage/upload-temp';
import type { Storage } from '../../lib/storage/storage';
import { checkOriginalName, contentDisposition, extensionOf } from '../../lib/photo/file-name';
import { ALLOWED } from '../../lib/photo/file-check';
import { placeholderThumbnail, PLACEHOLDER_CONTENT_TYPE } from '../../lib/photo/thumbnail';
import { MAX_IMAGE_PIXELS } from '../../lib/photo/intake';
import { attachmentRoles, type AttachmentRole } from '@shared/schemas/claim';
import type { ClaimEvidence } from '@shared/schemas/evidence';
import { findReadableClaim } from '../claims/claims.queries';
import { claimUsage, findReadableAttachment, listReadableAttachments } from './attachments.queries';
import { createAttachmentsService, formatBytes, limitsView, toView, type IncomingFile, type UploadLimits } from './attachments.service';
import { evidenceFlags } from './attachments.flags';
import { createUploadLeases, type UploadLeaseHandle } from './attachments.leases';

const ROUTE_ID = /^[A-Za-z0-9-]{1,64}$/;
/** Longest side of the lightbox preview, in pixels. */
const PREVIEW_SIZE = 1600;

/** Served files never run as a page: no sniffing, a sandbox with nothing allowed, never cached. */
export function setDownloadHeaders(res: Response, contentType: string, disposition: string, size?: number) {
  res.setHeader('Content-Type', contentType);
  res.setHeader('Content-Disposition', disposition);
  res.setHeader('X-Content-Type-Options', 'nosniff');
  res.setHeader('Content-Security-Policy', "sandbox; default-src 'none'; frame-ancestors 'none'");
  res.setHeader('Cross-Origin-Resource-Policy', 'same-origin');
  res.setHeader('Cache-Control', 'private, no-store');
  if (size !== undefined) res.setHeader('Content-Length', String(size));
}

export function isMalformedMultipart(e: unknown): boolean {
  return e instanceof Error && /Malformed part header|Unexpected end of form|Malformed urlencoded|boundary/i.test(e.message);
}

function multerError(e: unknown, limits: UploadLimits): unknown {
  if (e instanceof Error && /^Request aborted$|^Request closed$/i.test(e.message)) {
    return new ValidationError('The upload was interrupted before it was complete.');
  }
  if (isMalformedMultipart(e)) {
    return new ValidationError('The upload is malformed: a part header could not be read. File names with control characters (NUL, CR or LF) are refused.');
  }
  if (!(e instanceof MulterError)) return e;
  switch (e.code) {
    case 'LIMIT_FILE_SIZE':
      return new PayloadTooLargeError(`Each file may be at most ${formatBytes(limits.maxFileBytes)}.`);
    case 'LIMIT_FILE_COUNT':
      return new PayloadTooLargeError(`At most ${limits.maxFilesPerRequest} files can be sent at once.`);
    case 'LIMIT_PART_COUNT':
    case 'LIMIT_FIELD_COUNT':
      return new PayloadTooLargeError('The upload has too many parts.');
    case 'LIMIT_FIELD_VALUE':
    case 'LIMIT_FIELD_KEY':
      return new ValidationError('A form field of the upload is too long.');
    case 'LIMIT_UNEXPECTED_FILE':
      return new ValidationError('Send the files in the field "files".', { files: 'Unexpected file field.' });
    default:
      return new ValidationError('The upload could not be read.');
  }
}

/**
 * Streams the multipart body to temporary files under fixed limits (never whole into memory);
 * maps every failure to a clear 4xx. The caller removes the files with `removeTempFiles(req)`.
 */
function readMultipart(limits: UploadLimits, fileField: string, maxFiles: number, tempDir: string) {
  const parser = multer({
    storage: tempFileStorage(tempDir),
    preservePath: true,
    defParamCharset: 'utf8',
    limits: {
      fileSize: limits.maxFileBytes,
      files: maxFiles,
      fields: 2 * maxFiles + 4,
      parts: 3 * maxFiles + 4,
      fieldNameSize: 40,
      fieldSize: 2000,
      headerPairs: 20,
    },
    fileFilter(_req, file, cb) {
      try {
        if (file.fieldname !== fileField) throw new ValidationError(`Send the files in the field "${fileField}".`, { [fileField]: 'Unexpected file field.' });
        const name = checkOriginalName(file.originalname);
        const ext = extensionOf(name);
        if (!Object.values(ALLOWED).some((a) => a.extensions.includes(ext))) {
          throw new UnsupportedMediaTypeError(`"${name}": this type of file is not accepted. Accepted: JPEG, PNG, WebP or HEIC photos, PDF documents and CSV readings sheets.`);
        }
        cb(null, true);
      } catch (e) {
        cb(e as Error);
      }
    },
  }).any();
  return (req: Request, res: Response) =>
    new Promise<Express.Multer.File[]>((resolve, reject) => {
      if (!req.is('multipart/form-data')) {
        reject(new UnsupportedMediaTypeError('Send the files as multipart/form-data.'));
        return;
      }
      parser(req, res, (err?: unknown) => {
        if (err) reject(multerError(err, limits));
        else resolve((req.files as Express.Multer.File[] | undefined) ?? []);
      });
    });
}

function asList(v: unknown): string[] {
  if (v === undefined || v === null) return [];
  if (Array.isArray(v)) return v.map((x) => String(x));
  return [String(v)];
}

/** Each file's role: `role` or `roles` repeated once per file in order, or once for all. */
export function rolesFor(body: Record<string, unknown>, count: number): AttachmentRole[] {
  const given = [...asList(body.role), ...asList(body.roles), ...asList(body['roles[]'])];
  for (const [i, r] of given.entries()) {
    if (!(attachmentRoles as readonly string[]).includes(r)) {
      throw new ValidationError('Some fields need attention.', { [`roles.${i}`]: `Choose a role: ${attachmentRoles.join(', ')}.` });
    }
  }
  if (given.length === 0) return Array(count).fill('other');
  if (given.length === 1) return Array(count).fill(given[0]);
  if (given.length !== count) throw new ValidationError('Give one role per file, in the order of the files.', { roles: `${given.length} roles for ${count} files.` });
  return given as AttachmentRole[];
}

export function attachmentsRouter(deps: AppDeps, opts: { storage?: Storage; limits?: UploadLimits } = {}): Router {
  const storage = opts.storage ?? storageFor(deps.env);
  const service = createAttachmentsService(deps, storage, opts.limits);
  const { limits } = service;
  const leases = createUploadLeases(deps.db, deps.clock, deps.env.UPLOAD_MAX_CONCURRENT_PER_USER);
  const parseUpload = readMultipart(limits, 'files', limits.maxFilesPerRequest, uploadTempDir(deps.env));
  const r = Router();

  const validId: RequestHandler = (req, _res, next) => {
    if (!ROUTE_ID.test(String(req.params.id))) throw new NotFoundError();
    next();
  };

  r.get('/claims/:id/attachments', requireUser, validId, (req, res) => {
    const ctx = requireCtx(req);
    const claim = findReadableClaim(deps.db, ctx.ability, String(req.params.id));
    if (!claim) throw new NotFoundError('No such claim.');
    const rows = listReadableAttachments(deps.db, ctx.ability, claim.id);
    const manufacturer = ctx.user.organisationKind === 'manufacturer';
    const body: ClaimEvidence = {
      attachments: rows.map(toView),
      flags: evidenceFlags(deps.db, claim.id, { revealOtherAgencies: manufacturer }).map(({ otherClaimId: _o, ...f }) => f),
      limits: limitsView(limits),
      usage: claimUsage(deps.db, claim.id),
    };
    res.json(body);
  });

  // limitUploads: upload requests per user and minute (429 with Retry-After).
  r.post('/claims/:id/attachments', requireUser, limitUploads(deps), validId, async (req, res) => {
    const ctx = requireCtx(req);
    const claimId = String(req.params.id);
    const ip = clientAddress(req);
    let lease: UploadLeaseHandle | null = null;
    try {
      service.uploadableClaim(ctx, claimId);
      const declared = Number(req.get('content-length') ?? 0);
      if (declared > limits.maxFileBytes * limits.maxFilesPerRequest + 64 * 1024) {
        throw new PayloadTooLargeError(`At most ${limits.maxFilesPerRequest} files of up to ${formatBytes(limits.maxFileBytes)} each can be sent at once.`);
      }
      lease = leases.acquire(ctx.user.id);
      const files = await parseUpload(req, res);
      if (files.length === 0) throw new ValidationError('Attach at least one file in the field "files".', { files: 'No file was sent.' });
      const roles = rolesFor(req.body ?? {}, files.length);
      const incoming: IncomingFile[] = files.map((f, i) => ({ originalName: checkOriginalName(f.originalname), path: f.path, role: roles[i] }));
      const views = await service.upload(ctx, claimId, incoming, ip);
      const flags = evidenceFlags(deps.db, claimId, { revealOtherAgencies: false }).filter((f) => views.some((v) => v.id === f.attachmentId));
      res.status(201).json({ attachments: views, flags: flags.map(({ otherClaimId: _o, ...f }) => f) });
    } catch (e) {
      service.auditFailure(ctx, claimId, e, ip);
      if (!req.readableEnded) req.resume();
      throw e;
    } finally {
      await removeTempFiles(req);
      lease?.release();
    }
  });

  r.get('/attachments/:id', requireUser, validId, async (req, res) => {
    const ctx = requireCtx(req);
    const a = findReadableAttachment(deps.db, ctx.ability, String(req.params.id));
    if (!a) throw new NotFoundError();
    const obj = await storage.open(a.storageKey);
    if (!obj) throw new NotFoundError('The file of this attachment is missing from storage.');
    writeAudit(deps.db, deps.clock, {
      actorId: ctx.user.id,
      organisationId: ctx.user.organisationId,
      action: 'attachment.download',
      recordType: 'attachment',
      recordId: a.id,
      outcome: 'success',
      ip: clientAddress(req),
      detail: { claimId: a.claimId },
    });
    setDownloadHeaders(res, a.contentType, contentDisposition(a.originalName, 'attachment'), obj.size);
    obj.stream.on('error', () => res.destroy());
    obj.stream.pipe(res);
  });

  /**
   * The lightbox's view of a photo: always a JPEG re-encoded here (upright, at most 1600 px, no
   * metadata), never the uploaded bytes; a placeholder where no thumbnail could be made.
   */
  r.get('/attachments/:id/preview', requireUser, validId, async (req, res) => {
    const ctx = requireCtx(req);
    const a = findReadableAttachment(deps.db, ctx.ability, String(req.params.id));
    if (!a) throw new NotFoundError();
    const base = a.originalName.replace(/\.[^.]*$/, '');
    const obj = a.thumbnailKey && a.contentType.startsWith('image/') ? await storage.open(a.storageKey) : null;
    if (obj) {
      const encoder = sharp({ limitInputPixels: MAX_IMAGE_PIXELS, failOn: 'truncated' }).rotate().resize(PREVIEW_SIZE, PREVIEW_SIZE, { fit: 'inside', withoutEnlargement: true }).jpeg({ quality: 82 });
      obj.stream.on('error', (e) => encoder.destroy(e));
      const jpeg = await obj.stream.pipe(encoder).toBuffer();
      setDownloadHeaders(res, 'image/jpeg', contentDisposition(`${base}-preview.jpg`, 'inline'), jpeg.length);
      res.end(jpeg);
      return;
    }
    const kind = a.contentType === 'image/heic' ? 'heic' : a.contentType === 'application/pdf' ? 'pdf' : a.contentType.startsWith('text/csv') ? 'csv' : 'image';
    const png = await placeholderThumbnail(kind);
    setDownloadHeaders(res, PLACEHOLDER_CONTENT_TYPE, contentDisposition(`${base}-placeholder.png`, 'inline'), png.length);
    res.end(png);
  });

  r.get('/attachments/:id/thumbnail', requireUser, validId, async (req, res) => {
    const ctx = requireCtx(req);
    const a = findReadableAttachment(deps.db, ctx.ability, String(req.params.id));
    if (!a) throw new NotFoundError();
    const base = a.originalName.replace(/\.[^.]*$/, '');
    const thumb = a.thumbnailKey ? await storage.read(a.thumbnailKey) : null;
    if (thumb) {
      setDownloadHeaders(res, 'image/jpeg', contentDisposition(`${base}-thumbnail.jpg`, 'inline'), thumb.length);
      res.end(thumb);
      return;
    }
    const kind = a.contentType === 'image/heic' ? 'heic' : a.contentType === 'application/pdf' ? 'pdf' : a.contentType.startsWith('text/csv') ? 'csv' : 'image';
    const png = await placeholderThumbnail(kind);
    setDownloadHeaders(res, PLACEHOLDER_CONTENT_TYPE, contentDisposition(`${base}-placeholder.png`, 'inline'), png.length);
    res.end(png);
  });

  return r;
}
