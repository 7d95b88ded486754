import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, type TestApp } from '../factories/test-app';
import { editableClaimOf, claimInState, snapshot } from '../fixtures/evidence-app';
import { evidenceFlags } from '../../server/modules/attachments/attachments.flags';

// The readings sheet import: nothing is imported until the whole file is clean, every bad row
// is reported with its line number; a clean sheet's readings are judged in the spec's unit
// (NIST SP 811 B.9: t(°C) = (t(°F) − 32) / 1.8) and the sheet is kept as evidence.

const ORIGIN = 'http://localhost:3000';
type Agent = Awaited<ReturnType<TestApp['signIn']>>;

interface SpecRow {
  key: string;
  unit: string;
  nominal: number;
  tolerance: number;
  phase: string;
}

describe('POST /api/claims/:id/readings/import', () => {
  let t: TestApp;
  let tech: Agent;
  let claim: ReturnType<typeof editableClaimOf>;
  let temp: SpecRow;

  const readingsCount = () => (t.db.$client.prepare('select count(*) as n from claim_readings where claim_id = ?').get(claim.id) as { n: number }).n;
  const version = () => (t.db.$client.prepare('select version from claims where id = ?').get(claim.id) as { version: number }).version;
  const post = (csv: string, name = 'readings.csv', agent = tech, claimId = claim.id) =>
    agent.post(`/api/claims/${claimId}/readings/import`).set('Origin', ORIGIN).attach('file', Buffer.from(csv, 'utf8'), name);

  beforeAll(async () => {
    t = await makeTestApp();
    tech = await t.signIn('techA');
    claim = editableClaimOf(t, 'tech@harborview.test');
    const specs = t.db.$client.prepare('select rs.key, rs.unit, rs.nominal, rs.tolerance, rs.phase from reading_specs rs join units u on u.model_id = rs.model_id where u.id = ?').all(claim.unitId) as SpecRow[];
    temp = specs.find((s) => s.unit === 'F' && s.phase === 'both')!;
    expect(temp).toBeDefined();
  });
  afterAll(async () => {
    await t.close();
  });

  it('a sheet with bad rows: 400 with each line and reason, and nothing imported or stored', async () => {
    const before = { readings: readingsCount(), evidence: snapshot(t), version: version() };
    const csv = ['key,phase,value,unit', `${temp.key},before,${temp.nominal},F`, 'no_such_key,after,1,A', `${temp.key},after,warm,F`, `${temp.key},after,${temp.nominal},V`].join('\r\n');
    const res = await post(csv);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('csv_invalid');
    expect(res.body.error.message).toMatch(/3 problems; nothing was imported/);
    expect(res.body.errors.map((e: { line: number }) => e.line)).toEqual([3, 4, 5]);
    expect(res.body.error.fields['line.4']).toMatch(/"warm" is not a number/);
    expect(readingsCount()).toBe(before.readings);
    expect(snapshot(t)).toEqual(before.evidence);
    expect(version()).toBe(before.version);
  });

  it('a file that is not a strict UTF-8 CSV: 400 and nothing stored', async () => {
    const before = snapshot(t);
    const res = await tech.post(`/api/claims/${claim.id}/readings/import`).set('Origin', ORIGIN).attach('file', Buffer.from('key,phase\xff,value,unit\r\n', 'latin1'), 'r.csv');
    expect(res.status).toBe(400);
    expect(res.body.errors[0].message).toMatch(/not valid UTF-8/);
    expect(snapshot(t)).toEqual(before);
    const notCsv = await tech.post(`/api/claims/${claim.id}/readings/import`).set('Origin', ORIGIN).attach('file', Buffer.from('x'), 'r.txt');
    expect(notCsv.status).toBe(415);
  });

  it('a clean sheet: readings stored in the unit given, judged in the spec unit, the sheet kept as readings_sheet evidence', async () => {
    const before = { evidence: snapshot(t), version: version() };
    // The nominal in °F written in °C (NIST SP 811 B.9), and an after value two tolerances high.
    const celsius = ((temp.nominal - 32) / 1.8).toFixed(6);
    const high = temp.nominal + 2 * temp.tolerance;
    const res = await post(['key,phase,value,unit', `${temp.key},before,${celsius},C`, `${temp.key},after,${high},°F`, 'core_temp_ground_beef,after,157,F'].join('\n'), 'sheet.csv');
    expect(res.status).toBe(200);
    expect(res.body.imported).toBe(3);
    expect(res.body.version).toBe(before.version + 1);
    expect(res.body.attachmentIds).toHaveLength(1);
    expect(snapshot(t).rows).toBe(before.evidence.rows + 1);
    const role = t.db.$client.prepare('select role, content_type from attachments where id = ?').get(res.body.attachmentIds[0]) as { role: string; content_type: string };
    expect(role).toEqual({ role: 'readings_sheet', content_type: 'text/csv; charset=utf-8' });

    const report = (await tech.get(`/api/claims/${claim.id}/readings`)).body;
    const b = report.readings.find((r: { key: string; phase: string }) => r.key === temp.key && r.phase === 'before');
    expect(b.unit).toBe('C');
    expect(b.convertedValue).toBeCloseTo(temp.nominal, 4);
    expect(b.pass).toBe(true);
    const a = report.readings.find((r: { key: string; phase: string }) => r.key === temp.key && r.phase === 'after');
    expect(a.pass).toBe(false);
    expect(a.failsAfterRepair).toBe(true);
    const food = report.readings.find((r: { key: string }) => r.key === 'core_temp_ground_beef');
    expect(food.kind).toBe('food');
    // FDA Food Code §3-401.11(A)(2): 155 °F for 17 seconds.
    expect(food.pass).toBe(true);
    expect(food.explanation).toContain('§3-401.11(A)(2)');
    expect(report.specs.length).toBeGreaterThan(0);
    expect(report.foodKeys.map((k: { key: string }) => k.key)).toContain('core_temp_poultry');

    expect(evidenceFlags(t.db, claim.id).filter((f) => f.code === 'readings_out_of_tolerance').map((f) => f.readingKey)).toEqual([temp.key]);
  });

  it('importing again replaces the readings of the same key and phase, and keeps the others', async () => {
    const res = await post(`${temp.key},after,${temp.nominal},F\n`, 'fix.csv');
    expect(res.status).toBe(200);
    const rows = t.db.$client.prepare('select key, phase, value from claim_readings where claim_id = ? order by key, phase').all(claim.id) as Array<{ key: string; phase: string; value: number }>;
    expect(rows.filter((r) => r.key === temp.key && r.phase === 'after')).toEqual([{ key: temp.key, phase: 'after', value: temp.nominal }]);
    expect(rows.some((r) => r.key === temp.key && r.phase === 'before')).toBe(true);
    expect(rows.some((r) => r.key === 'core_temp_ground_beef')).toBe(true);
    expect(evidenceFlags(t.db, claim.id).some((f) => f.code === 'readings_out_of_tolerance')).toBe(false);
  });

  it('another agency: 404; a filed claim: 409; a reviewer: 404 on a draft', async () => {
    const techB = await t.signIn('techB');
    expect((await post(`${temp.key},after,1,F`, 'x.csv', techB)).status).toBe(404);
    expect((await techB.get(`/api/claims/${claim.id}/readings`)).status).toBe(404);
    const submitted = claimInState(t, 'tech@harborview.test', 'submitted');
    const filed = await post(`${temp.key},after,1,F`, 'x.csv', tech, submitted.id);
    expect(filed.status).toBe(409);
    const reviewer = await t.signIn('reviewer');
    expect((await post(`${temp.key},after,1,F`, 'x.csv', reviewer)).status).toBe(404);
    expect((await reviewer.get(`/api/claims/${submitted.id}/readings`)).status).toBe(200);
  });
});
