import type { Db } from '../db/client';
import { auditLog } from '../db/schema/index';
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
}

/** Appends one security audit row (UTC). Rows cannot be updated or deleted (database triggers). */
export function writeAudit(t: Db, clock: Clock, e: AuditEntry): void {
  t.insert(auditLog)
    .values({
      id: newId(),
      at: clock.now().toISOString(),
      actorId: e.actorId ?? null,
      organisationId: e.organisationId ?? null,
      action: e.action,
      recordType: e.recordType ?? null,
      recordId: e.recordId ?? null,
      outcome: e.outcome,
      ip: e.ip ?? null,
      detail: e.detail ?? null,
    })
    .run();
}
