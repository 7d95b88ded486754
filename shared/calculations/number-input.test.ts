import { describe, expect, it } from 'vitest';
import { decimalSeparatorOf, implausibleReading, parseDecimalInput } from './number-input';

const refused = (text: string, separator: '.' | ',' = '.') => {
  const p = parseDecimalInput(text, { separator });
  expect(p.ok, text).toBe(false);
  return p.ok ? '' : p.message;
};

describe('strict number input', () => {
  it('reads plain decimals, and a comma only where the locale writes decimals with one', () => {
    expect(parseDecimalInput('1.5')).toEqual({ ok: true, value: 1.5 });
    expect(parseDecimalInput(' 35 ')).toEqual({ ok: true, value: 35 });
    expect(parseDecimalInput('-12.25')).toEqual({ ok: true, value: -12.25 });
    expect(parseDecimalInput('1,5', { separator: ',' })).toEqual({ ok: true, value: 1.5 });
    expect(parseDecimalInput('1.5', { separator: ',' })).toEqual({ ok: true, value: 1.5 });
    expect(refused('1,5')).toMatch(/point for decimals/); // never 15
  });

  it('refuses what used to be changed silently, saying why', () => {
    expect(refused('35O')).toMatch(/not a number/); // never 35
    expect(refused('1e6')).toMatch(/exponent/); // never 16 or 1000000
    expect(refused('12..5')).toMatch(/more than one decimal separator/); // never 12.5
    expect(refused('1,500.5')).toMatch(/no thousands separators/);
    expect(refused('1.500,5', ',')).toMatch(/no thousands separators/);
    expect(refused('1,500')).toMatch(/point for decimals/);
    expect(refused('')).toBe('Enter a number.');
    expect(refused('Infinity')).toMatch(/not a number/);
    expect(refused('0x10')).toMatch(/not a number/);
    expect(parseDecimalInput('1.5', { integer: true })).toEqual({ ok: false, message: 'Enter a whole number.' });
  });

  it('tells the separator of a locale (Intl)', () => {
    expect(decimalSeparatorOf('en-US')).toBe('.');
    expect(decimalSeparatorOf('de-DE')).toBe(',');
  });
});

describe('plausible reading ranges', () => {
  it('refuses 9,999,999 °F with the range, keeps ordinary readings', () => {
    expect(implausibleReading(9_999_999, 'F')).toBe('A reading in °F must be between -100 and 1,500 °F.');
    expect(implausibleReading(350, 'F')).toBeNull();
    expect(implausibleReading(-101, 'F')).not.toBeNull();
    expect(implausibleReading(36, 'in')).toBeNull(); // common practice: a countertop grill's cooking surface at 36 in
    expect(implausibleReading(-1, 'in')).not.toBeNull();
  });

  it('°C bounds are the °F bounds converted by NIST SP 811, t(°C) = (t(°F) − 32) / 1.8, rounded outward', () => {
    expect(implausibleReading(815.5, 'C')).toBeNull(); // 1500 °F = 815.56 °C
    expect(implausibleReading(817, 'C')).not.toBeNull();
    expect(implausibleReading(-73.3, 'C')).toBeNull(); // -100 °F = -73.33 °C
    expect(implausibleReading(-75, 'C')).not.toBeNull();
  });
});
