/**
 * Readings taken by the technician before and after a repair, entered in the
 * unit at hand and judged in the spec's unit against nominal +/- tolerance
 * (inclusive at both limits). Comparisons are made on the exact converted value,
 * so 350 °F against a 176.6667 °C limit is not decided by float noise.
 *
 * Also: the FDA Food Code minimum internal cooking temperatures (§3-401.11) and
 * holding temperatures (§3-501.16), used to judge a product core temperature
 * after a verification cook cycle. The Code's °F figures are authoritative; its
 * °C figures are rounded, so a °C reading is converted to °F and judged there.
 */
import { CalculationInputError } from './errors';
import { abs, cmp, rational, sub, toNumber, type Rational } from './exact';
import { convertExact, isUnitCode, unitLabel, type UnitCode } from './units';
import { num } from './format';

export type ReadingPhase = 'before' | 'after';

export interface ReadingValue {
  value: number;
  unit: string;
}

export interface ReadingSpec {
  unit: string;
  nominal: number;
  /** Plus or minus, in the spec's unit. */
  tolerance: number;
  phase: ReadingPhase;
  label?: string;
}

export interface ReadingJudgement {
  value: number;
  unit: UnitCode;
  specUnit: UnitCode;
  convertedValue: number;
  /** convertedValue - nominal, in the spec's unit. */
  deviation: number;
  low: number;
  high: number;
  pass: boolean;
  direction: 'low' | 'high' | 'within';
  phase: ReadingPhase;
  /** An after-repair reading outside the tolerance (a reviewer flag). */
  failsAfterRepair: boolean;
  explanation: string;
}

function finite(x: unknown, field: string): number {
  if (typeof x !== 'number' || !Number.isFinite(x)) throw new CalculationInputError(field, `${field} must be a number`);
  return x;
}

export function judgeReading(reading: ReadingValue, spec: ReadingSpec): ReadingJudgement {
  if (!reading || !spec) throw new CalculationInputError('reading', 'reading and spec are required');
  const value = finite(reading.value, 'reading.value');
  const nominal = finite(spec.nominal, 'spec.nominal');
  const tolerance = finite(spec.tolerance, 'spec.tolerance');
  if (tolerance < 0) throw new CalculationInputError('spec.tolerance', 'spec.tolerance must be 0 or more');
  if (!isUnitCode(reading.unit)) throw new CalculationInputError('reading.unit', `Unknown unit "${String(reading.unit)}"`);
  if (!isUnitCode(spec.unit)) throw new CalculationInputError('spec.unit', `Unknown unit "${String(spec.unit)}"`);
  if (spec.phase !== 'before' && spec.phase !== 'after') {
    throw new CalculationInputError('spec.phase', "spec.phase must be 'before' or 'after'");
  }
  const converted = convertExact(value, reading.unit, spec.unit);
  const deviation = sub(converted, rational(nominal));
  const pass = cmp(abs(deviation), rational(tolerance)) <= 0;
  const direction = pass ? 'within' : deviation.n < 0n ? 'low' : 'high';
  const su = unitLabel(spec.unit);
  const shown =
    reading.unit === spec.unit ? `${num(value)} ${su}` : `${num(value)} ${unitLabel(reading.unit)} = ${num(converted)} ${su}`;
  const what = spec.label ? `${spec.label} ${spec.phase} repair` : `Reading ${spec.phase} repair`;
  const explanation = `${what}: ${shown}; spec ${num(nominal)} ± ${num(tolerance)} ${su}; deviation ${num(deviation)} ${su}: ${
    pass ? 'within tolerance' : direction === 'low' ? 'below tolerance' : 'above tolerance'
  }.`;
  return {
    value,
    unit: reading.unit,
    specUnit: spec.unit,
    convertedValue: toNumber(converted),
    deviation: toNumber(deviation),
    low: nominal - tolerance,
    high: nominal + tolerance,
    pass,
    direction,
    phase: spec.phase,
    failsAfterRepair: spec.phase === 'after' && !pass,
    explanation,
  };
}

// ---------------------------------------------------------------------------
// FDA Food Code (2013 and later, incl. 2022)

export type FoodCategory = 'whole_muscle_fish_eggs' | 'comminuted_meat' | 'poultry';

export interface CookAlternative {
  minF: number;
  /** The Code's rounded °C figure where recorded here; null where not. */
  minC: number | null;
  /** Hold time at or above the temperature; 0 = instantaneous. */
  holdSeconds: number;
}

export interface FoodCodeCookRequirement {
  category: FoodCategory;
  section: string;
  label: string;
  /** The first is the Code's principal figure. */
  alternatives: CookAlternative[];
}

export const FDA_FOOD_CODE_COOKING: Record<FoodCategory, FoodCodeCookRequirement> = {
  whole_muscle_fish_eggs: {
    category: 'whole_muscle_fish_eggs',
    section: 'FDA Food Code §3-401.11(A)(1)',
    label: 'Whole-muscle meat, fish and eggs',
    alternatives: [{ minF: 145, minC: 63, holdSeconds: 15 }],
  },
  comminuted_meat: {
    category: 'comminuted_meat',
    section: 'FDA Food Code §3-401.11(A)(2)',
    label: 'Comminuted meat (ground beef patties)',
    alternatives: [
      { minF: 155, minC: 68, holdSeconds: 17 },
      { minF: 145, minC: null, holdSeconds: 180 },
      { minF: 150, minC: null, holdSeconds: 60 },
      { minF: 158, minC: null, holdSeconds: 0 },
    ],
  },
  poultry: {
    category: 'poultry',
    section: 'FDA Food Code §3-401.11(A)(3)',
    label: 'Poultry',
    alternatives: [{ minF: 165, minC: 74, holdSeconds: 0 }],
  },
};

