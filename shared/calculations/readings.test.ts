import { describe, it, expect } from 'vitest';
import { judgeReading, judgeCookTemperature, judgeHoldingTemperature, FDA_FOOD_CODE_COOKING, FDA_FOOD_CODE_HOLDING } from './readings';

describe('readings against a spec', () => {
  it('converts to the spec unit and judges nominal ± tolerance, inclusive', () => {
    // NIST SP 811 (2008) B.9: 350 °F = (350 - 32) / 1.8 = 176.666... °C
    const r = judgeReading({ value: 350, unit: 'F' }, { unit: 'C', nominal: 177, tolerance: 3, phase: 'after' });
    expect(r.convertedValue).toBeCloseTo(176.6667, 4);
    expect(r.deviation).toBeCloseTo(-0.3333, 4);
    expect(r.pass).toBe(true);
    expect(r.failsAfterRepair).toBe(false);
    // NIST SP 811 (2008) B.8: 1 in = 25.4 mm; 36 in = 914.4 mm, the spec's upper limit exactly
    const edge = judgeReading({ value: 36, unit: 'in' }, { unit: 'mm', nominal: 900, tolerance: 14.4, phase: 'after' });
    expect(edge.convertedValue).toBe(914.4);
    expect(edge.pass).toBe(true);
    const over = judgeReading({ value: 36.01, unit: 'in' }, { unit: 'mm', nominal: 900, tolerance: 14.4, phase: 'after' });
    expect(over).toMatchObject({ pass: false, direction: 'high', failsAfterRepair: true });
  });

  it('a before-repair reading out of tolerance documents the fault, it is not an after-repair failure', () => {
    const r = judgeReading({ value: 4.1, unit: 'A' }, { unit: 'A', nominal: 12, tolerance: 1, phase: 'before', label: 'Element current' });
    expect(r).toMatchObject({ pass: false, direction: 'low', failsAfterRepair: false });
    expect(r.explanation).toMatch(/^Element current before repair: 4.1 A; spec 12 ± 1 A; deviation -7.9 A: below tolerance/);
  });

  it('refuses incompatible units', () => {
    expect(() => judgeReading({ value: 120, unit: 'V' }, { unit: 'A', nominal: 12, tolerance: 1, phase: 'after' })).toThrow(/Cannot convert V to A/);
  });
});

