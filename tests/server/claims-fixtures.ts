/**
 * Shared set-up for the claim, workflow and tenancy tests: a real app on a real SQLite file,
 * seeded with the demo scenario, and helpers that file complete claims through the API.
 */
import { eq } from 'drizzle-orm';
import type request from 'supertest';
import { makeTestApp, TestClock, type TestApp } from '../factories/test-app';
import { attachments, claims, models, organisations, productFamilies, repairCodes, units, users } from '../../server/db/schema/index';
import { newId } from '../../server/lib/ids';

export type Agent = ReturnType<typeof request.agent>;
export const ORIGIN = 'http://localhost:3000';

/** Test day; the seed counts the scenario back from it. */
export const TODAY = '2026-06-15';
export const daysAgo = (n: number) => new Date(Date.parse(`${TODAY}T00:00:00Z`) - n * 86_400_000).toISOString().slice(0, 10);

export async function makeClaimsApp(): Promise<TestApp & { clock: TestClock }> {
  const clock = new TestClock(new Date(`${TODAY}T12:00:00.000Z`));
  const t = await makeTestApp({ clock });
  return Object.assign(t, { clock });
}

export function userId(t: TestApp, email: string): string {
  const u = t.db.select({ id: users.id }).from(users).where(eq(users.email, email)).get();
  if (!u) throw new Error(`no user ${email}`);
  return u.id;
}

export function agencyIdByName(t: TestApp, name: string): string {
  const o = t.db.select({ id: organisations.id }).from(organisations).where(eq(organisations.name, name)).get();
  if (!o) throw new Error(`no organisation ${name}`);
  return o.id;
}

export const HARBORVIEW = 'Harborview Appliance Service';
export const PRAIRIE = 'Prairie Line Kitchen Repair';

/** A grill unit of the demo catalogue and the repair code used for complete claims (needs one photo, two readings). */
export function grillFixture(t: TestApp) {
  const unit = t.db
    .select({ id: units.id, serial: units.serial })
    .from(units)
    .innerJoin(models, eq(models.id, units.modelId))
    .innerJoin(productFamilies, eq(productFamilies.id, models.familyId))
    .where(eq(productFamilies.code, 'GRL'))
    .orderBy(units.serial)
    .get();
  const code = t.db.select().from(repairCodes).where(eq(repairCodes.code, 'GR-160')).get();
  const otherFamilyCode = t.db.select().from(repairCodes).where(eq(repairCodes.code, 'FR-210')).get();
  if (!unit || !code || !otherFamilyCode) throw new Error('demo catalogue lacks the grill fixture');
  return { unit, code, otherFamilyCode };
}

/** A complete draft body: unit, dates, complaint/cause/correction, one labor line, the readings GR-160 asks for. */
export function completeDraftBody(t: TestApp, extra: Record<string, unknown> = {}) {
  const { unit, code } = grillFixture(t);
  return {
    serial: unit.serial,
    complaint: 'Grill rocks on its stand and product cooks unevenly front to back.',
    cause: 'Front leveling foot worn through; cooking surface out of level.',
    correction: 'Replaced nothing; re-leveled the stand and set the cooking height.',
    failureDate: daysAgo(4),
    repairDate: daysAgo(3),
    laborLines: [{ repairCodeId: code.id, hoursWorked: 0.75, overtime: false, note: '' }],
    travel: { roundTripMiles: 18, travelHours: 0.6 },
    readings: [
      { key: 'cooking_height', phase: 'before', value: 35.2, unit: 'in' },
      { key: 'cooking_height', phase: 'after', value: 36.1, unit: 'in' },
    ],
    ...extra,
  };
}

