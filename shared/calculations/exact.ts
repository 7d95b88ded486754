/**
 * Exact rational arithmetic on BigInt, used wherever a money amount or a unit
 * conversion must not pick up binary floating-point error.
 *
 * A JavaScript number is read through its shortest round-trip decimal form
 * (`String(x)`): 2.345 is read as exactly 2345/1000, not as the binary double
 * 2.34499999999999997... This is the same reading decimal.js makes of a number.
 */
import { CalculationInputError } from './errors';

/** value = n / d, with d > 0 (not necessarily in lowest terms). */
export interface Rational {
  readonly n: bigint;
  readonly d: bigint;
}

const DECIMAL_RE = /^([+-]?)(\d+)(?:\.(\d*))?(?:e([+-]?\d+))?$/i;
const DECIMAL_RE_LEADING_DOT = /^([+-]?)()\.(\d+)(?:e([+-]?\d+))?$/i;

const POW10_CACHE: bigint[] = [];
export function pow10(k: number): bigint {
  if (k < 64) {
    let v = POW10_CACHE[k];
    if (v === undefined) {
      v = 10n ** BigInt(k);
      POW10_CACHE[k] = v;
    }
    return v;
  }
  return 10n ** BigInt(k);
}

/** Reads a finite number, a decimal string ("12.50", "-1e-3") or a bigint exactly. */
export function rational(x: number | string | bigint | Rational, field = 'value'): Rational {
  if (typeof x === 'object') return x;
  if (typeof x === 'bigint') return { n: x, d: 1n };
  if (typeof x === 'number') {
    if (!Number.isFinite(x)) throw new CalculationInputError(field, `${field} must be a finite number`);
    if (Number.isSafeInteger(x)) return { n: BigInt(x), d: 1n };
    // Fast path for short decimals: when N / 10^k rounds back to x and |x| < 1e9, the
    // spacing of doubles is below 10^-6, so N / 10^k is the decimal String(x) shows.
    if (x > -1e9 && x < 1e9) {
      let scale = 10;
      for (let k = 1; k <= 6; k++, scale *= 10) {
        const m = Math.round(x * scale);
        if (m / scale === x) return { n: BigInt(m), d: pow10(k) };
      }
    }
  }
  const s = String(x).trim();
  const m = DECIMAL_RE.exec(s) ?? DECIMAL_RE_LEADING_DOT.exec(s);
  if (!m) throw new CalculationInputError(field, `${field} must be a decimal number, got "${s}"`);
  const sign = m[1] === '-' ? -1n : 1n;
  const intPart = m[2] ?? '';
  const fracPart = m[3] ?? '';
  const exp = m[4] ? Number(m[4]) : 0;
  let n = BigInt((intPart + fracPart) || '0') * sign;
  let scale = fracPart.length - exp;
  if (scale <= 0) {
    n *= pow10(-scale);
    scale = 0;
  }
  return { n, d: pow10(scale) };
}

export const ZERO: Rational = { n: 0n, d: 1n };
export const ONE: Rational = { n: 1n, d: 1n };

export function add(a: Rational, b: Rational): Rational {
  if (a.d === b.d) return { n: a.n + b.n, d: a.d };
  return { n: a.n * b.d + b.n * a.d, d: a.d * b.d };
}

export function sub(a: Rational, b: Rational): Rational {
  return add(a, { n: -b.n, d: b.d });
}

export function mul(a: Rational, b: Rational): Rational {
  return { n: a.n * b.n, d: a.d * b.d };
}

export function div(a: Rational, b: Rational): Rational {
  if (b.n === 0n) throw new RangeError('division by zero');
  return b.n < 0n ? { n: -a.n * b.d, d: a.d * -b.n } : { n: a.n * b.d, d: a.d * b.n };
}

export function product(factors: ReadonlyArray<Rational | number | string>): Rational {
  let r = ONE;
  for (const f of factors) r = mul(r, rational(f));
  return r;
}

/** -1, 0 or 1. */
export function cmp(a: Rational, b: Rational): number {
  const l = a.n * b.d;
  const r = b.n * a.d;
  return l < r ? -1 : l > r ? 1 : 0;
}

export function min(a: Rational, b: Rational): Rational {
  return cmp(a, b) <= 0 ? a : b;
}

export function abs(a: Rational): Rational {
  return a.n < 0n ? { n: -a.n, d: a.d } : a;
}

function gcd(a: bigint, b: bigint): bigint {
  if (a < 0n) a = -a;
  while (b !== 0n) {
    const t = a % b;
    a = b;
    b = t;
  }
  return a;
}

export function normalize(a: Rational): Rational {
  const g = gcd(a.n, a.d);
  return g > 1n ? { n: a.n / g, d: a.d / g } : a;
}

/**
 * Rounds to the nearest integer; a tie (exactly half) goes away from zero,
 * as decimal.js ROUND_HALF_UP does: 2.5 -> 3, -2.5 -> -3.
 */
export function roundHalfUpToInteger(a: Rational): bigint {
  const neg = a.n < 0n;
  const n = neg ? -a.n : a.n;
  const q = (2n * n + a.d) / (2n * a.d);
  return neg ? -q : q;
}

const SAFE = 2n ** 53n;

/** Nearest double to the exact value (both parts under 2^53: a single IEEE division, which is correctly rounded). */
export function toNumber(a: Rational): number {
  let r = a;
  if (r.n >= SAFE || -r.n >= SAFE || r.d >= SAFE) r = normalize(r);
  if (r.n < SAFE && -r.n < SAFE && r.d < SAFE) {
    const v = Number(r.n) / Number(r.d);
    return v === 0 ? 0 : v;
  }
  return Number(toDecimalString(r, 20));
}

/** Decimal text rounded half-up to `places` places, trailing zeros kept: (1234, 2) -> "12.34" for 1234/100. */
export function toFixedString(a: Rational, places: number): string {
  const scaled = roundHalfUpToInteger(mul(a, { n: pow10(places), d: 1n }));
  const neg = scaled < 0n;
  const digits = (neg ? -scaled : scaled).toString().padStart(places + 1, '0');
  const body = places > 0 ? `${digits.slice(0, digits.length - places)}.${digits.slice(digits.length - places)}` : digits;
  return neg ? `-${body}` : body;
}

/** Decimal text rounded half-up to at most `maxPlaces` places, trailing zeros dropped: 1.250 -> "1.25", 2 -> "2". */
export function toDecimalString(a: Rational, maxPlaces = 6): string {
  const s = toFixedString(a, maxPlaces);
  if (!s.includes('.')) return s;
  const t = s.replace(/0+$/, '').replace(/\.$/, '');
  return t === '-0' ? '0' : t;
}
