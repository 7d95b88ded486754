import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { HARBORVIEW, PRAIRIE, agencyIdByName, completeDraftBody, makeClaimsApp, type Agent } from './claims-fixtures';

// A unit lookup must not tell one agency where another agency works (OWASP ASVS 5.0 V8.2.2).
// A site is shown only from the agency's own claims on the unit or from the manufacturer's
// registration of the unit (units.site_id).

type App = Awaited<ReturnType<typeof makeClaimsApp>>;

describe('the site a unit lookup shows', () => {
  let t: App;
  let techA: Agent;
  let techB: Agent;
  let adminB: Agent;
  let reviewer: Agent;
  let agencyA: string;
  let agencyB: string;
  const SERIAL = 'LC-TEST-SITE-0001';
  const q = <T>(sql: string, ...args: unknown[]) => t.db.$client.prepare(sql).all(...args) as T[];

  beforeAll(async () => {
    t = await makeClaimsApp();
    techA = await t.signIn('techA');
    techB = await t.signIn('techB');
    adminB = await t.signIn('adminB');
    reviewer = await t.signIn('reviewer');
    agencyA = agencyIdByName(t, HARBORVIEW);
    agencyB = agencyIdByName(t, PRAIRIE);
    // A unit registered at a restaurant, of the grill model the complete draft uses.
    const model = (q<{ model_id: string }>("select u.model_id from units u where u.serial = ?", completeDraftBody(t).serial))[0].model_id;
    t.db.$client
      .prepare("insert into sites (id, name, address_line, city, region, postal_code, latitude, longitude, created_at) values ('site-test', 'Test Diner 9', '1 Test Way', 'Testville', 'KS', '67202', 37.68, -97.33, '2026-01-01T00:00:00.000Z')")
      .run();
    t.db.$client
      .prepare("insert into units (id, serial, model_id, revision, ship_date, install_date, site_id, created_at) values ('unit-test', ?, ?, 'C', '2026-01-10', '2026-02-01', 'site-test', '2026-01-10T00:00:00.000Z')")
      .run(SERIAL, model);
  });
  afterAll(async () => {
    await t.close();
  });

  const siteOf = async (agent: Agent, serial: string) => {
    const res = await agent.get(`/api/units/${encodeURIComponent(serial)}`);
    expect(res.status).toBe(200);
    return res.body.site as null | { id: string; addressLine: string };
  };

  it('a registered site is shown to every agency; once the registration is gone, only the agency whose claim carries it still sees it', async () => {
    expect((await siteOf(techB, SERIAL))?.id).toBe('site-test');
    // agency A files on the unit while it is registered: its claim carries the site
    const draft = await techA.post('/api/claims').send(completeDraftBody(t, { serial: SERIAL }));
    expect(draft.status).toBe(201);
    expect(draft.body.site?.id).toBe('site-test');
    // the manufacturer withdraws the registration (say, it was entered for the wrong unit)
    t.db.$client.prepare("update units set site_id = null where id = 'unit-test'").run();

    expect((await siteOf(techA, SERIAL))?.id).toBe('site-test');
    expect(await siteOf(techB, SERIAL)).toBeNull();
    expect(await siteOf(adminB, SERIAL)).toBeNull();

    // agency B cannot learn it by filing a draft either
    const theirs = await techB.post('/api/claims').send(completeDraftBody(t, { serial: SERIAL }));
    expect(theirs.status).toBe(201);
    expect(theirs.body.site).toBeNull();
    const moved = await techB.patch(`/api/claims/${theirs.body.id}`).send({ version: theirs.body.version, serial: SERIAL.toLowerCase() });
    expect(moved.status).toBe(200);
    expect(moved.body.site).toBeNull();
  });

  it('the manufacturer sees the registration, else the site of the latest claim', async () => {
    // agency A's draft is not visible to the reviewer, but the site is the manufacturer's to know
    const site = await siteOf(reviewer, SERIAL);
    expect(site?.id).toBe('site-test');
  });

  it('in the demo data, lookups of units agency B never touched show no site that only agency A’s claims carry', async () => {
    const unregistered = q<{ serial: string; site_id: string }>(
      `select u.serial, c.site_id from units u join claims c on c.unit_id = u.id
       where u.site_id is null and c.agency_id = ? and c.site_id is not null
         and not exists (select 1 from claims c2 where c2.unit_id = u.id and c2.agency_id = ?)
       group by u.id order by u.serial limit 15`,
      agencyA,
      agencyB,
    );
    expect(unregistered.length).toBeGreaterThan(0);
    let revealed = 0;
    for (const u of unregistered) {
      if ((await siteOf(adminB, u.serial)) !== null) revealed++;
      expect((await siteOf(techA, u.serial))?.id).toBe(u.site_id);
    }
    expect(revealed).toBe(0);
    // and every site agency B is shown is a registration or on one of its own claims
    const sample = q<{ serial: string }>('select serial from units order by serial limit 25');
    for (const { serial } of sample) {
      const s = await siteOf(techB, serial);
      if (!s) continue;
      const registered = q('select 1 from units where serial = ? and site_id = ?', serial, s.id).length > 0;
      const own = q('select 1 from claims c join units u on u.id = c.unit_id where u.serial = ? and c.agency_id = ? and c.site_id = ?', serial, agencyB, s.id).length > 0;
      expect(registered || own, serial).toBe(true);
    }
  });

  it('the case-insensitive serial look-up walks an index, not the units table', () => {
    const plan = q<{ detail: string }>('explain query plan select id from units where lower(serial) = lower(?)', 'lc-test-site-0001').map((r) => r.detail);
    expect(plan.join(' | ')).toMatch(/USING INDEX units_serial_lower_idx/);
  });
});