describe('FDA Food Code minimum internal temperatures', () => {
  it('table figures', () => {
    expect(FDA_FOOD_CODE_COOKING.poultry.alternatives[0]).toEqual({ minF: 165, minC: 74, holdSeconds: 0 }); // FDA Food Code §3-401.11(A)(3): 165 °F (74 °C) instantaneous
    expect(FDA_FOOD_CODE_COOKING.comminuted_meat.alternatives[0]).toEqual({ minF: 155, minC: 68, holdSeconds: 17 }); // FDA Food Code §3-401.11(A)(2): 155 °F (68 °C) for 17 s
    expect(FDA_FOOD_CODE_COOKING.whole_muscle_fish_eggs.alternatives[0]).toEqual({ minF: 145, minC: 63, holdSeconds: 15 }); // FDA Food Code §3-401.11(A)(1): 145 °F (63 °C) for 15 s
    expect(FDA_FOOD_CODE_HOLDING.hot.minF).toBe(135); // FDA Food Code §3-501.16: hot holding 135 °F or above
    expect(FDA_FOOD_CODE_HOLDING.cold.maxF).toBe(41); // FDA Food Code §3-501.16: cold holding 41 °F or less
  });

  it('poultry: 165 °F instantaneous', () => {
    expect(judgeCookTemperature({ category: 'poultry', value: 165, unit: 'F' }).pass).toBe(true); // FDA Food Code §3-401.11(A)(3): 165 °F
    expect(judgeCookTemperature({ category: 'poultry', value: 164.9, unit: 'F' }).pass).toBe(false); // FDA Food Code §3-401.11(A)(3): below 165 °F
    // 74 °C = 74 x 1.8 + 32 = 165.2 °F (NIST SP 811 B.9), at or above 165 °F (FDA Food Code §3-401.11(A)(3))
    const c = judgeCookTemperature({ category: 'poultry', value: 74, unit: 'C' });
    expect(c.valueF).toBeCloseTo(165.2, 10);
    expect(c.pass).toBe(true);
  });

  it('comminuted meat: 155 °F for 17 s, or the time-temperature alternatives', () => {
    expect(judgeCookTemperature({ category: 'comminuted_meat', value: 155, unit: 'F', holdSeconds: 17 }).pass).toBe(true); // FDA Food Code §3-401.11(A)(2): 155 °F for 17 s
    // Older adoptions printed 15 s; the 2013 and later Code requires 17 s at 155 °F
    expect(judgeCookTemperature({ category: 'comminuted_meat', value: 155, unit: 'F', holdSeconds: 15 }).pass).toBe(false); // FDA Food Code 2013+ §3-401.11(A)(2)
    expect(judgeCookTemperature({ category: 'comminuted_meat', value: 150, unit: 'F', holdSeconds: 60 }).pass).toBe(true); // FDA Food Code §3-401.11(A)(2): 150 °F for 1 min
    expect(judgeCookTemperature({ category: 'comminuted_meat', value: 145, unit: 'F', holdSeconds: 180 }).pass).toBe(true); // FDA Food Code §3-401.11(A)(2): 145 °F for 3 min
    expect(judgeCookTemperature({ category: 'comminuted_meat', value: 145, unit: 'F', holdSeconds: 179 }).pass).toBe(false); // FDA Food Code §3-401.11(A)(2): 3 min not reached
    expect(judgeCookTemperature({ category: 'comminuted_meat', value: 158, unit: 'F', holdSeconds: 0 }).pass).toBe(true); // FDA Food Code §3-401.11(A)(2): 158 °F instantaneous
    expect(judgeCookTemperature({ category: 'comminuted_meat', value: 157.9, unit: 'F', holdSeconds: 0 }).pass).toBe(false); // FDA Food Code §3-401.11(A)(2)
  });

  it('without a recorded hold time, the principal figure passes on condition of its hold', () => {
    const r = judgeCookTemperature({ category: 'comminuted_meat', value: 156, unit: 'F' }); // FDA Food Code §3-401.11(A)(2): 155 °F for 17 s
    expect(r).toMatchObject({ pass: true, holdAssumed: true });
    expect(r.explanation).toMatch(/provided it is held that long/);
    expect(judgeCookTemperature({ category: 'comminuted_meat', value: 159, unit: 'F' })).toMatchObject({ pass: true, holdAssumed: false }); // 158 °F instantaneous
    expect(judgeCookTemperature({ category: 'whole_muscle_fish_eggs', value: 144, unit: 'F' }).pass).toBe(false); // FDA Food Code §3-401.11(A)(1): 145 °F
  });

  it('judges in °F, the Code’s authoritative figure (its °C figures are rounded)', () => {
    // 68 °C = 154.4 °F (NIST SP 811 B.9), short of 155 °F (FDA Food Code §3-401.11(A)(2)); no exact round trip is asserted
    const r = judgeCookTemperature({ category: 'comminuted_meat', value: 68, unit: 'C', holdSeconds: 17 });
    expect(r.valueF).toBeCloseTo(154.4, 10);
    expect(r.pass).toBe(false);
  });

  it('hot and cold holding', () => {
    expect(judgeHoldingTemperature({ mode: 'hot', value: 135, unit: 'F' }).pass).toBe(true); // FDA Food Code §3-501.16: 135 °F or above
    expect(judgeHoldingTemperature({ mode: 'hot', value: 134.9, unit: 'F' }).pass).toBe(false); // FDA Food Code §3-501.16
    expect(judgeHoldingTemperature({ mode: 'cold', value: 41, unit: 'F' }).pass).toBe(true); // FDA Food Code §3-501.16: 41 °F or less
    expect(judgeHoldingTemperature({ mode: 'cold', value: 41.1, unit: 'F' }).pass).toBe(false); // FDA Food Code §3-501.16
    expect(judgeHoldingTemperature({ mode: 'cold', value: 5, unit: 'C' }).pass).toBe(true); // 5 °C = 41 °F exactly (NIST SP 811 B.9), FDA Food Code §3-501.16
    expect(() => judgeHoldingTemperature({ mode: 'hot', value: 60, unit: 'A' })).toThrow(/F or C/);
  });
});
