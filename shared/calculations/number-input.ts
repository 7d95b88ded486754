/**
 * Strict reading of numbers typed by people. Nothing is changed without saying so: a text is a
 * number only when it is digits with at most one decimal separator and an optional leading
 * minus; letters, exponents ("1e6"), repeated separators ("12..5") and thousands separators
 * ("1,500") are refused with a message rather than dropped or guessed.
 *
 * The decimal separator: "." is always accepted; "," is accepted instead when the user's
 * locale writes decimals with a comma (de-DE "1,5"). In a point locale, "1,5" is refused: it
 * could mean 1.5 or 15.
 */
export type DecimalSeparator = '.' | ',';

export type NumberParse = { ok: true; value: number } | { ok: false; message: string };

/** The decimal separator a locale writes (Intl), "." when it cannot be told. */
export function decimalSeparatorOf(locale?: string): DecimalSeparator {
  try {
    const part = new Intl.NumberFormat(locale).formatToParts(1.5).find((p) => p.type === 'decimal');
    return part?.value === ',' ? ',' : '.';
  } catch {
    return '.';
  }
}

const PLAIN = /^-?\d+(?:\.\d+)?$/;

export function parseDecimalInput(raw: string, opts: { separator?: DecimalSeparator; integer?: boolean } = {}): NumberParse {
  const separator = opts.separator ?? '.';
  const text = raw.trim().replace(/^\u2212/, '-'); // a typographic minus is a minus
  const example = separator === ',' ? '1,5' : '1.5';
  if (text === '') return { ok: false, message: 'Enter a number.' };
  if (/[eE]/.test(text) && /\d/.test(text)) return { ok: false, message: `Write the number out in digits, without an exponent (“${text}” is not accepted).` };
  const commas = (text.match(/,/g) ?? []).length;
  const points = (text.match(/\./g) ?? []).length;
  if (commas + points > 1) {
    return commas > 0 && points > 0
      ? { ok: false, message: `Use one decimal separator and no thousands separators, like ${example}.` }
      : { ok: false, message: `“${text}” has more than one decimal separator; write it like ${example}.` };
  }
  if (commas === 1 && separator === '.') return { ok: false, message: `Use a point for decimals, like 1.5 (a comma could mean thousands).` };
  const normal = commas === 1 ? text.replace(',', '.') : text;
  if (!PLAIN.test(normal)) return { ok: false, message: `“${text}” is not a number; use digits only, like ${example}.` };
  const value = Number(normal);
  if (!Number.isFinite(value)) return { ok: false, message: `“${text}” is not a number.` };
  if (opts.integer && !Number.isInteger(value)) return { ok: false, message: 'Enter a whole number.' };
  return { ok: true, value: Object.is(value, -0) ? 0 : value };
}

/**
 * Plausible reading values per unit (inclusive), so a typing slip is refused with the range
 * shown instead of being judged "High". Bounds are common practice for commercial cooking
 * equipment, generous on purpose: temperature -100..1500 °F (the °C bounds are the same
 * temperatures by NIST SP 811: t(°C) = (t(°F) - 32) / 1.8, rounded outward), lengths up to
 * 10 ft (3048 mm), current up to 500 A, supply voltage up to 1000 V.
 */
export const PLAUSIBLE_READING_RANGES: Record<string, { min: number; max: number; label: string }> = {
  F: { min: -100, max: 1500, label: '°F' },
  C: { min: -74, max: 816, label: '°C' },
  in: { min: 0, max: 120, label: 'in' },
  mm: { min: 0, max: 3048, label: 'mm' },
  A: { min: 0, max: 500, label: 'A' },
  V: { min: 0, max: 1000, label: 'V' },
};

/** The message for a reading outside its unit's plausible range, or null when it is plausible. */
export function implausibleReading(value: number, unit: string): string | null {
  const r = PLAUSIBLE_READING_RANGES[unit];
  if (!r) return null;
  const fmt = (n: number) => n.toLocaleString('en-US');
  return value < r.min || value > r.max ? `A reading in ${r.label} must be between ${fmt(r.min)} and ${fmt(r.max)} ${r.label}.` : null;
}
