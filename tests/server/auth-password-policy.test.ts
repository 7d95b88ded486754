import { describe, expect, it } from 'vitest';
import bcrypt from 'bcryptjs';
import { checkPassword, passwordLength } from '../../server/lib/password-policy';
import { hashPassword, prehash, verifyPassword } from '../../server/lib/passwords';
import { newPasswordSchema } from '@shared/schemas/user';

// Vectors for NIST SP 800-63B-4 §3.1.1.2 (minimum 15 characters when the password is the only
// factor, at least 64 allowed, all printing characters and Unicode allowed, each code point one
// character, no composition rules, a block-list of common and context-specific words) and OWASP
// ASVS 5.0 6.2.x. The 72-byte case: bcrypt uses only the first 72 bytes of its input
// (Provos and Mazières, "A Future-Adaptable Password Scheme", USENIX 1999, section 6), so
// without the pre-hash two long passwords that differ after byte 72 would both verify.

const PEPPER = 'a-test-pepper-of-enough-length';
const context = ['tech@harborview.test', 'Morgan Ellery', 'Harborview Appliance Service'];

describe('password length (NIST SP 800-63B-4 §3.1.1.2)', () => {
  it('refuses 14 characters and accepts 15', () => {
    const fourteen = 'violet ferns ab';
    expect(fourteen.slice(0, 14)).toHaveLength(14);
    expect(checkPassword(fourteen.slice(0, 14), context)).toMatch(/at least 15/);
    expect(newPasswordSchema.safeParse(fourteen.slice(0, 14)).success).toBe(false);
    const fifteen = 'violet ferns ab';
    expect(fifteen).toHaveLength(15);
    expect(checkPassword(fifteen, context)).toBeNull();
    expect(newPasswordSchema.safeParse(fifteen).success).toBe(true);
  });

  it('accepts 64 characters', () => {
    const p = 'tangerine ladders hum softly while seven otters debate 4 orbits!';
    expect(p).toHaveLength(64);
    expect(checkPassword(p, context)).toBeNull();
    expect(newPasswordSchema.safeParse(p).success).toBe(true);
  });

  it('accepts 64 emoji, counting each code point as one character', () => {
    const emoji = [...'🍕🚀🌵🎻🦊🧲🪁🥨🐙🎲🧊🌋🦉🍋🛶🪴🎈🧵🦀🌶🐝🎺🧀🪐🦔🍩🚲🌈🐢🎯🧭🥝🦜🍄🛸🪕🎃🧶🐳🌻🦩🍇🚂🪄🐞🎷🧁🌙🦥🍒🛼🪶🎸🧃🐌🌽🦚🍔🚁🪀🐠🎹🧂🌊'].join('');
    expect(passwordLength(emoji)).toBe(64);
    expect(emoji.length).toBe(128); // UTF-16 units: twice the characters
    expect(checkPassword(emoji, context)).toBeNull();
    expect(newPasswordSchema.safeParse(emoji).success).toBe(true);
    // Seven emoji are 14 UTF-16 units but only 7 characters: too short.
    expect(checkPassword(emoji.slice(0, 14), context)).toMatch(/at least 15/);
  });

  it('caps the length at 128 characters', () => {
    const long = 'quiet lanterns drift over amber fields '.repeat(4).slice(0, 129);
    expect(checkPassword(long, context)).toMatch(/at most 128/);
  });

  it('has no composition rules: all lower case letters and spaces are fine', () => {
    expect(checkPassword('marble owls juggle plums', context)).toBeNull();
  });
});

describe('block-list of common passwords and context words', () => {
  it.each([
    'password1234567890',
    'qwertyuiopasdfghjkl',
    '123456789012345',
    'iloveyou12345678',
    'aaaaaaaaaaaaaaaa',
    'Password!Password!',
  ])('refuses the common password %s', (p) => {
    expect(checkPassword(p, context)).toMatch(/common|guess/i);
  });

  it.each([
    'fieldproof-fieldproof',
    'larkfield larkfield 1',
    'FieldproofLarkfield!',
    'harborview-harborview',
    'tech@harborview.test',
    'morganellery2026!',
  ])('refuses %s, built from the service name, the e-mail or the name', (p) => {
    expect(checkPassword(p, context)).not.toBeNull();
  });

  it('allows a context word inside an otherwise strong passphrase', () => {
    expect(checkPassword('harborview pelicans argue about saffron', context)).toBeNull();
  });
});

describe('the 72-byte case: the whole password is verified', () => {
  const a = 'x'.repeat(72) + 'a';
  const b = 'x'.repeat(72) + 'b';

  it('bcrypt alone would accept the other password (why the pre-hash exists)', async () => {
    const raw = bcrypt.hashSync(a, 4);
    expect(await bcrypt.compare(b, raw)).toBe(true);
  });

  it('the hash of "x"*72+"a" does not verify "x"*72+"b"', async () => {
    const hash = hashPassword(a, PEPPER, 4);
    expect(await verifyPassword(a, hash, PEPPER)).toBe(true);
    expect(await verifyPassword(b, hash, PEPPER)).toBe(false);
    expect(prehash(a, PEPPER)).not.toBe(prehash(b, PEPPER));
  });

  it('the pepper is part of the hash: another pepper does not verify', async () => {
    const hash = hashPassword(a, PEPPER, 4);
    expect(await verifyPassword(a, hash, 'another-pepper-of-enough-length')).toBe(false);
  });
});
