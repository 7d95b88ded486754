import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Worker } from 'node:worker_threads';
import type { AddressInfo } from 'node:net';
import request from 'supertest';
import { DEMO_PASSWORD, demoAccounts, type TestApp } from '../factories/test-app';
import { makeFixtures, makeTableApp, ORIGIN, principals, PUBLIC_ROUTES, routeKey, routes, send, urlOf, type Fixtures, type Principal, type Req, type RouteCase } from './authz-routes';

// No request, however malformed, answers 500 (OWASP ASVS 5.0 2.2.1 input validated against an
// allow-list of fields and types; 15.3.6 no prototype pollution; 16.5.x errors handled without a
// crash): malformed and oversized JSON, `__proto__` and `constructor.prototype` keys, a wrong type
// in every field of every write, huge strings, arrays for objects, bad path and query
// parameters, and 10,000 malformed multipart bodies against the upload route.

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };

/** Who may use a route: the public routes are tried signed out, the others by the first principal the table lets in. */
function allowedPrincipal(row: RouteCase): Principal {
  if (PUBLIC_ROUTES.has(routeKey(row))) return 'anonymous';
  const who = principals.find((p) => p !== 'anonymous' && row.expect[p] === 'ok');
  if (!who) throw new Error(`${routeKey(row)}: nobody may use it`);
  return who;
}

/** Rows whose every principal refuses or that need an ok cell: one row per route, the first that lets someone in. */
function firstOkRows(): RouteCase[] {
  const seen = new Set<string>();
  const out: RouteCase[] = [];
  for (const r of routes) {
    const k = routeKey(r);
    if (seen.has(k) || !principals.some((p) => r.expect[p] === 'ok')) continue;
    seen.add(k);
    out.push(r);
  }
  return out;
}

/** Every leaf of a JSON value with its path (objects and arrays are walked, 3 levels deep). */
function leaves(v: Json, path: Array<string | number> = [], depth = 0): Array<{ path: Array<string | number>; value: Json }> {
  if (depth < 3 && v !== null && typeof v === 'object') {
    const entries: Array<[string | number, Json]> = Array.isArray(v) ? v.map((x, i) => [i, x]) : Object.entries(v);
    const inner = entries.flatMap(([k, x]) => leaves(x, [...path, k], depth + 1));
    return path.length > 0 ? [{ path, value: v }, ...inner] : inner;
  }
  return [{ path, value: v }];
}

function setAt(v: Json, path: Array<string | number>, value: Json): Json {
  const copy = structuredClone(v) as Record<string | number, Json>;
  let cur: Record<string | number, Json> = copy;
  for (const k of path.slice(0, -1)) cur = cur[k] as Record<string | number, Json>;
  cur[path[path.length - 1]] = value;
  return copy;
}

/** A value of another type than the one the field holds. */
function wrongTypeFor(v: Json): Json {
  if (typeof v === 'string') return 12_345;
  if (typeof v === 'number') return String(v);
  if (typeof v === 'boolean') return 'yes';
  if (Array.isArray(v)) return { 0: v[0] ?? null };
  if (v === null) return { nested: true };
  return ['an', 'array'];
}

const pollutionKeys = () => Object.getOwnPropertyNames(Object.prototype).sort();

