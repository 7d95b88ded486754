import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync, readdirSync, existsSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, relative, sep } from 'node:path';
import Database from 'better-sqlite3';
import { storedFiles } from '../fixtures/evidence-app';
import { scenePhoto } from '../fixtures/photos';

// Crash safety, modelled on SQLite's own crash testing: the server is killed with SIGKILL
// (kill -9) in the middle of 50 uploads, restarted, and then the database must pass
// `PRAGMA integrity_check`, every upload that was answered 201 must still be there, and after
// the start-up sweep there is no file without its row and no row without its file.

const ROUNDS = 3;
const UPLOADS = 50;
const CONCURRENCY = 4;

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

interface Running {
  child: ChildProcess;
  output: string[];
  exited: Promise<number | null>;
}

function startServer(env: NodeJS.ProcessEnv): Running {
  // node --import tsx: the server is this very process, so SIGKILL hits it and nothing else.
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], { cwd: process.cwd(), env, stdio: ['ignore', 'pipe', 'pipe'] });
  const output: string[] = [];
  child.stdout!.on('data', (d: Buffer) => output.push(d.toString()));
  child.stderr!.on('data', (d: Buffer) => output.push(d.toString()));
  const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
  return { child, output, exited };
}

async function waitReady(base: string, r: Running) {
  const until = Date.now() + 60_000;
  while (Date.now() < until) {
    if (r.child.exitCode !== null) throw new Error(`server exited: ${r.output.join('')}`);
    try {
      const res = await fetch(`${base}/api/auth/me`);
      if (res.status === 401) return;
    } catch {
      /* not listening yet */
    }
    await new Promise((res) => setTimeout(res, 100));
  }
  throw new Error(`server did not start: ${r.output.join('')}`);
}

