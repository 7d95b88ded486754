import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { TestApp } from '../factories/test-app';
import {
  appRoutes,
  makeFixtures,
  makeTableApp,
  matches,
  principals,
  PENDING_SIGN_IN_ROUTES,
  PUBLIC_ROUTES,
  routeKey,
  routes,
  send,
  type Agent,
  type Fixtures,
  type IdKind,
  type Outcome,
  type Principal,
  type Req,
  type RouteCase,
} from './authz-routes';

// Every /api route x the seven principals, from one table (OWASP ASVS 5.0 8.1.1 documented
// rules, 8.2.1 function-level and 8.2.2 data-level access, 8.3.1 enforced on the server), and
// agency B replaying every record id of agency A (8.2.2, 8.4.1 multi-tenant isolation).

/**
 * A request built for a refused cell changes nothing, so the other refused cells of the row reuse
 * it; each cell that may succeed gets a request of its own (a fresh draft, run, invitation...).
 */
const refusedRequest = new Map<RouteCase, Req>();

async function answer(f: Fixtures, row: RouteCase, who: Principal): Promise<{ status: number; body: unknown }> {
  const mayChange = row.expect[who] === 'ok' || row.ownSession;
  let req = mayChange ? undefined : refusedRequest.get(row);
  if (!req) req = await row.build({ who, f });
  if (!mayChange) refusedRequest.set(row, req);
  const agent = row.ownSession ? await f.freshAgent(who) : await f.agent(who);
  const res = await send(agent, row.method, row.route, req, row.headers);
  if (row.endsSessions) f.forget(who);
  row.check?.(who, res);
  return { status: res.status, body: res.body };
}

describe('authorization matrix: every route x every principal', () => {
  let t: TestApp;
  let f: Fixtures;

  beforeAll(async () => {
    t = await makeTableApp();
    f = await makeFixtures(t);
  }, 60_000);
  afterAll(async () => {
    await f?.close();
    await t.close();
  });

  it('the table lists every route the app serves, and no route the app does not have', () => {
    const served = appRoutes(t.app);
    expect(served.length).toBeGreaterThan(50);
    expect(new Set(served).size).toBe(served.length);
    const listed = new Set(routes.map(routeKey));
    const missing = served.filter((r) => !listed.has(r));
    const stale = [...listed].filter((r) => !served.includes(r));
    expect(missing, 'routes the app serves that the table does not list').toEqual([]);
    expect(stale, 'routes the table lists that the app no longer serves').toEqual([]);
  });

  it('the route walk sees a route that is added (the completeness check can fail)', async () => {
    const { default: express } = await import('express');
    const app = express();
    const api = express.Router();
    const inner = express.Router();
    inner.get('/:id/ghost', (_req, res) => void res.end());
    api.use('/claims', inner);
    app.use('/api', api);
    expect(appRoutes(app)).toEqual(['GET /api/claims/:id/ghost']);
  });

  it('anonymous gets 401 on every route but the public ones, which are exactly the sign-in, reset, invitation and dev-mailbox routes', () => {
    for (const row of routes) {
      const key = routeKey(row);
      // A Host or Origin probe is refused before authentication: 421 or 403, also for anonymous.
      if (row.headers) continue;
      if (PUBLIC_ROUTES.has(key)) expect(row.expect.anonymous, key).not.toBe(401);
      else expect(row.expect.anonymous, key).toBe(401);
    }
    expect([...PUBLIC_ROUTES].every((k) => routes.some((r) => routeKey(r) === k))).toBe(true);
  });

  it('every route has at least one principal it serves and one it refuses (no route is open to all signed-in roles by accident of the table)', () => {
    const openToAll = new Set(['GET /api/claims', 'GET /api/auth/me', 'GET /api/home', 'GET /api/catalog/models', 'GET /api/catalog/parts', 'GET /api/catalog/repair-codes', 'GET /api/postal-codes/:code',
      // Every signed-in user confirms it is them, and manages their own second factors.
      'POST /api/auth/step-up', 'GET /api/account/security', 'POST /api/account/security/passkeys/options']);
    for (const key of new Set(routes.map(routeKey))) {
      const rows = routes.filter((r) => routeKey(r) === key);
      const cells = rows.flatMap((r) => principals.map((p) => r.expect[p]));
      // The second step of an enrolment serves only the answer to its first step (tested in second-factor.test.ts).
      // Removing a factor serves only a user who has one to spare (tested there too).
      const secondSteps = ['POST /api/account/security/totp/confirm', 'POST /api/account/security/passkeys', 'DELETE /api/account/security/totp', 'DELETE /api/account/security/passkeys/:id'];
      expect(cells.includes('ok') || PENDING_SIGN_IN_ROUTES.has(key) || secondSteps.includes(key), `${key} serves someone`).toBe(true);
      if (!PUBLIC_ROUTES.has(key) && !openToAll.has(key) && !PENDING_SIGN_IN_ROUTES.has(key)) expect(cells.filter((c) => c !== 'ok' && c !== 401).length, `${key} refuses a signed-in principal`).toBeGreaterThan(0);
    }
  });

  it.each(routes.map((r) => [`${routeKey(r)}${r.name ? ` (${r.name})` : ''}`, r] as const))('%s', async (_label, row) => {
    const got = {} as Record<Principal, Outcome>;
    const unauthenticatedBodies: unknown[] = [];
    for (const who of principals) {
      const res = await answer(f, row, who);
      const want = row.expect[who];
      got[who] = matches(want, res.status) ? want : res.status;
      if (res.status === 401) unauthenticatedBodies.push(res.body);
      expect(res.status, `${who}: never a server error`).toBeLessThan(500);
    }
    expect(got).toEqual(row.expect);
    for (const body of unauthenticatedBodies) expect(body).toMatchObject({ error: { code: 'unauthenticated' } });
  });
});

