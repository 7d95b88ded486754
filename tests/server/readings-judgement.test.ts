import { describe, expect, it } from 'vitest';
import { judgeReadings } from '../../server/modules/readings/readings.judge';
import { parseReadingsCsv } from '../../server/modules/readings/readings.csv';
import type { ReadingSpec } from '../../server/db/schema/index';

// Readings are entered in the unit at hand and judged in the spec's unit with exact factors,
// NIST SP 811 (2008) Appendix B.8 and B.9: 1 in = 25.4 mm exactly; t(°C) = (t(°F) − 32) / 1.8.
// Product core temperatures are judged against FDA Food Code §3-401.11 (2013 and later, incl.
// 2022). The specs below are made up for the test; the check values come from those sources.

const spec = (key: string, unit: ReadingSpec['unit'], nominal: number, tolerance: number, phase: ReadingSpec['phase'] = 'both'): ReadingSpec => ({
  id: `spec-${key}`,
  modelId: 'model-test',
  key,
  label: key.replace(/_/g, ' '),
  unit,
  nominal,
  tolerance,
  phase,
  requiredForCodes: [],
});

const specs = [
  spec('water_boil', 'C', 100, 0),
  spec('oil', 'F', 350, 5),
  spec('gap', 'mm', 6.35, 0.254),
  spec('current', 'A', 4, 0.5),
  spec('voltage', 'V', 120, 6, 'before'),
];

const judge = (key: string, value: number, unit: string, phase: 'before' | 'after' = 'after') => judgeReadings(specs, [{ key, phase, value, unit }])[0];

describe('readings judged against their spec with exact conversions (NIST SP 811 B.8, B.9)', () => {
  it('212 °F is exactly 100 °C: within a tolerance of zero', () => {
    const j = judge('water_boil', 212, 'F');
    expect(j.convertedValue).toBe(100);
    expect(j.deviation).toBe(0);
    expect(j.pass).toBe(true);
  });

  it('32 °F is exactly 0 °C and -40 °F is -40 °C', () => {
    expect(judge('water_boil', 32, 'F').convertedValue).toBe(0);
    expect(judge('water_boil', -40, 'F').convertedValue).toBe(-40);
    expect(judge('water_boil', 32, 'F').direction).toBe('low');
  });

  it('a °C reading against a °F spec: 176 °C = 348.8 °F within 350 ± 5; 180 °C = 356 °F above it', () => {
    const ok = judge('oil', 176, 'C');
    expect(ok.convertedValue).toBeCloseTo(348.8, 10);
    expect(ok.pass).toBe(true);
    const hot = judge('oil', 180, 'C');
    expect(hot.convertedValue).toBe(356);
    expect(hot.pass).toBe(false);
    expect(hot.direction).toBe('high');
    expect(hot.failsAfterRepair).toBe(true);
    expect(hot.explanation).toContain('above tolerance');
  });

  it('inches against a millimetre spec: 0.26 in = 6.604 mm, exactly on 6.35 + 0.254 (inclusive); 0.2601 in is over', () => {
    const edge = judge('gap', 0.26, 'in');
    expect(edge.convertedValue).toBe(6.604);
    expect(edge.pass).toBe(true);
    const over = judge('gap', 0.2601, 'in');
    expect(over.convertedValue).toBeCloseTo(6.60654, 12);
    expect(over.pass).toBe(false);
    // 0.24 in = 6.096 mm = 6.35 − 0.254 exactly: the lower limit is inclusive too.
    expect(judge('gap', 0.24, 'in').pass).toBe(true);
  });

  it('a before-repair reading out of tolerance is judged but is not an after-repair failure', () => {
    const j = judge('oil', 330, 'F', 'before');
    expect(j.pass).toBe(false);
    expect(j.failsAfterRepair).toBe(false);
  });

  it('a unit of another quantity, or a key with no spec, is not judged', () => {
    expect(judge('current', 4, 'V')).toMatchObject({ kind: 'unknown', pass: null });
    expect(judge('nothing_here', 1, 'A')).toMatchObject({ kind: 'unknown', pass: null, explanation: 'The model has no specification for this reading.' });
  });
});

