/**
 * The authorization table: every /api route of the app, each with a concrete request and the
 * answer each principal must get. The matrix test checks every cell and that this table and the
 * routes Express knows are the same set; the cross-tenant and malformed-input tests reuse the
 * request builders. (OWASP ASVS 5.0 8.1.1, 8.2.1, 8.3.1: deny by default, checked on the server
 * for every function and every record.)
 *
 * Columns: anonymous, technician A, agency admin A, technician B, reviewer, accountant,
 * manufacturer admin. A is the agency "Harborview", B "Prairie Line".
 */
import { accessSync, constants } from 'node:fs';
import type { Server } from 'node:http';
import request from 'supertest';
import sharp from 'sharp';
import { completeSecondFactor, DEMO_PASSWORD, demoAccounts, makeTestApp, TestClock, type DemoKey, type TestApp } from '../factories/test-app';
import { attachEvidence, completeDraftBody } from './claims-fixtures';
import { insertApprovedClaim } from './payments-fixtures';
import { hashToken, newId, newToken } from '../../server/lib/ids';
import { hashPassword } from '../../server/lib/passwords';

export type Agent = ReturnType<typeof request.agent>;
export const ORIGIN = 'http://localhost:3000';

export const principals = ['anonymous', 'techA', 'adminA', 'techB', 'reviewer', 'accountant', 'mfrAdmin'] as const;
export type Principal = (typeof principals)[number];

/** 'ok': any 2xx. 'deny': 403 or 404. A number: exactly that status. */
export type Outcome = 'ok' | 'deny' | number;
export type Expectation = Record<Principal, Outcome>;

/** Positional: anonymous, techA, adminA, techB, reviewer, accountant, mfrAdmin. */
export function x(anonymous: Outcome, techA: Outcome, adminA: Outcome, techB: Outcome, reviewer: Outcome, accountant: Outcome, mfrAdmin: Outcome): Expectation {
  return { anonymous, techA, adminA, techB, reviewer, accountant, mfrAdmin };
}

/** What kind of record a path parameter names, so the cross-tenant test can replay every one of agency A. */
export type IdKind = 'claim' | 'attachment' | 'partLine' | 'paymentRun' | 'agencyUser' | 'certification' | 'invitation';

export interface MultipartFile {
  field: string;
  name: string;
  data: Buffer;
  contentType?: string;
}

export interface Req {
  params?: Record<string, string>;
  query?: Record<string, string>;
  body?: unknown;
  multipart?: { files: MultipartFile[]; fields?: Record<string, string> };
}

export interface Cell {
  who: Principal;
  f: Fixtures;
}

export interface RouteCase {
  method: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  /** The route as Express knows it, e.g. /api/claims/:id */
  route: string;
  /** Tells variants of one route apart. */
  name?: string;
  /** The kind of record behind each path parameter that holds an id of agency A. */
  ids?: Record<string, IdKind>;
  /** Cross-tenant: replay this variant too (by default only the first row of a route is replayed). */
  replay?: boolean;
  build(c: Cell): Promise<Req> | Req;
  expect: Expectation;
  /** Each cell uses an agent of its own, signed in for that cell (the request changes the session cookie). */
  ownSession?: boolean;
  /** The request ends every session of the principal; the shared agent is signed in again after it. */
  endsSessions?: boolean;
  /** More to check on an answer than its status. */
  check?(who: Principal, res: { status: number; body: unknown }): void;
  /** Headers sent with the request (a probe of the Host allow-list or the Origin check). */
  headers?: Record<string, string>;
}

/**
 * The sign-in's second step: served only to a pending sign-in (a right password, no second factor
 * yet), which no principal of the table holds; their successes are tested in second-factor.test.ts.
 */
export const PENDING_SIGN_IN_ROUTES = new Set([
  'POST /api/auth/second-factor/totp',
  'POST /api/auth/second-factor/recovery',
  'POST /api/auth/second-factor/passkey/options',
  'POST /api/auth/second-factor/passkey',
  'POST /api/auth/second-factor/enrol/totp',
  'POST /api/auth/second-factor/enrol/totp/confirm',
]);

/** Routes a signed-out visitor may call. Everything else must answer 401 to anonymous. */
export const PUBLIC_ROUTES = new Set([
  'POST /api/auth/sign-in',
  'POST /api/auth/sign-out',
  'POST /api/auth/password-reset',
  'POST /api/auth/password-reset/confirm',
  'POST /api/invitations/preview',
  'POST /api/invitations/accept',
  'GET /api/dev/mailbox',
]);

export const routeKey = (r: { method: string; route: string }) => `${r.method} ${r.route}`;

/** The concrete URL of a request built for a route. */
export function urlOf(route: string, req: Req): string {
  let path = route.replace(/:(\w+)/g, (_m, name: string) => {
    const v = req.params?.[name];
    if (v === undefined) throw new Error(`${route}: no value for :${name}`);
    return encodeURIComponent(v);
  });
  if (req.query && Object.keys(req.query).length > 0) path += `?${new URLSearchParams(req.query).toString()}`;
  return path;
}

/** Sends a built request with the agent (same-origin header set). */
export function send(agent: Agent, method: RouteCase['method'], route: string, req: Req, headers: Record<string, string> = {}) {
  const url = urlOf(route, req);
  let r = (method === 'GET' ? agent.get(url) : method === 'POST' ? agent.post(url) : method === 'PATCH' ? agent.patch(url) : method === 'PUT' ? agent.put(url) : agent.delete(url)).set('Origin', ORIGIN);
  for (const [k, v] of Object.entries(headers)) r = r.set(k, v);
  if (req.multipart) {
    for (const [k, v] of Object.entries(req.multipart.fields ?? {})) r = r.field(k, v);
    for (const file of req.multipart.files) r = r.attach(file.field, file.data, { filename: file.name, contentType: file.contentType ?? 'application/octet-stream' });
    return r;
  }
  if (req.body !== undefined) return r.send(req.body as object);
  return r;
}

export function matches(outcome: Outcome, status: number): boolean {
  if (outcome === 'ok') return status >= 200 && status < 300;
  if (outcome === 'deny') return status === 403 || status === 404;
  return status === outcome;
}

// ---------------------------------------------------------------------------------- fixtures

/** The day the table's apps live on (the seed counts the demo scenario back from it). */
export const TABLE_DAY = new Date('2026-06-15T12:00:00.000Z');

/**
 * A test app (real SQLite on a temp file, demo scenario, mail sink) whose temp folder is in the
 * memory-backed /dev/shm when the machine has one: the same SQLite and the same synchronous
 * commits, without waiting on the disk for each of the thousands of audit rows these tests write.
 */
export async function makeTableApp(clock = new TestClock(TABLE_DAY)): Promise<TestApp> {
  let shm = false;
  try {
    accessSync('/dev/shm', constants.W_OK);
    shm = true;
  } catch {
    shm = false;
  }
  const before = process.env.TMPDIR;
  if (shm) process.env.TMPDIR = '/dev/shm';
  try {
    return await makeTestApp({ clock });
  } finally {
    if (before === undefined) delete process.env.TMPDIR;
    else process.env.TMPDIR = before;
  }
}

