/**
 * The paid-claims export: who may export what, and a row source that streams from the
 * database. The rows come from a `.iterate()` over a read-only connection of its own, opened
 * per export: better-sqlite3 refuses other statements on a connection while an iterator is
 * open, and the export pauses between rows whenever the client reads slower than the
 * database, so it must not hold the app's connection. In WAL mode that connection reads one
 * consistent snapshot from the first row to the last while writers carry on.
 */
import Database from 'better-sqlite3';
import { and, eq } from 'drizzle-orm';
import { subject } from '@casl/ability';
import { organisations } from '../../db/schema/index';
import type { AppDeps } from '../../lib/deps';
import type { RequestContext } from '../../lib/context';
import { writeAudit } from '../../lib/audit';
import { ForbiddenError, NotFoundError } from '../../lib/errors';
import { todayFor } from '../../lib/business-day';
import type { PaidClaimsExportQuery } from '@shared/schemas/payment';
import { exportScope, paidClaimsStatement } from './exports.queries';
import type { PaidClaimRow } from './paid-claims.csv';

export interface Actor {
  ctx: RequestContext;
  ip?: string | null;
}

export interface ExportCursor {
  /** How many rows the export holds, counted in the same read transaction as the rows. */
  total: number;
  rows: Iterator<PaidClaimRow> & Iterable<PaidClaimRow>;
  close(): void;
}

export interface PreparedExport {
  filename: string;
  /** Opens the connection and starts the statement; call close() when done or aborted. */
  open(): ExportCursor;
}

export function createExportsService(deps: AppDeps) {
  const { db, clock } = deps;

  function prepare(a: Actor, q: PaidClaimsExportQuery): PreparedExport {
    const { ability, user } = a.ctx;
    const audit = (outcome: 'success' | 'denied', detail: Record<string, unknown>) =>
      writeAudit(db, clock, { actorId: user.id, organisationId: user.organisationId, action: 'export.paid_claims', recordType: 'export', recordId: null, outcome, ip: a.ip ?? null, detail });
    if (!ability.can('export', 'PaidClaimsExport')) {
      audit('denied', { status: 403 });
      throw new ForbiddenError('Only the manufacturer’s accountant and agency admins export paid claims.');
    }
    if (q.agency !== undefined) {
      // A foreign or unknown agency reads as unknown: the same 404 for both.
      const agency = db.select({ id: organisations.id }).from(organisations).where(and(eq(organisations.id, q.agency), eq(organisations.kind, 'agency'))).get();
      if (!agency || !ability.can('export', subject('PaidClaimsExport', { agencyId: agency.id }))) {
        audit('denied', { status: 404, agency: q.agency });
        throw new NotFoundError('No service agency with that id.');
      }
    }
    const statement = paidClaimsStatement(db, exportScope(ability), { from: q.from, to: q.to, agencyId: q.agency });
    audit('success', { from: q.from ?? null, to: q.to ?? null, agency: q.agency ?? null });
    const day = todayFor(db, clock, user.organisationId);
    const span = q.from || q.to ? `${q.from ?? 'start'}-to-${q.to ?? day}` : day;
    return {
      filename: `paid-claims-${span}.csv`,
      open() {
        const main = db.$client;
        if (main.memory) {
          // An in-memory database cannot be opened twice; read it whole (only ever a small test database).
          const all = main.prepare(statement.sql).raw(true).all(...statement.params) as PaidClaimRow[];
          return { total: all.length, rows: all[Symbol.iterator](), close() {} };
        }
        const conn = new Database(main.name, { readonly: true, fileMustExist: true });
        let it: IterableIterator<PaidClaimRow>;
        let total: number;
        try {
          conn.pragma('busy_timeout = 5000');
          // The ORDER BY sorts in memory up to the page cache's size, then spills to a temp file:
          // a 2 MB cache (better-sqlite3 builds with 16 MB) keeps the export's memory flat.
          conn.pragma('cache_size = -2000');
          // One read transaction: the count and the rows see the same snapshot.
          conn.exec('BEGIN');
          total = conn.prepare(`select count(*) from (${statement.sql})`).pluck().get(...statement.params) as number;
          it = conn.prepare(statement.sql).raw(true).iterate(...statement.params) as IterableIterator<PaidClaimRow>;
        } catch (e) {
          conn.close();
          throw e;
        }
        let closed = false;
        return {
          total,
          rows: it,
          close() {
            if (closed) return;
            closed = true;
            try {
              it.return?.();
              conn.exec('COMMIT');
            } finally {
              conn.close();
            }
          },
        };
      },
    };
  }

  return { prepare };
}
