import { createReadStream } from 'node:fs';
import { copyFile, mkdir, open, readdir, readFile, rename, rm, stat, unlink } from 'node:fs/promises';
import { randomUUID } from 'node:crypto';
import { dirname, join, relative, resolve, sep } from 'node:path';
import { assertKey, type ObjectInfo, type Storage } from './storage';

const TEMP_DIR = '.tmp';

function isMissing(e: unknown): boolean {
  return typeof e === 'object' && e !== null && (e as { code?: string }).code === 'ENOENT';
}

async function fsyncDir(path: string): Promise<void> {
  const fh = await open(path, 'r');
  try {
    await fh.sync();
  } finally {
    await fh.close();
  }
}

/**
 * Files on the local disk under one root folder (outside the web root). A write goes to a
 * temporary name under `<root>/.tmp`, is flushed with fsync, renamed into place (atomic on the
 * same file system) and the folder is synced, so a crash leaves either the whole file or none.
 */
export class LocalStorage implements Storage {
  readonly driver = 'local' as const;
  readonly root: string;

  constructor(root: string) {
    this.root = resolve(root);
  }

  private path(key: string): string {
    assertKey(key);
    if (key === TEMP_DIR || key.startsWith(`${TEMP_DIR}/`)) throw new Error('Reserved storage key');
    const p = resolve(this.root, key);
    if (!p.startsWith(this.root + sep)) throw new Error('Storage key escapes the root');
    return p;
  }

  async put(key: string, data: Buffer, _contentType?: string): Promise<void> {
    const final = this.path(key);
    const tmpDir = join(this.root, TEMP_DIR);
    await mkdir(tmpDir, { recursive: true });
    await mkdir(dirname(final), { recursive: true });
    const tmp = join(tmpDir, `${randomUUID()}.part`);
    const fh = await open(tmp, 'wx', 0o600);
    try {
      await fh.writeFile(data);
      await fh.sync();
    } catch (e) {
      await fh.close().catch(() => undefined);
      await unlink(tmp).catch(() => undefined);
      throw e;
    }
    await fh.close();
    try {
      await rename(tmp, final);
    } catch (e) {
      await unlink(tmp).catch(() => undefined);
      throw e;
    }
    await fsyncDir(dirname(final));
  }

  /**
   * The upload's temporary file is synced and renamed into place (no copy, no memory); across
   * file systems it is copied to a temporary name first, synced and renamed.
   */
  async putFile(key: string, path: string, _contentType?: string): Promise<void> {
    const final = this.path(key);
    await mkdir(dirname(final), { recursive: true });
    const src = await open(path, 'r+');
    try {
      await src.sync();
    } finally {
      await src.close();
    }
    try {
      await rename(path, final);
    } catch (e) {
      if ((e as { code?: string }).code !== 'EXDEV') throw e;
      const tmpDir = join(this.root, TEMP_DIR);
      await mkdir(tmpDir, { recursive: true });
      const tmp = join(tmpDir, `${randomUUID()}.part`);
      try {
        await copyFile(path, tmp);
        const fh = await open(tmp, 'r+');
        try {
          await fh.sync();
        } finally {
          await fh.close();
        }
        await rename(tmp, final);
      } catch (err) {
        await unlink(tmp).catch(() => undefined);
        throw err;
      }
    }
    await fsyncDir(dirname(final));
  }

  async read(key: string): Promise<Buffer | null> {
    try {
      return await readFile(this.path(key));
    } catch (e) {
      if (isMissing(e)) return null;
      throw e;
    }
  }

  async open(key: string) {
    const p = this.path(key);
    const info = await this.stat(key);
    if (!info) return null;
    return { stream: createReadStream(p), size: info.size };
  }

  async stat(key: string): Promise<ObjectInfo | null> {
    try {
      const s = await stat(this.path(key));
      if (!s.isFile()) return null;
      return { key, size: s.size, modifiedAt: s.mtime };
    } catch (e) {
      if (isMissing(e)) return null;
      throw e;
    }
  }

  async delete(key: string): Promise<void> {
    try {
      await unlink(this.path(key));
    } catch (e) {
      if (!isMissing(e)) throw e;
    }
  }

  async *list(prefix = ''): AsyncIterable<ObjectInfo> {
    const walk = async function* (dir: string, root: string): AsyncGenerator<ObjectInfo> {
      let entries;
      try {
        entries = await readdir(dir, { withFileTypes: true });
      } catch (e) {
        if (isMissing(e)) return;
        throw e;
      }
      for (const ent of entries) {
        const full = join(dir, ent.name);
        const rel = relative(root, full).split(sep).join('/');
        if (rel === TEMP_DIR) continue;
        if (ent.isDirectory()) yield* walk(full, root);
        else if (ent.isFile()) {
          const s = await stat(full).catch(() => null);
          if (s) yield { key: rel, size: s.size, modifiedAt: s.mtime };
        }
      }
    };
    for await (const o of walk(this.root, this.root)) if (o.key.startsWith(prefix)) yield o;
  }

  async cleanTemp(olderThan: Date): Promise<string[]> {
    const dir = join(this.root, TEMP_DIR);
    const removed: string[] = [];
    let names: string[];
    try {
      names = await readdir(dir);
    } catch (e) {
      if (isMissing(e)) return removed;
      throw e;
    }
    for (const name of names) {
      const p = join(dir, name);
      const s = await stat(p).catch(() => null);
      if (s && s.mtime <= olderThan) {
        await rm(p, { force: true, recursive: true });
        removed.push(`${TEMP_DIR}/${name}`);
      }
    }
    return removed;
  }
}
