/** Small text helpers for explanations. */
import { centsToDecimalString, currencySymbol, formatCents, groupThousands } from './money';
import { rational, toDecimalString, type Rational } from './exact';

/** "$85.50" with a currency, "85.50" without. */
export function money(cents: number, currency?: string): string {
  return currency ? formatCents(cents, currency) : centsToDecimalString(cents);
}

/** A cents rate that may carry a fraction of a cent (65.5 cents per mile) shown in major units: "$0.655". */
export function rateText(centsPerUnit: number | Rational, currency?: string): string {
  const r = rational(centsPerUnit);
  const major = toDecimalString({ n: r.n, d: r.d * 100n }, 6);
  const neg = major.startsWith('-');
  const abs = neg ? major.slice(1) : major;
  const dot = abs.indexOf('.');
  const i = dot < 0 ? abs : abs.slice(0, dot);
  const f = dot < 0 ? '' : abs.slice(dot + 1);
  const body = `${groupThousands(i)}.${f.length >= 2 ? f : f.padEnd(2, '0')}`;
  return `${neg ? '-' : ''}${currency ? currencySymbol(currency) : ''}${body}`;
}

const PLAIN_DECIMAL = /^-?\d+(?:\.(\d+))?$/;

/** Exact value of a decimal shown with at most `places` places: 1.25 -> "1.25". */
export function num(x: number | Rational, places = 4): string {
  if (typeof x === 'number') {
    const s = String(x);
    const m = PLAIN_DECIMAL.exec(s);
    if (m && (m[1] === undefined || m[1].length <= places)) return s === '-0' ? '0' : s;
  }
  return toDecimalString(rational(x), places);
}
