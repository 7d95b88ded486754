/**
 * Business days are the agency's own days, in its IANA time zone (offsets from the IANA time
 * zone database, tzdata): the filing date and the filed-late flag, "not in the future", the
 * default day of a unit lookup, and part returns overdue on the home page. Instants stay UTC.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { agencyTerms, claims, organisations } from '../../server/db/schema/index';
import { agencyIdByName, attachEvidence, completeDraftBody, HARBORVIEW, makeClaimsApp, move, PRAIRIE, type Agent } from './claims-fixtures';
import { insertApprovedClaim } from './payments-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let techA: Agent;
let techB: Agent;
let harborview: string;
let prairie: string;

beforeAll(async () => {
  t = await makeClaimsApp();
  techA = await t.signIn('techA');
  techB = await t.signIn('techB');
  harborview = agencyIdByName(t, HARBORVIEW);
  prairie = agencyIdByName(t, PRAIRIE);
  // a San Diego agency and a European one
  t.db.update(organisations).set({ timeZone: 'America/Los_Angeles' }).where(eq(organisations.id, harborview)).run();
  t.db.update(organisations).set({ timeZone: 'Europe/Berlin' }).where(eq(organisations.id, prairie)).run();
});
afterAll(async () => {
  await t.close();
});

/** Moves the clock and signs in again (sessions run on the same clock). */
async function at(iso: string) {
  t.clock.set(iso);
  techA = await t.signIn('techA');
  techB = await t.signIn('techB');
}

const windowOf = (agencyId: string, day: string) =>
  t.db
    .select()
    .from(agencyTerms)
    .where(eq(agencyTerms.agencyId, agencyId))
    .all()
    .find((x) => x.effectiveFrom <= day && (x.effectiveTo === null || x.effectiveTo >= day))!.filingWindowDays;
const addDays = (day: string, n: number) => new Date(Date.parse(`${day}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);

async function draft(agent: Agent, uploader: string, body: Record<string, unknown>) {
  const res = await agent.post('/api/claims').send(completeDraftBody(t, body));
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  attachEvidence(t, res.body.id, 'unit_overall', uploader);
  return res.body as { id: string; version: number };
}

describe('the filing window counts in the agency’s days', () => {
  it('a claim submitted at 18:30 local on the last day of its window in America/Los_Angeles is not filed late', async () => {
    const repair = '2026-05-08';
    const last = addDays(repair, windowOf(harborview, repair)); // the last day of the window (it counts)
    // 18:30 PDT (UTC-7, tzdata) on the last day is 01:30 UTC on the next day
    await at(`${addDays(last, 1)}T01:30:00.000Z`);
    const c = await draft(techA, 'tech@harborview.test', { failureDate: addDays(repair, -1), repairDate: repair });
    const res = await move(techA, c.id, 'submit', c.version);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const row = t.db.select().from(claims).where(eq(claims.id, c.id)).get()!;
    expect(row.firstSubmittedAt).toBe(`${addDays(last, 1)}T01:30:00.000Z`); // the instant stays UTC
    expect(row.flags).not.toContain('filed_late');
    const v = await techA.get(`/api/claims/${c.id}/valuation`);
    expect(v.body.flags.map((f: { code: string }) => f.code)).not.toContain('filed_late');
  });

  it('one local day later (00:30 PDT) it is filed late', async () => {
    const repair = '2026-05-08';
    const last = addDays(repair, windowOf(harborview, repair));
    await at(`${addDays(last, 1)}T07:30:00.000Z`); // 00:30 PDT on the day after the window
    const c = await draft(techA, 'tech@harborview.test', { failureDate: addDays(repair, -1), repairDate: repair });
    expect((await move(techA, c.id, 'submit', c.version)).status).toBe(200);
    expect(t.db.select().from(claims).where(eq(claims.id, c.id)).get()!.flags).toContain('filed_late');
  });
});

describe('“not in the future” is the agency’s today', () => {
  it('a European agency is not blocked just after its local midnight', async () => {
    await at('2026-06-15T22:30:00.000Z'); // 00:30 CEST on 2026-06-16 (UTC+2, tzdata); UTC is still on the 15th
    const c = await draft(techB, 'tech@prairieline.test', { failureDate: '2026-06-15', repairDate: '2026-06-16' });
    const res = await move(techB, c.id, 'submit', c.version);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
  });

  it('in the evening in a US zone, tomorrow’s local date is refused and today’s local date is accepted', async () => {
    await at('2026-06-15T03:30:00.000Z'); // 20:30 PDT on 2026-06-14; UTC has passed midnight
    const tomorrow = await draft(techA, 'tech@harborview.test', { failureDate: '2026-06-14', repairDate: '2026-06-15' });
    const refused = await move(techA, tomorrow.id, 'submit', tomorrow.version);
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields.repairDate).toMatch(/future/);
    const today = await draft(techA, 'tech@harborview.test', { failureDate: '2026-06-13', repairDate: '2026-06-14' });
    expect((await move(techA, today.id, 'submit', today.version)).status).toBe(200);
  });

  it('the signed-in user’s organisation carries its time zone, for the date pickers', async () => {
    const me = await techA.get('/api/auth/me');
    expect(me.body.organisation.timeZone).toBe('America/Los_Angeles');
  });
});

describe('part returns are overdue by the agency’s days', () => {
  it('a return approved at 01:30 in Berlin is due on that local day + 30, not the UTC day + 30', async () => {
    // approved 2026-06-15T23:30Z = 2026-06-16 01:30 CEST: local approval day 06-16, last day on time 07-16
    const c = insertApprovedClaim(t, { agency: PRAIRIE, decidedOn: '2026-06-15', parts: [{ cents: 1_000, status: 'awaiting' }] });
    t.db.update(claims).set({ decidedAt: '2026-06-15T23:30:00.000Z' }).where(eq(claims.id, c.id)).run();
    await at('2026-07-16T12:00:00.000Z'); // 14:00 CEST on 07-16: still on time
    let adminB = await t.signIn('adminB');
    const onTime = await adminB.get(`/api/claims/${c.id}/part-returns`);
    expect(onTime.body.dueDate).toBe('2026-07-16');
    expect(onTime.body.lines[0].overdue).toBe(false);
    const overdueNow = async () => ((await adminB.get('/api/home')).body.notices as { key: string; message: string }[]).find((n) => n.key === 'part_returns_overdue');
    const before = (await overdueNow())?.message ?? '0 approved';
    await at('2026-07-16T22:30:00.000Z'); // 00:30 CEST on 07-17: overdue
    adminB = await t.signIn('adminB');
    const late = await adminB.get(`/api/claims/${c.id}/part-returns`);
    expect(late.body.lines[0].overdue).toBe(true);
    expect(late.body.overdueDays).toBe(1);
    const after = (await overdueNow())?.message ?? '0 approved';
    expect(Number.parseInt(after, 10)).toBe(Number.parseInt(before, 10) + 1);
  });
});