describe('malformed input: 4xx, never 500, Object.prototype unchanged', () => {
  let t: TestApp;
  let f: Fixtures;
  const prototypeBefore = pollutionKeys();
  /** A valid request per route, built once, for the allowed principal. */
  const valid = new Map<RouteCase, Req>();

  beforeAll(async () => {
    t = await makeTableApp();
    f = await makeFixtures(t);
    for (const row of firstOkRows()) valid.set(row, await row.build({ who: allowedPrincipal(row), f }));
  }, 120_000);
  afterAll(async () => {
    await f?.close();
    await t.close();
  });

  const writeRows = () => [...valid.keys()].filter((r) => r.method !== 'GET' && !valid.get(r)!.multipart);
  const bodyRows = () => writeRows().filter((r) => valid.get(r)!.body !== undefined);

  it('the table gives the writes to try', () => {
    expect(writeRows().length).toBeGreaterThan(40);
    expect(bodyRows().length).toBeGreaterThan(35);
  });

  it('malformed JSON, JSON that is not an object, and a body over the 256 kB limit: 400 or 413 on every write', async () => {
    const problems: string[] = [];
    const big = JSON.stringify({ complaint: 'x'.repeat(1024 * 1024) });
    for (const row of writeRows()) {
      const who = allowedPrincipal(row);
      const agent = await f.agent(who);
      const url = urlOf(row.route, valid.get(row)!);
      const raw = (body: string) => {
        const m = row.method.toLowerCase() as 'post' | 'patch' | 'delete';
        return agent[m](url).set('Origin', ORIGIN).set('Content-Type', 'application/json').send(body);
      };
      for (const [body, status, code] of [
        ['{"email": "a@b.test", ', 400, 'entity_parse_failed'],
        ['{"a": 1}}', 400, 'entity_parse_failed'],
        ["{'single': 'quotes'}", 400, 'entity_parse_failed'],
        ['"just a string"', 400, 'entity_parse_failed'],
        ['12345', 400, 'entity_parse_failed'],
        ['null', 400, 'entity_parse_failed'],
        [big, 413, 'entity_too_large'],
      ] as const) {
        const res = await raw(body);
        if (res.status !== status || res.body?.error?.code !== code) problems.push(`${routeKey(row)} ${body.slice(0, 20)}: ${res.status} ${JSON.stringify(res.body).slice(0, 120)}`);
      }
    }
    expect(problems).toEqual([]);
    expect(pollutionKeys()).toEqual(prototypeBefore);
  });

  it('an array where an object is expected, and __proto__ / constructor.prototype keys: 400 on every write that reads a body, and no prototype is polluted', async () => {
    const problems: string[] = [];
    for (const row of bodyRows()) {
      const who = allowedPrincipal(row);
      const agent = await f.agent(who);
      const req = valid.get(row)!;
      const url = urlOf(row.route, req);
      const body = JSON.stringify(req.body);
      const m = row.method.toLowerCase() as 'post' | 'patch' | 'delete';
      const inner = body.slice(1, -1);
      for (const raw of [
        `[${body}]`,
        '[]',
        `{"__proto__": {"polluted": "yes", "isAdmin": true}${inner ? `, ${inner}` : ''}}`,
        `{"constructor": {"prototype": {"polluted": "yes"}}${inner ? `, ${inner}` : ''}}`,
        `{"__proto__": {"role": "manufacturer_admin"}, "constructor": {"prototype": {"agencyId": "x"}}${inner ? `, ${inner}` : ''}}`,
      ]) {
        const res = await agent[m](url).set('Origin', ORIGIN).set('Content-Type', 'application/json').send(raw);
        if (res.status !== 400 || !res.body?.error?.code) problems.push(`${routeKey(row)} ${raw.slice(0, 30)}: ${res.status} ${JSON.stringify(res.body).slice(0, 120)}`);
      }
    }
    expect(problems).toEqual([]);
    expect(pollutionKeys()).toEqual(prototypeBefore);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect(({} as Record<string, unknown>).isAdmin).toBeUndefined();
    expect(({} as Record<string, unknown>).role).toBeUndefined();
    expect(({} as Record<string, unknown>).agencyId).toBeUndefined();
  });

  it('a wrong type in any field of any write body: 400 with field errors', async () => {
    const problems: string[] = [];
    let tried = 0;
    for (const row of bodyRows()) {
      const who = allowedPrincipal(row);
      const agent = await f.agent(who);
      const req = valid.get(row)!;
      for (const leaf of leaves(req.body as Json)) {
        const body = setAt(req.body as Json, leaf.path, wrongTypeFor(leaf.value));
        const res = await send(agent, row.method, row.route, { ...req, body });
        tried++;
        const fields = res.body?.error?.fields as Record<string, string> | undefined;
        if (res.status !== 400 || !fields || Object.keys(fields).length === 0) problems.push(`${routeKey(row)} ${leaf.path.join('.')}: ${res.status} ${JSON.stringify(res.body).slice(0, 160)}`);
      }
    }
    expect(tried).toBeGreaterThan(100);
    expect(problems).toEqual([]);
  });

  it('a 200,000-character string in any text field of any write body: 400 with field errors', async () => {
    const problems: string[] = [];
    const huge = 'W'.repeat(200_000);
    for (const row of bodyRows()) {
      const who = allowedPrincipal(row);
      const agent = await f.agent(who);
      const req = valid.get(row)!;
      for (const leaf of leaves(req.body as Json).filter((l) => typeof l.value === 'string')) {
        const res = await send(agent, row.method, row.route, { ...req, body: setAt(req.body as Json, leaf.path, huge) });
        const fields = res.body?.error?.fields as Record<string, string> | undefined;
        if (res.status !== 400 || !fields) problems.push(`${routeKey(row)} ${leaf.path.join('.')}: ${res.status} ${JSON.stringify(res.body).slice(0, 160)}`);
      }
    }
    expect(problems).toEqual([]);
  });

  it('bad path parameters (../, NUL, broken percent-encoding, 5,000-character ids, header injection): 4xx on every route', async () => {
    const bad = [
      '..%2F..%2F..%2Fetc%2Fpasswd',
      '%2e%2e%2f%2e%2e%2f',
      '..',
      '%00',
      'abc%00def',
      '%E0%A4%A',
      '%',
      '%ZZ',
      'x'.repeat(5_000),
      "'%20OR%201%3D1--",
      '%0D%0ASet-Cookie:%20sid%3Dx',
      '%F0%9F%94%A5',
      '-1',
      '1e309',
      '__proto__',
      'constructor',
    ];
    const problems: string[] = [];
    let tried = 0;
    for (const row of [...valid.keys()].filter((r) => r.route.includes(':'))) {
      const who = allowedPrincipal(row);
      const agent = await f.agent(who);
      const req = valid.get(row)!;
      for (const param of row.route.match(/:(\w+)/g)!.map((p) => p.slice(1))) {
        for (const value of bad) {
          const url = row.route.replace(/:(\w+)/g, (_m, name: string) => (name === param ? value : encodeURIComponent(req.params![name])));
          const m = row.method.toLowerCase() as 'get' | 'post' | 'patch' | 'delete';
          let r = agent[m](url).set('Origin', ORIGIN);
          if (req.multipart) for (const file of req.multipart.files) r = r.attach(file.field, file.data, { filename: file.name, contentType: file.contentType ?? 'application/octet-stream' });
          else if (req.body !== undefined) r = r.send(req.body as object);
          const res = await r;
          tried++;
          if (res.status < 400 || res.status >= 500) problems.push(`${row.method} ${url.slice(0, 90)}: ${res.status} ${JSON.stringify(res.body).slice(0, 120)}`);
        }
      }
    }
    expect(tried).toBeGreaterThan(500);
    expect(problems).toEqual([]);
  });

  it('bad query parameters on every GET route: never 500; the filters that are validated answer 400', async () => {
    const bad = [
      'limit=abc',
      'limit=-5',
      'limit=1e400',
      'cursor=%FF%FE%FD',
      `cursor=${'A'.repeat(190)}`,
      'cursor=eyJzb3J0IjoiRFJPUCBUQUJMRSJ9',
      'state=bogus',
      'state=draft&state=paid',
      'states=draft,,nonsense',
      'from=2026-02-30',
      'to=tomorrow',
      `q=${'x'.repeat(3_000)}`,
      'q=%00%27%22',
      'on=31-12-2026',
      'agency[x]=1',
      'agency=' + 'z'.repeat(100),
      'sort=password_hash',
      'dir=sideways',
      'minCents=-1',
      'maxCents=NaN',
      'flag=%3Cscript%3E',
      '__proto__[polluted]=1',
      'constructor[prototype][polluted]=1',
      'userId=a&userId=b',
      'to=%E0%A4%A',
    ];
    const problems: string[] = [];
    for (const row of [...valid.keys()].filter((r) => r.method === 'GET')) {
      const who = allowedPrincipal(row);
      const agent = await f.agent(who);
      const base = urlOf(row.route, valid.get(row)!);
      for (const q of bad) {
        const res = await agent.get(`${base}${base.includes('?') ? '&' : '?'}${q}`);
        if (res.status >= 500) problems.push(`${row.route}?${q.slice(0, 40)}: ${res.status}`);
      }
    }
    expect(problems).toEqual([]);
    expect(pollutionKeys()).toEqual(prototypeBefore);

    const techA = await f.agent('techA');
    const accountant = await f.agent('accountant');
    const expect400 = async (agent: typeof techA, url: string) => {
      const res = await agent.get(url);
      expect(res.status, url).toBe(400);
      expect(res.body.error.fields, url).toBeTruthy();
    };
    for (const q of ['limit=abc', 'limit=0', 'state=bogus', 'state=draft&state=paid', 'from=2026-02-30', 'to=tomorrow', 'sort=password_hash', 'dir=sideways', `cursor=${'A'.repeat(201)}`, 'minCents=-1']) {
      await expect400(techA, `/api/claims?${q}`);
    }
    await expect400(techA, `/api/units/${encodeURIComponent(f.serial)}?on=31-12-2026`);
    await expect400(accountant, '/api/payment-runs?state=bogus');
    await expect400(accountant, '/api/payment-runs?limit=1000');
    await expect400(accountant, '/api/exports/paid-claims.csv?from=2026-02-30');
    await expect400(accountant, '/api/exports/paid-claims.csv?from=2026-06-02&to=2026-06-01');
    // A cursor that decodes to nonsense is refused, not trusted.
    for (const cursor of ['%FF%FE%FD', 'eyJzb3J0IjoiRFJPUCBUQUJMRSJ9', 'bm90IGpzb24', 'W10', 'eyJ2IjpudWxsfQ']) {
      const res = await techA.get(`/api/claims?cursor=${cursor}`);
      expect(res.status, cursor).toBe(400);
    }
  });

  it('10,000 malformed multipart bodies against the upload route: 0 answers 500, nothing stored, and the server still serves a normal upload', async () => {
    const draft = await f.fresh.draft();
    const path = `/api/claims/${draft.id}/attachments`;
    const signIn = await request(f.server).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: demoAccounts.techA, password: DEMO_PASSWORD });
    const cookie = String(signIn.headers['set-cookie']?.[0] ?? '').split(';')[0];
    expect(cookie).toMatch(/=/);
    const { port } = f.server.address() as AddressInfo;
    const attachmentsBefore = (t.db.$client.prepare('select count(*) as n from attachments where claim_id = ?').get(draft.id) as { n: number }).n;

    const bodies = malformedMultipartBodies(10_000, 20_260_615);
    const started = Date.now();
    // The client runs in a worker thread, so the server has this thread's event loop to itself.
    const { statuses, failures } = await floodFromWorker({ port, path, cookie, bodies, concurrency: 20 });
    const elapsed = Date.now() - started;

    const summary = Object.fromEntries([...statuses.entries()].sort((a, b) => a[0] - b[0]));
    expect(failures.slice(0, 20), JSON.stringify(summary)).toEqual([]);
    const answered = [...statuses.values()].reduce((a, b) => a + b, 0);
    expect(answered).toBe(10_000);
    for (const status of statuses.keys()) expect(status, JSON.stringify(summary)).toBeGreaterThanOrEqual(400);
    for (const status of statuses.keys()) expect(status, JSON.stringify(summary)).toBeLessThan(500);
    // A hang guard only: the run takes well under a minute on an idle two-core machine.
    expect(elapsed, `${elapsed} ms`).toBeLessThan(180_000);
    const attachmentsAfter = (t.db.$client.prepare('select count(*) as n from attachments where claim_id = ?').get(draft.id) as { n: number }).n;
    expect(attachmentsAfter).toBe(attachmentsBefore);

    // Still serving: a normal request and a normal upload.
    const techA = await f.agent('techA');
    expect((await techA.get('/api/auth/me')).status).toBe(200);
    const ok = await techA.post(path).set('Origin', ORIGIN).attach('files', await f.fresh.png(), { filename: 'after.png', contentType: 'image/png' });
    expect(ok.status).toBe(201);
    expect(pollutionKeys()).toEqual(prototypeBefore);
  }, 240_000);
});

