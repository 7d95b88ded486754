/**
 * Units of measure for readings and distances, with exact factors
 * (NIST SP 811, 2008, Appendix B.8 and B.9):
 *   1 in = 25.4 mm, 1 mi = 1.609344 km, 1 lb = 0.45359237 kg (all exact);
 *   t(°C) = (t(°F) - 32) / 1.8.
 * Conversions are carried out as exact fractions and rounded only once, to the
 * nearest double, at the end: convert(98.6, 'F', 'C') is exactly 37.
 */
import { CalculationInputError } from './errors';
import { add, div, mul, rational, sub, toNumber, type Rational } from './exact';

export const UNIT_CODES = ['F', 'C', 'in', 'mm', 'mi', 'km', 'lb', 'kg', 'A', 'V'] as const;
export type UnitCode = (typeof UNIT_CODES)[number];

export type Quantity = 'temperature' | 'length' | 'mass' | 'current' | 'voltage';

interface UnitDef {
  quantity: Quantity;
  label: string;
  /** base = value * scale + offset; base units: °C, mm, kg, A, V. */
  scale: Rational;
  offset: Rational;
}

const r = (n: bigint, d: bigint = 1n): Rational => ({ n, d });

const UNITS: Record<UnitCode, UnitDef> = {
  C: { quantity: 'temperature', label: '°C', scale: r(1n), offset: r(0n) },
  // t(°C) = (t(°F) - 32) / 1.8 = t(°F) * 5/9 - 160/9
  F: { quantity: 'temperature', label: '°F', scale: r(5n, 9n), offset: r(-160n, 9n) },
  mm: { quantity: 'length', label: 'mm', scale: r(1n), offset: r(0n) },
  in: { quantity: 'length', label: 'in', scale: r(254n, 10n), offset: r(0n) },
  km: { quantity: 'length', label: 'km', scale: r(1_000_000n), offset: r(0n) },
  mi: { quantity: 'length', label: 'mi', scale: r(1_609_344n), offset: r(0n) },
  kg: { quantity: 'mass', label: 'kg', scale: r(1n), offset: r(0n) },
  lb: { quantity: 'mass', label: 'lb', scale: r(45_359_237n, 100_000_000n), offset: r(0n) },
  A: { quantity: 'current', label: 'A', scale: r(1n), offset: r(0n) },
  V: { quantity: 'voltage', label: 'V', scale: r(1n), offset: r(0n) },
};

export function isUnitCode(code: unknown): code is UnitCode {
  return typeof code === 'string' && Object.prototype.hasOwnProperty.call(UNITS, code);
}

function unitDef(code: string, field: string): UnitDef {
  if (!isUnitCode(code)) {
    throw new CalculationInputError(field, `Unknown unit "${code}"; expected one of ${UNIT_CODES.join(', ')}`);
  }
  return UNITS[code];
}

export function quantityOf(code: UnitCode): Quantity {
  return UNITS[code].quantity;
}

export function unitLabel(code: UnitCode): string {
  return UNITS[code].label;
}

export function areCompatible(from: string, to: string): boolean {
  return isUnitCode(from) && isUnitCode(to) && UNITS[from].quantity === UNITS[to].quantity;
}

function defs(from: string, to: string): [UnitDef, UnitDef] {
  const a = unitDef(from, 'from');
  const b = unitDef(to, 'to');
  if (a.quantity !== b.quantity) {
    throw new CalculationInputError(
      'unit',
      `Cannot convert ${a.label} to ${b.label}: ${a.quantity} and ${b.quantity} are different quantities`,
    );
  }
  return [a, b];
}

/** Exact converted value as a fraction. */
export function convertExact(value: number | string | Rational, from: string, to: string): Rational {
  const [a, b] = defs(from, to);
  const v = rational(value, 'value');
  if (from === to) return v;
  const base = add(mul(v, a.scale), a.offset);
  return div(sub(base, b.offset), b.scale);
}

/** convert(212, 'F', 'C') = 100; convert(1, 'in', 'mm') = 25.4. Throws on unknown or incompatible units. */
export function convert(value: number, from: string, to: string): number {
  return toNumber(convertExact(value, from, to));
}

/** A difference (interval) between two values, converted without the offset: 1 °F interval = 5/9 °C. */
export function convertInterval(value: number, from: string, to: string): number {
  const [a, b] = defs(from, to);
  return toNumber(div(mul(rational(value, 'value'), a.scale), b.scale));
}

export const fahrenheitToCelsius = (f: number): number => convert(f, 'F', 'C');
export const celsiusToFahrenheit = (c: number): number => convert(c, 'C', 'F');
export const inchesToMillimetres = (inches: number): number => convert(inches, 'in', 'mm');
export const millimetresToInches = (mm: number): number => convert(mm, 'mm', 'in');
export const milesToKilometres = (mi: number): number => convert(mi, 'mi', 'km');
export const kilometresToMiles = (km: number): number => convert(km, 'km', 'mi');
export const poundsToKilograms = (lb: number): number => convert(lb, 'lb', 'kg');
export const kilogramsToPounds = (kg: number): number => convert(kg, 'kg', 'lb');
