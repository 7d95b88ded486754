/** Unit lookup by serial, the catalogue, the per-role home page and the local mailbox. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createApp } from '../../server/app';
import { smtpMailer } from '../../server/lib/mail/mailer';
import { demoAccounts, type DemoKey } from '../factories/test-app';
import { allClaims, daysAgo, grillFixture, makeClaimsApp, userId, type Agent } from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
const agents = {} as Record<DemoKey, Agent>;

beforeAll(async () => {
  t = await makeClaimsApp();
  for (const k of Object.keys(demoAccounts) as DemoKey[]) agents[k] = await t.signIn(k);
});
afterAll(async () => {
  await t.close();
});

describe('GET /api/units/:serial', () => {
  it('gives the unit, model, family, site and coverage on the date asked', async () => {
    const { unit } = grillFixture(t);
    const u = t.db.$client.prepare('select ship_date, install_date from units where id = ?').get(unit.id) as { ship_date: string; install_date: string | null };
    const res = await agents.techA.get(`/api/units/${encodeURIComponent(unit.serial)}?on=${u.ship_date}`);
    expect(res.status).toBe(200);
    expect(res.body.unit.serial).toBe(unit.serial);
    expect(res.body.family.code).toBe('GRL');
    expect(res.body.on).toBe(u.ship_date);
    // on the ship date itself a unit is within its terms (coverage starts at shipping)
    expect(res.body.coverage.parts.covered).toBe(true);
    const before = await agents.techA.get(`/api/units/${encodeURIComponent(unit.serial)}?on=${daysAgo(20000)}`);
    expect(before.body.coverage.parts.covered).toBe(false);
    expect(before.body.coverage.parts.reasonCode).toBe('before_ship_date');
    const today = await agents.techA.get(`/api/units/${encodeURIComponent(unit.serial.toLowerCase())}`);
    expect(today.status).toBe(200);
    expect(today.body.on).toBe('2026-06-15');
  });

  it('answers 404 with a clear message for an unknown serial, 400 for a bad date, 403 for the accountant', async () => {
    const unknown = await agents.techA.get('/api/units/NO-SUCH-UNIT');
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.message).toMatch(/serial number "NO-SUCH-UNIT"/);
    const { unit } = grillFixture(t);
    expect((await agents.techA.get(`/api/units/${unit.serial}?on=2026-02-30`)).status).toBe(400);
    expect((await agents.accountant.get(`/api/units/${unit.serial}`)).status).toBe(403);
    expect((await request(t.app).get(`/api/units/${unit.serial}`)).status).toBe(401);
  });

  it('lists the prior claims on the unit that this user may see', async () => {
    const claimed = allClaims(t).filter((c) => c.unitId !== null);
    const byUnit = new Map<string, typeof claimed>();
    for (const c of claimed) byUnit.set(c.unitId!, [...(byUnit.get(c.unitId!) ?? []), c]);
    const [unitId, onUnit] = [...byUnit.entries()].sort((a, b) => b[1].length - a[1].length)[0];
    const { serial } = t.db.$client.prepare('select serial from units where id = ?').get(unitId) as { serial: string };
    const filed = ['submitted', 'in_review', 'returned', 'approved', 'denied', 'paid'];
    const res = await agents.reviewer.get(`/api/units/${encodeURIComponent(serial)}`);
    expect(new Set(res.body.priorClaims.map((p: { id: string }) => p.id))).toEqual(new Set(onUnit.filter((c) => filed.includes(c.state)).map((c) => c.id)));
    const tech = await agents.techA.get(`/api/units/${encodeURIComponent(serial)}`);
    const mateo = userId(t, demoAccounts.techA);
    expect(new Set(tech.body.priorClaims.map((p: { id: string }) => p.id))).toEqual(new Set(onUnit.filter((c) => c.technicianId === mateo).map((c) => c.id)));
  });
});

describe('GET /api/catalog', () => {
  it('lists models, parts and repair codes, filtered by family id or code', async () => {
    const models = await agents.techA.get('/api/catalog/models');
    expect(models.status).toBe(200);
    expect(models.body.items.length).toBeGreaterThanOrEqual(4);
    const grill = models.body.items.find((m: { family: { code: string } }) => m.family.code === 'GRL');
    expect(grill.readingSpecs.length).toBeGreaterThan(0);
    const codes = await agents.techA.get('/api/catalog/repair-codes?family=GRL');
    expect(codes.body.items.length).toBeGreaterThan(0);
    expect(codes.body.items.every((c: { familyCode: string }) => c.familyCode === 'GRL')).toBe(true);
    const byId = await agents.techA.get(`/api/catalog/repair-codes?family=${grill.family.id}`);
    expect(byId.body.items).toEqual(codes.body.items);
    const parts = await agents.accountant.get('/api/catalog/parts?family=FRY');
    expect(parts.status).toBe(200);
    expect(parts.body.items.every((p: { familyCode: string | null }) => p.familyCode === 'FRY' || p.familyCode === null)).toBe(true);
    expect((await agents.techA.get('/api/catalog/parts?family=NOPE')).body.items).toEqual([]);
    expect((await request(t.app).get('/api/catalog/models')).status).toBe(401);
  });
});

describe('GET /api/home', () => {
  const keys: Record<DemoKey, string[]> = {
    techA: ['my_returned', 'my_drafts', 'my_waiting'],
    techB: ['my_returned', 'my_drafts', 'my_waiting'],
    adminA: ['agency_returned', 'agency_drafts', 'agency_approved', 'agency_part_returns'],
    adminB: ['agency_returned', 'agency_drafts', 'agency_approved', 'agency_part_returns'],
    reviewer: ['review_queue', 'my_reviews', 'returned_to_agency'],
    accountant: ['ready_to_pay', 'open_runs'],
    mfrAdmin: ['catalog_models', 'catalog_parts', 'catalog_repair_codes', 'agencies', 'manufacturer_users'],
  };

  it.each(Object.keys(demoAccounts) as DemoKey[])('%s sees its own queues, counted within its scope', async (who) => {
    const res = await agents[who].get('/api/home');
    expect(res.status).toBe(200);
    expect(res.body.cards.map((c: { key: string }) => c.key)).toEqual(keys[who]);
    for (const card of res.body.cards) {
      expect(card.items.length).toBeLessThanOrEqual(Math.min(5, card.count));
      if (card.count > 0 && card.key !== 'open_runs' && !card.key.startsWith('catalog') && !['agencies', 'manufacturer_users'].includes(card.key)) expect(card.items.length).toBeGreaterThan(0);
    }
  });

  it('the review queue is oldest first and holds submitted claims only', async () => {
    const res = await agents.reviewer.get('/api/home');
    const queue = res.body.cards.find((c: { key: string }) => c.key === 'review_queue');
    const submitted = allClaims(t).filter((c) => c.state === 'submitted');
    expect(queue.count).toBe(submitted.length);
    const times = queue.items.map((i: { submittedAt: string }) => i.submittedAt);
    expect([...times].sort()).toEqual(times);
    expect(queue.items.every((i: { state: string }) => i.state === 'submitted')).toBe(true);
  });

  it('a technician’s drafts count only their own', async () => {
    const res = await agents.techA.get('/api/home');
    const mateo = userId(t, demoAccounts.techA);
    const drafts = res.body.cards.find((c: { key: string }) => c.key === 'my_drafts');
    expect(drafts.count).toBe(allClaims(t).filter((c) => c.state === 'draft' && c.technicianId === mateo).length);
  });
});

describe('GET /api/dev/mailbox', () => {
  it('shows what the local sink received, signed out, newest first, filtered by address', async () => {
    const before = t.sink.messages.length;
    await request(t.app).post('/api/auth/password-reset').set('Origin', 'http://localhost:3000').send({ email: 'tech@harborview.test' });
    for (let i = 0; i < 3; i++) {
      await t.deps.outbox.stop();
      await t.deps.outbox.flush();
    }
    expect(t.sink.messages.length).toBeGreaterThan(before);
    const res = await request(t.app).get('/api/dev/mailbox?to=tech@harborview.test');
    expect(res.status).toBe(200);
    expect(res.body.messages.length).toBeGreaterThan(0);
    expect(res.body.messages.every((m: { to: string[] }) => m.to.includes('tech@harborview.test'))).toBe(true);
    const ids = res.body.messages.map((m: { id: number }) => m.id);
    expect([...ids].sort((a: number, b: number) => b - a)).toEqual(ids);
  });

  it('does not exist when no local sink is in use (a real mail server is configured)', async () => {
    const env = { ...t.env, SMTP_URL: 'smtp://127.0.0.1:1' };
    const { app } = createApp({ db: t.db, env, mailer: smtpMailer(env.SMTP_URL, env.MAIL_FROM), sink: null });
    const res = await request(app).get('/api/dev/mailbox').set('Host', 'localhost:3000');
    expect(res.status).toBe(404);
  });
});
