import { z } from 'zod';

/**
 * The one contract for human-entered names and short texts (agency, person, site and catalogue
 * names, references, reasons) and for longer free text (complaint, cause, correction, comments).
 *
 * Every value is normalised to Unicode NFC and trimmed, then refused with a plain message when it
 * holds characters that can make one text look like another or break a line in a mail, a CSV or a
 * log (OWASP ASVS 5.0 V2.2; Unicode Technical Report #36, "Unicode Security Considerations"):
 * - C0 and C1 control characters (U+0000–U+001F, U+007F–U+009F). One-line fields refuse CR, LF and
 *   tab too; multi-line fields keep LF (CRLF and a lone CR become LF) and refuse the rest.
 * - Bidirectional formatting characters: embeddings and overrides U+202A–U+202E, isolates
 *   U+2066–U+2069, the marks U+200E, U+200F and U+061C.
 * - Invisible characters that make two names look alike: zero-width space U+200B, joiners U+200C/D
 *   (kept only inside multi-line text, where scripts that need them are written), word joiner U+2060,
 *   invisible operators U+2061–U+2064, U+FEFF, soft hyphen U+00AD, and the line and paragraph
 *   separators U+2028/U+2029.
 * Lengths count code points after normalisation, so an emoji is one character, not two.
 */

const CONTROL_EXCEPT_LF = /[\u0000-\u0009\u000B-\u001F\u007F-\u009F]/u;
const LINE_BREAK = /[\r\n\u2028\u2029\u0085]/u;
const TAB = /\t/u;
const BIDI = /[\u202A-\u202E\u2066-\u2069\u200E\u200F\u061C]/u;
const INVISIBLE_ONE_LINE = /[\u200B-\u200D\u2060-\u2064\uFEFF\u00AD]/u;
const INVISIBLE_MULTI_LINE = /[\u200B\u2060-\u2064\uFEFF\u00AD\u2028\u2029]/u;

/** NFC, line breaks as LF, trimmed. */
export function normaliseText(value: string): string {
  return value.normalize('NFC').replace(/\r\n?/g, '\n').trim();
}

const codePoints = (s: string) => [...s].length;

/** The first problem of a one-line text, as a message naming the field, or null. */
export function oneLineProblem(value: string, label: string): string | null {
  if (LINE_BREAK.test(value)) return `${label} cannot contain line breaks.`;
  if (TAB.test(value)) return `${label} cannot contain tabs.`;
  if (CONTROL_EXCEPT_LF.test(value)) return `${label} cannot contain control characters.`;
  if (BIDI.test(value)) return `${label} cannot contain text-direction control characters.`;
  if (INVISIBLE_ONE_LINE.test(value)) return `${label} cannot contain invisible characters.`;
  return null;
}

/** The first problem of a multi-line text (LF allowed), or null. */
export function multiLineProblem(value: string, label: string): string | null {
  if (CONTROL_EXCEPT_LF.test(value)) return `${label} cannot contain control characters other than line breaks.`;
  if (BIDI.test(value)) return `${label} cannot contain text-direction control characters.`;
  if (INVISIBLE_MULTI_LINE.test(value)) return `${label} cannot contain invisible characters.`;
  return null;
}

export interface TextOptions {
  /** Most code points allowed. */
  max: number;
  /** Fewest code points when given; 0 allows ''. Defaults to 1. */
  min?: number;
  /** The field's name in messages, e.g. "Name", "The reference". */
  label?: string;
  /** The message when the field is empty (min >= 1). */
  required?: string;
}

function build(multiLine: boolean, opts: TextOptions) {
  const label = opts.label ?? (multiLine ? 'This text' : 'This field');
  const min = opts.min ?? 1;
  const required = opts.required ?? `${label} is required.`;
  return z
    .string(required)
    .transform((v) => normaliseText(v))
    .superRefine((v, ctx) => {
      const problem = multiLine ? multiLineProblem(v, label) : oneLineProblem(v, label);
      if (problem) {
        ctx.addIssue({ code: 'custom', message: problem });
        return;
      }
      const n = codePoints(v);
      if (n === 0 && min > 0) ctx.addIssue({ code: 'custom', message: required });
      else if (n < min) ctx.addIssue({ code: 'custom', message: `Enter at least ${min} characters.` });
      else if (n > opts.max) ctx.addIssue({ code: 'custom', message: `Keep it under ${opts.max} characters.` });
    });
}

/** A name or short text on one line. */
export function oneLine(opts: TextOptions) {
  return build(false, opts);
}

/** Free text that may run over several lines (LF kept). */
export function multiLine(opts: TextOptions) {
  return build(true, opts);
}

/** A one-line text that may be left blank: '' (and null) are stored as null. */
export function optionalOneLine(opts: Omit<TextOptions, 'min' | 'required'>) {
  return z
    .union([oneLine({ ...opts, min: 0 }), z.null()])
    .transform((v) => (v === '' || v === null ? null : v));
}

/**
 * The key two organisation names are compared by: NFKC (so full-width and compatibility forms
 * match their plain letters), case-folded, every space and separator removed. "Harborview
 * Appliance", "HARBORVIEW  appliance" and "Harbor View Appliance" share one key.
 */
export function nameKey(name: string): string {
  return name
    .normalize('NFKC')
    .toLocaleLowerCase('en-US')
    .replace(/[\s\p{Z}\p{Cf}]/gu, '');
}
