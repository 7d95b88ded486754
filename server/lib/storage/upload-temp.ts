import { createWriteStream } from 'node:fs';
import { mkdir, unlink, writeFile } from 'node:fs/promises';
import { randomUUID } from 'node:crypto';
import { join, resolve } from 'node:path';
import { pipeline } from 'node:stream';
import type { Request } from 'express';
import type { StorageEngine } from 'multer';
import type { Env } from '../../env';

/**
 * Uploads are received into temporary files here, never whole into memory. The folder sits
 * inside the storage folder (`.tmp`, the same file system, so a checked file is renamed into
 * place) and is swept at start-up by the storage driver's `cleanTemp`.
 */
export function uploadTempDir(env: Pick<Env, 'STORAGE_DIR'>): string {
  return join(resolve(env.STORAGE_DIR), '.tmp');
}

const TEMP_FILES = Symbol('uploadTempFiles');
const PENDING = Symbol('uploadTempWrites');
type Tracked = Request & { [TEMP_FILES]?: string[]; [PENDING]?: Promise<unknown>[] };

function track(req: Request, path: string, done: Promise<unknown>) {
  const r = req as Tracked;
  (r[TEMP_FILES] ??= []).push(path);
  (r[PENDING] ??= []).push(done);
}

export function newTempPath(dir: string): string {
  return join(dir, `${randomUUID()}.upload`);
}

/** A buffer already in memory (a small readings sheet) as a temporary file, so intake has one path. */
export async function bufferToTempFile(dir: string, data: Buffer): Promise<string> {
  await mkdir(dir, { recursive: true });
  const path = newTempPath(dir);
  await writeFile(path, data, { flag: 'wx', mode: 0o600 });
  return path;
}

export async function removeFile(path: string): Promise<void> {
  await unlink(path).catch((e: { code?: string }) => {
    if (e?.code !== 'ENOENT') throw e;
  });
}

/** Removes every temporary file this request received (moved or missing ones are no error). */
export async function removeTempFiles(req: Request): Promise<void> {
  const r = req as Tracked;
  // A write still in flight (an aborted request) could create its file after the unlink.
  await Promise.all((r[PENDING] ?? []).map((p) => p.catch(() => undefined)));
  const paths = r[TEMP_FILES] ?? [];
  r[TEMP_FILES] = [];
  await Promise.all(paths.map((p) => removeFile(p).catch(() => undefined)));
}

/**
 * A multer storage engine that streams each part to its own temporary file (mode 0600, a
 * server-made name) and remembers it on the request, so the route removes it on every path:
 * success, refusal, a multer limit or an aborted request.
 */
export function tempFileStorage(dir: string): StorageEngine {
  let made: Promise<unknown> | null = null;
  return {
    _handleFile(req, file, cb) {
      (made ??= mkdir(dir, { recursive: true })).then(
        () => {
          const path = newTempPath(dir);
          const out = createWriteStream(path, { flags: 'wx', mode: 0o600 });
          let size = 0;
          file.stream.on('data', (c: Buffer) => {
            size += c.length;
          });
          track(
            req,
            path,
            new Promise<void>((resolve) => {
              pipeline(file.stream, out, (err) => {
                resolve();
                if (err) cb(err);
                else cb(null, { path, size });
              });
            }),
          );
        },
        (e) => {
          made = null;
          cb(e as Error);
        },
      );
    },
    _removeFile(_req, file, cb) {
      removeFile(file.path).then(() => cb(null), (e) => cb(e as Error));
    },
  };
}