/** Evidence row for a claim (the upload pipeline has its own tests; here only the role matters). */
export function attachEvidence(t: TestApp, claimId: string, role: (typeof attachments.$inferInsert)['role'], uploaderEmail: string): void {
  const claim = t.db.select({ agencyId: claims.agencyId }).from(claims).where(eq(claims.id, claimId)).get()!;
  const id = newId();
  t.db
    .insert(attachments)
    .values({
      id,
      claimId,
      organisationId: claim.agencyId,
      role,
      originalName: `${role}.jpg`,
      storageKey: `test/${id}.jpg`,
      contentType: 'image/jpeg',
      sizeBytes: 1234,
      sha256: id.replace(/-/g, '').padEnd(64, '0'),
      uploadedBy: userId(t, uploaderEmail),
      createdAt: new Date().toISOString(),
    })
    .run();
}

/** Files a complete draft as the given agent and attaches the evidence its repair code requires. */
export async function createCompleteDraft(t: TestApp, agent: Agent, uploaderEmail: string, extra: Record<string, unknown> = {}) {
  const res = await agent.post('/api/claims').send(completeDraftBody(t, extra));
  if (res.status !== 201) throw new Error(`create failed: ${res.status} ${JSON.stringify(res.body)}`);
  attachEvidence(t, res.body.id, 'unit_overall', uploaderEmail);
  return res.body as { id: string; version: number; number: string; state: string };
}

export async function move(agent: Agent, id: string, type: string, version: number, extra: Record<string, unknown> = {}) {
  return agent.post(`/api/claims/${id}/transitions`).send({ type, version, ...extra });
}

/** Moves a fresh claim to the wanted state through the API, returning its id and version. */
export async function claimIn(
  t: TestApp,
  agents: { tech: Agent; reviewer: Agent },
  target: 'draft' | 'submitted' | 'in_review' | 'returned' | 'approved' | 'denied' | 'withdrawn',
  uploaderEmail = 'tech@harborview.test',
): Promise<{ id: string; version: number }> {
  const c = await createCompleteDraft(t, agents.tech, uploaderEmail);
  let version = c.version;
  const step = async (agent: Agent, type: string, extra: Record<string, unknown> = {}) => {
    const r = await move(agent, c.id, type, version, extra);
    if (r.status !== 200) throw new Error(`${type} failed: ${r.status} ${JSON.stringify(r.body)}`);
    version = r.body.version;
  };
  if (target === 'draft') return { id: c.id, version };
  if (target === 'withdrawn') {
    await step(agents.tech, 'withdraw');
    return { id: c.id, version };
  }
  await step(agents.tech, 'submit');
  if (target === 'submitted') return { id: c.id, version };
  await step(agents.reviewer, 'start_review');
  if (target === 'in_review') return { id: c.id, version };
  if (target === 'returned') await step(agents.reviewer, 'return', { reason: 'missing_evidence', comment: 'The serial plate photo is missing.' });
  if (target === 'denied') await step(agents.reviewer, 'deny', { reason: 'not_a_warranty_failure', comment: 'Worn leveling feet are normal wear.' });
  if (target === 'approved') await step(agents.reviewer, 'approve');
  return { id: c.id, version };
}

/** A snapshot of what a write could change on a claim, to prove that nothing did. */
export function claimFootprint(t: TestApp, id: string) {
  const row = t.db.select().from(claims).where(eq(claims.id, id)).get();
  const n = (table: string) => (t.db.$client.prepare(`select count(*) as n from ${table} where claim_id = ?`).get(id) as { n: number }).n;
  return {
    row,
    events: n('claim_events'),
    comments: n('comments'),
    labor: t.db.$client.prepare('select * from claim_labor_lines where claim_id = ? order by position').all(id),
    parts: t.db.$client.prepare('select * from claim_part_lines where claim_id = ? order by position').all(id),
    travel: t.db.$client.prepare('select * from claim_travel where claim_id = ?').all(id),
    readings: t.db.$client.prepare('select * from claim_readings where claim_id = ? order by key, phase').all(id),
  };
}

export function countRows(t: TestApp, table: string, where = '1 = 1', ...params: unknown[]): number {
  return (t.db.$client.prepare(`select count(*) as n from ${table} where ${where}`).get(...params) as { n: number }).n;
}

export const allClaims = (t: TestApp) => t.db.select().from(claims).all();
