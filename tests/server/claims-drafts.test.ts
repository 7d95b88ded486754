import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { claimEvents, claims } from '../../server/db/schema/index';
import {
  agencyIdByName,
  claimFootprint,
  claimIn,
  completeDraftBody,
  countRows,
  createCompleteDraft,
  grillFixture,
  HARBORVIEW,
  makeClaimsApp,
  userId,
  type Agent,
} from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let techA: Agent;
let adminA: Agent;
let reviewer: Agent;
let agencyA: string;

beforeAll(async () => {
  t = await makeClaimsApp();
  techA = await t.signIn('techA');
  adminA = await t.signIn('adminA');
  reviewer = await t.signIn('reviewer');
  agencyA = agencyIdByName(t, HARBORVIEW);
});
afterAll(async () => {
  await t.close();
});

describe('POST /api/claims', () => {
  it('creates a draft in the session agency with the next FP-YYYY-NNNNNN number, a created event and an audit row', async () => {
    const res1 = await techA.post('/api/claims').send(completeDraftBody(t));
    const res2 = await adminA.post('/api/claims').send({ serial: grillFixture(t).unit.serial });
    expect(res1.status).toBe(201);
    expect(res2.status).toBe(201);
    for (const [res, email] of [
      [res1, 'tech@harborview.test'],
      [res2, 'admin@harborview.test'],
    ] as const) {
      expect(res.body.number).toMatch(/^FP-2026-\d{6}$/);
      expect(res.body.state).toBe('draft');
      expect(res.body.version).toBe(1);
      expect(res.body.agencyId).toBe(agencyA);
      expect(res.body.technicianId).toBe(userId(t, email));
      expect(res.body.allowedActions).toContain('withdraw');
      const events = t.db.select().from(claimEvents).where(eq(claimEvents.claimId, res.body.id)).all();
      expect(events.map((e) => [e.type, e.fromState, e.toState])).toEqual([['created', null, 'draft']]);
      expect(countRows(t, 'audit_log', "action = 'claim.create' and record_id = ?", res.body.id)).toBe(1);
    }
    expect(Number(res2.body.number.slice(8))).toBe(Number(res1.body.number.slice(8)) + 1);
    const used = t.db.select({ n: claims.number }).from(claims).all().map((r) => r.n);
    expect(new Set(used).size).toBe(used.length);
    // the complete body stored its lines and readings, and is ready to submit once evidence is attached
    expect(res1.body.laborLines).toHaveLength(1);
    expect(res1.body.readings).toHaveLength(2);
    expect(res1.body.travel).toMatchObject({ roundTripMiles: 18, travelHours: 0.6 });
    expect(res1.body.allowedActions).not.toContain('submit');
  });

  it('answers 400 on the serial field for an unknown serial, and writes nothing', async () => {
    const before = countRows(t, 'claims');
    const counters = t.db.$client.prepare('select * from claim_counters').all();
    const res = await techA.post('/api/claims').send({ serial: 'NO-SUCH-SERIAL-0000' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.serial).toMatch(/serial/i);
    expect(countRows(t, 'claims')).toBe(before);
    expect(t.db.$client.prepare('select * from claim_counters').all()).toEqual(counters);
  });

  it.each([
    ['agencyId', 'some-other-agency'],
    ['technicianId', 'someone-else'],
    ['state', 'approved'],
    ['approvedTotalCents', 999999],
    ['claimedTotalCents', 999999],
    ['number', 'FP-2026-999999'],
    ['version', 7],
    ['flags', []],
  ])('refuses a mass-assigned %s with 400 and writes nothing', async (key, value) => {
    const before = countRows(t, 'claims');
    const res = await techA.post('/api/claims').send({ ...completeDraftBody(t), [key]: value });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(countRows(t, 'claims')).toBe(before);
  });

  it('refuses manufacturer users with 403', async () => {
    for (const who of ['reviewer', 'accountant', 'mfrAdmin'] as const) {
      const agent = who === 'reviewer' ? reviewer : await t.signIn(who);
      const before = countRows(t, 'claims');
      const res = await agent.post('/api/claims').send({ serial: grillFixture(t).unit.serial });
      expect(res.status, who).toBe(403);
      expect(countRows(t, 'claims')).toBe(before);
    }
  });

  it('answers 400 on the field for unknown or wrong-family catalogue references and duplicated readings', async () => {
    const { otherFamilyCode } = grillFixture(t);
    const before = countRows(t, 'claims');
    const cases: Array<[Record<string, unknown>, string]> = [
      [{ laborLines: [{ repairCodeId: 'nope', hoursWorked: 1 }] }, 'laborLines.0.repairCodeId'],
      [{ laborLines: [{ repairCodeId: otherFamilyCode.id, hoursWorked: 1 }] }, 'laborLines.0.repairCodeId'],
      [{ partLines: [{ partId: 'nope', quantity: 1 }] }, 'partLines.0.partId'],
      [
        {
          readings: [
            { key: 'cooking_height', phase: 'after', value: 36, unit: 'in' },
            { key: 'cooking_height', phase: 'after', value: 36.1, unit: 'in' },
          ],
        },
        'readings.1.key',
      ],
      [{ readings: [{ key: 'cooking_height', phase: 'after', value: 36, unit: 'F' }] }, 'readings.0.unit'],
      [{ laborLines: [{ repairCodeId: 'x', hoursWorked: -1 }] }, 'laborLines.0.hoursWorked'],
      [{ failureDate: '2026-02-30' }, 'failureDate'],
    ];
    for (const [extra, field] of cases) {
      const res = await techA.post('/api/claims').send({ ...completeDraftBody(t), ...extra });
      expect(res.status, field).toBe(400);
      expect(Object.keys(res.body.error.fields), field).toContain(field);
    }
    expect(countRows(t, 'claims')).toBe(before);
  });
});

describe('PATCH /api/claims/:id', () => {
  it('replaces the lines it is sent, keeps the others, and bumps the version', async () => {
    const c = await createCompleteDraft(t, techA, 'tech@harborview.test');
    const { code } = grillFixture(t);
    const part = t.db.$client.prepare("select p.id from parts p join product_families f on f.id = p.family_id where f.code = 'GRL' and p.active = 1 limit 1").get() as { id: string };
    const r1 = await techA.patch(`/api/claims/${c.id}`).send({
      version: 1,
      laborLines: [
        { repairCodeId: code.id, hoursWorked: 0.5 },
        { repairCodeId: code.id, hoursWorked: 0.25, note: 'second visit' },
      ],
      partLines: [{ partId: part.id, quantity: 2 }],
    });
    expect(r1.status).toBe(200);
    expect(r1.body.version).toBe(2);
    expect(r1.body.laborLines.map((l: { hoursWorked: number }) => l.hoursWorked)).toEqual([0.5, 0.25]);
    expect(r1.body.partLines).toHaveLength(1);
    expect(r1.body.readings).toHaveLength(2); // not sent, kept
    const r2 = await techA.patch(`/api/claims/${c.id}`).send({ version: 2, laborLines: [{ repairCodeId: code.id, hoursWorked: 1.5 }], travel: null, complaint: 'Grill wobbles.' });
    expect(r2.status).toBe(200);
    expect(r2.body.version).toBe(3);
    expect(r2.body.laborLines.map((l: { hoursWorked: number; position: number }) => [l.position, l.hoursWorked])).toEqual([[1, 1.5]]);
    expect(r2.body.travel).toBeNull();
    expect(r2.body.partLines).toHaveLength(1);
    expect(r2.body.complaint).toBe('Grill wobbles.');
    expect(countRows(t, 'claim_labor_lines', 'claim_id = ?', c.id)).toBe(1);
  });

  it('answers 409 on a stale version and changes nothing', async () => {
    const c = await createCompleteDraft(t, techA, 'tech@harborview.test');
    const ok = await techA.patch(`/api/claims/${c.id}`).send({ version: 1, complaint: 'first edit' });
    expect(ok.status).toBe(200);
    const before = claimFootprint(t, c.id);
    const stale = await adminA.patch(`/api/claims/${c.id}`).send({ version: 1, complaint: 'second edit from an old screen', laborLines: [] });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale_version');
    expect(claimFootprint(t, c.id)).toEqual(before);
  });

  it('is atomic: a bad reference in one list leaves every list and field as it was', async () => {
    const c = await createCompleteDraft(t, techA, 'tech@harborview.test');
    const before = claimFootprint(t, c.id);
    const res = await techA.patch(`/api/claims/${c.id}`).send({ version: 1, complaint: 'changed', laborLines: [], partLines: [{ partId: 'missing-part', quantity: 1 }] });
    expect(res.status).toBe(400);
    expect(res.body.error.fields['partLines.0.partId']).toBeTruthy();
    expect(claimFootprint(t, c.id)).toEqual(before);
  });

  it('refuses mass-assigned fields with 400 and changes nothing', async () => {
    const c = await createCompleteDraft(t, techA, 'tech@harborview.test');
    const before = claimFootprint(t, c.id);
    for (const extra of [{ state: 'approved' }, { approvedTotalCents: 1 }, { agencyId: 'x' }, { technicianId: 'x' }, { reviewerId: 'x' }, { resubmissionCount: 9 }]) {
      const res = await techA.patch(`/api/claims/${c.id}`).send({ version: 1, complaint: 'x', ...extra });
      expect(res.status).toBe(400);
    }
    expect(claimFootprint(t, c.id)).toEqual(before);
  });

  it('edits only while draft or returned: 409 once filed, 403 for roles that never edit, 404 for a colleague technician', async () => {
    const filed = await claimIn(t, { tech: techA, reviewer }, 'submitted');
    const before = claimFootprint(t, filed.id);
    const byTech = await techA.patch(`/api/claims/${filed.id}`).send({ version: filed.version, complaint: 'late change' });
    expect(byTech.status).toBe(409);
    expect(byTech.body.error.code).toBe('not_editable');
    const byReviewer = await reviewer.patch(`/api/claims/${filed.id}`).send({ version: filed.version, complaint: 'reviewer edit' });
    expect(byReviewer.status).toBe(403);
    const colleague = await t.signIn('priya.halvorsen@harborview.test');
    const byColleague = await colleague.patch(`/api/claims/${filed.id}`).send({ version: filed.version, complaint: 'x' });
    expect(byColleague.status).toBe(404);
    expect(claimFootprint(t, filed.id)).toEqual(before);

    const returned = await claimIn(t, { tech: techA, reviewer }, 'returned');
    const fix = await techA.patch(`/api/claims/${returned.id}`).send({ version: returned.version, correction: 'Re-leveled and photographed the serial plate.' });
    expect(fix.status).toBe(200);
    expect(fix.body.state).toBe('returned');
  });

  it('changing the serial moves the claim to that unit and its site; an unknown serial is a 400 on serial', async () => {
    const c = await createCompleteDraft(t, techA, 'tech@harborview.test');
    const other = t.db.$client
      .prepare("select u.id, u.serial, u.site_id from units u join models m on m.id = u.model_id join product_families f on f.id = m.family_id where f.code = 'GRL' order by u.serial desc limit 1")
      .get() as { id: string; serial: string; site_id: string | null };
    const res = await techA.patch(`/api/claims/${c.id}`).send({ version: 1, serial: other.serial.toLowerCase() });
    expect(res.status).toBe(200);
    expect(res.body.unit.id).toBe(other.id);
    expect(res.body.site?.id ?? null).toBe(other.site_id);
    const bad = await techA.patch(`/api/claims/${c.id}`).send({ version: 2, serial: 'ZZ-NOPE' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.serial).toBeTruthy();
  });
});

describe('comments', () => {
  it('the agency and the reviewer comment on a filed claim; comments appear in the detail; a withdrawn claim takes none', async () => {
    const filed = await claimIn(t, { tech: techA, reviewer }, 'submitted');
    const c1 = await techA.post(`/api/claims/${filed.id}/comments`).send({ body: 'Photos of the stand are attached.' });
    const c2 = await reviewer.post(`/api/claims/${filed.id}/comments`).send({ body: 'Thanks, looking now.' });
    expect(c1.status).toBe(201);
    expect(c2.status).toBe(201);
    const detail = await techA.get(`/api/claims/${filed.id}`);
    expect(detail.body.comments.map((c: { body: string; authorOrganisation: string }) => [c.body, c.authorOrganisation])).toEqual([
      ['Photos of the stand are attached.', HARBORVIEW],
      ['Thanks, looking now.', 'Larkfield Cookline Co.'],
    ]);
    expect((await techA.post(`/api/claims/${filed.id}/comments`).send({ body: '   ' })).status).toBe(400);
    expect((await techA.post(`/api/claims/${filed.id}/comments`).send({ body: 'x', authorId: 'y' })).status).toBe(400);

    const withdrawn = await claimIn(t, { tech: techA, reviewer }, 'withdrawn');
    const before = countRows(t, 'comments', 'claim_id = ?', withdrawn.id);
    const refused = await techA.post(`/api/claims/${withdrawn.id}/comments`).send({ body: 'Anyone?' });
    expect(refused.status).toBe(403);
    expect(countRows(t, 'comments', 'claim_id = ?', withdrawn.id)).toBe(before);
  });
});
