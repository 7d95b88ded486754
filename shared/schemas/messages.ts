/**
 * Messages written for people, for every zod check that has no message of its own, on both
 * sides (the server's 400 field messages and the client's form errors). Installed once by
 * server/app.ts and src/main.tsx through `installMessages()`; a schema's own message wins.
 */
import { z } from 'zod';
import { parseDecimalInput } from '../calculations/number-input';

const fmt = (n: number | bigint) => (typeof n === 'bigint' ? n.toString() : n.toLocaleString('en-US'));

type Issue = z.core.$ZodRawIssue;

/** The people's message for one zod issue (undefined keeps zod's own, which none of ours need). */
export function humanMessage(iss: Issue): string | undefined {
  switch (iss.code) {
    case 'too_big': {
      const max = iss.maximum as number | bigint;
      if (iss.origin === 'number' || iss.origin === 'int' || iss.origin === 'bigint') return iss.inclusive ? `At most ${fmt(max)}.` : `Less than ${fmt(max)}.`;
      if (iss.origin === 'string') return `At most ${fmt(max)} characters.`;
      if (iss.origin === 'array' || iss.origin === 'set') return `At most ${fmt(max)} entries.`;
      return 'Too large.';
    }
    case 'too_small': {
      const min = iss.minimum as number | bigint;
      if (iss.origin === 'number' || iss.origin === 'int' || iss.origin === 'bigint') {
        if (Number(min) === 0 && iss.inclusive) return 'This cannot be negative.';
        return iss.inclusive ? `At least ${fmt(min)}.` : `More than ${fmt(min)}.`;
      }
      if (iss.origin === 'string') return Number(min) <= 1 ? 'This cannot be empty.' : `At least ${fmt(min)} characters.`;
      if (iss.origin === 'array' || iss.origin === 'set') return Number(min) <= 1 ? 'Add at least one.' : `Add at least ${fmt(min)}.`;
      return 'Too small.';
    }
    case 'invalid_type': {
      if (iss.input === undefined) return 'This is required.';
      if (iss.expected === 'int') return 'Enter a whole number.';
      if (iss.expected === 'number') {
        if (typeof iss.input === 'string') {
          const p = parseDecimalInput(iss.input);
          return p.ok ? 'Send the number as a number, not as text.' : p.message;
        }
        return 'Enter a number.';
      }
      if (iss.expected === 'string') return 'Enter text.';
      if (iss.expected === 'boolean') return 'Choose yes or no.';
      if (iss.expected === 'array') return 'A list is expected here.';
      if (iss.expected === 'object') return 'A set of fields is expected here.';
      return 'This value has the wrong type.';
    }
    case 'invalid_format':
      if (iss.format === 'date') return 'Use a date as YYYY-MM-DD, like 2026-03-31.';
      if (iss.format === 'datetime') return 'Use a date and time like 2026-03-31T14:30:00Z.';
      if (iss.format === 'email') return 'Enter an e-mail address like name@example.com.';
      if (iss.format === 'url') return 'Enter a web address starting with https://.';
      return 'This is not in the expected format.';
    case 'invalid_value':
      return iss.values && iss.values.length <= 12 ? `Choose one of: ${iss.values.map(String).join(', ')}.` : 'Choose one of the listed values.';
    case 'unrecognized_keys':
      return `Not a field of this form: ${iss.keys.join(', ')}.`;
    case 'not_multiple_of':
      return `Use steps of ${String(iss.divisor)}.`;
    case 'invalid_union':
      return 'This value is not one of the accepted kinds.';
    case 'custom':
      return 'This value is not accepted.';
    default:
      return undefined;
  }
}

let installed = false;
/** Makes `humanMessage` zod's fallback for every schema in this process or page. */
export function installMessages(): void {
  if (installed) return;
  installed = true;
  z.config({ customError: humanMessage });
}

/** "The end date (2026-03-01) is before the start date (2026-03-31)." naming both dates. */
export function reversedRangeMessage(endLabel: string, end: string, startLabel: string, start: string): string {
  return `The ${endLabel} (${end}) is before the ${startLabel} (${start}).`;
}

/**
 * Refinement parameters for an object whose `to` date may not precede its `from` date: the
 * message names both dates, on the `to` field.
 */
export function rangeOrder<K extends string, L extends string>(fromKey: K, toKey: L, fromLabel: string, toLabel: string) {
  return {
    path: [toKey],
    error: (iss: { input?: unknown }) => {
      const v = (iss.input ?? {}) as Record<string, unknown>;
      return reversedRangeMessage(toLabel, String(v[toKey]), fromLabel, String(v[fromKey]));
    },
  };
}