// ------------------------------------------------------------------------------------ multipart flood

/** Posts every body with `concurrency` keep-alive connections from a worker thread; counts the statuses. */
async function floodFromWorker(opts: { port: number; path: string; cookie: string; bodies: MalformedBody[]; concurrency: number }) {
  const source = `
    const { parentPort, workerData } = require('node:worker_threads');
    const http = require('node:http');
    const { port, path, cookie, origin, bodies, concurrency } = workerData;
    const agent = new http.Agent({ keepAlive: true, maxSockets: concurrency });
    const statuses = new Map();
    const failures = [];
    let next = 0;
    const post = (b) => new Promise((resolve) => {
      const req = http.request({ host: '127.0.0.1', port, path, method: 'POST', agent,
        headers: { Cookie: cookie, Origin: origin, 'Content-Type': b.contentType, 'Content-Length': b.body.length } }, (res) => {
        res.resume();
        res.on('end', () => resolve(res.statusCode || 0));
        res.on('error', (e) => { failures.push(b.kind + ': response ' + e.message); resolve(-1); });
      });
      req.setTimeout(15000, () => req.destroy(new Error('timeout')));
      req.on('error', (e) => { failures.push(b.kind + ': ' + e.message); resolve(-1); });
      req.end(Buffer.from(b.body));
    });
    const run = async () => {
      while (next < bodies.length) {
        const b = bodies[next++];
        const status = await post(b);
        statuses.set(status, (statuses.get(status) || 0) + 1);
        if (status >= 500) failures.push(b.kind + ': ' + status);
      }
    };
    Promise.all(Array.from({ length: concurrency }, run)).then(() => {
      agent.destroy();
      parentPort.postMessage({ statuses: [...statuses.entries()], failures });
    });
  `;
  const worker = new Worker(source, {
    eval: true,
    workerData: { ...opts, origin: ORIGIN, bodies: opts.bodies.map((b) => ({ kind: b.kind, contentType: b.contentType, body: new Uint8Array(b.body) })) },
  });
  try {
    const result = await new Promise<{ statuses: Array<[number, number]>; failures: string[] }>((resolve, reject) => {
      worker.once('message', resolve);
      worker.once('error', reject);
      worker.once('exit', (code) => reject(new Error(`the flood worker exited with ${code}`)));
    });
    return { statuses: new Map(result.statuses), failures: result.failures };
  } finally {
    await worker.terminate();
  }
}