type Row = Record<string, unknown>;

export interface Fixtures {
  t: TestApp;
  org: { A: string; B: string; M: string };
  user: Record<DemoKey, string>;
  /** One claim of agency A per state: technician A's own where there is one. */
  claimA: Record<'draft' | 'submitted' | 'in_review' | 'returned' | 'approved' | 'denied' | 'paid' | 'withdrawn', string>;
  /** A draft of agency A filed by another technician of A. */
  otherTechDraftA: string;
  /** A submitted claim of technician A with an uploaded photo. */
  evidenceClaimA: string;
  attachmentA: string;
  /** An approved claim of technician A with a part awaiting return. */
  returnClaimA: { claimId: string; lineId: string };
  openRunA: string;
  paidRunA: string;
  certificationA: string;
  /** Pending invitations to agency A: a technician's and an agency admin's. */
  invitationTechA: { id: string; token: string };
  invitationAdminA: { id: string; token: string };
  serial: string;
  postalCode: string;
  seeded: { familyId: string; partId: string; repairCodeId: string; termsIdA: string };
  /** Catalogue and agency records made for the table, so writes do not touch the demo scenario. */
  own: { familyId: string; modelId: string; specId: string; partId: string; repairCodeId: string; agencyId: string };
  /** The shared, signed-in agent of a principal (a bare one for anonymous). */
  agent(who: Principal): Promise<Agent>;
  /** The listening server the agents talk to. */
  server: Server;
  close(): Promise<void>;
  /** Signs in a new agent (or a bare one for anonymous), not shared with other cells. */
  freshAgent(who: Principal | DemoKey): Promise<Agent>;
  forget(who: Principal): void;
  n(): number;
  version(claimId: string): number;
  one<T = Row>(sql: string, ...params: unknown[]): T;
  fresh: {
    draft(): Promise<{ id: string; version: number }>;
    submitted(): Promise<{ id: string; version: number }>;
    inReview(): Promise<{ id: string; version: number; laborLineId: string }>;
    /** An approved claim of technician A, ready to pay. */
    approved(): string;
    approvedWithReturn(status?: 'awaiting' | 'shipped'): { claimId: string; lineId: string };
    openRun(): Promise<string>;
    user(org: 'A' | 'B' | 'M', role: string): { id: string; email: string };
    /** A certificate of a new technician of agency A, not revoked. */
    certification(): string;
    invitation(org: 'A' | 'M', role: string): { id: string; token: string };
    passwordReset(): { token: string };
    spec(): Promise<string>;
    terms(): string;
    png(): Promise<Buffer>;
  };
}

