import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { auditLog, claimReadings, partPrices, parts, readingSpecs, repairCodeAllowances, repairCodes } from '../../server/db/schema/index';
import { allowanceOn, allowancesOn, priceOn, pricesOn } from '../../server/modules/admin/catalog.queries';
import { TestClock, makeTestApp, type TestApp } from '../factories/test-app';

// Effective-dated catalogue values: a change applies to claims whose repair date is on or after
// its effective date, earlier repairs keep the value in force then (common practice for
// labor-time guides and price lists). Test values are chosen here, not taken from the demo data.

type Agent = Awaited<ReturnType<TestApp['signIn']>>;
const TODAY = '2026-06-15';

describe('catalogue administration', () => {
  let t: TestApp;
  let mfr: Agent;
  let familyId: string;

  beforeAll(async () => {
    t = await makeTestApp({ clock: new TestClock(new Date(`${TODAY}T12:00:00.000Z`)) });
    mfr = await t.signIn('mfrAdmin');
  });
  afterAll(async () => {
    await t.close();
  });

  it('is only for the manufacturer admin (403 before the body is read)', async () => {
    for (const who of ['reviewer', 'accountant', 'adminA', 'techA'] as const) {
      const a = await t.signIn(who);
      expect((await a.get('/api/admin/repair-codes')).status).toBe(403);
      expect((await a.post('/api/admin/parts').send({})).status).toBe(403);
      expect((await a.patch('/api/admin/families/x').send({ name: 'X' })).status).toBe(403);
    }
  });

  it('creates a family, refuses a duplicate code, retires it without deleting it', async () => {
    const r = await mfr.post('/api/admin/families').send({ code: 'stm', name: 'Steamers', fuel: 'electric' });
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({ code: 'STM', active: true });
    familyId = r.body.id;
    const dup = await mfr.post('/api/admin/families').send({ code: 'STM', name: 'Steamers again', fuel: 'gas' });
    expect(dup.status).toBe(409);
    expect(dup.body.error.fields.code).toBeTruthy();
    const bad = await mfr.post('/api/admin/families').send({ code: '!', name: '', fuel: 'coal' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['code', 'fuel', 'name']);

    const retired = await mfr.patch(`/api/admin/families/${familyId}`).send({ active: false });
    expect(retired.status).toBe(200);
    expect(retired.body.active).toBe(false);
    const list = await mfr.get('/api/admin/families');
    expect(list.body.items.find((f: { id: string }) => f.id === familyId).active).toBe(false);
    expect((await mfr.patch(`/api/admin/families/${familyId}`).send({ active: true })).body.active).toBe(true);
    const actions = t.db.select().from(auditLog).where(eq(auditLog.recordId, familyId)).all().map((a) => a.action);
    expect(actions).toEqual(['catalog.family.create', 'catalog.family.retire', 'catalog.family.update']);
  });

  it('creates a model with warranty terms, component terms and reading specs', async () => {
    const part = await mfr.post('/api/admin/parts').send({ partNumber: 'P-ST-0001', description: 'Steam generator', familyId, listPriceCents: 41_250, returnRequired: true });
    expect(part.status).toBe(201);
    const capTooShort = await mfr.post('/api/admin/models').send({ familyId, modelNumber: 'ST-10', name: 'Steamer', partsMonths: 24, laborMonths: 12, capMonthsFromShip: 18, installGraceDays: 90 });
    expect(capTooShort.status).toBe(400);
    expect(capTooShort.body.error.fields.capMonthsFromShip).toBeTruthy();
    const m = await mfr.post('/api/admin/models').send({
      familyId,
      modelNumber: 'ST-10',
      name: 'Countertop steamer',
      partsMonths: 24,
      laborMonths: 12,
      capMonthsFromShip: 30,
      installGraceDays: 90,
      componentTerms: [{ partId: part.body.id, label: 'Steam generator', partsMonths: 60 }],
    });
    expect(m.status).toBe(201);
    expect(m.body.componentTerms).toEqual([expect.objectContaining({ partNumber: 'P-ST-0001', partsMonths: 60 })]);

    const code = await mfr.post('/api/admin/repair-codes').send({ code: 'ST-100', familyId, description: 'Replace steam generator', allowedHours: 1.5, requiredEvidence: ['serial_plate', 'failed_part'] });
    expect(code.status).toBe(201);
    const spec = await mfr.post(`/api/admin/models/${m.body.id}/reading-specs`).send({ key: 'cavity_temp', label: 'Cavity temperature', unit: 'F', nominal: 212, tolerance: 4, phase: 'both', requiredForCodes: ['ST-100'] });
    expect(spec.status).toBe(201);
    const unknownCode = await mfr.post(`/api/admin/models/${m.body.id}/reading-specs`).send({ key: 'supply_voltage', label: 'Supply voltage', unit: 'V', nominal: 208, tolerance: 10, phase: 'before', requiredForCodes: ['ZZ-999'] });
    expect(unknownCode.status).toBe(400);
    expect(unknownCode.body.error.fields.requiredForCodes).toMatch(/ZZ-999/);
    const dupKey = await mfr.post(`/api/admin/models/${m.body.id}/reading-specs`).send({ key: 'cavity_temp', label: 'Again', unit: 'F', nominal: 1, tolerance: 1, phase: 'after' });
    expect(dupKey.status).toBe(409);

    const edited = await mfr.patch(`/api/admin/models/${m.body.id}`).send({ laborMonths: 18, componentTerms: [] });
    expect(edited.status).toBe(200);
    expect(edited.body).toMatchObject({ laborMonths: 18, componentTerms: [] });
    expect(edited.body.readingSpecs.map((s: { key: string }) => s.key)).toEqual(['cavity_temp']);
    expect((await mfr.patch(`/api/admin/models/${m.body.id}`).send({ laborMonths: 48 })).status).toBe(400);

    expect((await mfr.delete(`/api/admin/models/${m.body.id}/reading-specs/${spec.body.id}`)).status).toBe(204);
    expect(t.db.select().from(readingSpecs).where(eq(readingSpecs.id, spec.body.id)).get()).toBeUndefined();
  });

  it('keeps a reading spec that claims recorded (409), and never deletes what a claim references', async () => {
    const used = t.db.select({ specId: claimReadings.specId }).from(claimReadings).all().find((r) => r.specId !== null);
    expect(used).toBeDefined();
    const spec = t.db.select().from(readingSpecs).where(eq(readingSpecs.id, used!.specId!)).get()!;
    const r = await mfr.delete(`/api/admin/models/${spec.modelId}/reading-specs/${spec.id}`);
    expect(r.status).toBe(409);
    expect(r.body.error.code).toBe('in_use');
    expect((await mfr.delete(`/api/admin/parts/${spec.id}`)).status).toBe(404); // no such route: retire instead
  });

  it('applies a new repair-code allowance only to repairs on or after its effective date', async () => {
    const code = t.db.select().from(repairCodes).where(eq(repairCodes.code, 'ST-100')).get()!;
    expect(allowanceOn(t.db, code.id, '2026-01-01')).toBe(1.5);

    // effective before today: a reason is required, and the answer names the filed claims it touches
    const silent = await mfr.patch(`/api/admin/repair-codes/${code.id}`).send({ allowedHours: 2.25, allowanceEffectiveFrom: '2026-06-01' });
    expect(silent.status).toBe(400);
    expect(silent.body.error.fields.reason).toMatch(/takes effect in the past \(2026-06-01\)/);
    const r = await mfr.patch(`/api/admin/repair-codes/${code.id}`).send({ allowedHours: 2.25, allowanceEffectiveFrom: '2026-06-01', reason: 'Labor guide revision' });
    expect(r.status).toBe(200);
    expect(r.body.affectedClaims).toMatchObject({ effectiveFrom: '2026-06-01' });
    expect(r.body.affectedClaims.count).toBe(r.body.affectedClaims.numbers.length);
    expect(r.body.allowedHours).toBe(2.25);
    expect(allowanceOn(t.db, code.id, '2026-05-31')).toBe(1.5);
    expect(allowanceOn(t.db, code.id, '2026-06-01')).toBe(2.25);
    expect(allowanceOn(t.db, code.id, '2027-01-01')).toBe(2.25);

    // A change dated in the future leaves today's allowance alone until then.
    const later = await mfr.patch(`/api/admin/repair-codes/${code.id}`).send({ allowedHours: 1.75, allowanceEffectiveFrom: '2026-09-01' });
    expect(later.body.allowedHours).toBe(2.25);
    expect(later.body.scheduled).toEqual([expect.objectContaining({ effectiveFrom: '2026-09-01', allowedHours: 1.75 })]);
    expect(allowanceOn(t.db, code.id, '2026-08-31')).toBe(2.25);
    expect(allowanceOn(t.db, code.id, '2026-09-01')).toBe(1.75);
    expect(allowancesOn(t.db, [code.id], '2026-05-15').get(code.id)).toBe(1.5);

    const history = await mfr.get(`/api/admin/repair-codes/${code.id}/allowances`);
    expect(history.body.items.map((h: { allowedHours: number }) => h.allowedHours)).toEqual([1.5, 2.25, 1.75]);
    expect(t.db.select().from(repairCodeAllowances).where(eq(repairCodeAllowances.repairCodeId, code.id)).all()).toHaveLength(3);
    const audit = t.db.select().from(auditLog).where(eq(auditLog.recordId, code.id)).all();
    expect(audit.at(-1)?.detail).toMatchObject({ allowedHours: { from: 2.25, to: 1.75, effectiveFrom: '2026-09-01' } });

    // A code that never changed answers its catalogue value for any date.
    const untouched = t.db.select().from(repairCodes).all().find((c) => c.id !== code.id)!;
    expect(allowanceOn(t.db, untouched.id, '2001-01-01')).toBe(untouched.allowedHours);
    expect(allowanceOn(t.db, 'no-such-code', TODAY)).toBeUndefined();
  });

  it('applies a new list price only to repairs on or after its effective date (default today)', async () => {
    const part = t.db.select().from(parts).where(eq(parts.partNumber, 'P-ST-0001')).get()!;
    const r = await mfr.patch(`/api/admin/parts/${part.id}`).send({ listPriceCents: 44_900 });
    expect(r.status).toBe(200);
    expect(r.body.listPriceCents).toBe(44_900);
    expect(priceOn(t.db, part.id, '2026-06-14')).toBe(41_250);
    expect(priceOn(t.db, part.id, TODAY)).toBe(44_900);
    expect(pricesOn(t.db, [part.id], '2026-06-14').get(part.id)).toBe(41_250);
    expect(t.db.select().from(partPrices).where(eq(partPrices.partId, part.id)).all()).toHaveLength(2);

    const noPrice = await mfr.patch(`/api/admin/parts/${part.id}`).send({ priceEffectiveFrom: '2026-07-01' });
    expect(noPrice.status).toBe(400);
    expect(noPrice.body.error.fields.listPriceCents).toBeTruthy();
    const fraction = await mfr.patch(`/api/admin/parts/${part.id}`).send({ listPriceCents: 10.5 });
    expect(fraction.status).toBe(400);
    const retire = await mfr.patch(`/api/admin/parts/${part.id}`).send({ active: false, returnRequired: false });
    expect(retire.body).toMatchObject({ active: false, returnRequired: false, listPriceCents: 44_900 });
  });
});