describe('kill -9 during uploads, then restart', () => {
  const dir = mkdtempSync(join(tmpdir(), 'fieldproof-crash-'));
  const storageDir = join(dir, 'files');
  const dbPath = join(dir, 'fieldproof.sqlite');
  let env: NodeJS.ProcessEnv;
  let base: string;
  let server: Running | null = null;
  let photos: Buffer[];

  beforeAll(async () => {
    const port = await freePort();
    base = `http://127.0.0.1:${port}`;
    env = {
      PATH: process.env.PATH,
      HOME: process.env.HOME,
      NODE_ENV: 'test',
      HOST: '127.0.0.1',
      PORT: String(port),
      PUBLIC_URL: base,
      DATABASE_PATH: dbPath,
      STORAGE_DIR: storageDir,
      SEED_DEMO: 'true',
      BCRYPT_COST: '4',
      MAIL_SINK_PORT: '0',
      // 150 uploads by one technician within a minute or two: this test is about crashes, not rates.
      RATE_UPLOADS_PER_MINUTE: '100000',
      RATE_WRITES_PER_MINUTE: '100000',
    };
    photos = [];
    for (let i = 0; i < 20; i++) photos.push(await scenePhoto(9000 + i, { width: 640, height: 480 }));
  });
  afterAll(async () => {
    if (server && server.child.exitCode === null) {
      server.child.kill('SIGKILL');
      await server.exited;
    }
    rmSync(dir, { recursive: true, force: true });
  });

  async function signIn(): Promise<string> {
    const res = await fetch(`${base}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', Origin: base },
      body: JSON.stringify({ email: 'tech@harborview.test', password: 'fieldproof-demo' }),
    });
    expect(res.status).toBe(200);
    const cookie = res.headers.getSetCookie().find((c) => c.startsWith('fp_session='));
    return cookie!.split(';')[0];
  }

  function editableClaims(): string[] {
    const db = new Database(dbPath, { readonly: true });
    try {
      return (
        db
          .prepare("select c.id from claims c join users u on u.id = c.technician_id where u.email = 'tech@harborview.test' and c.state in ('draft', 'returned') order by c.number")
          .all() as Array<{ id: string }>
      ).map((r) => r.id);
    } finally {
      db.close();
    }
  }

  function check(answered: string[]) {
    const db = new Database(dbPath, { readonly: true });
    try {
      expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
      expect(db.pragma('foreign_key_check')).toEqual([]);
      const rows = db.prepare('select id, storage_key, thumbnail_key from attachments').all() as Array<{ id: string; storage_key: string; thumbnail_key: string | null }>;
      const ids = new Set(rows.map((r) => r.id));
      for (const id of answered) expect(ids.has(id), `answered 201 but lost: ${id}`).toBe(true);
      const named = new Set(rows.flatMap((r) => [r.storage_key, r.thumbnail_key].filter((k): k is string => !!k)));
      const files = storedFiles(storageDir).map((p) => relative(storageDir, p).split(sep).join('/'));
      const tmp = existsSync(join(storageDir, '.tmp')) ? readdirSync(join(storageDir, '.tmp')) : [];
      expect(tmp, 'temporary files left after the sweep').toEqual([]);
      for (const f of files) expect(named.has(f), `file without a row: ${f}`).toBe(true);
      for (const k of named) expect(files.includes(k), `row without its file: ${k}`).toBe(true);
      return rows.length;
    } finally {
      db.close();
    }
  }

  it(`survives ${ROUNDS} rounds of SIGKILL during ${UPLOADS} uploads`, { timeout: 240_000 }, async () => {
    const t0 = Date.now();
    server = startServer(env);
    await waitReady(base, server);
    console.log(`first start with seeding: ${Date.now() - t0} ms`);
    const answered: string[] = [];
    let killedMidway = 0;
    for (let round = 0; round < ROUNDS; round++) {
      const cookie = await signIn();
      const claims = editableClaims();
      const killAfter = 5 + Math.floor(Math.random() * 35);
      let started = 0;
      let completed = 0;
      let dead = false;
      const victim = server;
      const one = async (i: number) => {
        const form = new FormData();
        form.append('role', 'unit_overall');
        form.append('files', new Blob([new Uint8Array(photos[(round * UPLOADS + i) % photos.length])], { type: 'image/jpeg' }), `round${round}-${i}.jpg`);
        try {
          const res = await fetch(`${base}/api/claims/${claims[i % claims.length]}/attachments`, { method: 'POST', headers: { Cookie: cookie, Origin: base }, body: form });
          if (res.status === 201) {
            const body = (await res.json()) as { attachments: Array<{ id: string }> };
            answered.push(...body.attachments.map((a) => a.id));
          } else {
            expect(res.status, await res.text()).toBeLessThan(500);
          }
        } catch {
          expect(dead, 'a request failed while the server was up').toBe(true);
        }
        completed++;
        if (completed === killAfter && !dead) {
          // Let the next uploads get under way, then pull the plug.
          await new Promise((r) => setTimeout(r, Math.floor(Math.random() * 40)));
          dead = true;
          killedMidway = UPLOADS - completed;
          victim.child.kill('SIGKILL');
        }
      };
      const workers = Array.from({ length: CONCURRENCY }, async () => {
        while (started < UPLOADS && !dead) await one(started++);
      });
      await Promise.all(workers);
      expect(await victim.exited).toBeNull(); // killed by a signal, not a clean exit
      expect(killedMidway).toBeGreaterThan(0);

      const t1 = Date.now();
      server = startServer(env);
      await waitReady(base, server);
      console.log(`restart: ${Date.now() - t1} ms`);
      const sweepLine = /Start-up sweep: removed \d+ file\(s\) without a row, \d+ row\(s\) without a file[^\n]*/.exec(server.output.join(''));
      expect(sweepLine).not.toBeNull();
      console.log(`round ${round + 1}: killed after ${killAfter} completed uploads; ${sweepLine![0]}`);
      const rows = check(answered);
      expect(rows).toBeGreaterThanOrEqual(answered.length);
    }
    // The restarted server still takes uploads.
    const cookie = await signIn();
    const form = new FormData();
    form.append('files', new Blob([new Uint8Array(photos[0])], { type: 'image/jpeg' }), 'after.jpg');
    const res = await fetch(`${base}/api/claims/${editableClaims()[0]}/attachments`, { method: 'POST', headers: { Cookie: cookie, Origin: base }, body: form });
    expect(res.status).toBe(201);
    server.child.kill('SIGTERM');
    await server.exited;
    check(answered);
  });
});
