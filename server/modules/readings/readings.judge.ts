import { judgeCookTemperature, judgeReading, type CookJudgement, type FoodCategory } from '@shared/calculations/readings';
import { areCompatible, isUnitCode, unitLabel } from '@shared/calculations/units';
import type { ReadingSpec } from '../../db/schema/index';

/**
 * Keys for a product core temperature taken after the verification cook cycle. They are not
 * model specs: they are judged against the FDA Food Code minimum for the product cooked, as
 * information for the reviewer (never a pass/fail of the repair).
 */
export const FOOD_CORE_TEMP_KEYS: Record<string, { category: FoodCategory; label: string }> = {
  core_temp_ground_beef: { category: 'comminuted_meat', label: 'Product core temperature, ground beef patty' },
  core_temp_poultry: { category: 'poultry', label: 'Product core temperature, poultry' },
  core_temp_whole_muscle: { category: 'whole_muscle_fish_eggs', label: 'Product core temperature, whole-muscle meat, fish or eggs' },
};

export const isFoodKey = (key: string): boolean => Object.prototype.hasOwnProperty.call(FOOD_CORE_TEMP_KEYS, key);

export interface ReadingRow {
  id?: string;
  key: string;
  phase: 'before' | 'after';
  value: number;
  unit: string;
}

export interface SpecView {
  key: string;
  label: string;
  unit: string;
  unitLabel: string;
  nominal: number;
  tolerance: number;
  low: number;
  high: number;
  phase: 'before' | 'after' | 'both';
  requiredForCodes: string[];
}

export interface JudgedReading {
  id: string | null;
  key: string;
  label: string;
  phase: 'before' | 'after';
  value: number;
  unit: string;
  kind: 'spec' | 'food' | 'unknown';
  spec: SpecView | null;
  /** The value in the spec's unit (exact factors, rounded once). */
  convertedValue: number | null;
  deviation: number | null;
  /** Within tolerance; null when there is no spec to judge against. */
  pass: boolean | null;
  direction: 'low' | 'high' | 'within' | null;
  /** An after-repair reading outside its tolerance: a flag for the reviewer. */
  failsAfterRepair: boolean;
  explanation: string;
  food: CookJudgement | null;
}

export function specView(s: ReadingSpec): SpecView {
  return {
    key: s.key,
    label: s.label,
    unit: s.unit,
    unitLabel: isUnitCode(s.unit) ? unitLabel(s.unit) : s.unit,
    nominal: s.nominal,
    tolerance: s.tolerance,
    low: s.nominal - s.tolerance,
    high: s.nominal + s.tolerance,
    phase: s.phase,
    requiredForCodes: s.requiredForCodes,
  };
}

export function phaseAllowed(spec: Pick<ReadingSpec, 'phase'>, phase: 'before' | 'after'): boolean {
  return spec.phase === 'both' || spec.phase === phase;
}

/** Judges each reading against the model's spec of its key (converted to the spec's unit). */
export function judgeReadings(specs: ReadingSpec[], rows: ReadingRow[]): JudgedReading[] {
  const byKey = new Map(specs.map((s) => [s.key, s]));
  return rows.map((r) => {
    const base = { id: r.id ?? null, key: r.key, phase: r.phase, value: r.value, unit: r.unit };
    const food = FOOD_CORE_TEMP_KEYS[r.key];
    if (food) {
      if (r.unit !== 'F' && r.unit !== 'C') {
        return { ...base, label: food.label, kind: 'food', spec: null, convertedValue: null, deviation: null, pass: null, direction: null, failsAfterRepair: false, explanation: 'A product temperature must be in °F or °C.', food: null };
      }
      const j = judgeCookTemperature({ category: food.category, value: r.value, unit: r.unit });
      return {
        ...base,
        label: food.label,
        kind: 'food',
        spec: null,
        convertedValue: j.valueF,
        deviation: null,
        pass: j.pass,
        direction: null,
        failsAfterRepair: false,
        explanation: `${j.explanation} For information only.`,
        food: j,
      };
    }
    const spec = byKey.get(r.key);
    if (!spec || !areCompatible(r.unit, spec.unit)) {
      return {
        ...base,
        label: spec?.label ?? r.key,
        kind: 'unknown',
        spec: spec ? specView(spec) : null,
        convertedValue: null,
        deviation: null,
        pass: null,
        direction: null,
        failsAfterRepair: false,
        explanation: spec ? `The unit ${r.unit} cannot be converted to ${spec.unit}.` : 'The model has no specification for this reading.',
        food: null,
      };
    }
    const j = judgeReading({ value: r.value, unit: r.unit }, { unit: spec.unit, nominal: spec.nominal, tolerance: spec.tolerance, phase: r.phase, label: spec.label });
    return {
      ...base,
      label: spec.label,
      kind: 'spec',
      spec: specView(spec),
      convertedValue: j.convertedValue,
      deviation: j.deviation,
      pass: j.pass,
      direction: j.direction,
      failsAfterRepair: j.failsAfterRepair,
      explanation: j.explanation,
      food: null,
    };
  });
}
