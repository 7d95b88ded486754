import { existsSync, mkdirSync, rmSync } from 'node:fs';
import { homedir } from 'node:os';
import { parse, resolve } from 'node:path';
import { openDatabase, type Db } from '../client';

/**
 * Starting over means deleting the database file rather than its rows: the audit trail
 * (claim_events, audit_log) is append-only and its triggers refuse DELETE, by design.
 */
export function removeDatabaseFiles(databasePath: string, storageDir: string | null): string[] {
  const removed: string[] = [];
  if (databasePath !== ':memory:') {
    const base = resolve(databasePath);
    for (const suffix of ['', '-wal', '-shm', '-journal']) {
      const file = base + suffix;
      if (existsSync(file)) {
        rmSync(file, { force: true });
        removed.push(file);
      }
    }
  }
  if (storageDir) {
    const dir = resolve(storageDir);
    // Never wipe a filesystem root, the home directory or the working directory itself.
    if (dir === parse(dir).root || dir === resolve(homedir()) || dir === process.cwd()) {
      throw new Error(`Refusing to empty STORAGE_DIR=${storageDir}: point it at a folder of its own`);
    }
    if (existsSync(dir)) {
      rmSync(dir, { recursive: true, force: true });
      removed.push(dir);
    }
    mkdirSync(dir, { recursive: true });
  }
  return removed;
}

/** Deletes the database (and stored files) and opens a fresh, migrated, empty database. */
export function resetDatabase(databasePath: string, storageDir: string | null): Db {
  removeDatabaseFiles(databasePath, storageDir);
  return openDatabase(databasePath);
}
