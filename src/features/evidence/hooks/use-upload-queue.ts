import { useCallback, useEffect, useRef, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import type { AttachmentRole } from '@shared/schemas/claim';
import type { CsvImportError, EvidenceFlagView } from '@shared/schemas/evidence';
import { errorMessage } from '@/lib/api-client';
import { uploadAttachment } from '../api/upload-attachment';
import { csvErrorsOf, importReadings } from '../api/import-readings';
import { evidenceKeys } from '../api/evidence-keys';

export type UploadStatus = 'queued' | 'uploading' | 'done' | 'failed';

export interface UploadItem {
  key: string;
  file: File;
  role: AttachmentRole;
  /** A CSV is imported as a readings sheet (checked row by row) and kept as evidence. */
  asReadings: boolean;
  status: UploadStatus;
  progress: number;
  error: string | null;
  csvErrors: CsvImportError[];
  flags: EvidenceFlagView[];
}

const CONCURRENT = 2;
let seq = 0;

export const isCsv = (f: File) => /\.csv$/i.test(f.name);

/** The role a file most likely has, until the technician says otherwise. */
export function defaultRole(file: File, chosen: AttachmentRole): AttachmentRole {
  if (isCsv(file)) return 'readings_sheet';
  if (/\.pdf$/i.test(file.name) && chosen !== 'other') return chosen === 'readings_sheet' ? 'invoice' : chosen;
  return chosen;
}

/**
 * Uploads files one request each (so each has its own progress bar and its own retry), two at
 * a time. A finished upload refreshes the claim, its evidence and its readings.
 */
export function useUploadQueue(claimId: string, opts: { onImported?: () => void } = {}) {
  const queryClient = useQueryClient();
  const [items, setItems] = useState<UploadItem[]>([]);
  const [tick, setTick] = useState(0);
  const running = useRef(new Set<string>());
  const itemsRef = useRef(items);
  itemsRef.current = items;
  const onImported = useRef(opts.onImported);
  onImported.current = opts.onImported;

  const patch = useCallback((key: string, p: Partial<UploadItem>) => setItems((xs) => xs.map((x) => (x.key === key ? { ...x, ...p } : x))), []);

  const run = useCallback(
    async (item: UploadItem) => {
      running.current.add(item.key);
      patch(item.key, { status: 'uploading', progress: 0, error: null, csvErrors: [] });
      try {
        const onProgress = (f: number) => patch(item.key, { progress: f });
        if (item.asReadings) {
          await importReadings({ claimId, file: item.file, onProgress });
          patch(item.key, { status: 'done', progress: 1 });
          onImported.current?.();
        } else {
          const r = await uploadAttachment({ claimId, file: item.file, role: item.role, onProgress });
          patch(item.key, { status: 'done', progress: 1, flags: r.flags });
        }
        await queryClient.invalidateQueries({ queryKey: evidenceKeys.claim(claimId) });
      } catch (e) {
        patch(item.key, { status: 'failed', error: errorMessage(e), csvErrors: csvErrorsOf(e) });
      } finally {
        running.current.delete(item.key);
        setTick((n) => n + 1);
      }
    },
    [claimId, patch, queryClient],
  );

  // Start queued items while fewer than CONCURRENT are running.
  useEffect(() => {
    const free = CONCURRENT - running.current.size;
    if (free <= 0) return;
    items
      .filter((x) => x.status === 'queued' && !running.current.has(x.key))
      .slice(0, free)
      .forEach((x) => void run(x));
  }, [items, tick, run]);

  const add = useCallback((files: File[], role: AttachmentRole) => {
    setItems((xs) => [
      ...xs,
      ...files.map((file) => ({
        key: `u${++seq}`,
        file,
        role: defaultRole(file, role),
        asReadings: isCsv(file),
        status: 'queued' as const,
        progress: 0,
        error: null,
        csvErrors: [],
        flags: [],
      })),
    ]);
  }, []);

  const retry = useCallback((key: string) => patch(key, { status: 'queued', progress: 0, error: null }), [patch]);
  const setRole = useCallback((key: string, role: AttachmentRole) => patch(key, { role }), [patch]);
  const remove = useCallback((key: string) => setItems((xs) => xs.filter((x) => x.key !== key || x.status === 'uploading')), []);
  const clearDone = useCallback(() => setItems((xs) => xs.filter((x) => x.status !== 'done')), []);

  return { items, add, retry, setRole, remove, clearDone };
}
