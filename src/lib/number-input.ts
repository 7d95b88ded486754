import { decimalSeparatorOf, parseDecimalInput, type NumberParse } from '@shared/calculations/number-input';

/** The decimal separator of the browser's locale: "1,5" is read as 1.5 only where the locale writes it so. */
export const browserDecimalSeparator = () => decimalSeparatorOf(typeof navigator === 'undefined' ? undefined : navigator.language);

/** Strict parse of a typed number in the browser's locale ("1.5" always; "1,5" in comma locales). */
export function parseTypedNumber(text: string, integer = false): NumberParse {
  return parseDecimalInput(text, { separator: browserDecimalSeparator(), integer });
}

/**
 * For react-hook-form's `setValueAs`: the number when the text reads as one, otherwise the text
 * itself, so the shared schema refuses it with the strict parser's message (never a silent guess).
 */
export function typedNumberValue(v: unknown): unknown {
  if (typeof v === 'number') return v;
  if (typeof v !== 'string') return v;
  const p = parseTypedNumber(v);
  return p.ok ? p.value : v;
}
