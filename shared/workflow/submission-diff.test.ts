import { describe, expect, it } from 'vitest';
import { diffSnapshots, submissionSnapshot } from './submission-diff';

const base = {
  complaint: 'No heat.',
  cause: 'Element open.',
  correction: 'Replaced element.',
  failureDate: '2026-01-02',
  repairDate: '2026-01-03',
  preAuthorization: null,
  laborLines: [{ repairCode: 'RC-1', hoursWorked: 1, overtime: false, note: '' }],
  travel: { roundTripMiles: 10, travelHours: 0.5 },
  partLines: [{ partNumber: 'P-1', quantity: 1 }],
  readings: [{ key: 'temp', phase: 'after', value: 350, unit: 'F' }],
  attachments: [{ role: 'unit_overall', originalName: 'a.jpg', retractedAt: null }],
};

describe('submission snapshots and their diff', () => {
  it('lists changed, added and removed fields with before and after, and nothing for equal submissions', () => {
    const a = submissionSnapshot(base);
    expect(diffSnapshots(a, submissionSnapshot(base))).toEqual([]);
    const b = submissionSnapshot({
      ...base,
      cause: 'Element shorted.',
      partLines: [{ partNumber: 'P-1', quantity: 2 }, { partNumber: 'P-2', quantity: 1 }],
      attachments: [{ role: 'unit_overall', originalName: 'a.jpg', retractedAt: '2026-01-04T00:00:00Z' }],
    });
    expect(diffSnapshots(a, b)).toEqual([
      { field: 'Cause', before: 'Element open.', after: 'Element shorted.' },
      { field: 'Part P-1', before: 'quantity 1', after: 'quantity 2' },
      { field: 'Part P-2', before: null, after: 'quantity 1' },
      { field: 'Evidence: a.jpg', before: expect.any(String), after: null },
    ]);
  });

  it('numbers two lines with the same label instead of letting one hide the other', () => {
    const s = submissionSnapshot({ ...base, laborLines: [base.laborLines[0]!, { repairCode: 'RC-1', hoursWorked: 2, overtime: true, note: '' }] });
    expect(s['Labor RC-1']).toBe('1 h');
    expect(s['Labor RC-1 #2']).toBe('2 h, overtime');
  });
});