// ------------------------------------------------------------------------------------ cross-tenant

const GHOST = '00000000-0000-4000-8000-000000000000';

describe('cross-tenant: agency B replays every id of agency A', () => {
  let t: TestApp;
  let f: Fixtures;
  const templates: Array<{ row: RouteCase; req: Req }> = [];
  const idsOfA = {} as Record<IdKind, string[]>;
  const b = {} as Record<'techB' | 'adminB', Agent>;
  let replayed = 0;

  /** What a write could change anywhere outside the audit log, to prove nothing did. */
  const footprint = () => {
    const q = (sql: string) => t.db.$client.prepare(sql).all();
    return JSON.stringify([
      q('select id, state, version, updated_at from claims order by id'),
      q('select count(*) from comments'),
      q('select count(*) from claim_events'),
      q('select id, claim_id from attachments order by id'),
      q('select id, return_status from claim_part_lines order by id'),
      q('select id, state, reference from payment_runs order by id'),
      q('select id, role, active, session_version from users order by id'),
      q('select id, certificate_number, valid_to from certifications order by id'),
      q('select id, token_hash, revoked_at, accepted_at from invitations order by id'),
      q('select count(*) from outbox'),
    ]);
  };

  beforeAll(async () => {
    t = await makeTableApp();
    f = await makeFixtures(t);
    // The replayed requests: the first row of each route that takes an id of A, and marked variants.
    const seen = new Set<string>();
    for (const row of routes) {
      if (!row.ids) continue;
      const key = routeKey(row);
      if (seen.has(key) && !row.replay) continue;
      seen.add(key);
      templates.push({ row, req: await row.build({ who: 'adminA', f }) });
    }
    // A second photo, so more than one attachment id is replayed.
    const d = await f.fresh.draft();
    const techA = await f.agent('techA');
    const up = await techA.post(`/api/claims/${d.id}/attachments`).set('Origin', 'http://localhost:3000').attach('files', await f.fresh.png(), { filename: 'second.png', contentType: 'image/png' });
    expect(up.status).toBe(201);
    f.fresh.invitation('A', 'agency_admin');

    const all = (sql: string, ...p: unknown[]) => (t.db.$client.prepare(sql).all(...p) as Array<{ id: string }>).map((r) => r.id);
    idsOfA.claim = all('select id from claims where agency_id = ?', f.org.A);
    idsOfA.attachment = all('select id from attachments where organisation_id = ?', f.org.A);
    idsOfA.partLine = all('select l.id from claim_part_lines l join claims c on c.id = l.claim_id where c.agency_id = ?', f.org.A);
    idsOfA.paymentRun = all('select id from payment_runs where agency_id = ?', f.org.A);
    idsOfA.agencyUser = all('select id from users where organisation_id = ?', f.org.A);
    idsOfA.certification = all('select id from certifications where organisation_id = ?', f.org.A);
    idsOfA.invitation = all('select id from invitations where organisation_id = ?', f.org.A);
    b.techB = await f.freshAgent('techB');
    b.adminB = await f.freshAgent('adminB');
  }, 60_000);
  afterAll(async () => {
    await f?.close();
    await t.close();
  });

  it('agency A has records of every kind to aim at', () => {
    expect(idsOfA.claim.length).toBeGreaterThan(20);
    for (const kind of Object.keys(idsOfA) as IdKind[]) expect(idsOfA[kind].length, kind).toBeGreaterThan(0);
    const kinds = new Set(templates.flatMap(({ row }) => Object.values(row.ids ?? {})));
    expect([...kinds].sort()).toEqual(['agencyUser', 'attachment', 'certification', 'claim', 'invitation', 'partLine', 'paymentRun']);
  });

  /** The targets of one route: every id of A for its main parameter; a part line goes with its own claim. */
  function targets(row: RouteCase): Array<Record<string, string>> {
    const ids = row.ids!;
    if (ids.lineId === 'partLine') {
      return (t.db.$client.prepare('select l.id as lineId, l.claim_id as id from claim_part_lines l join claims c on c.id = l.claim_id where c.agency_id = ?').all(f.org.A) as Array<{ id: string; lineId: string }>).map(
        (r) => ({ id: r.id, lineId: r.lineId }),
      );
    }
    const [param, kind] = Object.entries(ids)[0];
    return idsOfA[kind].map((id) => ({ [param]: id }));
  }

  const withVersion = (body: unknown, claimId: string) => {
    if (!body || typeof body !== 'object' || !('version' in body)) return body;
    const row = t.db.$client.prepare('select version from claims where id = ?').get(claimId) as { version: number } | undefined;
    return { ...body, version: row?.version ?? 1 };
  };

  const variants = [
    { name: 'plain', headers: {}, query: {}, body: (b: unknown) => b },
    {
      name: "agency A's id in the query and the tenant headers",
      headers: (a: string) => ({ 'X-Agency-Id': a, 'X-Organisation-Id': a }),
      query: (a: string) => ({ agencyId: a, agency: a, organisationId: a }),
      body: (b: unknown) => b,
    },
    {
      name: "agency A's id in the body as well",
      headers: (a: string) => ({ 'X-Agency-Id': a, 'X-Organisation-Id': a }),
      query: (a: string) => ({ agencyId: a, agency: a }),
      body: (b: unknown, a: string) => (b && typeof b === 'object' ? { ...b, agencyId: a } : { agencyId: a }),
    },
  ] as const;

  it.each(routes.filter((r) => r.ids).map((r) => [`${routeKey(r)}${r.name ? ` (${r.name})` : ''}`, r] as const))('%s: 0 answers 2xx, each the same as for an id that never existed', async (_l, row) => {
    const template = templates.find((x) => x.row === row);
    if (!template) {
      // A variant of a route already replayed through its first row.
      expect(templates.some((x) => routeKey(x.row) === routeKey(row))).toBe(true);
      return;
    }
    const before = footprint();
    const jsonBody = row.method !== 'GET' && !template.req.multipart;
    let sent = 0;
    for (const who of ['techB', 'adminB'] as const) {
      for (const v of variants) {
        if (v.name === "agency A's id in the body as well" && !jsonBody) continue;
        const headers = typeof v.headers === 'function' ? v.headers(f.org.A) : v.headers;
        const query = typeof v.query === 'function' ? v.query(f.org.A) : v.query;
        const req = (params: Record<string, string>): Req => ({
          params,
          query: { ...template.req.query, ...query },
          body: jsonBody ? v.body(withVersion(template.req.body, row.ids!.id === 'claim' ? params.id : ''), f.org.A) : undefined,
          multipart: template.req.multipart,
        });
        const ghostParams = Object.fromEntries(Object.keys(row.ids!).map((k) => [k, GHOST]));
        const ghost = await send(b[who], row.method, row.route, req(ghostParams), headers);
        if (v.name === "agency A's id in the body as well") {
          // A body naming another agency is refused whole by the strict schemas, whatever the id.
          expect([400, 403, 404], `${who} ${v.name}: the ghost id`).toContain(ghost.status);
        } else if (who === 'adminB') {
          // Agency B's admin may use every one of these routes on B's own records: only "not found" is right.
          expect(ghost.status, `${who} ${v.name}: the ghost id`).toBe(404);
        } else {
          // Technician B is either refused the function outright (403 whatever the id) or finds nothing.
          expect([403, 404], `${who} ${v.name}: the ghost id`).toContain(ghost.status);
        }
        const all = targets(row);
        for (let i = 0; i < all.length; i += 8) {
          const batch = all.slice(i, i + 8);
          const answers = await Promise.all(batch.map((params) => send(b[who], row.method, row.route, req(params), headers)));
          answers.forEach((res, k) => {
            const where = `${who} ${v.name} ${JSON.stringify(batch[k])}`;
            expect(res.status, where).toBeGreaterThanOrEqual(400);
            expect({ status: res.status, body: res.body }, where).toEqual({ status: ghost.status, body: ghost.body });
          });
          sent += batch.length;
        }
      }
    }
    expect(sent).toBeGreaterThan(0);
    replayed += sent;
    expect(footprint()).toBe(before);
  });

  it('thousands of replays were made, none answered 2xx', () => {
    expect(replayed).toBeGreaterThan(2_000);
  });

  it('lists with agency A named in the query, the headers or a filter show agency B nothing of A', async () => {
    for (const who of ['techB', 'adminB'] as const) {
      const a = b[who];
      for (const res of [
        await a.get(`/api/claims?agency=${f.org.A}&limit=100`),
        await a.get('/api/claims?limit=100').set('X-Agency-Id', f.org.A).set('X-Organisation-Id', f.org.A),
        await a.get(`/api/agency/certifications?userId=${f.user.techA}`),
      ]) {
        expect(res.status).toBe(200);
        const items = res.body.items as Array<Record<string, unknown>>;
        for (const i of items) expect(JSON.stringify(i)).not.toContain(f.org.A);
        for (const i of items) expect(i.userId ?? i.technicianId).not.toBe(f.user.techA);
      }
    }
    const runs = await b.adminB.get('/api/payment-runs').set('X-Agency-Id', f.org.A);
    expect(runs.status).toBe(200);
    for (const r of runs.body.items) expect(r.agencyId).toBe(f.org.B);
    const csv = await b.adminB.get(`/api/exports/paid-claims.csv?agency=${f.org.A}`);
    expect(csv.status).toBe(404);
  });
});
