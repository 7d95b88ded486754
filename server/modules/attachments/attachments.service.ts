import { stat } from 'node:fs/promises';
import { and, eq } from 'drizzle-orm';
import { subject } from '@casl/ability';
import type { Db } from '../../db/client';
import { tx } from '../../db/client';
import { attachments, claims, type Attachment, type Claim } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { writeAudit } from '../../lib/audit';
import { newId } from '../../lib/ids';
import { AppError, ConflictError, ForbiddenError, NotFoundError, PayloadTooLargeError } from '../../lib/errors';
import type { Storage } from '../../lib/storage/storage';
import { attachmentKey, thumbnailKey } from '../../lib/storage/keys';
import { bufferToTempFile, removeFile, uploadTempDir } from '../../lib/storage/upload-temp';
import { intakeFile, type IntakeResult } from '../../lib/photo/intake';
import { ALLOWED } from '../../lib/photo/file-check';
import { isFlagCode, FLAG_INFO } from '@shared/calculations/flags';
import { attachmentRoleLabels, type AttachmentRole } from '@shared/schemas/claim';
import type { AttachmentView, UploadLimitsView } from '@shared/schemas/evidence';
import { findReadableClaim, claimScope } from '../claims/claims.queries';
import { claimUsage, organisationUsage, type AttachmentListRow } from './attachments.queries';
import { evidenceFlags } from './attachments.flags';

export interface UploadLimits {
  maxFileBytes: number;
  maxFilesPerRequest: number;
  maxFilesPerClaim: number;
  maxBytesPerClaim: number;
  agencyQuotaBytes: number;
}

export function uploadLimitsFrom(env: AppDeps['env']): UploadLimits {
  return {
    maxFileBytes: env.UPLOAD_MAX_FILE_BYTES,
    maxFilesPerRequest: env.UPLOAD_MAX_FILES_PER_REQUEST,
    maxFilesPerClaim: env.UPLOAD_MAX_FILES_PER_CLAIM,
    maxBytesPerClaim: env.UPLOAD_MAX_BYTES_PER_CLAIM,
    agencyQuotaBytes: env.UPLOAD_AGENCY_QUOTA_BYTES,
  };
}

export function limitsView(l: UploadLimits): UploadLimitsView {
  return {
    maxFileBytes: l.maxFileBytes,
    maxFilesPerRequest: l.maxFilesPerRequest,
    maxFilesPerClaim: l.maxFilesPerClaim,
    maxBytesPerClaim: l.maxBytesPerClaim,
    accept: Object.values(ALLOWED).flatMap((a) => a.extensions.map((e) => `.${e}`)),
  };
}

export function formatBytes(n: number): string {
  if (n >= 1024 * 1024 * 1024) return `${+(n / (1024 * 1024 * 1024)).toFixed(1)} GB`;
  if (n >= 1024 * 1024) return `${+(n / (1024 * 1024)).toFixed(1)} MB`;
  if (n >= 1024) return `${+(n / 1024).toFixed(1)} KB`;
  return `${n} bytes`;
}

/** A received file: a temporary file on disk (uploads) or a small buffer (a readings sheet). */
export type IncomingFile = { originalName: string; role: AttachmentRole } & ({ path: string; buffer?: undefined } | { buffer: Buffer; path?: undefined });

const EDITABLE = new Set(['draft', 'returned']);

export function toView(a: Attachment & { uploadedByName?: string | null }): AttachmentView {
  const kind = a.contentType.startsWith('image/') ? 'photo' : a.contentType.startsWith('text/csv') ? 'sheet' : 'document';
  return {
    id: a.id,
    claimId: a.claimId ?? '',
    role: a.role,
    originalName: a.originalName,
    contentType: a.contentType,
    kind,
    sizeBytes: a.sizeBytes,
    sha256: a.sha256,
    width: a.width,
    height: a.height,
    takenAtRaw: a.takenAtRaw,
    takenAtOffset: a.takenAtOffset,
    takenAtUtc: a.takenAtUtc,
    gps: a.gpsLatitude !== null && a.gpsLongitude !== null ? { latitude: a.gpsLatitude, longitude: a.gpsLongitude } : null,
    hasThumbnail: a.thumbnailKey !== null,
    url: `/api/attachments/${a.id}`,
    thumbnailUrl: `/api/attachments/${a.id}/thumbnail`,
    previewUrl: `/api/attachments/${a.id}/preview`,
    uploadedBy: a.uploadedBy,
    uploadedByName: a.uploadedByName ?? null,
    createdAt: a.createdAt,
    retractedAt: a.retractedAt,
    retractionReason: a.retractionReason,
  };
}

