import { createHash } from 'node:crypto';
import { lt, sql } from 'drizzle-orm';
import type { Db } from '../db/client';
import { auditLog, auditRepeats } from '../db/schema/index';
import { newId } from './ids';
import type { Clock } from './clock';

export interface AuditEntry {
  actorId?: string | null;
  organisationId?: string | null;
  action: string;
  recordType?: string | null;
  recordId?: string | null;
  outcome: 'success' | 'failure' | 'denied';
  ip?: string | null;
  /** Never secrets: no passwords, tokens or hashes. */
  detail?: Record<string, unknown> | null;
  /**
   * Refusals and failures are collapsed by default: identical ones (same actor, action, outcome,
   * code and record) within one UTC minute give one row at the first and one summary row with
   * the count when the minute is over. `keep` writes every occurrence (e.g. each compared password).
   */
  repeats?: 'collapse' | 'keep';
}

const MINUTE_MS = 60_000;

/** What makes two refusals "identical": actor (or, for an anonymous one, the address), action, outcome, code and target. */
function repeatKey(e: AuditEntry): string {
  const d = e.detail ?? {};
  const code = d.code ?? d.reason ?? d.status ?? '';
  const subject = d.emailDigest ?? '';
  const who = e.actorId ?? (e.recordId || subject ? '' : (e.ip ?? ''));
  const parts = [e.action, e.outcome, who, e.organisationId ?? '', e.recordType ?? '', e.recordId ?? '', String(code), String(subject)];
  return createHash('sha256').update(parts.join('\u0000')).digest('base64url').slice(0, 32);
}

function insertRow(t: Db, id: string, at: string, e: AuditEntry, detail: Record<string, unknown> | null): void {
  t.insert(auditLog)
    .values({
      id,
      at,
      actorId: e.actorId ?? null,
      organisationId: e.organisationId ?? null,
      action: e.action,
      recordType: e.recordType ?? null,
      recordId: e.recordId ?? null,
      outcome: e.outcome,
      ip: e.ip ?? null,
      detail,
    })
    .run();
}

/**
 * Outside a transaction, a counting write commits with `synchronous = NORMAL`: a flood of
 * refusals then costs no fsync each (a power cut may lose the last few counts; the audit row
 * of each first occurrence is written with the connection's own level, FULL, which syncs them).
 */
function relaxedSync<T>(t: Db, fn: () => T): T {
  const c = (t as Partial<Db>).$client;
  if (!c || c.inTransaction) return fn();
  const level = c.pragma('synchronous', { simple: true }) as number;
  if (level <= 1) return fn();
  c.pragma('synchronous = NORMAL');
  try {
    return fn();
  } finally {
    c.pragma(`synchronous = ${level}`);
  }
}

/**
 * Appends one security audit row (UTC). Rows cannot be updated or deleted (database triggers),
 * so repeats are counted in `audit_repeats` and summarised by `flushAuditRepeats`.
 */
export function writeAudit(t: Db, clock: Clock, e: AuditEntry): void {
  const now = clock.now();
  const at = now.toISOString();
  const minute = Math.floor(now.getTime() / MINUTE_MS);
  flushAuditRepeats(t, clock);
  const id = newId();
  if (e.outcome !== 'success' && e.repeats !== 'keep') {
    const { repeats: _r, ...entry } = e;
    const row = relaxedSync(t, () =>
      t
        .insert(auditRepeats)
        .values({ key: repeatKey(e), minute, count: 1, firstId: id, lastAt: at, entry: entry as Record<string, unknown> })
        .onConflictDoUpdate({ target: [auditRepeats.key, auditRepeats.minute], set: { count: sql`${auditRepeats.count} + 1`, lastAt: at } })
        .returning({ count: auditRepeats.count })
        .get(),
    );
    if (row && row.count > 1) return;
  }
  insertRow(t, id, at, e, e.detail ?? null);
}

/**
 * Closes the minutes that are over: each repeated refusal gets one summary row (`detail.repeats`
 * = how many identical ones followed the first row, `detail.repeatOf` = that row's id); the
 * counting rows are removed. Runs with every audit write (one indexed look-up when nothing is
 * due); `all` closes the current minute too (tests, shutdown). Safe with several processes (DELETE ... RETURNING claims each row once).
 */
export function flushAuditRepeats(t: Db, clock: Clock, all = false): number {
  const minute = all ? Number.MAX_SAFE_INTEGER : Math.floor(clock.now().getTime() / MINUTE_MS);
  const due = t.select({ key: auditRepeats.key }).from(auditRepeats).where(lt(auditRepeats.minute, minute)).limit(1).get();
  if (!due) return 0;
  return t.transaction((tt) => {
    const rows = tt
      .delete(auditRepeats)
      .where(sql`rowid IN (SELECT rowid FROM ${auditRepeats} WHERE ${auditRepeats.minute} < ${minute} LIMIT 200)`)
      .returning()
      .all();
    let written = 0;
    for (const r of rows) {
      if (r.count <= 1) continue;
      const e = r.entry as unknown as AuditEntry;
      insertRow(tt as unknown as Db, newId(), r.lastAt, e, { ...(e.detail ?? {}), repeatOf: r.firstId, repeats: r.count - 1, minute: new Date(r.minute * MINUTE_MS).toISOString() });
      written++;
    }
    return written;
  });
}
