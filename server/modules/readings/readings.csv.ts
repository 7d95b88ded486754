import { implausibleReading } from '@shared/calculations/number-input';
import { parse } from 'csv-parse/sync';
import { areCompatible, isUnitCode, unitLabel } from '@shared/calculations/units';
import type { ReadingSpec } from '../../db/schema/index';
import { FOOD_CORE_TEMP_KEYS, isFoodKey, phaseAllowed, type ReadingRow } from './readings.judge';

export const MAX_CSV_ROWS = 200;

export interface CsvRowError {
  line: number;
  message: string;
}

export interface ParsedReadingsCsv {
  rows: Array<ReadingRow & { line: number }>;
  errors: CsvRowError[];
}

const UNIT_ALIASES: Record<string, string> = {
  f: 'F', '°f': 'F', degf: 'F', fahrenheit: 'F',
  c: 'C', '°c': 'C', degc: 'C', celsius: 'C',
  in: 'in', inch: 'in', inches: 'in',
  mm: 'mm', millimetre: 'mm', millimetres: 'mm', millimeter: 'mm', millimeters: 'mm',
  a: 'A', amp: 'A', amps: 'A', ampere: 'A', amperes: 'A',
  v: 'V', volt: 'V', volts: 'V',
};

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)$/;

export function normaliseUnit(raw: string): string | null {
  return UNIT_ALIASES[raw.trim().toLowerCase()] ?? null;
}

/**
 * Parses a readings sheet: records of key, phase, value, unit (an optional header line of those
 * names). Every bad record is reported with its line number and reason; the caller imports
 * nothing unless `errors` is empty.
 */
export function parseReadingsCsv(text: string, specs: ReadingSpec[], modelNumber: string | null): ParsedReadingsCsv {
  const errors: CsvRowError[] = [];
  const rows: ParsedReadingsCsv['rows'] = [];
  let records: Array<{ record: string[]; info: { lines: number } }>;
  try {
    records = parse(text, { bom: true, info: true, relax_column_count: true, skip_empty_lines: true, relax_quotes: false, trim: true }) as unknown as typeof records;
  } catch (e) {
    const err = e as { message?: string; lines?: number };
    return { rows, errors: [{ line: err.lines ?? 1, message: `The file is not well-formed CSV: ${err.message ?? 'parse error'}.` }] };
  }
  const byKey = new Map(specs.map((s) => [s.key, s]));
  const known = [...specs.map((s) => s.key), ...Object.keys(FOOD_CORE_TEMP_KEYS)];
  const seen = new Map<string, number>();
  let first = true;
  for (const { record, info } of records) {
    const line = info.lines;
    if (first) {
      first = false;
      if (record.map((c) => c.toLowerCase()).join(',') === 'key,phase,value,unit') continue;
    }
    if (rows.length + errors.length >= MAX_CSV_ROWS) {
      errors.push({ line, message: `A readings sheet may have at most ${MAX_CSV_ROWS} rows.` });
      break;
    }
    if (record.length !== 4) {
      errors.push({ line, message: `Expected 4 fields (key, phase, value, unit), found ${record.length}.` });
      continue;
    }
    const [key, phaseRaw, valueRaw, unitRaw] = record;
    const problems: string[] = [];
    const spec = byKey.get(key);
    const food = isFoodKey(key);
    if (!key) problems.push('the key is empty');
    else if (!spec && !food) {
      problems.push(`unknown reading key "${key.slice(0, 60)}"${modelNumber ? ` for model ${modelNumber}` : ''} (expected one of: ${known.join(', ')})`);
    }
    const phase = phaseRaw.toLowerCase();
    if (phase !== 'before' && phase !== 'after') problems.push(`the phase must be "before" or "after", not "${phaseRaw.slice(0, 20)}"`);
    else if (spec && !phaseAllowed(spec, phase)) problems.push(`${spec.label} is taken ${spec.phase} the repair only`);
    else if (food && phase !== 'after') problems.push('a product core temperature is taken after the repair (the verification cook cycle)');
    let value = NaN;
    if (!NUMBER.test(valueRaw)) problems.push(`the value "${valueRaw.slice(0, 30)}" is not a number`);
    else value = Number(valueRaw);
    const unit = normaliseUnit(unitRaw);
    const implausible = unit && Number.isFinite(value) ? implausibleReading(value, unit) : null;
    if (implausible) problems.push(implausible.replace(/^A/, 'a').replace(/\.$/, ''));
    if (!unit) problems.push(`the unit "${unitRaw.slice(0, 20)}" is not one of F, C, in, mm, A, V`);
    else if (spec && !areCompatible(unit, spec.unit)) {
      problems.push(`the unit ${isUnitCode(unit) ? unitLabel(unit) : unit} cannot be converted to ${isUnitCode(spec.unit) ? unitLabel(spec.unit) : spec.unit} for ${spec.label}`);
    } else if (food && unit !== 'F' && unit !== 'C') problems.push('a product temperature must be in F or C');
    if (problems.length === 0) {
      const k = `${key}:${phase}`;
      const earlier = seen.get(k);
      if (earlier !== undefined) problems.push(`${key} ${phase} the repair is already given on line ${earlier}`);
      else seen.set(k, line);
    }
    if (problems.length > 0) {
      errors.push({ line, message: `${problems[0][0].toUpperCase()}${problems.join('; ').slice(1)}.` });
      continue;
    }
    rows.push({ line, key, phase: phase as 'before' | 'after', value, unit: unit! });
  }
  if (rows.length === 0 && errors.length === 0) errors.push({ line: 1, message: 'The file has no readings.' });
  return { rows, errors };
}
