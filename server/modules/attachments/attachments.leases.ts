import { hostname } from 'node:os';
import { and, eq, lte, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { uploadLeases } from '../../db/schema/index';
import type { Clock } from '../../lib/clock';
import { newId } from '../../lib/ids';
import { TooManyRequestsError } from '../../lib/errors';

/** A lease lasts this long unless renewed; a request renews it every third of it. */
export const UPLOAD_LEASE_MS = 60_000;
/** What a refused client is told to wait: an upload of a few photos takes seconds. */
export const UPLOAD_RETRY_AFTER_S = 5;

/** Lease ids start with `<host>:<pid>:`, so a process can tell leases left by dead processes on its host. */
const HOST = hostname().replace(/:/g, '_');

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as { code?: string }).code === 'EPERM';
  }
}

export interface UploadLeaseHandle {
  release(): void;
}

/**
 * The per-user limit on uploads in progress. A lease row is taken in an IMMEDIATE transaction
 * (expired leases of the user removed, the rest counted, one inserted), so two processes on one
 * database cannot both take the last slot; it is renewed while the request runs and deleted when
 * it ends. A lease of a process killed mid-upload is removed at once when that process was on
 * this host (its pid is gone, or it is this pid but not one of this process's leases: a restart),
 * and otherwise expires within UPLOAD_LEASE_MS.
 */
export function createUploadLeases(db: Db, clock: Clock, maxPerUser: number) {
  const mine = new Set<string>();

  function stale(id: string): boolean {
    const [host, pidText] = id.split(':');
    if (host !== HOST) return false;
    const pid = Number(pidText);
    if (!Number.isInteger(pid) || pid <= 0) return false;
    return pid === process.pid ? !mine.has(id) : !alive(pid);
  }

  function acquire(userId: string): UploadLeaseHandle {
    const id = `${HOST}:${process.pid}:${newId()}`;
    db.transaction(
      (t) => {
        const now = clock.now();
        t.delete(uploadLeases).where(and(eq(uploadLeases.userId, userId), lte(uploadLeases.expiresAt, now.toISOString()))).run();
        for (const l of t.select({ id: uploadLeases.id }).from(uploadLeases).where(eq(uploadLeases.userId, userId)).all()) {
          if (stale(l.id)) t.delete(uploadLeases).where(eq(uploadLeases.id, l.id)).run();
        }
        const held = t.select({ n: sql<number>`count(*)` }).from(uploadLeases).where(eq(uploadLeases.userId, userId)).get()?.n ?? 0;
        if (held >= maxPerUser) {
          throw new TooManyRequestsError(
            UPLOAD_RETRY_AFTER_S,
            `You already have ${held} upload${held === 1 ? '' : 's'} in progress; at most ${maxPerUser} can run at once. Wait for one to finish, then try again.`,
          );
        }
        mine.add(id);
        t.insert(uploadLeases).values({ id, userId, expiresAt: new Date(now.getTime() + UPLOAD_LEASE_MS).toISOString(), createdAt: now.toISOString() }).run();
      },
      { behavior: 'immediate' },
    );
    const renew = setInterval(() => {
      try {
        db.update(uploadLeases).set({ expiresAt: new Date(clock.now().getTime() + UPLOAD_LEASE_MS).toISOString() }).where(eq(uploadLeases.id, id)).run();
      } catch {
        /* a busy database: the next renewal tries again */
      }
    }, UPLOAD_LEASE_MS / 3);
    renew.unref();
    let released = false;
    return {
      release() {
        if (released) return;
        released = true;
        clearInterval(renew);
        mine.delete(id);
        try {
          db.delete(uploadLeases).where(eq(uploadLeases.id, id)).run();
        } catch {
          /* the database is gone (shutdown) or busy: the lease expires on its own */
        }
      },
    };
  }
  return { acquire, maxPerUser };
}
