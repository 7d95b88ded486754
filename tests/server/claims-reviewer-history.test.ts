/**
 * What the reviewer reads beside a claim: the unit's other claims (every agency the reviewer may
 * read, scoped in SQL by the same rules as the list) and, for a resubmitted claim, what changed
 * since the last submission, from the snapshot kept with each submit event.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { claimIn, createCompleteDraft, grillFixture, makeClaimsApp, move, type Agent } from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let techA: Agent;
let techB: Agent;
let reviewer: Agent;
let accountant: Agent;

beforeAll(async () => {
  t = await makeClaimsApp();
  techA = await t.signIn('techA');
  techB = await t.signIn('techB');
  reviewer = await t.signIn('reviewer');
  accountant = await t.signIn('accountant');
});
afterAll(async () => {
  await t.close();
});

describe('the unit’s other claims', () => {
  it('lists every agency’s readable claims on the unit for the reviewer, only its own for an agency, never the claim itself', async () => {
    const a1 = await claimIn(t, { tech: techA, reviewer }, 'submitted');
    const a2 = await claimIn(t, { tech: techA, reviewer }, 'approved');
    const b = await createCompleteDraft(t, techB, 'tech@prairieline.test');
    expect((await move(techB, b.id, 'submit', b.version)).status).toBe(200);
    const bDraft = await createCompleteDraft(t, techB, 'tech@prairieline.test');

    const forReviewer = await reviewer.get(`/api/claims/${a1.id}/unit-claims`);
    expect(forReviewer.status).toBe(200);
    const ids = (forReviewer.body.items as { id: string; agencyName: string; serial: string }[]).map((c) => c.id);
    expect(ids).toContain(a2.id);
    expect(ids).toContain(b.id);
    expect(ids).not.toContain(a1.id);
    // a draft of another agency is not the reviewer's to read, so it is not listed either
    expect(ids).not.toContain(bDraft.id);
    const { unit } = grillFixture(t);
    expect(new Set((forReviewer.body.items as { serial: string }[]).map((c) => c.serial))).toEqual(new Set([unit.serial]));

    const forAgencyA = (await techA.get(`/api/claims/${a1.id}/unit-claims`)).body.items as { id: string }[];
    expect(forAgencyA.map((c) => c.id)).toContain(a2.id);
    expect(forAgencyA.map((c) => c.id)).not.toContain(b.id);

    // agency B cannot use agency A's claim to reach the unit's history
    expect((await techB.get(`/api/claims/${a1.id}/unit-claims`)).status).toBe(404);
    // the accountant reads approved claims only: the submitted one is not listed to them
    const forAccountant = await accountant.get(`/api/claims/${a2.id}/unit-claims`);
    expect(forAccountant.status).toBe(200);
    expect((forAccountant.body.items as { id: string }[]).map((c) => c.id)).not.toContain(a1.id);
  });

  it('is served by the unit index, not a scan of the claims table', () => {
    const plan = t.db.all<{ detail: string }>(sql`explain query plan select id from claims where unit_id = 'u' and id != 'c' order by repair_date desc, id desc limit 50`);
    const details = plan.map((p) => p.detail).join(' | ');
    expect(details).toMatch(/claims_unit_idx/);
    expect(details).not.toMatch(/SCAN claims\b(?! USING)/);
  });
});

describe('what changed since the last submission', () => {
  it('keeps a snapshot with every submit event and shows field, before and after for a resubmission', async () => {
    const c = await claimIn(t, { tech: techA, reviewer }, 'returned');
    const before = await reviewer.get(`/api/claims/${c.id}/changes`);
    expect(before.status).toBe(200);
    expect(before.body).toMatchObject({ submissions: 1, changes: [] });

    const detail = (await techA.get(`/api/claims/${c.id}`)).body as { version: number; laborLines: { repairCodeId: string; hoursWorked: number; overtime: boolean; note: string }[] };
    const newCause = 'Both front leveling feet worn through; surface low at the front.';
    const patched = await techA.patch(`/api/claims/${c.id}`).send({
      version: detail.version,
      cause: newCause,
      laborLines: detail.laborLines.map((l) => ({ repairCodeId: l.repairCodeId, hoursWorked: 1, overtime: l.overtime, note: l.note })),
    });
    expect(patched.status, JSON.stringify(patched.body)).toBe(200);
    const resubmitted = await move(techA, c.id, 'submit', patched.body.version);
    expect(resubmitted.status, JSON.stringify(resubmitted.body)).toBe(200);

    const changes = await reviewer.get(`/api/claims/${c.id}/changes`);
    expect(changes.status).toBe(200);
    expect(changes.body.submissions).toBe(2);
    expect(changes.body.previousAt).toBeTruthy();
    const byField = new Map((changes.body.changes as { field: string; before: string | null; after: string | null }[]).map((ch) => [ch.field, ch]));
    expect(byField.get('Cause')).toEqual({ field: 'Cause', before: 'Front leveling foot worn through; cooking surface out of level.', after: newCause });
    expect(byField.get('Labor GR-160')).toEqual({ field: 'Labor GR-160', before: '0.75 h', after: '1 h' });
    // unchanged fields are not listed
    expect(byField.has('Complaint')).toBe(false);
    expect(byField.has('Reading cooking_height (after)')).toBe(false);

    const rows = t.db.all<{ snapshot: string | null }>(sql`select snapshot from claim_events where claim_id = ${c.id} and type = 'submit' order by at`);
    expect(rows).toHaveLength(2);
    for (const r of rows) expect(JSON.parse(r.snapshot!)).toHaveProperty('Complaint');

    // the agency of another tenant learns nothing
    expect((await techB.get(`/api/claims/${c.id}/changes`)).status).toBe(404);
  });
});
