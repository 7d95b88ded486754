import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createServer, request as httpRequest, type ClientRequest, type Server } from 'node:http';
import { join } from 'node:path';
import { hostname } from 'node:os';
import request from 'supertest';
import { makeTestApp, demoAccounts, DEMO_PASSWORD, type TestApp } from '../factories/test-app';
import { editableClaimOf, storedFiles } from '../fixtures/evidence-app';
import { scenePhoto } from '../fixtures/photos';

// Per-user limit on uploads in progress (OWASP ASVS 5.0 5.2.x; 2.4.1 anti-automation): the third
// parallel upload of one user answers 429 with Retry-After while other users upload freely; the
// limit is lease rows in SQLite, so it holds for every process on the database; an aborted upload
// frees its slot and leaves no temporary file.

const ORIGIN = 'http://localhost:3000';

async function until(check: () => boolean, what: string, ms = 10_000) {
  const end = Date.now() + ms;
  while (!check()) {
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

describe('concurrent uploads per user', () => {
  let t: TestApp;
  let server: Server;
  let port: number;
  let cookieA: string;
  let urlA: string;
  let jpeg: Buffer;
  const held: ClientRequest[] = [];
  const leases = () => (t.db.$client.prepare('select count(*) as n from upload_leases').get() as { n: number }).n;
  const tempFiles = () => storedFiles(join(t.env.STORAGE_DIR, '.tmp')).length;

  beforeAll(async () => {
    t = await makeTestApp();
    jpeg = await scenePhoto(951, { width: 160, height: 120 });
    server = createServer(t.app);
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
    port = (server.address() as { port: number }).port;
    const res = await request(t.app).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: demoAccounts.techA, password: DEMO_PASSWORD });
    cookieA = (res.headers['set-cookie'] as unknown as string[]).map((c) => c.split(';')[0]).join('; ');
    urlA = `/api/claims/${editableClaimOf(t, demoAccounts.techA).id}/attachments`;
  });
  afterAll(async () => {
    for (const r of held) r.destroy();
    await until(() => leases() === 0, 'the held uploads to end');
    await new Promise((r) => server.close(r));
    await t.close();
  });

  /** An upload that sends its first megabyte and then waits: the server holds it in progress. */
  function slowUpload(): ClientRequest {
    const boundary = 'fieldproofslowupload';
    const head = Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="files"; filename="slow.jpg"\r\nContent-Type: image/jpeg\r\n\r\n`);
    const req = httpRequest({
      host: '127.0.0.1',
      port,
      method: 'POST',
      path: urlA,
      headers: { Host: 'localhost:3000', Origin: ORIGIN, Cookie: cookieA, 'Content-Type': `multipart/form-data; boundary=${boundary}`, 'Content-Length': String(head.length + 8 * 1024 * 1024) },
    });
    req.on('error', () => undefined);
    req.write(head);
    req.write(Buffer.concat([jpeg, Buffer.alloc(1024 * 1024 - jpeg.length)]));
    held.push(req);
    return req;
  }

  it('two uploads in progress: the third of the same user is 429 with Retry-After; another user still uploads', async () => {
    const a = await t.signIn('techA');
    slowUpload();
    slowUpload();
    await until(() => leases() === 2 && tempFiles() === 2, 'two uploads in progress');
    const third = await a.post(urlA).set('Origin', ORIGIN).attach('files', jpeg, 'third.jpg');
    expect(third.status).toBe(429);
    expect(third.headers['retry-after']).toBe('5');
    expect(third.body.error.message).toMatch(/2 uploads in progress; at most 2 can run at once/);

    const b = await t.signIn('techB');
    const other = await b.post(`/api/claims/${editableClaimOf(t, demoAccounts.techB).id}/attachments`).set('Origin', ORIGIN).attach('files', jpeg, 'other.jpg');
    expect(other.status).toBe(201);
  });

  it('an aborted upload frees its slot and leaves no temporary file', async () => {
    held.shift()!.destroy();
    await until(() => leases() === 1, 'the aborted upload to release its lease');
    await until(() => tempFiles() === 1, 'the aborted upload to remove its temporary file');
    const a = await t.signIn('techA');
    const next = await a.post(urlA).set('Origin', ORIGIN).attach('files', jpeg, 'next.jpg');
    expect(next.status).toBe(201);
    held.shift()!.destroy();
    await until(() => leases() === 0 && tempFiles() === 0, 'every lease and temporary file to go');
  });

  it('leases taken by another process on the same database count; expired ones do not', async () => {
    const userId = (t.db.$client.prepare('select id from users where email = ?').get(demoAccounts.techA) as { id: string }).id;
    const future = new Date(Date.now() + 60_000).toISOString();
    const insert = t.db.$client.prepare('insert into upload_leases (id, user_id, expires_at, created_at) values (?, ?, ?, ?)');
    insert.run('other-process-1', userId, future, new Date().toISOString());
    insert.run('other-process-2', userId, future, new Date().toISOString());
    const a = await t.signIn('techA');
    expect((await a.post(urlA).set('Origin', ORIGIN).attach('files', jpeg, 'x.jpg')).status).toBe(429);
    // The other process died: its leases were not renewed and have expired.
    t.db.$client.prepare("update upload_leases set expires_at = '2000-01-01T00:00:00.000Z'").run();
    expect((await a.post(urlA).set('Origin', ORIGIN).attach('files', jpeg, 'y.jpg')).status).toBe(201);
    await until(() => leases() === 0, 'the lease to be released');
  });

  it('leases left by a killed process on this host are freed at once (its pid is gone, or it is this pid after a restart)', async () => {
    const userId = (t.db.$client.prepare('select id from users where email = ?').get(demoAccounts.techA) as { id: string }).id;
    const future = new Date(Date.now() + 60_000).toISOString();
    const insert = t.db.$client.prepare('insert into upload_leases (id, user_id, expires_at, created_at) values (?, ?, ?, ?)');
    const host = hostname().replace(/:/g, '_');
    // pid 2^22 + 1 is above Linux's default pid_max (proc(5)), so no process has it.
    insert.run(`${host}:4194305:gone`, userId, future, new Date().toISOString());
    insert.run(`${host}:${process.pid}:before-restart`, userId, future, new Date().toISOString());
    const a = await t.signIn('techA');
    expect((await a.post(urlA).set('Origin', ORIGIN).attach('files', jpeg, 'z.jpg')).status).toBe(201);
    await until(() => leases() === 0, 'the stale leases to go');
  });
});
