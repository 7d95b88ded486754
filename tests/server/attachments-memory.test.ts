import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, openAsBlob, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import sharp from 'sharp';

// Upload memory (OWASP ASVS 5.0 5.2.x: large uploads must not exhaust the server): 8 parallel
// requests of 10 photos of about 14 MiB each, from 4 users (2 each, within the per-user limit on
// concurrent uploads), against the real server in a child process. Its resident memory is read
// from /proc/<pid>/status (VmRSS before, VmHWM = the peak after; proc(5)) and may grow by less than
// 100 MB. Held whole in memory, the same load would need 8 x 10 x 14 MiB = 1,120 MiB.

const USERS = ['tech@harborview.test', 'admin@harborview.test', 'tech@prairieline.test', 'admin@prairieline.test'];
const REQUESTS_PER_USER = 2;
const FILES_PER_REQUEST = 10;
const MiB = 1024 * 1024;

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

/** A field of /proc/<pid>/status in bytes (the kernel reports kB). */
function procStatus(pid: number, field: 'VmRSS' | 'VmHWM'): number {
  const m = new RegExp(`^${field}:\\s+(\\d+) kB`, 'm').exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
  if (!m) throw new Error(`no ${field} in /proc/${pid}/status`);
  return Number(m[1]) * 1024;
}

describe('upload memory', () => {
  const dir = mkdtempSync(join(tmpdir(), 'fieldproof-memory-'));
  const dbPath = join(dir, 'fieldproof.sqlite');
  const photoPath = join(dir, 'large.jpg');
  let base: string;
  let child: ChildProcess;
  const output: string[] = [];

  beforeAll(async () => {
    // Invented content: gaussian noise, which JPEG cannot compress, so the file is large.
    const photo = await sharp({ create: { width: 3200, height: 2380, channels: 3, background: '#808080', noise: { type: 'gaussian', mean: 128, sigma: 50 } } })
      .jpeg({ quality: 96, chromaSubsampling: '4:4:4' })
      .toBuffer();
    writeFileSync(photoPath, photo);
    const port = await freePort();
    base = `http://127.0.0.1:${port}`;
    child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
      cwd: process.cwd(),
      env: {
        PATH: process.env.PATH,
        HOME: process.env.HOME,
        NODE_ENV: 'test',
        HOST: '127.0.0.1',
        PORT: String(port),
        PUBLIC_URL: base,
        DATABASE_PATH: dbPath,
        STORAGE_DIR: join(dir, 'files'),
        SEED_DEMO: 'true',
        BCRYPT_COST: '4',
        MAIL_SINK_PORT: '0',
        UPLOAD_MAX_FILES_PER_CLAIM: '1000',
        UPLOAD_MAX_BYTES_PER_CLAIM: String(4096 * MiB),
      },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    child.stdout!.on('data', (d: Buffer) => output.push(d.toString()));
    child.stderr!.on('data', (d: Buffer) => output.push(d.toString()));
    const until = Date.now() + 60_000;
    for (;;) {
      if (child.exitCode !== null) throw new Error(`server exited: ${output.join('')}`);
      if (Date.now() > until) throw new Error(`server did not start: ${output.join('')}`);
      const up = await fetch(`${base}/api/auth/me`).then((r) => r.status === 401, () => false);
      if (up) break;
      await new Promise((r) => setTimeout(r, 100));
    }
  }, 120_000);

  afterAll(() => {
    if (child && child.exitCode === null) child.kill('SIGKILL');
    rmSync(dir, { recursive: true, force: true });
  });

  async function signIn(email: string): Promise<string> {
    const res = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'Content-Type': 'application/json', Origin: base }, body: JSON.stringify({ email, password: 'fieldproof-demo' }) });
    expect(res.status, await res.clone().text()).toBe(200);
    return res.headers.getSetCookie().find((c) => c.startsWith('fp_session='))!.split(';')[0];
  }

  function editableClaimOf(email: string): string {
    const db = new Database(dbPath, { readonly: true });
    try {
      const row = db
        .prepare(
          `select c.id from claims c join users u on u.email = ? where c.state in ('draft', 'returned')
           and (c.technician_id = u.id or (u.role = 'agency_admin' and c.agency_id = u.organisation_id)) order by c.number limit 1`,
        )
        .get(email) as { id: string } | undefined;
      if (!row) throw new Error(`no editable claim for ${email}`);
      return row.id;
    } finally {
      db.close();
    }
  }

  async function upload(cookie: string, claimId: string, files: number): Promise<number> {
    const form = new FormData();
    // A file-backed Blob: the test process streams it from disk too.
    const blob = await openAsBlob(photoPath, { type: 'image/jpeg' });
    for (let i = 0; i < files; i++) form.append('files', blob, `large-${i}.jpg`);
    const res = await fetch(`${base}/api/claims/${claimId}/attachments`, { method: 'POST', headers: { Cookie: cookie, Origin: base }, body: form });
    const text = await res.text();
    if (res.status !== 201) throw new Error(`upload answered ${res.status}: ${text}`);
    return res.status;
  }

  it('8 parallel requests of 10 x 14 MiB raise the server RSS by less than 100 MB', async () => {
    const size = readFileSync(photoPath).length;
    expect(size).toBeGreaterThan(13 * MiB);
    expect(size).toBeLessThan(15 * MiB);
    const sessions = await Promise.all(USERS.map(async (email) => ({ cookie: await signIn(email), claimId: editableClaimOf(email) })));
    // Warm up: every module and the image library loaded, one large photo taken in.
    await upload(sessions[0].cookie, sessions[0].claimId, 1);
    const pid = child.pid!;
    const before = procStatus(pid, 'VmRSS');
    const started = Date.now();
    const statuses = await Promise.all(sessions.flatMap((s) => Array.from({ length: REQUESTS_PER_USER }, () => upload(s.cookie, s.claimId, FILES_PER_REQUEST))));
    const seconds = (Date.now() - started) / 1000;
    const peak = procStatus(pid, 'VmHWM');
    const growth = peak - before;
    console.log(
      `upload memory: ${statuses.length} requests x ${FILES_PER_REQUEST} x ${(size / MiB).toFixed(1)} MiB in ${seconds.toFixed(1)} s; ` +
        `RSS before ${(before / MiB).toFixed(0)} MiB, peak ${(peak / MiB).toFixed(0)} MiB, growth ${(growth / MiB).toFixed(1)} MiB`,
    );
    expect(statuses).toEqual(Array(USERS.length * REQUESTS_PER_USER).fill(201));
    const db = new Database(dbPath, { readonly: true });
    try {
      expect((db.prepare('select count(*) as n from attachments where size_bytes = ?').get(size) as { n: number }).n).toBe(1 + USERS.length * REQUESTS_PER_USER * FILES_PER_REQUEST);
    } finally {
      db.close();
    }
    expect(growth).toBeLessThan(100 * 1000 * 1000);
  }, 300_000);
});
