import express from 'express';
import Database from 'better-sqlite3';
import type { AddressInfo } from 'node:net';
import { claimListCountSql, claimListPageSql } from '../lib/claim-list-sql';

/**
 * The bare baseline: plain Express and better-sqlite3 running the same claim list statement,
 * with no session, validation, scoping rules or ORM. Agency and state come from the query
 * string. Sends `{ port }`.
 */
const sqlite = new Database(process.env.DATABASE_PATH!, { fileMustExist: true });
sqlite.pragma('journal_mode = WAL');
sqlite.pragma('busy_timeout = 5000');
const page = sqlite.prepare(claimListPageSql);
const count = sqlite.prepare(claimListCountSql).pluck();

const app = express();
app.get('/claims', (req, res) => {
  const agency = String(req.query.agency);
  const state = String(req.query.state);
  const limit = 50;
  const rows = page.all(agency, state, limit + 1) as Array<Record<string, unknown> & { id: string; createdAt: string; flags: string }>;
  const more = rows.length > limit;
  const items = (more ? rows.slice(0, limit) : rows).map((r) => ({ ...r, flags: JSON.parse(r.flags) as string[] }));
  const last = items[items.length - 1];
  res.json({
    items,
    nextCursor: more && last ? Buffer.from(JSON.stringify(['createdAt', 'desc', last.createdAt, last.id])).toString('base64url') : null,
    total: count.get(agency, state) as number,
  });
});

const server = app.listen(0, '127.0.0.1', () => {
  process.send?.({ port: (server.address() as AddressInfo).port });
});
process.on('SIGTERM', () => {
  server.close();
  server.closeAllConnections();
  sqlite.close();
  process.exit(0);
});
