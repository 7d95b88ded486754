import type { Db } from '../../db/client';
import type { Clock } from '../../lib/clock';
import { writeAudit, type AuditEntry } from '../../lib/audit';

/** The account a sign-in attempt names, when it exists. */
interface SignInAccount {
  id: string;
  organisationId: string;
}

/**
 * The audit row of one sign-in attempt (success, failure or throttled refusal): the actor and
 * record are the account when it exists, and no secret is ever put in the detail.
 */
export function auditSignIn(
  db: Db,
  clock: Clock,
  account: SignInAccount | null | undefined,
  outcome: AuditEntry['outcome'],
  ip: string,
  detail?: Record<string, unknown>,
  repeats?: AuditEntry['repeats'],
): void {
  writeAudit(db, clock, {
    actorId: account?.id ?? null,
    organisationId: account?.organisationId ?? null,
    action: 'auth.sign_in',
    recordType: 'User',
    recordId: account?.id ?? null,
    outcome,
    ip,
    ...(detail ? { detail } : {}),
    ...(repeats ? { repeats } : {}),
  });
}
