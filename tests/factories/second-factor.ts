import type Database from 'better-sqlite3';
import { TOTP_STEP_SECONDS, totpCodeAt, totpStep } from '../../server/lib/totp';

/**
 * The authenticator code a test types for an account with a seeded TOTP secret, read from the
 * database as the demo command does. A code is accepted once (RFC 6238 §5.2), so when this
 * step's code was used already the next step's is given (the server accepts one step of drift).
 */
export function totpCodeFor(sqlite: Database.Database, email: string, nowMs = Date.now()): string {
  const row = sqlite
    .prepare('select t.secret as secret, t.last_used_step as last from totp_credentials t join users u on u.id = t.user_id where u.email = ?')
    .get(email) as { secret: string; last: number | null } | undefined;
  if (!row) throw new Error(`${email} has no TOTP secret`);
  const now = totpStep(nowMs);
  const step = Math.max(now - 1, (row.last ?? -Infinity) + 1);
  if (step > now + 1) throw new Error(`every code of ${email} within the drift window was used already; wait ${TOTP_STEP_SECONDS} s`);
  return totpCodeAt(row.secret, step * TOTP_STEP_SECONDS * 1000);
}