export const FDA_FOOD_CODE_HOLDING = {
  hot: { section: 'FDA Food Code §3-501.16', minF: 135, minC: 57 },
  cold: { section: 'FDA Food Code §3-501.16', maxF: 41, maxC: 5 },
} as const;

export interface CookJudgement {
  pass: boolean;
  category: FoodCategory;
  section: string;
  valueF: number;
  /** The alternative met, if any. */
  met: CookAlternative | null;
  /** True when no hold time was recorded and the pass rests on holding for `met.holdSeconds`. */
  holdAssumed: boolean;
  explanation: string;
}

function toFahrenheitExact(value: number, unit: string, field: string): Rational {
  finite(value, field);
  if (unit !== 'F' && unit !== 'C') throw new CalculationInputError(`${field}Unit`, 'a food temperature must be in F or C');
  return convertExact(value, unit, 'F');
}

function holdText(s: number): string {
  if (s === 0) return 'instantaneous';
  if (s % 60 === 0) return `for ${s / 60} min`;
  return `for ${s} s`;
}

/**
 * Judges a product core temperature against §3-401.11. With `holdSeconds`, passes
 * when some alternative's temperature and hold are both met; without it, an
 * instantaneous alternative passes outright and otherwise the principal figure is
 * checked and the pass is conditional on its hold time (`holdAssumed`).
 */
export function judgeCookTemperature(input: {
  category: FoodCategory;
  value: number;
  unit: 'F' | 'C' | string;
  holdSeconds?: number | null;
}): CookJudgement {
  const req = FDA_FOOD_CODE_COOKING[input.category];
  if (!req) throw new CalculationInputError('category', `Unknown food category "${String(input.category)}"`);
  const f = toFahrenheitExact(input.value, input.unit, 'value');
  const valueF = toNumber(f);
  const reached = (a: CookAlternative) => cmp(f, rational(a.minF)) >= 0;
  const shown = input.unit === 'C' ? `${num(input.value)} °C (${num(f, 2)} °F)` : `${num(input.value)} °F`;
  const hold = input.holdSeconds;
  let met: CookAlternative | null = null;
  let holdAssumed = false;
  if (hold !== undefined && hold !== null) {
    if (typeof hold !== 'number' || !Number.isFinite(hold) || hold < 0) {
      throw new CalculationInputError('holdSeconds', 'holdSeconds must be 0 or more');
    }
    met = req.alternatives.find((a) => reached(a) && hold >= a.holdSeconds) ?? null;
  } else {
    met = req.alternatives.find((a) => a.holdSeconds === 0 && reached(a)) ?? null;
    if (!met && reached(req.alternatives[0])) {
      met = req.alternatives[0];
      holdAssumed = true;
    }
  }
  const principal = req.alternatives[0];
  const need = req.alternatives.map((a) => `${a.minF} °F ${holdText(a.holdSeconds)}`).join(', or ');
  const explanation = met
    ? `${req.label}: core ${shown}${hold != null ? ` held ${hold} s` : ''} meets ${met.minF} °F ${holdText(met.holdSeconds)}${
        holdAssumed ? ' provided it is held that long' : ''
      } (${req.section}).`
    : `${req.label}: core ${shown}${hold != null ? ` held ${hold} s` : ''} does not meet ${need} (${req.section}; principal figure ${principal.minF} °F).`;
  return { pass: met !== null, category: req.category, section: req.section, valueF, met, holdAssumed, explanation };
}

export interface HoldingJudgement {
  pass: boolean;
  mode: 'hot' | 'cold';
  valueF: number;
  section: string;
  explanation: string;
}

/** Hot holding at 135 °F or above; cold holding at 41 °F or below (§3-501.16). */
export function judgeHoldingTemperature(input: { mode: 'hot' | 'cold'; value: number; unit: 'F' | 'C' | string }): HoldingJudgement {
  if (input.mode !== 'hot' && input.mode !== 'cold') throw new CalculationInputError('mode', "mode must be 'hot' or 'cold'");
  const f = toFahrenheitExact(input.value, input.unit, 'value');
  const shown = input.unit === 'C' ? `${num(input.value)} °C (${num(f, 2)} °F)` : `${num(input.value)} °F`;
  if (input.mode === 'hot') {
    const h = FDA_FOOD_CODE_HOLDING.hot;
    const pass = cmp(f, rational(h.minF)) >= 0;
    return {
      pass, mode: 'hot', valueF: toNumber(f), section: h.section,
      explanation: `Hot holding ${shown}: ${pass ? 'at or above' : 'below'} ${h.minF} °F (${h.section}).`,
    };
  }
  const c = FDA_FOOD_CODE_HOLDING.cold;
  const pass = cmp(f, rational(c.maxF)) <= 0;
  return {
    pass, mode: 'cold', valueF: toNumber(f), section: c.section,
    explanation: `Cold holding ${shown}: ${pass ? 'at or below' : 'above'} ${c.maxF} °F (${c.section}).`,
  };
}
