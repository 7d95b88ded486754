import { useCallback, useEffect, useRef, useState } from 'react';
import type { Path, UseFormReturn } from 'react-hook-form';
import { claimDraftSchema, type ClaimDetail } from '@shared/schemas/claim';
import { errorMessage, isApiError, type ApiError } from '@/lib/api-client';
import { updateClaim } from '../api/update-claim';
import { SAVE_KEYS, type ClaimFormValues, type SaveKey } from '../form-model';

export type SaveState =
  | { status: 'idle' }
  | { status: 'pending' }
  | { status: 'saving' }
  | { status: 'saved'; at: Date }
  /** Some changes are kept back until their fields are fixed; the rest was saved (at, if anything was). */
  | { status: 'invalid'; fields: string[]; at: Date | null }
  | { status: 'failed'; message: string };

type Snapshot = Record<SaveKey, string>;

const snapshotOf = (values: ClaimFormValues): Snapshot =>
  Object.fromEntries(SAVE_KEYS.map((k) => [k, JSON.stringify(values[k] ?? null)])) as Snapshot;

export interface AutosaveOptions {
  claimId: string;
  version: number;
  form: UseFormReturn<ClaimFormValues>;
  /** Wait after the last change before saving. */
  delayMs?: number;
  onSaved?: (claim: ClaimDetail) => void;
  /** A 409: the claim changed elsewhere (stale version) or is no longer editable. */
  onConflict: (error: ApiError) => void | Promise<void>;
}

export interface Autosave {
  state: SaveState;
  /** Saves now (after any save in flight); true when every change is on the server. `mark` shows the errors of fields held back. */
  flush: (opts?: { mark?: boolean }) => Promise<boolean>;
  /** The version of the claim the last save left on the server. */
  version: () => number;
  /** Takes a claim loaded from the server as the saved state (after a conflict reload). */
  rebase: (claim: ClaimDetail, values: ClaimFormValues) => void;
  /** Takes the server's version and some fields as saved, when the server changed them itself (a readings import). */
  adopt: (claim: ClaimDetail, values: Partial<ClaimFormValues>) => void;
}

/**
 * Saves the draft on the server as the technician works: a debounced PATCH of the fields
 * that changed since the last save, each checked with its own part of the shared draft
 * schema, so one field being typed does not hold back the others. Saves run one at a time,
 * carrying the version the previous one returned.
 */
export function useAutosave({ claimId, version: initialVersion, form, delayMs = 900, onSaved, onConflict }: AutosaveOptions): Autosave {
  const version = useRef(initialVersion);
  const saved = useRef<Snapshot>(snapshotOf(form.getValues()));
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const chain = useRef<Promise<unknown>>(Promise.resolve());
  const lastAt = useRef<Date | null>(null);
  const [state, setState] = useState<SaveState>({ status: 'idle' });
  const callbacks = useRef({ onSaved, onConflict });
  callbacks.current = { onSaved, onConflict };

  const run = useCallback(async (mark: boolean): Promise<boolean> => {
    const values = form.getValues();
    const body: Record<string, unknown> = {};
    const sent: Partial<Snapshot> = {};
    const invalid: SaveKey[] = [];
    for (const key of SAVE_KEYS) {
      const raw = JSON.stringify(values[key] ?? null);
      if (raw === saved.current[key]) continue;
      const parsed = claimDraftSchema.shape[key].safeParse(values[key]);
      if (!parsed.success) {
        invalid.push(key);
        continue;
      }
      body[key] = parsed.data;
      sent[key] = raw;
    }
    // Fields still being typed are held back quietly; their errors show when the user leaves them, or on submit.
    if (mark && invalid.length > 0) void form.trigger(invalid as Path<ClaimFormValues>[]);
    if (Object.keys(body).length === 0) {
      setState(invalid.length > 0 ? { status: 'invalid', fields: invalid, at: lastAt.current } : lastAt.current ? { status: 'saved', at: lastAt.current } : { status: 'idle' });
      return invalid.length === 0;
    }
    setState({ status: 'saving' });
    try {
      const claim = await updateClaim(claimId, { version: version.current, ...body });
      version.current = claim.version;
      Object.assign(saved.current, sent);
      lastAt.current = new Date();
      setState(invalid.length > 0 ? { status: 'invalid', fields: invalid, at: lastAt.current } : { status: 'saved', at: lastAt.current });
      callbacks.current.onSaved?.(claim);
      return invalid.length === 0;
    } catch (e) {
      if (isApiError(e, 409)) {
        setState({ status: 'failed', message: errorMessage(e) });
        await callbacks.current.onConflict(e);
        return false;
      }
      if (isApiError(e, 400) && e.fields) {
        const names = Object.keys(e.fields);
        for (const [name, message] of Object.entries(e.fields)) form.setError(name as Path<ClaimFormValues>, { type: 'server', message });
        setState({ status: 'invalid', fields: names, at: lastAt.current });
        return false;
      }
      setState({ status: 'failed', message: errorMessage(e) });
      return false;
    }
  }, [claimId, form]);

  const flush = useCallback((opts: { mark?: boolean } = {}): Promise<boolean> => {
    if (timer.current) clearTimeout(timer.current);
    timer.current = null;
    const next = chain.current.then(() => run(opts.mark === true));
    chain.current = next.catch(() => false);
    return next;
  }, [run]);

  useEffect(() => {
    const sub = form.watch(() => {
      if (timer.current) clearTimeout(timer.current);
      setState((s) => (s.status === 'pending' || s.status === 'saving' ? s : { status: 'pending' }));
      timer.current = setTimeout(() => void flush(), delayMs);
    });
    return () => sub.unsubscribe();
  }, [form, flush, delayMs]);

  // Leaving the page or the app: save what is waiting rather than drop it.
  useEffect(() => {
    const onHide = () => {
      if (document.visibilityState === 'hidden' && timer.current) void flush();
    };
    const onBeforeUnload = (e: BeforeUnloadEvent) => {
      if (timer.current) {
        void flush();
        e.preventDefault();
      }
    };
    document.addEventListener('visibilitychange', onHide);
    window.addEventListener('beforeunload', onBeforeUnload);
    return () => {
      document.removeEventListener('visibilitychange', onHide);
      window.removeEventListener('beforeunload', onBeforeUnload);
      if (timer.current) void flush();
    };
  }, [flush]);

  const rebase = useCallback((claim: ClaimDetail, values: ClaimFormValues) => {
    if (timer.current) clearTimeout(timer.current);
    timer.current = null;
    version.current = claim.version;
    saved.current = snapshotOf(values);
  }, []);

  const adopt = useCallback((claim: ClaimDetail, values: Partial<ClaimFormValues>) => {
    version.current = claim.version;
    for (const key of SAVE_KEYS) if (key in values) saved.current[key] = JSON.stringify(values[key] ?? null);
  }, []);

  return { state, flush, version: useCallback(() => version.current, []), rebase, adopt };
}
