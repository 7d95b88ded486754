import Database from 'better-sqlite3';
import { drizzle, type BetterSQLite3Database } from 'drizzle-orm/better-sqlite3';
import { migrate } from 'drizzle-orm/better-sqlite3/migrator';
import { mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import * as schema from './schema/index';
import { nameKey } from '@shared/schemas/text';

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

const migrationsFolder = resolve(dirname(fileURLToPath(import.meta.url)), '../../drizzle');

/**
 * Opens the database with the pragmas money needs (WAL, synchronous FULL), applies the
 * migrations with foreign keys off (a table rebuild could otherwise cascade), then checks them.
 */
export function openDatabase(path: string): Db {
  if (path !== ':memory:') mkdirSync(dirname(resolve(path)), { recursive: true });
  const sqlite = new Database(path);
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('synchronous = FULL');
  sqlite.pragma('busy_timeout = 5000');
  // REPLACE deletes a conflicting row; only with recursive triggers does that fire the triggers that keep audit rows and claim events.
  sqlite.pragma('recursive_triggers = ON');
  sqlite.pragma('foreign_keys = OFF');
  // The migration that added organisations.name_key backfills it with the same function the services use.
  sqlite.function('fp_name_key', { deterministic: true }, (name: unknown) => nameKey(String(name ?? '')));
  const db = drizzle(sqlite, { schema }) as Db;
  migrate(db, { migrationsFolder });
  sqlite.pragma('foreign_keys = ON');
  const problems = sqlite.pragma('foreign_key_check') as unknown[];
  if (problems.length > 0) {
    sqlite.close();
    throw new Error(`foreign_key_check found ${problems.length} problem(s) after migration`);
  }
  return db;
}

/** Runs fn in one synchronous transaction (no await inside). */
export function tx<T>(db: Db, fn: (t: Db) => T): T {
  return db.transaction((t) => fn(t as unknown as Db));
}