const expectStatus = (res: { status: number; body: unknown }, status: number, what: string) => {
  if (res.status !== status) throw new Error(`${what}: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body as Row;
};

export async function makeFixtures(t: TestApp): Promise<Fixtures> {
  const db = t.db.$client;
  const one = <T = Row>(sql: string, ...params: unknown[]) => {
    const r = db.prepare(sql).get(...params) as T | undefined;
    if (r === undefined) throw new Error(`fixture query found nothing: ${sql}`);
    return r;
  };
  let counter = 0;
  const n = () => ++counter;
  /** Approved claims written straight into the database get numbers outside the app's FP- series. */
  const fixtureNumber = () => `TX-2026-${String(n()).padStart(6, '0')}`;

  // One listening server for every agent of the table (supertest would otherwise start one per request).
  const server: Server = await new Promise((resolve) => {
    const s = t.app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const agents = new Map<Principal, Agent>();
  const freshAgent = async (who: Principal | DemoKey): Promise<Agent> => {
    const a = request.agent(server);
    if (who === 'anonymous') return a;
    const res = await a.post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: demoAccounts[who], password: DEMO_PASSWORD });
    expectStatus(res, 200, `sign-in as ${who}`);
    if (res.body?.secondFactor) await completeSecondFactor(a, t.db, demoAccounts[who as DemoKey], res.body.secondFactor.purpose, t.deps.clock.now().getTime());
    return a;
  };
  const agent = async (who: Principal): Promise<Agent> => {
    let a = agents.get(who);
    if (!a) {
      a = await freshAgent(who);
      agents.set(who, a);
    }
    return a;
  };

  const orgId = (name: string) => one<{ id: string }>('select id from organisations where name = ?', name).id;
  const org = { A: orgId('Harborview Appliance Service'), B: orgId('Prairie Line Kitchen Repair'), M: orgId('Larkfield Cookline Co.') };
  const user = Object.fromEntries(Object.entries(demoAccounts).map(([k, email]) => [k, one<{ id: string }>('select id from users where email = ?', email).id])) as Record<DemoKey, string>;

  const claimOf = (state: string) =>
    one<{ id: string }>(
      `select id from claims where agency_id = ? and state = ? order by (technician_id = ?) desc, number limit 1`,
      org.A,
      state,
      user.techA,
    ).id;
  const claimA = {
    draft: claimOf('draft'),
    submitted: claimOf('submitted'),
    in_review: claimOf('in_review'),
    returned: claimOf('returned'),
    approved: claimOf('approved'),
    denied: claimOf('denied'),
    paid: claimOf('paid'),
    withdrawn: claimOf('withdrawn'),
  };
  const otherTechDraftA = one<{ id: string }>("select id from claims where agency_id = ? and state = 'draft' and technician_id != ? order by number limit 1", org.A, user.techA).id;
  const version = (claimId: string) => one<{ version: number }>('select version from claims where id = ?', claimId).version;

  const png = async () => {
    const k = n();
    return sharp({ create: { width: 48, height: 36, channels: 3, background: { r: (k * 37) % 256, g: (k * 91) % 256, b: (k * 53) % 256 } } })
      .png()
      .toBuffer();
  };

  // The shared agents are looked up at each use: a sign-out cell replaces them.
  const draft = async () => {
    const body = expectStatus(await (await agent('techA')).post('/api/claims').set('Origin', ORIGIN).send(completeDraftBody(t)), 201, 'fresh draft');
    attachEvidence(t, body.id as string, 'unit_overall', demoAccounts.techA);
    return { id: body.id as string, version: body.version as number };
  };
  const moveAs = async (a: Agent, id: string, type: string, extra: Row = {}) =>
    expectStatus(await a.post(`/api/claims/${id}/transitions`).set('Origin', ORIGIN).send({ type, version: version(id), ...extra }), 200, type);
  const submitted = async () => {
    const d = await draft();
    await moveAs(await agent('techA'), d.id, 'submit');
    return { id: d.id, version: version(d.id) };
  };
  const inReview = async () => {
    const s = await submitted();
    await moveAs(await agent('reviewer'), s.id, 'start_review');
    const line = one<{ id: string }>('select id from claim_labor_lines where claim_id = ? order by position limit 1', s.id);
    return { id: s.id, version: version(s.id), laborLineId: line.id };
  };
  const approvedWithReturn = (status: 'awaiting' | 'shipped' = 'awaiting') => {
    const c = insertApprovedClaim(t, { parts: [{ cents: 4_200, status }], number: fixtureNumber() });
    const line = one<{ id: string }>('select id from claim_part_lines where claim_id = ?', c.id);
    return { claimId: c.id, lineId: line.id };
  };
  const approved = () => insertApprovedClaim(t, { number: fixtureNumber() }).id;
  const openRun = async () => {
    const run = expectStatus(await (await agent('accountant')).post('/api/payment-runs').set('Origin', ORIGIN).send({ agencyId: org.A, claimIds: [approved()] }), 201, 'fresh payment run');
    return run.id as string;
  };
  const freshUser = (o: 'A' | 'B' | 'M', role: string) => {
    const id = newId();
    const email = `person-${n()}-${o.toLowerCase()}@fixture.test`;
    const now = new Date().toISOString();
    db.prepare('insert into users (id, organisation_id, role, email, name, password_hash, active, session_version, created_at, updated_at) values (?, ?, ?, ?, ?, ?, 1, 1, ?, ?)').run(
      id,
      org[o],
      role,
      email,
      `Fixture Person ${counter}`,
      hashPassword(DEMO_PASSWORD, t.env.PASSWORD_PEPPER, 4),
      now,
      now,
    );
    return { id, email };
  };
  const invitation = (o: 'A' | 'M', role: string) => {
    const { token, hash } = newToken();
    const id = newId();
    const now = t.deps.clock.now();
    db.prepare('insert into invitations (id, organisation_id, email, role, token_hash, invited_by, expires_at, created_at) values (?, ?, ?, ?, ?, ?, ?, ?)').run(
      id,
      org[o],
      `invitee-${n()}@fixture.test`,
      role,
      hash,
      o === 'A' ? user.adminA : user.mfrAdmin,
      new Date(now.getTime() + 3 * 86_400_000).toISOString(),
      now.toISOString(),
    );
    return { id, token };
  };
  const certification = () => {
    const u = freshUser('A', 'technician');
    const id = newId();
    const fam = one<{ id: string }>("select id from product_families where code = 'GRL'").id;
    db.prepare('insert into certifications (id, organisation_id, user_id, family_id, certificate_number, valid_from, valid_to, created_at) values (?, ?, ?, ?, ?, ?, ?, ?)').run(
      id,
      org.A,
      u.id,
      fam,
      `FIX-${n()}`,
      '2026-01-01',
      '2028-12-31',
      new Date().toISOString(),
    );
    return id;
  };
  const passwordReset = () => {
    const u = freshUser('A', 'technician');
    const token = newToken().token;
    const now = t.deps.clock.now();
    db.prepare('insert into password_resets (id, user_id, token_hash, expires_at, created_at) values (?, ?, ?, ?, ?)').run(newId(), u.id, hashToken(token), new Date(now.getTime() + 10 * 60_000).toISOString(), now.toISOString());
    return { token };
  };

  // The table's own catalogue records and agency, made through the API like the admin would.
  const post = async (path: string, body: Row) => expectStatus(await (await agent('mfrAdmin')).post(path).set('Origin', ORIGIN).send(body), 201, `POST ${path}`);
  const fam = await post('/api/admin/families', { code: 'AZF', name: 'Table family', fuel: 'gas' });
  const model = await post('/api/admin/models', { familyId: fam.id, modelNumber: 'AZM-1', name: 'Table model', partsMonths: 12, laborMonths: 12, capMonthsFromShip: 24, installGraceDays: 90 });
  const spec = async () =>
    (await post(`/api/admin/models/${model.id}/reading-specs`, { key: `probe_${n()}`, label: 'Probe reading', unit: 'F', nominal: 350, tolerance: 10, phase: 'both' })).id as string;
  const specId = await spec();
  const part = await post('/api/admin/parts', { partNumber: 'AZP-1', description: 'Table part', listPriceCents: 1_000 });
  const code = await post('/api/admin/repair-codes', { code: 'AZ-100', familyId: fam.id, description: 'Table repair', allowedHours: 1 });
  const agency = await post('/api/admin/agencies', {
    name: 'Table Test Agency',
    contactEmail: null,
    addressLine: null,
    city: null,
    region: null,
    postalCode: null,
    timeZone: 'America/Chicago',
    adminEmail: 'first-admin@fixture.test',
  });
  let termsYear = 2040;
  const terms = () => {
    const id = newId();
    const y = termsYear++;
    db.prepare(
      'insert into agency_terms (id, agency_id, effective_from, effective_to, labor_rate_cents, travel_rate_cents, mileage_rate_cents, max_round_trip_miles, max_travel_hours, parts_discount_bps, parts_handling_bps, overtime_multiplier, filing_window_days, created_at) values (?, ?, ?, ?, 9000, 4500, null, 100, 2, 0, 0, 1.5, 30, ?)',
    ).run(id, agency.id, `${y}-01-01`, `${y}-12-31`, new Date().toISOString());
    return id;
  };

  // Evidence: a photo uploaded to a draft of technician A, which is then submitted.
  const ev = await draft();
  const up = expectStatus(
    await (await agent('techA'))
      .post(`/api/claims/${ev.id}/attachments`)
      .set('Origin', ORIGIN)
      .field('role', 'serial_plate')
      .attach('files', await png(), { filename: 'plate.png', contentType: 'image/png' }),
    201,
    'fixture upload',
  );
  await moveAs(await agent('techA'), ev.id, 'submit');

  const returnClaimA = approvedWithReturn('awaiting');
  const run = (state: string) => one<{ id: string }>('select id from payment_runs where agency_id = ? and state = ? order by number limit 1', org.A, state).id;
  let openRunA: string;
  try {
    openRunA = run('open');
  } catch {
    openRunA = await openRun();
  }

  return {
    t,
    org,
    user,
    claimA,
    otherTechDraftA,
    evidenceClaimA: ev.id,
    attachmentA: ((up.attachments as Row[])[0].id as string) ?? '',
    returnClaimA,
    openRunA,
    paidRunA: run('paid'),
    certificationA: one<{ id: string }>('select id from certifications where organisation_id = ? order by certificate_number limit 1', org.A).id,
    invitationTechA: invitation('A', 'technician'),
    invitationAdminA: invitation('A', 'agency_admin'),
    serial: one<{ serial: string }>('select serial from units order by serial limit 1').serial,
    postalCode: '67202',
    seeded: {
      familyId: one<{ id: string }>("select id from product_families where code = 'GRL'").id,
      partId: one<{ id: string }>("select id from parts where part_number != 'AZP-1' order by part_number limit 1").id,
      repairCodeId: one<{ id: string }>("select id from repair_codes where code = 'GR-160'").id,
      termsIdA: one<{ id: string }>('select id from agency_terms where agency_id = ? order by effective_from limit 1', org.A).id,
    },
    own: { familyId: fam.id as string, modelId: model.id as string, specId, partId: part.id as string, repairCodeId: code.id as string, agencyId: agency.id as string },
    agent,
    server,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
    freshAgent,
    forget: (who) => void agents.delete(who),
    n,
    version,
    one,
    fresh: { draft, submitted, inReview, approved, approvedWithReturn, openRun, user: freshUser, certification, invitation, passwordReset, spec, terms, png },
  };
}

// ---------------------------------------------------------------------------------- the table

const csvSheet = () => Buffer.from('key,phase,value,unit\ncooking_height,before,35.4,in\ncooking_height,after,36.0,in\n', 'utf8');
const uniq = (f: Fixtures, prefix: string) => `${prefix}${f.n()}`;
const code = (f: Fixtures, prefix: string) => `${prefix}-${String(f.n()).padStart(3, '0')}`;

// Short names for the rows below.
const OK = 'ok' as const;

export const routes: RouteCase[] = [
  // ------------------------------------------------------------------------------ auth
  {
    method: 'POST',
    route: '/api/auth/sign-in',
    ownSession: true,
    build: ({ f }) => ({ body: { email: f.fresh.user('A', 'technician').email, password: DEMO_PASSWORD } }),
    expect: x(OK, OK, OK, OK, OK, OK, OK),
  },
  {
    method: 'POST',
    route: '/api/auth/sign-out',
    ownSession: true,
    endsSessions: true,
    build: () => ({}),
    expect: x(OK, OK, OK, OK, OK, OK, OK),
  },
  { method: 'GET', route: '/api/auth/me', build: () => ({}), expect: x(401, OK, OK, OK, OK, OK, OK) },
  {
    method: 'POST',
    route: '/api/auth/password-reset',
    build: ({ f }) => ({ body: { email: `nobody-${f.n()}@fixture.test` } }),
    expect: x(OK, OK, OK, OK, OK, OK, OK),
  },
  {
    method: 'POST',
    route: '/api/auth/password-reset/confirm',
    ownSession: true,
    build: ({ f }) => ({ body: { token: f.fresh.passwordReset().token, password: 'a long new passphrase for the fixture person' } }),
    expect: x(OK, OK, OK, OK, OK, OK, OK),
  },

  // ------------------------------------------------------------------------------ second factor and step-up
  // The sign-in's second step needs the pending cookie of a right password: without it everyone gets 401.
  ...(
    [
      ['/api/auth/second-factor/totp', { code: '123456' }],
      ['/api/auth/second-factor/recovery', { code: 'ABCDE-12345' }],
      ['/api/auth/second-factor/passkey/options', {}],
      ['/api/auth/second-factor/passkey', { response: { id: 'x', rawId: 'x', type: 'public-key', response: { clientDataJSON: 'x' } } }],
      ['/api/auth/second-factor/enrol/totp', {}],
      ['/api/auth/second-factor/enrol/totp/confirm', { code: '123456' }],
    ] as const
  ).map(([route, body]): RouteCase => ({ method: 'POST', route, build: () => ({ body }), expect: x(401, 401, 401, 401, 401, 401, 401) })),
  { method: 'POST', route: '/api/auth/step-up', build: () => ({ body: { password: DEMO_PASSWORD } }), expect: x(401, OK, OK, OK, OK, OK, OK) },
  { method: 'GET', route: '/api/account/security', build: () => ({}), expect: x(401, OK, OK, OK, OK, OK, OK) },
  // Starting an authenticator set-up: the accountant and the manufacturer admin have one already (409).
  { method: 'POST', route: '/api/account/security/totp', build: () => ({}), expect: x(401, OK, OK, OK, OK, 409, 409) },
  { method: 'POST', route: '/api/account/security/totp/confirm', build: () => ({ body: { code: '000000' } }), expect: x(401, 400, 400, 400, 400, 409, 409) },
  // Removing the only factor of a role that needs one is refused (409); nothing to remove is 404.
  { method: 'DELETE', route: '/api/account/security/totp', build: () => ({}), expect: x(401, 404, 404, 404, 404, 409, 409) },
  { method: 'POST', route: '/api/account/security/recovery-codes', build: () => ({}), expect: x(401, 409, 409, 409, 409, OK, OK) },
  { method: 'POST', route: '/api/account/security/passkeys/options', build: () => ({}), expect: x(401, OK, OK, OK, OK, OK, OK) },
  {
    method: 'POST',
    route: '/api/account/security/passkeys',
    build: () => ({ body: { response: { id: 'x', rawId: 'x', type: 'public-key', response: { clientDataJSON: 'x' } } } }),
    // No registration started for this agent (or a made-up answer): refused with a reason.
    expect: x(401, 400, 400, 400, 400, 400, 400),
  },
  { method: 'DELETE', route: '/api/account/security/passkeys/:id', build: () => ({ params: { id: 'no-such-passkey' } }), expect: x(401, 404, 404, 404, 404, 404, 404) },
  // Only an organisation's admin sets whether all its users need a second factor.
  { method: 'PUT', route: '/api/account/security/organisation', build: () => ({ body: { requireSecondFactor: false } }), expect: x(401, 403, OK, 403, 403, 403, OK) },

  // ------------------------------------------------------------------------------ claims
  {
    method: 'GET',
    route: '/api/claims',
    build: () => ({}),
    expect: x(401, OK, OK, OK, OK, OK, OK),
    check(who, res) {
      // The manufacturer admin has no claim rule: the list answers, empty.
      if (who === 'mfrAdmin' && (res.body as { items: unknown[] }).items.length !== 0) throw new Error('the manufacturer admin sees claims');
    },
  },
  {
    method: 'POST',
    route: '/api/claims',
    build: ({ f }) => ({ body: completeDraftBody(f.t) }),
    expect: x(401, OK, OK, OK, 403, 403, 403),
  },
  ...(
    [
      ['draft', x(401, OK, OK, 404, 404, 404, 404)],
      ['submitted', x(401, OK, OK, 404, OK, 404, 404)],
      ['in_review', x(401, OK, OK, 404, OK, 404, 404)],
      ['returned', x(401, OK, OK, 404, OK, 404, 404)],
      ['approved', x(401, OK, OK, 404, OK, OK, 404)],
      ['denied', x(401, OK, OK, 404, OK, 404, 404)],
      ['paid', x(401, OK, OK, 404, OK, OK, 404)],
      ['withdrawn', x(401, 404, OK, 404, 404, 404, 404)],
    ] as const
  ).map(
    ([state, expect]): RouteCase => ({
      method: 'GET',
      route: '/api/claims/:id',
      name: `${state} claim of A`,
      ids: { id: 'claim' },
      build: ({ f }) => ({ params: { id: f.claimA[state] } }),
      expect,
    }),
  ),
  {
    method: 'GET',
    route: '/api/claims/:id',
    name: "another technician's draft of A",
    ids: { id: 'claim' },
    build: ({ f }) => ({ params: { id: f.otherTechDraftA } }),
    expect: x(401, 404, OK, 404, 404, 404, 404),
  },
  {
    method: 'PATCH',
    route: '/api/claims/:id',
    name: 'a fresh draft of technician A',
    ids: { id: 'claim' },
    build: async ({ f }) => {
      const d = await f.fresh.draft();
      return { params: { id: d.id }, body: { version: d.version, complaint: 'Burner lights then drops out after a minute.' } };
    },
    expect: x(401, OK, OK, 404, 404, 404, 404),
  },
  {
    method: 'PATCH',
    route: '/api/claims/:id',
    name: 'a submitted claim of technician A',
    build: ({ f }) => ({ params: { id: f.claimA.submitted }, body: { version: f.version(f.claimA.submitted), complaint: 'Edited after filing.' } }),
    expect: x(401, 409, 409, 404, 403, 404, 404),
  },
  {
    method: 'POST',
    route: '/api/claims/:id/transitions',
    name: 'submit a fresh complete draft',
    ids: { id: 'claim' },
    build: async ({ f }) => {
      const d = await f.fresh.draft();
      return { params: { id: d.id }, body: { type: 'submit', version: d.version } };
    },
    expect: x(401, OK, OK, 404, 404, 404, 404),
  },
  {
    method: 'POST',
    route: '/api/claims/:id/transitions',
    name: 'start review of a fresh submitted claim',
    ids: { id: 'claim' },
    replay: true,
    build: async ({ f }) => {
      const s = await f.fresh.submitted();
      return { params: { id: s.id }, body: { type: 'start_review', version: s.version } };
    },
    expect: x(401, 403, 403, 404, OK, 404, 404),
  },
  {
    method: 'POST',
    route: '/api/claims/:id/transitions',
    name: 'approve a fresh claim in review',
    ids: { id: 'claim' },
    replay: true,
    build: async ({ f }) => {
      const r = await f.fresh.inReview();
      return { params: { id: r.id }, body: { type: 'approve', version: r.version } };
    },
    expect: x(401, 403, 403, 404, OK, 404, 404),
  },
  {
    method: 'POST',
    route: '/api/claims/:id/transitions',
    name: 'pay an approved claim outside a payment run',
    ids: { id: 'claim' },
    replay: true,
    build: ({ f }) => ({ params: { id: f.claimA.approved }, body: { type: 'pay', version: f.version(f.claimA.approved) } }),
    expect: x(401, 403, 403, 404, 403, 409, 404),
  },
  {
    method: 'POST',
    route: '/api/claims/:id/adjustments',
    ids: { id: 'claim' },
    build: async ({ f }) => {
      const r = await f.fresh.inReview();
      return { params: { id: r.id }, body: { version: r.version, laborLines: [{ id: r.laborLineId, approvedHours: 0.5, reason: 'Allowed time for this repair.' }] } };
    },
    expect: x(401, 403, 403, 404, OK, 404, 404),
  },
  {
    method: 'POST',
    route: '/api/claims/:id/take-over',
    ids: { id: 'claim' },
    build: async ({ f }) => {
      const r = await f.fresh.inReview();
      const other = f.fresh.user('M', 'reviewer');
      f.one('update claims set reviewer_id = ? where id = ? returning id', other.id, r.id);
      return { params: { id: r.id }, body: { version: r.version, reason: 'Covering while the first reviewer is away.' } };
    },
    expect: x(401, 403, 403, 404, OK, 404, 404),
  },
  {
    method: 'GET',
    route: '/api/claims/:id/valuation',
    ids: { id: 'claim' },
    build: ({ f }) => ({ params: { id: f.claimA.approved } }),
    expect: x(401, OK, OK, 404, OK, OK, 404),
  },
  {
    method: 'GET',
    route: '/api/claims/:id/unit-claims',
    ids: { id: 'claim' },
    build: ({ f }) => ({ params: { id: f.claimA.approved } }),
    expect: x(401, OK, OK, 404, OK, OK, 404),
  },
  {
    method: 'GET',
    route: '/api/claims/:id/changes',
    ids: { id: 'claim' },
    build: ({ f }) => ({ params: { id: f.claimA.approved } }),
    expect: x(401, OK, OK, 404, OK, OK, 404),
  },
  {
    method: 'GET',
    route: '/api/claims/:id/valuation-input',
    ids: { id: 'claim' },
    build: ({ f }) => ({ params: { id: f.claimA.approved } }),
    expect: x(401, OK, OK, 404, OK, OK, 404),
  },
  {
    method: 'POST',
    route: '/api/claims/:id/comments',
    name: 'a submitted claim of technician A',
    ids: { id: 'claim' },
    build: ({ f }) => ({ params: { id: f.claimA.submitted }, body: { body: 'Please confirm the gas pressure reading.' } }),
    expect: x(401, OK, OK, 404, OK, 404, 404),
  },
  {
    method: 'POST',
    route: '/api/claims/:id/comments',
    name: 'an approved claim of technician A',
    build: ({ f }) => ({ params: { id: f.claimA.approved }, body: { body: 'Noted.' } }),
    expect: x(401, OK, OK, 404, OK, 403, 404),
  },

  // ------------------------------------------------------------------------------ evidence and readings
  {
    method: 'GET',
    route: '/api/claims/:id/attachments',
    ids: { id: 'claim' },
    build: ({ f }) => ({ params: { id: f.evidenceClaimA } }),
    expect: x(401, OK, OK, 404, OK, 404, 404),
  },
  {
    method: 'POST',
    route: '/api/claims/:id/attachments',
    name: 'a fresh draft of technician A',
    ids: { id: 'claim' },
    build: async ({ f }) => {
      const d = await f.fresh.draft();
      return { params: { id: d.id }, multipart: { fields: { role: 'unit_overall' }, files: [{ field: 'files', name: 'unit.png', data: await f.fresh.png(), contentType: 'image/png' }] } };
    },
    expect: x(401, OK, OK, 404, 404, 404, 404),
  },
  {
    method: 'POST',
    route: '/api/claims/:id/attachments',
    name: 'a submitted claim of technician A',
    build: async ({ f }) => ({ params: { id: f.claimA.submitted }, multipart: { files: [{ field: 'files', name: 'late.png', data: await f.fresh.png(), contentType: 'image/png' }] } }),
    expect: x(401, 409, 409, 404, 403, 404, 404),
  },
  {
    method: 'GET',
    route: '/api/attachments/:id',
    ids: { id: 'attachment' },
    build: ({ f }) => ({ params: { id: f.attachmentA } }),
    expect: x(401, OK, OK, 404, OK, 404, 404),
  },
  {
    method: 'PATCH',
    route: '/api/attachments/:id',
    ids: { id: 'attachment' },
    build: async ({ f }) => ({ params: { id: (await freshAttachment(f, false)).id }, body: { role: 'failed_part' } }),
    expect: x(401, OK, OK, 404, 404, 404, 404),
  },
  {
    method: 'DELETE',
    route: '/api/attachments/:id',
    ids: { id: 'attachment' },
    build: async ({ f }) => ({ params: { id: (await freshAttachment(f, false)).id } }),
    expect: x(401, OK, OK, 404, 404, 404, 404),
  },
  {
    method: 'POST',
    route: '/api/attachments/:id/retraction',
    ids: { id: 'attachment' },
    build: async ({ f }) => ({ params: { id: (await freshAttachment(f, true)).id }, body: { reason: 'Photo of another unit on the site.' } }),
    expect: x(401, OK, OK, 404, 403, 404, 404),
  },
  {
    method: 'GET',
    route: '/api/attachments/:id/preview',
    ids: { id: 'attachment' },
    build: ({ f }) => ({ params: { id: f.attachmentA } }),
    expect: x(401, OK, OK, 404, OK, 404, 404),
  },
  {
    method: 'GET',
    route: '/api/attachments/:id/thumbnail',
    ids: { id: 'attachment' },
    build: ({ f }) => ({ params: { id: f.attachmentA } }),
    expect: x(401, OK, OK, 404, OK, 404, 404),
  },
  {
    method: 'GET',
    route: '/api/claims/:id/readings',
    ids: { id: 'claim' },
    build: ({ f }) => ({ params: { id: f.evidenceClaimA } }),
    expect: x(401, OK, OK, 404, OK, 404, 404),
  },
  {
    method: 'POST',
    route: '/api/claims/:id/readings/import',
    ids: { id: 'claim' },
    build: async ({ f }) => {
      const d = await f.fresh.draft();
      return { params: { id: d.id }, multipart: { files: [{ field: 'file', name: 'readings.csv', data: csvSheet(), contentType: 'text/csv' }] } };
    },
    expect: x(401, OK, OK, 404, 404, 404, 404),
  },

  // ------------------------------------------------------------------------------ part returns
  {
    method: 'GET',
    route: '/api/claims/:id/part-returns',
    ids: { id: 'claim' },
    build: ({ f }) => ({ params: { id: f.returnClaimA.claimId } }),
    expect: x(401, OK, OK, 404, OK, OK, 404),
  },
  {
    method: 'POST',
    route: '/api/claims/:id/part-returns/:lineId/shipment',
    ids: { id: 'claim', lineId: 'partLine' },
    build: ({ f }) => {
      const c = f.fresh.approvedWithReturn('awaiting');
      return { params: { id: c.claimId, lineId: c.lineId }, body: { carrier: 'Ground parcel', trackingNumber: `GP${f.n()}` } };
    },
    expect: x(401, 403, OK, 404, 403, 403, 404),
  },
  {
    method: 'POST',
    route: '/api/claims/:id/part-returns/:lineId/receipt',
    ids: { id: 'claim', lineId: 'partLine' },
    build: ({ f }) => {
      const c = f.fresh.approvedWithReturn('shipped');
      return { params: { id: c.claimId, lineId: c.lineId }, body: { condition: 'failure_confirmed' } };
    },
    expect: x(401, 403, 403, 404, OK, 403, 404),
  },
  {
    method: 'POST',
    route: '/api/claims/:id/part-returns/:lineId/waiver',
    ids: { id: 'claim', lineId: 'partLine' },
    build: ({ f }) => {
      const c = f.fresh.approvedWithReturn('awaiting');
      return { params: { id: c.claimId, lineId: c.lineId }, body: { reason: 'Part scrapped on site by agreement.' } };
    },
    expect: x(401, 403, 403, 404, OK, 403, 404),
  },

  // ------------------------------------------------------------------------------ lookups
  { method: 'GET', route: '/api/units/:serial', build: ({ f }) => ({ params: { serial: f.serial } }), expect: x(401, OK, OK, OK, OK, 403, OK) },
  { method: 'GET', route: '/api/catalog/models', build: () => ({}), expect: x(401, OK, OK, OK, OK, OK, OK) },
  { method: 'GET', route: '/api/catalog/parts', build: () => ({}), expect: x(401, OK, OK, OK, OK, OK, OK) },
  { method: 'GET', route: '/api/catalog/repair-codes', build: () => ({}), expect: x(401, OK, OK, OK, OK, OK, OK) },
  { method: 'GET', route: '/api/home', build: () => ({}), expect: x(401, OK, OK, OK, OK, OK, OK) },
  { method: 'GET', route: '/api/postal-codes/:code', build: ({ f }) => ({ params: { code: f.postalCode } }), expect: x(401, OK, OK, OK, OK, OK, OK) },

  // ------------------------------------------------------------------------------ agency administration
  { method: 'GET', route: '/api/agency/users', build: () => ({}), expect: x(401, 403, OK, 403, 403, 403, 403) },
  {
    method: 'POST',
    route: '/api/agency/users',
    build: ({ f }) => ({ body: { email: `new-tech-${f.n()}@fixture.test`, role: 'technician' } }),
    expect: x(401, 403, OK, 403, 403, 403, 403),
  },
  {
    method: 'PATCH',
    route: '/api/agency/users/:id',
    ids: { id: 'agencyUser' },
    build: ({ f }) => ({ params: { id: f.fresh.user('A', 'technician').id }, body: { role: 'agency_admin' } }),
    expect: x(401, 403, OK, 403, 403, 403, 403),
  },
  { method: 'GET', route: '/api/agency/certifications', build: () => ({}), expect: x(401, OK, OK, OK, 403, 403, 403) },
  { method: 'GET', route: '/api/agency/certifications/expiring', build: () => ({}), expect: x(401, OK, OK, OK, 403, 403, 403) },
  {
    method: 'POST',
    route: '/api/agency/certifications',
    build: ({ f }) => ({
      body: { userId: f.fresh.user('A', 'technician').id, familyId: f.seeded.familyId, certificateNumber: uniq(f, 'CERT-'), validFrom: '2026-01-01', validTo: '2028-12-31' },
    }),
    expect: x(401, 403, OK, 403, 403, 403, 403),
  },
  {
    method: 'PATCH',
    route: '/api/agency/certifications/:id',
    ids: { id: 'certification' },
    build: ({ f }) => ({ params: { id: f.certificationA }, body: { certificateNumber: uniq(f, 'RENEWED-') } }),
    expect: x(401, 403, OK, 403, 403, 403, 403),
  },
  {
    method: 'POST',
    route: '/api/agency/certifications/:id/revocation',
    ids: { id: 'certification' },
    build: ({ f }) => ({ params: { id: f.fresh.certification() }, body: { reason: 'Issued in error' } }),
    expect: x(401, 403, OK, 403, 403, 403, 403),
  },
  { method: 'GET', route: '/api/agency/families', build: () => ({}), expect: x(401, OK, OK, OK, 403, 403, 403) },
  { method: 'GET', route: '/api/agency/profile', build: () => ({}), expect: x(401, 403, OK, 403, 403, 403, 403) },
  {
    method: 'PATCH',
    route: '/api/agency/profile',
    build: () => ({ body: { city: 'Harbor City' } }),
    expect: x(401, 403, OK, 403, 403, 403, 403),
  },

  // ------------------------------------------------------------------------------ invitations
  {
    method: 'POST',
    route: '/api/invitations/preview',
    build: ({ f }) => ({ body: { token: f.fresh.invitation('A', 'technician').token } }),
    expect: x(OK, OK, OK, OK, OK, OK, OK),
  },
  {
    method: 'POST',
    route: '/api/invitations/accept',
    build: ({ f }) => ({ body: { token: f.fresh.invitation('A', 'technician').token, name: 'Fixture Invitee', password: 'a long passphrase chosen by the invitee' } }),
    expect: x(OK, OK, OK, OK, OK, OK, OK),
  },
  { method: 'GET', route: '/api/invitations', build: () => ({}), expect: x(401, 403, OK, 403, 403, 403, OK) },
  {
    method: 'POST',
    route: '/api/invitations',
    name: 'a technician',
    build: ({ f }) => ({ body: { email: `invited-${f.n()}@fixture.test`, role: 'technician' } }),
    expect: x(401, 403, OK, 403, 403, 403, 400),
  },
  {
    method: 'POST',
    route: '/api/invitations',
    name: 'a reviewer',
    build: ({ f }) => ({ body: { email: `invited-${f.n()}@fixture.test`, role: 'reviewer' } }),
    expect: x(401, 403, 400, 403, 403, 403, OK),
  },
  {
    method: 'POST',
    route: '/api/invitations/:id/resend',
    name: "agency A's technician invitation",
    ids: { id: 'invitation' },
    build: ({ f }) => ({ params: { id: f.invitationTechA.id } }),
    expect: x(401, 404, OK, 404, 404, 404, 404),
  },
  {
    method: 'POST',
    route: '/api/invitations/:id/resend',
    name: "agency A's admin invitation",
    build: ({ f }) => ({ params: { id: f.invitationAdminA.id } }),
    expect: x(401, 404, OK, 404, 404, 404, OK),
  },
  {
    method: 'POST',
    route: '/api/invitations/:id/revoke',
    ids: { id: 'invitation' },
    build: ({ f }) => ({ params: { id: f.fresh.invitation('A', 'technician').id } }),
    expect: x(401, 404, OK, 404, 404, 404, 404),
  },
  {
    method: 'DELETE',
    route: '/api/invitations/:id',
    ids: { id: 'invitation' },
    build: ({ f }) => ({ params: { id: f.fresh.invitation('A', 'technician').id } }),
    expect: x(401, 404, OK, 404, 404, 404, 404),
  },

  // ------------------------------------------------------------------------------ payments and exports
  { method: 'GET', route: '/api/payment-runs/ready', build: () => ({}), expect: x(401, 403, 403, 403, 403, OK, 403) },
  { method: 'GET', route: '/api/payment-runs', build: () => ({}), expect: x(401, 403, OK, 403, 403, OK, 403) },
  {
    method: 'POST',
    route: '/api/payment-runs',
    build: ({ f }) => ({ body: { agencyId: f.org.A, claimIds: [f.fresh.approved()] } }),
    expect: x(401, 403, 403, 403, 403, OK, 403),
  },
  {
    method: 'GET',
    route: '/api/payment-runs/:id',
    ids: { id: 'paymentRun' },
    build: ({ f }) => ({ params: { id: f.openRunA } }),
    expect: x(401, 403, OK, 403, 403, OK, 403),
  },
  {
    method: 'POST',
    route: '/api/payment-runs/:id/paid',
    ids: { id: 'paymentRun' },
    build: async ({ f }) => ({ params: { id: await f.fresh.openRun() }, body: { paymentDate: '2026-06-15', reference: uniq(f, 'REF-') } }),
    expect: x(401, 403, 403, 403, 403, OK, 403),
  },
  {
    method: 'POST',
    route: '/api/payment-runs/:id/void',
    ids: { id: 'paymentRun' },
    build: async ({ f }) => ({ params: { id: await f.fresh.openRun() } }),
    expect: x(401, 403, 403, 403, 403, OK, 403),
  },
  { method: 'GET', route: '/api/exports/paid-claims.csv', build: () => ({}), expect: x(401, 403, OK, 403, 403, OK, 403) },

  // ------------------------------------------------------------------------------ manufacturer administration
  ...adminRoutes(),

  // ------------------------------------------------------------------------------ development mailbox (the in-process sink is on)
  { method: 'GET', route: '/api/dev/mailbox', build: () => ({ query: { to: 'nobody@fixture.test' } }), expect: x(OK, OK, OK, OK, OK, OK, OK) },
  // A DNS-rebound page names its own host: refused before any route, whoever is signed in.
  { method: 'GET', route: '/api/dev/mailbox', name: 'Host evil.example (DNS rebinding)', headers: { Host: 'evil.example' }, build: () => ({}), expect: x(421, 421, 421, 421, 421, 421, 421) },
  { method: 'GET', route: '/api/auth/me', name: 'Host evil.example (DNS rebinding)', headers: { Host: 'evil.example:3000' }, build: () => ({}), expect: x(421, 421, 421, 421, 421, 421, 421) },
  {
    method: 'POST',
    route: '/api/auth/sign-out',
    name: 'Host and Origin both evil.example',
    headers: { Host: 'evil.example', Origin: 'http://evil.example' },
    build: () => ({}),
    expect: x(421, 421, 421, 421, 421, 421, 421),
  },
  // A write from a foreign Origin is refused before authentication (nothing ends, nothing is written).
  { method: 'POST', route: '/api/auth/sign-out', name: 'foreign Origin', headers: { Origin: 'https://attacker.example' }, build: () => ({}), expect: x(403, 403, 403, 403, 403, 403, 403) },
];

/** A photo on a fresh draft of technician A, the draft submitted when asked. */
async function freshAttachment(f: Fixtures, submit: boolean): Promise<{ id: string; claimId: string }> {
  const d = await f.fresh.draft();
  const tech = await f.freshAgent('techA');
  const up = await tech
    .post(`/api/claims/${d.id}/attachments`)
    .set('Origin', ORIGIN)
    .field('role', 'unit_overall')
    .attach('files', await f.fresh.png(), { filename: 'unit.png', contentType: 'image/png' });
  if (up.status !== 201) throw new Error(`fixture upload: ${up.status}`);
  if (submit) {
    const s = await tech.post(`/api/claims/${d.id}/transitions`).set('Origin', ORIGIN).send({ type: 'submit', version: f.version(d.id) });
    if (s.status !== 200) throw new Error(`fixture submit: ${s.status} ${JSON.stringify(s.body)}`);
  }
  return { id: (up.body.attachments as { id: string }[])[0]!.id, claimId: d.id };
}

/** /api/admin: the manufacturer admin's alone; every other signed-in principal gets 403. */
function adminRoutes(): RouteCase[] {
  const only = x(401, 403, 403, 403, 403, 403, OK);
  const r = (method: RouteCase['method'], route: string, build: RouteCase['build']): RouteCase => ({ method, route: `/api/admin${route}`, build, expect: only });
  return [
    r('GET', '/families', () => ({})),
    r('POST', '/families', ({ f }) => ({ body: { code: code(f, 'TF'), name: 'Table family', fuel: 'electric' } })),
    r('PATCH', '/families/:id', ({ f }) => ({ params: { id: f.own.familyId }, body: { name: uniq(f, 'Table family ') } })),
    r('GET', '/models', () => ({})),
    r('POST', '/models', ({ f }) => ({
      body: { familyId: f.own.familyId, modelNumber: code(f, 'TM'), name: 'Table model', partsMonths: 12, laborMonths: 6, capMonthsFromShip: 18, installGraceDays: 60 },
    })),
    r('PATCH', '/models/:id', ({ f }) => ({ params: { id: f.own.modelId }, body: { name: uniq(f, 'Table model ') } })),
    r('POST', '/models/:id/reading-specs', ({ f }) => ({
      params: { id: f.own.modelId },
      body: { key: `table_${f.n()}`, label: 'Table reading', unit: 'V', nominal: 120, tolerance: 6, phase: 'before' },
    })),
    r('PATCH', '/models/:id/reading-specs/:specId', ({ f }) => ({ params: { id: f.own.modelId, specId: f.own.specId }, body: { label: uniq(f, 'Relabelled ') } })),
    r('DELETE', '/models/:id/reading-specs/:specId', async ({ f }) => ({ params: { id: f.own.modelId, specId: await f.fresh.spec() } })),
    r('GET', '/parts', () => ({})),
    r('POST', '/parts', ({ f }) => ({ body: { partNumber: code(f, 'TP'), description: 'Table part', listPriceCents: 2_500 } })),
    r('PATCH', '/parts/:id', ({ f }) => ({ params: { id: f.own.partId }, body: { description: uniq(f, 'Table part ') } })),
    r('GET', '/parts/:id/prices', ({ f }) => ({ params: { id: f.seeded.partId } })),
    r('GET', '/repair-codes', () => ({})),
    r('POST', '/repair-codes', ({ f }) => ({ body: { code: code(f, 'TR'), familyId: f.own.familyId, description: 'Table repair', allowedHours: 1.5 } })),
    r('PATCH', '/repair-codes/:id', ({ f }) => ({ params: { id: f.own.repairCodeId }, body: { description: uniq(f, 'Table repair ') } })),
    r('GET', '/repair-codes/:id/allowances', ({ f }) => ({ params: { id: f.seeded.repairCodeId } })),
    r('GET', '/mileage-rates', () => ({})),
    r('POST', '/mileage-rates', ({ f }) => {
      const y = 2200 + f.n();
      return { body: { currency: 'CAD', unit: 'km', effectiveFrom: `${y}-01-01`, effectiveTo: `${y}-12-31`, rateCents: '41.5', source: 'Matrix fixture rate' } };
    }),
    r('PATCH', '/mileage-rates/:id', () => ({ params: { id: 'mr-usd-2026' }, body: { effectiveTo: '2026-12-31', reason: 'Matrix fixture: same last day' } })),
    r('GET', '/agencies', () => ({})),
    r('POST', '/agencies', ({ f }) => ({
      body: { name: uniq(f, 'Table Agency '), contactEmail: null, addressLine: null, city: null, region: null, postalCode: null, timeZone: 'America/Denver', adminEmail: `agency-admin-${f.n()}@fixture.test` },
    })),
    r('GET', '/agencies/:id', ({ f }) => ({ params: { id: f.org.A } })),
    r('PATCH', '/agencies/:id', ({ f }) => ({ params: { id: f.own.agencyId }, body: { city: uniq(f, 'Town ') } })),
    r('POST', '/agencies/:id/admin-invitation', ({ f }) => ({ params: { id: f.own.agencyId }, body: { email: `replacement-admin-${f.n()}@fixture.test` } })),
    r('GET', '/agencies/:id/terms', ({ f }) => ({ params: { id: f.org.A } })),
    r('POST', '/agencies/:id/terms', ({ f }) => {
      const y = 2100 + f.n();
      return {
        params: { id: f.own.agencyId },
        body: {
          effectiveFrom: `${y}-01-01`,
          effectiveTo: `${y}-12-31`,
          laborRateCents: 9_500,
          travelRateCents: 4_000,
          mileageRateCents: null,
          maxRoundTripMiles: 120,
          maxTravelHours: 3,
          partsDiscountBps: 0,
          partsHandlingBps: 500,
          overtimeMultiplier: 1.5,
          filingWindowDays: 30,
        },
      };
    }),
    r('PATCH', '/agencies/:id/terms/:termsId', ({ f }) => ({ params: { id: f.own.agencyId, termsId: f.fresh.terms() }, body: { laborRateCents: 9_900 } })),
    r('GET', '/users', () => ({})),
    r('POST', '/users', ({ f }) => ({ body: { email: `mfr-person-${f.n()}@fixture.test`, role: 'reviewer' } })),
    r('PATCH', '/users/:id', ({ f }) => ({ params: { id: f.fresh.user('M', 'reviewer').id }, body: { role: 'accountant' } })),
    r('GET', '/approval-limits', () => ({})),
    r('PATCH', '/approval-limits/:userId', ({ f }) => ({ params: { userId: f.fresh.user('M', 'reviewer').id }, body: { limitCents: 250_000 } })),
  ];
}

// ---------------------------------------------------------------------------------- the app's routes

interface RouterLayer {
  rawPath?: unknown;
  route?: { path: string | string[]; methods: Record<string, boolean> };
  handle: { stack?: RouterLayer[] };
}

/**
 * Every route Express knows, as "METHOD /path", from the app's router stack: nested routers are
 * walked with their mount paths (router 2 keeps each layer's raw path), and a trailing slash is
 * dropped (/api/claims/ is /api/claims).
 */
export function appRoutes(app: unknown): string[] {
  const root = (app as { router?: { stack: RouterLayer[] } }).router;
  if (!root) throw new Error('the app has no router');
  const out: string[] = [];
  const walk = (stack: RouterLayer[], prefix: string) => {
    for (const layer of stack) {
      const raw = typeof layer.rawPath === 'string' ? layer.rawPath : '';
      if (layer.route) {
        for (const p of Array.isArray(layer.route.path) ? layer.route.path : [layer.route.path]) {
          const path = `${prefix}${p}`.replace(/\/+$/, '') || '/';
          for (const m of Object.keys(layer.route.methods)) if (m !== '_all') out.push(`${m.toUpperCase()} ${path}`);
        }
      } else if (layer.handle?.stack) {
        if (typeof layer.rawPath !== 'string') throw new Error('a mounted router without a string mount path: the walk cannot name its routes');
        walk(layer.handle.stack, prefix + (raw === '/' ? '' : raw));
      }
    }
  };
  walk(root.stack, '');
  return out;
}