// ------------------------------------------------------------------------------------ multipart generator

interface MalformedBody {
  kind: string;
  contentType: string;
  body: Buffer;
}

/** mulberry32: a small seeded generator, so a failing body can be made again. */
function prng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let x = Math.imul(a ^ (a >>> 15), 1 | a);
    x = (x + Math.imul(x ^ (x >>> 7), 61 | x)) ^ x;
    return ((x ^ (x >>> 14)) >>> 0) / 4_294_967_296;
  };
}

/**
 * Bodies that are broken in one or more ways: truncated anywhere, boundaries that do not match
 * or are missing, empty or too long, part headers missing, without a colon, too many or too
 * long, names with NUL/CR/LF/../, nested multipart, unknown fields and file fields, bare LF line
 * ends, and file contents that are no accepted type (random bytes, truncated image signatures,
 * markup). None of them holds a whole accepted file, so every answer must be a 4xx.
 */
export function malformedMultipartBodies(count: number, seed: number): MalformedBody[] {
  const rnd = prng(seed);
  const int = (n: number) => Math.floor(rnd() * n);
  const pick = <T>(xs: readonly T[]): T => xs[int(xs.length)];
  const bytes = (n: number) => {
    const b = Buffer.allocUnsafe(n);
    for (let i = 0; i < n; i++) b[i] = int(256);
    return b;
  };
  const boundaryChars = "abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789'()+_,-./:=? ";
  const boundary = () => {
    const len = pick([1, 8, 16, 30, 70, 71, 120]);
    let s = '';
    for (let i = 0; i < len; i++) s += boundaryChars[int(boundaryChars.length)];
    return s.trim() || 'b';
  };
  const contents = [
    () => bytes(int(1500)),
    () => Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), bytes(int(600))]),
    () => Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), bytes(int(400))]),
    () => Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"><script>alert(1)</script></svg>'),
    () => Buffer.from('<!doctype html><html><body><script>fetch("/api/auth/me")</script></body></html>'),
    () => Buffer.from('%PDF-1.4\n%\xe2\xe3\n1 0 obj'),
    () => Buffer.alloc(0),
    () => Buffer.from('RIFF\x10\x00\x00\x00WEBPVP8 ', 'latin1'),
  ];
  const names = ['photo.jpg', 'a.png', '../../../etc/passwd.jpg', 'x\u0000y.jpg', 'evil\r\nContent-Type: text/html.jpg', 'C:\\temp\\a.jpg', `${'n'.repeat(600)}.jpg`, 'noext', '.jpg', 'shell.php.jpg', 'ü.heic', ''];
  const dispositions = [
    (n: string) => `Content-Disposition: form-data; name="files"; filename="${n}"`,
    (n: string) => `Content-Disposition: form-data; name="files"; filename=${n}`,
    (n: string) => `Content-Disposition: form-data; name="files; filename="${n}"`,
    (n: string) => `Content-Disposition: form-data; name="file"; filename="${n}"`,
    (n: string) => `Content-Disposition: form-data; name="${'f'.repeat(100)}"; filename="${n}"`,
    () => 'Content-Disposition: form-data',
    () => 'Content-Disposition: attachment',
    () => 'Content-Disposition:',
    () => 'Content-Disposition form-data name=files',
    () => 'X-Nothing: here',
    () => `Content-Disposition: form-data; name="role"`,
    (n: string) => `Content-Disposition: form-data; name="files"; filename*=UTF-8''${encodeURIComponent(n)}%ZZ`,
  ];
  const extraHeaders = [
    () => ['Content-Type: image/jpeg'],
    () => ['Content-Type: text/html'],
    () => ['Content-Type: multipart/mixed; boundary=inner', ''],
    () => [`X-Long: ${'h'.repeat(9_000)}`],
    () => Array.from({ length: 30 }, (_, i) => `X-H${i}: v`),
    () => ['no colon in this header line'],
    () => ['   : empty name'],
    () => [],
  ];
  const out: MalformedBody[] = [];
  for (let i = 0; i < count; i++) {
    const kinds: string[] = [];
    const declared = boundary();
    const used = rnd() < 0.2 ? (kinds.push('boundary mismatch'), boundary()) : declared;
    const eol = rnd() < 0.15 ? (kinds.push('bare LF'), '\n') : '\r\n';
    const chunks: Buffer[] = [];
    if (rnd() < 0.1) {
      kinds.push('preamble garbage');
      chunks.push(bytes(int(200)));
    }
    const parts = int(4) + (rnd() < 0.1 ? 30 : 0);
    for (let p = 0; p < parts; p++) {
      const head = [`--${used}`, pick(dispositions)(pick(names)), ...pick(extraHeaders)()];
      const headerless = rnd() < 0.08;
      chunks.push(Buffer.from(headerless ? `--${used}${eol}` : head.join(eol) + eol + (rnd() < 0.1 ? '' : eol), 'latin1'));
      if (rnd() < 0.1) {
        kinds.push('role field');
        chunks.push(Buffer.from(pick(['not_a_role', 'x'.repeat(3_000), '\u0000', ''])));
      } else {
        chunks.push(pick(contents)());
      }
      chunks.push(Buffer.from(eol));
    }
    if (parts === 0) kinds.push('no parts');
    if (rnd() < 0.7) chunks.push(Buffer.from(`--${used}--${eol}`));
    else kinds.push('no closing boundary');
    let body = Buffer.concat(chunks);
    if (rnd() < 0.35) {
      kinds.push('truncated');
      body = body.subarray(0, int(body.length + 1));
    }
    if (rnd() < 0.1) {
      kinds.push('bytes flipped');
      body = Buffer.from(body);
      for (let k = 0; k < 5 && body.length > 0; k++) body[int(body.length)] = int(256);
    }
    const contentType = pick([
      `multipart/form-data; boundary=${declared}`,
      `multipart/form-data; boundary="${declared}"`,
      `multipart/form-data; boundary=${declared}`,
      'multipart/form-data',
      'multipart/form-data; boundary=',
      `multipart/form-data; boundary="${declared}`,
      `multipart/form-data; boundary=${declared}; boundary=other`,
      `multipart/form-data; charset=x-unknown; boundary=${declared}`,
      `multipart/mixed; boundary=${declared}`,
      `multipart/form-data; boundary=${'b'.repeat(200)}`,
    ]);
    if (!contentType.endsWith(`boundary=${declared}`) && !contentType.endsWith(`boundary="${declared}"`)) kinds.push('odd content type');
    out.push({ kind: kinds.join(', ') || 'broken file contents', contentType, body });
  }
  return out;
}