describe('product core temperature after the cook cycle, FDA Food Code §3-401.11 (for information)', () => {
  it('ground beef patty (comminuted meat, (A)(2)): 155 °F meets 155 °F for 17 s if held; 154 °F does not; 158 °F is instantaneous', () => {
    const at = judge('core_temp_ground_beef', 155, 'F');
    expect(at.kind).toBe('food');
    expect(at.pass).toBe(true);
    expect(at.explanation).toContain('155 °F for 17 s');
    expect(at.explanation).toContain('provided it is held that long');
    expect(judge('core_temp_ground_beef', 154, 'F').pass).toBe(false);
    const instant = judge('core_temp_ground_beef', 158, 'F');
    expect(instant.pass).toBe(true);
    expect(instant.explanation).toContain('158 °F instantaneous');
  });

  it('poultry ((A)(3)): 165 °F instantaneous; 74 °C = 165.2 °F passes, 73.8 °C = 164.84 °F does not', () => {
    expect(judge('core_temp_poultry', 165, 'F').pass).toBe(true);
    expect(judge('core_temp_poultry', 164.9, 'F').pass).toBe(false);
    const c74 = judge('core_temp_poultry', 74, 'C');
    expect(c74.convertedValue).toBeCloseTo(165.2, 10);
    expect(c74.pass).toBe(true);
    expect(judge('core_temp_poultry', 73.8, 'C').pass).toBe(false);
  });

  it('whole-muscle meat, fish and eggs ((A)(1)): 145 °F for 15 s', () => {
    expect(judge('core_temp_whole_muscle', 145, 'F').pass).toBe(true);
    expect(judge('core_temp_whole_muscle', 144.9, 'F').pass).toBe(false);
  });

  it('is information only: never an after-repair failure of the equipment', () => {
    const j = judge('core_temp_poultry', 150, 'F');
    expect(j.pass).toBe(false);
    expect(j.failsAfterRepair).toBe(false);
    expect(j.explanation).toContain('For information only');
  });
});

describe('readings sheet parsing: every bad row with its line number and reason', () => {
  it('accepts a clean sheet with an optional header, unit spellings and CRLF line ends (RFC 4180)', () => {
    const r = parseReadingsCsv('key,phase,value,unit\r\noil,before,338,°F\r\noil,after,176.5,c\r\ngap,after,0.25,in\r\ncore_temp_poultry,after,166,F\r\n', specs, 'TEST-1');
    expect(r.errors).toEqual([]);
    expect(r.rows.map((x) => [x.line, x.key, x.phase, x.value, x.unit])).toEqual([
      [2, 'oil', 'before', 338, 'F'],
      [3, 'oil', 'after', 176.5, 'C'],
      [4, 'gap', 'after', 0.25, 'in'],
      [5, 'core_temp_poultry', 'after', 166, 'F'],
    ]);
  });

  it('reports each bad row and imports none', () => {
    const csv = [
      'key,phase,value,unit',
      'oil,after,350,F',
      'flux,after,1,A',
      'oil,during,350,F',
      'oil,before,hot,F',
      'gap,after,0.25,V',
      'voltage,after,120,V',
      'current,after,4',
      'oil,after,351,F',
      'core_temp_poultry,before,165,F',
      'current,after,=1+2,A',
    ].join('\r\n');
    const r = parseReadingsCsv(csv, specs, 'TEST-1');
    expect(r.errors.map((e) => e.line)).toEqual([3, 4, 5, 6, 7, 8, 9, 10, 11]);
    const msg = Object.fromEntries(r.errors.map((e) => [e.line, e.message]));
    expect(msg[3]).toMatch(/^Unknown reading key "flux" for model TEST-1/);
    expect(msg[4]).toMatch(/phase must be "before" or "after", not "during"/);
    expect(msg[5]).toMatch(/value "hot" is not a number/);
    expect(msg[6]).toMatch(/unit V cannot be converted to mm/);
    expect(msg[7]).toMatch(/taken before the repair only/);
    expect(msg[8]).toMatch(/Expected 4 fields \(key, phase, value, unit\), found 3/);
    expect(msg[9]).toMatch(/already given on line 2/);
    expect(msg[10]).toMatch(/after the repair \(the verification cook cycle\)/);
    expect(msg[11]).toMatch(/value "=1\+2" is not a number/);
  });

  it('a quoting error is reported at its line', () => {
    const r = parseReadingsCsv('key,phase,value,unit\noil,after,350,F\n"gap,after,0.25,in\n', specs, null);
    expect(r.rows).toEqual([]);
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0].message).toMatch(/not well-formed CSV/);
  });

  it('an empty sheet is refused', () => {
    expect(parseReadingsCsv('key,phase,value,unit\r\n', specs, null).errors).toEqual([{ line: 1, message: 'The file has no readings.' }]);
  });
});
