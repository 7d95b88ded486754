import { zxcvbn, zxcvbnOptions } from '@zxcvbn-ts/core';
import * as common from '@zxcvbn-ts/language-common';
import * as en from '@zxcvbn-ts/language-en';
import { MAX_PASSWORD_LENGTH, MIN_PASSWORD_LENGTH } from '@shared/schemas/user';

/**
 * Password rules after NIST SP 800-63B-4 §3.1.1.2: a minimum length of 15 characters, at least
 * 64 allowed (we allow 128), every printable character and space allowed, no composition rules,
 * and new passwords compared against a block-list of common passwords, dictionary words and
 * words from the context (the service name, the user's e-mail and name).
 *
 * The block-list is zxcvbn-ts with its common-password list and English word lists: a password
 * it rates below score 3 (fewer than about 10^8 guesses) is refused, as is a password made mostly
 * of one of the context words.
 */
zxcvbnOptions.setOptions({
  translations: en.translations,
  graphs: common.adjacencyGraphs,
  dictionary: { ...common.dictionary, ...en.dictionary },
});

/** Words every Fieldproof password is checked against besides the user's own. */
export const SERVICE_CONTEXT_WORDS = ['fieldproof', 'larkfield', 'warranty', 'claim', 'claims'];

const MIN_SCORE = 3;

/** Code points, so an emoji counts as one character (NIST SP 800-63B-4 §3.1.1.2). */
export const passwordLength = (password: string): number => [...password].length;

/** Splits e-mails and names into the words a person might build a password from. */
export function contextWords(context: string[]): string[] {
  const words = new Set<string>();
  for (const raw of [...context, ...SERVICE_CONTEXT_WORDS]) {
    const value = raw.trim().toLowerCase();
    if (!value) continue;
    words.add(value);
    const [local, domain] = value.split('@');
    for (const part of [local, ...(domain ? domain.split('.') : [])]) {
      if (!part) continue;
      words.add(part);
      for (const w of part.split(/[^\p{L}\p{N}]+/u)) if (w.length >= 3) words.add(w);
    }
    for (const w of value.split(/[^\p{L}\p{N}]+/u)) if (w.length >= 3) words.add(w);
  }
  return [...words].filter((w) => w.length >= 3);
}

const letters = (s: string) => s.toLowerCase().replace(/[^\p{L}\p{N}]+/gu, '');

/** True when context words (repeated or joined) make up at least half of the password. */
function mostlyContext(password: string, words: string[]): boolean {
  let rest = letters(password);
  const total = [...rest].length;
  if (total === 0) return false;
  // Longest words first, so "harborview" is removed before "harbor".
  for (const w of [...words].map(letters).filter((w) => w.length >= 3).sort((a, b) => b.length - a.length)) {
    rest = rest.split(w).join('');
  }
  return [...rest].length * 2 <= total;
}

/**
 * Checks a new password. Returns null when it may be used, or a message that says what to change.
 * `context` holds the user's e-mail, name and organisation name.
 */
export function checkPassword(password: string, context: string[] = []): string | null {
  const length = passwordLength(password);
  if (length < MIN_PASSWORD_LENGTH) return `Use at least ${MIN_PASSWORD_LENGTH} characters. A few unrelated words make a good one.`;
  if (length > MAX_PASSWORD_LENGTH) return `Use at most ${MAX_PASSWORD_LENGTH} characters.`;
  if (/[\u0000-\u001f\u007f]/.test(password)) return 'Use printable characters only (no control characters).';
  const words = contextWords(context);
  if (mostlyContext(password, words)) return 'Do not build the password from your name, your e-mail address or the name of this service.';
  const result = zxcvbn(password, words);
  if (result.score < MIN_SCORE) {
    const warning = result.feedback.warning ? ` ${result.feedback.warning.replace(/\.?$/, '.')}` : '';
    return `This password is too common or too easy to guess.${warning} Try a few unrelated words.`;
  }
  return null;
}