/**
 * Rewrites the photo flags held on the claim row (the others belong to the valuation), and
 * returns the other claims a reused photo was found on (their flags change too).
 */
export function refreshPhotoFlags(t: Db, claimId: string): string[] {
  const row = t.select({ flags: claims.flags }).from(claims).where(eq(claims.id, claimId)).get();
  if (!row) return [];
  const found = evidenceFlags(t, claimId, { revealOtherAgencies: true });
  const kept = row.flags.filter((f) => !(isFlagCode(f) && FLAG_INFO[f].raisedBy === 'attachments') && !f.startsWith('photo_'));
  const photo = [...new Set(found.filter((f) => f.code.startsWith('photo_')).map((f) => f.code))];
  const next = [...kept, ...photo];
  if (JSON.stringify(next) !== JSON.stringify(row.flags)) t.update(claims).set({ flags: next }).where(eq(claims.id, claimId)).run();
  return [...new Set(found.map((f) => f.otherClaimId).filter((id): id is string => !!id && id !== claimId))];
}

export interface UploadOptions {
  /** Audit action name (default attachment.upload). */
  action?: string;
  /** More writes in the same transaction as the attachment rows (e.g. imported readings). */
  inTransaction?: (t: Db, rows: Attachment[]) => void;
}

export function createAttachmentsService(deps: AppDeps, storage: Storage, limits: UploadLimits = uploadLimitsFrom(deps.env)) {
  const { db, clock } = deps;

  /**
   * The claim, when this user may add evidence to it now: 404 when it cannot be read, 409 when
   * it can but is no longer a draft or returned, 403 when the user may never add evidence.
   */
  function uploadableClaim(ctx: RequestContext, claimId: string, action: 'upload' | 'update' = 'upload'): Claim {
    const claim = findReadableClaim(db, ctx.ability, claimId);
    if (!claim) throw new NotFoundError('No such claim.');
    const allowed = db.select({ id: claims.id }).from(claims).where(and(eq(claims.id, claimId), claimScope(ctx.ability, action))).get();
    if (allowed && EDITABLE.has(claim.state)) return claim;
    if (ctx.ability.can(action, subject('Claim', { ...claim, state: 'draft' } as Record<string, unknown>))) {
      throw new ConflictError('Evidence can be added only while the claim is a draft or returned to the agency.', 'not_editable');
    }
    throw new ForbiddenError('You may not add evidence to this claim.');
  }

  function checkQuota(t: Db, claim: Claim, count: number, bytes: number) {
    const c = claimUsage(t, claim.id);
    if (c.files + count > limits.maxFilesPerClaim) {
      throw new PayloadTooLargeError(`A claim may carry at most ${limits.maxFilesPerClaim} files; this one has ${c.files}, so ${Math.max(0, limits.maxFilesPerClaim - c.files)} more can be added.`);
    }
    if (c.bytes + bytes > limits.maxBytesPerClaim) {
      throw new PayloadTooLargeError(`A claim may carry at most ${formatBytes(limits.maxBytesPerClaim)} of files; this one has ${formatBytes(c.bytes)}.`);
    }
    const o = organisationUsage(t, claim.agencyId);
    if (o.bytes + bytes > limits.agencyQuotaBytes) {
      throw new PayloadTooLargeError(`Your agency's storage quota of ${formatBytes(limits.agencyQuotaBytes)} is used up (${formatBytes(o.bytes)} stored).`);
    }
  }

  function auditFailure(ctx: RequestContext | undefined, claimId: string, err: unknown, ip: string | null, action = 'attachment.upload') {
    const e = err instanceof AppError ? err : null;
    writeAudit(db, clock, {
      actorId: ctx?.user.id ?? null,
      organisationId: ctx?.user.organisationId ?? null,
      action,
      recordType: 'claim',
      recordId: claimId,
      outcome: e && (e.status === 403 || e.status === 404) ? 'denied' : 'failure',
      ip,
      detail: { code: e?.code ?? 'error', message: (e?.message ?? 'error').slice(0, 300) },
    });
  }

  /**
   * Takes files in: all are checked first (type, hashes, EXIF, thumbnail) and any refusal
   * refuses the whole request with nothing stored; then each file and thumbnail is written
   * durably; then, in one transaction, the limits are checked again and the rows and audit rows
   * committed. If the transaction fails, the written files are removed again.
   */
  async function upload(ctx: RequestContext, claimId: string, files: IncomingFile[], ip: string | null, opts: UploadOptions = {}): Promise<AttachmentView[]> {
    const claim = uploadableClaim(ctx, claimId, opts.action === 'readings.import' ? 'update' : 'upload');
    const made: string[] = [];
    try {
      const paths: string[] = [];
      for (const f of files) {
        if (f.path !== undefined) paths.push(f.path);
        else {
          const p = await bufferToTempFile(uploadTempDir(deps.env), f.buffer);
          made.push(p);
          paths.push(p);
        }
      }
      const sizes = await Promise.all(paths.map(async (p) => (await stat(p)).size));
      return await uploadFromDisk(ctx, claim, files, paths, sizes.reduce((a, b) => a + b, 0), ip, opts);
    } finally {
      await Promise.all(made.map((p) => removeFile(p).catch(() => undefined)));
    }
  }

  async function uploadFromDisk(
    ctx: RequestContext,
    claim: Claim,
    files: IncomingFile[],
    paths: string[],
    total: number,
    ip: string | null,
    opts: UploadOptions,
  ): Promise<AttachmentView[]> {
    checkQuota(db, claim, files.length, total);
    const taken: Array<{ file: IncomingFile; path: string; intake: IntakeResult; id: string }> = [];
    for (const [i, file] of files.entries()) {
      const intake = await intakeFile(paths[i], file.originalName);
      taken.push({ file, path: paths[i], intake, id: newId() });
    }
    const written: string[] = [];
    const rows: Attachment[] = [];
    try {
      for (const { file, path, intake, id } of taken) {
        const key = attachmentKey(claim.agencyId, claim.id, id, intake.type.ext);
        await storage.putFile(key, path, intake.type.contentType);
        written.push(key);
        let thumbKey: string | null = null;
        if (intake.thumbnail) {
          thumbKey = thumbnailKey(claim.agencyId, claim.id, id);
          await storage.put(thumbKey, intake.thumbnail, 'image/jpeg');
          written.push(thumbKey);
        }
        rows.push({
          id,
          retractedAt: null, retractedBy: null, retractionReason: null,
          claimId: claim.id,
          organisationId: claim.agencyId,
          role: file.role,
          originalName: file.originalName,
          storageKey: key,
          thumbnailKey: thumbKey,
          contentType: intake.type.contentType,
          sizeBytes: intake.sizeBytes,
          sha256: intake.sha256,
          perceptualHash: intake.perceptualHash,
          width: intake.width,
          height: intake.height,
          takenAtRaw: intake.metadata.takenAtRaw,
          takenAtOffset: intake.metadata.takenAtOffset,
          takenAtUtc: intake.metadata.takenAtUtc,
          gpsLatitude: intake.metadata.gpsLatitude,
          gpsLongitude: intake.metadata.gpsLongitude,
          uploadedBy: ctx.user.id,
          createdAt: clock.now().toISOString(),
        });
      }
      tx(db, (t) => {
        const now = t.select({ state: claims.state }).from(claims).where(eq(claims.id, claim.id)).get();
        if (!now || !EDITABLE.has(now.state)) throw new ConflictError('The claim changed while the files were sent: it is no longer a draft or returned.', 'not_editable');
        checkQuota(t, claim, files.length, total);
        for (const row of rows) {
          t.insert(attachments).values(row).run();
          writeAudit(t, clock, {
            actorId: ctx.user.id,
            organisationId: ctx.user.organisationId,
            action: opts.action ?? 'attachment.upload',
            recordType: 'attachment',
            recordId: row.id,
            outcome: 'success',
            ip,
            detail: { claimId: claim.id, role: row.role, contentType: row.contentType, sizeBytes: row.sizeBytes },
          });
        }
        opts.inTransaction?.(t, rows);
        for (const other of refreshPhotoFlags(t, claim.id)) refreshPhotoFlags(t, other);
      });
    } catch (e) {
      await Promise.all(written.map((k) => storage.delete(k).catch(() => undefined)));
      throw e;
    }
    return rows.map((r) => toView({ ...r, uploadedByName: ctx.user.name }));
  }

  return { upload, uploadableClaim, auditFailure, limits };
}

export type AttachmentsService = ReturnType<typeof createAttachmentsService>;

export function roleLabel(role: string): string {
  return (attachmentRoleLabels as Record<string, string>)[role] ?? role;
}

export type { AttachmentListRow };
