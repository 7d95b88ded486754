/**
 * Money: integer amounts in the currency's minor unit ("cents").
 *
 * Rounding rule: every line amount is computed exactly (rates, hours, quantities
 * and percentages multiplied as exact decimals, never as binary floats) and then
 * rounded half-up (away from zero at the tie) once per line, to whole cents.
 * Totals are sums of the rounded line amounts, so they add up on paper.
 */
import { CalculationInputError } from './errors';
import { product, rational, roundHalfUpToInteger, toFixedString, mul, pow10, type Rational } from './exact';

/** ISO 4217 minor units (digits after the decimal point) of the currencies Fieldproof accepts. */
export const ISO_4217_MINOR_UNITS = { USD: 2, CAD: 2, EUR: 2 } as const;

export type CurrencyCode = keyof typeof ISO_4217_MINOR_UNITS;

export const CURRENCY_CODES = Object.keys(ISO_4217_MINOR_UNITS) as CurrencyCode[];

const SYMBOLS: Record<CurrencyCode, string> = { USD: '$', CAD: 'CA$', EUR: '€' };

export function isCurrencyCode(code: unknown): code is CurrencyCode {
  return typeof code === 'string' && Object.prototype.hasOwnProperty.call(ISO_4217_MINOR_UNITS, code);
}

export function minorUnits(currency: string): number {
  if (!isCurrencyCode(currency)) {
    throw new CalculationInputError('currency', `Unsupported currency "${currency}"; expected one of ${CURRENCY_CODES.join(', ')}`);
  }
  return ISO_4217_MINOR_UNITS[currency];
}

export function isCents(x: unknown): x is number {
  return typeof x === 'number' && Number.isSafeInteger(x);
}

export function assertCents(x: unknown, field = 'amount'): number {
  if (!isCents(x)) throw new CalculationInputError(field, `${field} must be a whole number of cents`);
  return x === 0 ? 0 : x;
}

export function sumCents(values: readonly number[]): number {
  let total = 0;
  for (const v of values) total += v;
  return total;
}

function bigToSafeNumber(v: bigint): number {
  const n = Number(v);
  if (!Number.isSafeInteger(n)) throw new CalculationInputError('amount', 'amount is too large to be held in cents');
  return n === 0 ? 0 : n;
}

/**
 * Rounds an amount in major units (dollars, euros) to whole minor units, half-up
 * (away from zero at the tie): 2.345 -> 235, -2.345 -> -235, 0.125 -> 13.
 * The number is read through its shortest decimal form, so 2.345 is the tie it
 * looks like, not the binary double just below it.
 */
export function roundHalfUpToCents(x: number | string, digits = 2): number {
  return bigToSafeNumber(roundHalfUpToInteger(mul(rational(x, 'amount'), { n: pow10(digits), d: 1n })));
}

/** Exact rational value rounded half-up (away from zero at the tie) to a whole number of cents. */
export function roundRationalToCents(value: Rational): number {
  return bigToSafeNumber(roundHalfUpToInteger(value));
}

/**
 * The exact product of the factors (one of them a rate in cents), rounded half-up
 * once to whole cents: productCents([8550, 1.25, 1.5]) = 160312.5 -> 160313.
 */
export function productCents(factors: ReadonlyArray<number | string | Rational>): number {
  return roundRationalToCents(product(factors));
}

/** 1234 -> "12.34", -5 -> "-0.05", 0 -> "0.00". */
export function centsToDecimalString(cents: number, digits = 2): string {
  assertCents(cents, 'cents');
  if (digits === 2) {
    const neg = cents < 0;
    const a = neg ? -cents : cents;
    const frac = a % 100;
    return `${neg ? '-' : ''}${(a - frac) / 100}.${frac < 10 ? '0' : ''}${frac}`;
  }
  return toFixedString({ n: BigInt(cents), d: pow10(digits) }, digits);
}

/** Whole cents from a decimal text such as "12.34" (half-up when it carries more places). */
export function decimalStringToCents(text: string, digits = 2): number {
  return roundHalfUpToCents(text, digits);
}

export function groupThousands(intDigits: string): string {
  const len = intDigits.length;
  if (len <= 3) return intDigits;
  let out = intDigits.slice(0, len % 3 || 3);
  for (let i = len % 3 || 3; i < len; i += 3) out += `,${intDigits.slice(i, i + 3)}`;
  return out;
}

export function currencySymbol(currency: string): string {
  minorUnits(currency);
  return SYMBOLS[currency as CurrencyCode];
}

/**
 * Display text, deterministic on every platform: 123456 USD -> "$1,234.56",
 * -5 CAD -> "-CA$0.05", 340 EUR -> "€3.40".
 */
export function formatCents(cents: number, currency: string): string {
  const digits = minorUnits(currency);
  const text = centsToDecimalString(cents, digits);
  const neg = text.startsWith('-');
  const body = neg ? text.slice(1) : text;
  const dot = body.indexOf('.');
  const grouped = dot < 0 ? groupThousands(body) : `${groupThousands(body.slice(0, dot))}${body.slice(dot)}`;
  return `${neg ? '-' : ''}${SYMBOLS[currency as CurrencyCode]}${grouped}`;
}
