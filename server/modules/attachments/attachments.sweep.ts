import { eq } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { tx } from '../../db/client';
import { attachments } from '../../db/schema/index';
import { writeAudit } from '../../lib/audit';
import { systemClock, type Clock } from '../../lib/clock';
import type { Storage } from '../../lib/storage/storage';
import { ATTACHMENT_PREFIX } from '../../lib/storage/keys';
import { refreshPhotoFlags } from './attachments.service';

export interface SweepReport {
  /** Stored files that no attachment row names (a crash between the write and the commit). */
  removedFiles: string[];
  /** Attachment rows whose file is gone. */
  removedRows: Array<{ id: string; claimId: string | null; storageKey: string }>;
  /** Rows whose thumbnail was gone: the thumbnail is cleared and a placeholder shown. */
  clearedThumbnails: string[];
  /** Temporary leftovers of interrupted writes. */
  removedTemp: string[];
}

export interface SweepOptions {
  clock?: Clock;
  /**
   * Only files older than this are removed, so a sweep never races an upload in flight on
   * another app server sharing the storage. 0 at a single server's start-up.
   */
  graceMs?: number;
}

/**
 * The start-up sweep: removes files without rows and rows without files, and reports what it
 * removed. Rows are read before the files are listed, so a file written and committed while the
 * sweep runs is never mistaken for an orphan (and the grace period covers the rest). A missing
 * file is confirmed one by one before its row goes; a storage error stops the sweep unchanged.
 */
export async function sweepOrphans(db: Db, storage: Storage, opts: SweepOptions = {}): Promise<SweepReport> {
  const clock = opts.clock ?? systemClock;
  const cutoff = new Date(clock.now().getTime() - (opts.graceMs ?? 0));
  const rows = db.select({ id: attachments.id, claimId: attachments.claimId, storageKey: attachments.storageKey, thumbnailKey: attachments.thumbnailKey }).from(attachments).all();
  const named = new Set<string>();
  for (const r of rows) {
    named.add(r.storageKey);
    if (r.thumbnailKey) named.add(r.thumbnailKey);
  }
  const report: SweepReport = { removedFiles: [], removedRows: [], clearedThumbnails: [], removedTemp: [] };
  report.removedTemp = await storage.cleanTemp(cutoff);

  const present = new Set<string>();
  for await (const o of storage.list(ATTACHMENT_PREFIX)) {
    present.add(o.key);
    if (!named.has(o.key) && o.modifiedAt <= cutoff) {
      await storage.delete(o.key);
      report.removedFiles.push(o.key);
    }
  }

  const goneRows: typeof rows = [];
  const goneThumbs: typeof rows = [];
  for (const r of rows) {
    if (!present.has(r.storageKey) && !(await storage.stat(r.storageKey))) goneRows.push(r);
    else if (r.thumbnailKey && !present.has(r.thumbnailKey) && !(await storage.stat(r.thumbnailKey))) goneThumbs.push(r);
  }
  if (goneRows.length > 0 || goneThumbs.length > 0 || report.removedFiles.length > 0) {
    tx(db, (t) => {
      const claimsTouched = new Set<string>();
      for (const r of goneRows) {
        t.delete(attachments).where(eq(attachments.id, r.id)).run();
        report.removedRows.push({ id: r.id, claimId: r.claimId, storageKey: r.storageKey });
        if (r.claimId) claimsTouched.add(r.claimId);
      }
      for (const r of goneThumbs) {
        t.update(attachments).set({ thumbnailKey: null }).where(eq(attachments.id, r.id)).run();
        report.clearedThumbnails.push(r.id);
      }
      for (const c of claimsTouched) refreshPhotoFlags(t, c);
      writeAudit(t, clock, {
        action: 'attachment.sweep',
        outcome: 'success',
        detail: {
          removedFiles: report.removedFiles.length,
          removedRows: report.removedRows.map((r) => r.id),
          clearedThumbnails: report.clearedThumbnails.length,
          removedTemp: report.removedTemp.length,
        },
      });
    });
  }
  // A thumbnail file whose row is gone was already removed with the other files.
  for (const r of goneRows) if (r.thumbnailKey) await storage.delete(r.thumbnailKey);
  return report;
}

export function describeSweep(r: SweepReport): string {
  return `Start-up sweep: removed ${r.removedFiles.length} file(s) without a row, ${r.removedRows.length} row(s) without a file, ${r.removedTemp.length} temporary file(s); cleared ${r.clearedThumbnails.length} missing thumbnail(s).`;
}
