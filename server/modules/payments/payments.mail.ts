/** The remittance advice: written to the outbox in the transaction that marks the run paid. */
import { and, eq, sql } from 'drizzle-orm';
import { stringify } from 'csv-stringify/sync';
import type { Db } from '../../db/client';
import { organisations, users, type PaymentRun } from '../../db/schema/index';
import type { Clock } from '../../lib/clock';
import { enqueueMail } from '../../lib/mail/outbox';
import { formatCents } from '@shared/calculations/money';
import { paidClaimsQuery } from '../exports/exports.queries';
import { csvOptions, paidClaimRecord, type PaidClaimRow } from '../exports/paid-claims.csv';

/** Active admins of the agency: the people who reconcile the payment. */
export function agencyAdminAddresses(t: Db, agencyId: string): string[] {
  return t
    .select({ email: users.email })
    .from(users)
    .where(and(eq(users.organisationId, agencyId), eq(users.role, 'agency_admin'), eq(users.active, true)))
    .all()
    .map((u) => u.email);
}

/** Who gets the remittance: the agency's admins and its contact address from the profile, each once. */
export function remittanceAddresses(t: Db, agencyId: string): string[] {
  const contact = t.select({ email: organisations.contactEmail }).from(organisations).where(eq(organisations.id, agencyId)).get()?.email?.trim();
  const seen = new Set<string>();
  return [...agencyAdminAddresses(t, agencyId), ...(contact ? [contact] : [])].filter((e) => {
    const k = e.toLowerCase();
    if (seen.has(k)) return false;
    seen.add(k);
    return true;
  });
}

/**
 * The run's lines as CSV, in the paid-claims export's columns and rules (quoting, neutralised
 * formula cells), read inside the caller's transaction after the claims moved to paid.
 */
export function remittanceCsv(t: Db, runId: string): { csv: string; rows: PaidClaimRow[] } {
  const rows = paidClaimsQuery(t, sql`1 = 1`, { runId }).values() as PaidClaimRow[];
  return { csv: stringify(rows.map((r) => paidClaimRecord([...r] as PaidClaimRow)), csvOptions), rows };
}

export function queueRemittanceMail(t: Db, clock: Clock, m: { run: PaymentRun & { paymentDate: string; reference: string }; publicUrl: string }): { to: string[]; filename: string } {
  const to = remittanceAddresses(t, m.run.agencyId);
  const payee = m.run.payeeName;
  const { csv, rows } = remittanceCsv(t, m.run.id);
  const filename = `remittance-${m.run.number}.csv`;
  const total = formatCents(m.run.totalCents, m.run.currency);
  const lines = rows.map((r) => `  ${r[0]}  ${formatCents(r[12], r[13])}`).join('\n');
  const link = `${m.publicUrl.replace(/\/+$/, '')}/payment-runs/${m.run.id}`;
  enqueueMail(t, clock, {
    to,
    subject: `Remittance ${m.run.number}: ${total} paid to ${payee}`,
    text:
      `Payment run ${m.run.number} for ${payee} was paid.\n\n` +
      `Payment date: ${m.run.paymentDate}\n` +
      `Reference: ${m.run.reference}\n` +
      `Total: ${total} for ${rows.length} claim${rows.length === 1 ? '' : 's'}\n\n` +
      `Claims paid:\n${lines}\n\n` +
      `The attached ${filename} lists each claim with its approved labor, travel and parts.\n` +
      `See the run: ${link}\n`,
    attachments: [{ filename, contentType: 'text/csv; charset=utf-8', content: csv }],
  });
  return { to, filename };
}
