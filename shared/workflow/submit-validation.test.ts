import { describe, expect, it } from 'vitest';
import { validateForSubmit, problemsAsFields, type SubmitFacts } from './submit-validation';

const complete: SubmitFacts = {
  unitId: 'unit-1',
  failureDate: '2026-05-02',
  repairDate: '2026-05-04',
  today: '2026-05-10',
  complaint: 'Platen does not heat evenly.',
  cause: 'Upper heating element open circuit.',
  correction: 'Replaced the upper element, calibrated the gap.',
  laborLines: [{ repairCode: 'GR-110', requiredEvidence: ['serial_plate', 'failed_part'] }],
  partLines: [{ partId: 'part-1' }],
  attachments: [{ role: 'serial_plate' }, { role: 'failed_part' }],
  requiredReadings: [{ key: 'platen_gap', label: 'Platen gap', phase: 'after' }],
  readings: [{ key: 'platen_gap', phase: 'after' }],
};

const paths = (f: SubmitFacts) => validateForSubmit(f).problems.map((p) => `${p.path}:${p.code}`);

describe('validateForSubmit', () => {
  it('accepts a complete claim', () => {
    expect(validateForSubmit(complete)).toEqual({ ok: true, problems: [] });
  });

  it('needs a unit', () => {
    expect(paths({ ...complete, unitId: null })).toEqual(['serial:unit_missing']);
  });

  it('needs both dates, real ones, not in the future, repair not before failure', () => {
    expect(paths({ ...complete, failureDate: null, repairDate: '' })).toEqual(['failureDate:date_missing', 'repairDate:date_missing']);
    expect(paths({ ...complete, failureDate: '2026-02-30' })).toEqual(['failureDate:date_invalid']);
    expect(paths({ ...complete, repairDate: '2026-05-11' })).toEqual(['repairDate:date_in_future']);
    expect(paths({ ...complete, repairDate: '2026-05-10' })).toEqual([]); // today is allowed
    expect(paths({ ...complete, repairDate: '2026-05-01' })).toEqual(['repairDate:repair_before_failure']);
    expect(paths({ ...complete, repairDate: '2026-05-02' })).toEqual([]); // same day is allowed
  });

  it('needs at least one labor or part line', () => {
    expect(paths({ ...complete, laborLines: [], partLines: [] })).toEqual(['laborLines:no_lines']);
    expect(paths({ ...complete, laborLines: [], partLines: [{ partId: 'p' }], requiredReadings: [] })).toEqual([]);
    expect(paths({ ...complete, partLines: [] })).toEqual([]);
  });

  it('needs complaint, cause and correction that are not blank', () => {
    expect(paths({ ...complete, complaint: '  ', cause: '', correction: '\n' })).toEqual(['complaint:text_missing', 'cause:text_missing', 'correction:text_missing']);
  });

  it('needs the evidence every repair code requires, once per role', () => {
    const facts: SubmitFacts = {
      ...complete,
      laborLines: [
        { repairCode: 'GR-110', requiredEvidence: ['serial_plate', 'failed_part'] },
        { repairCode: 'GR-120', requiredEvidence: ['failed_part', 'readings_sheet'] },
      ],
      attachments: [{ role: 'serial_plate' }, { role: 'other' }],
    };
    const v = validateForSubmit(facts);
    expect(v.ok).toBe(false);
    expect(v.problems.map((p) => p.path)).toEqual(['attachments.failed_part', 'attachments.readings_sheet']);
    expect(v.problems[0].message).toContain('GR-110, GR-120');
  });

  it('needs the readings the specs require for the repair codes', () => {
    expect(paths({ ...complete, readings: [{ key: 'platen_gap', phase: 'before' }] })).toEqual(['readings.platen_gap.after:reading_missing']);
  });

  it('gives field errors keyed by path', () => {
    const fields = problemsAsFields(validateForSubmit({ ...complete, unitId: null, complaint: '' }).problems);
    expect(Object.keys(fields)).toEqual(['serial', 'complaint']);
  });
});
