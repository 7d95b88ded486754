import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  convert,
  convertInterval,
  areCompatible,
  fahrenheitToCelsius,
  celsiusToFahrenheit,
  inchesToMillimetres,
  milesToKilometres,
  poundsToKilograms,
  kilogramsToPounds,
} from './units';
import { CalculationInputError } from './errors';

describe('exact conversion factors', () => {
  it('length: inch and mile', () => {
    expect(convert(1, 'in', 'mm')).toBe(25.4); // NIST SP 811 (2008) B.8/B.9: 1 in = 25.4 mm exactly
    expect(inchesToMillimetres(36)).toBe(914.4); // NIST SP 811 (2008) B.8: 36 x 25.4 mm exactly
    expect(convert(1, 'mi', 'km')).toBe(1.609344); // NIST SP 811 (2008) B.8/B.9: 1 mi (international) = 1.609344 km exactly
    expect(milesToKilometres(100)).toBe(160.9344); // NIST SP 811 (2008) B.8: 100 x 1.609344 km exactly
    expect(convert(1, 'mi', 'mm')).toBe(1_609_344); // NIST SP 811 (2008) B.8: 1.609344 km = 1,609,344 mm
    expect(convert(25.4, 'mm', 'in')).toBe(1); // NIST SP 811 (2008) B.8: inverse of 25.4 mm
    expect(convert(1.609344, 'km', 'mi')).toBe(1); // NIST SP 811 (2008) B.8: inverse of 1.609344 km
  });

  it('mass: pound', () => {
    expect(convert(1, 'lb', 'kg')).toBe(0.45359237); // NIST SP 811 (2008) B.8/B.9: 1 lb = 0.45359237 kg exactly (also NPL)
    expect(poundsToKilograms(100)).toBe(45.359237); // NIST SP 811 (2008) B.8: 100 x 0.45359237 kg
    expect(kilogramsToPounds(0.45359237)).toBe(1); // NIST SP 811 (2008) B.8: inverse
  });

  it('temperature: t(°C) = (t(°F) - 32) / 1.8', () => {
    expect(fahrenheitToCelsius(32)).toBe(0); // NIST SP 811 (2008) B.9: (32 - 32) / 1.8
    expect(fahrenheitToCelsius(212)).toBe(100); // NIST SP 811 (2008) B.9: (212 - 32) / 1.8 = 100
    expect(convert(-40, 'F', 'C')).toBe(-40); // NIST SP 811 (2008) B.9: (-40 - 32) / 1.8 = -40
    // NIST SP 811 (2008) B.9: (98.6 - 32) / 1.8 = 66.6 / 1.8 = 37 exactly; plain floats give 36.99999999999999
    expect(convert(98.6, 'F', 'C')).toBe(37);
    expect(celsiusToFahrenheit(100)).toBe(212); // NIST SP 811 (2008) B.9: 100 x 1.8 + 32
    expect(celsiusToFahrenheit(-40)).toBe(-40); // NIST SP 811 (2008) B.9
    expect(convert(350, 'F', 'C')).toBe(1590 / 9); // NIST SP 811 (2008) B.9: (350 - 32) / 1.8 = 318 / 1.8 = 1590/9
  });

  it('a temperature interval of 1 °F is 5/9 K (= 5/9 °C)', () => {
    expect(convertInterval(1, 'F', 'C')).toBe(5 / 9); // NIST SP 811 (2008) B.9: interval 1 °F = 5/9 K
    expect(convertInterval(9, 'F', 'C')).toBe(5); // NIST SP 811 (2008) B.9: 9 x 5/9
    expect(convertInterval(5, 'C', 'F')).toBe(9); // NIST SP 811 (2008) B.9: inverse
  });

  it('round trips return the value (exact factors, one final rounding)', () => {
    // NIST SP 811 (2008) B.8/B.9 factors are exact, so from->to->from returns the input
    fc.assert(
      fc.property(
        fc.integer({ min: -10_000_000, max: 10_000_000 }),
        fc.constantFrom(['in', 'mm'], ['mi', 'km'], ['lb', 'kg'], ['F', 'C']),
        (hundredths, [a, b]) => {
          const v = hundredths / 100;
          const there = convert(v, a, b);
          const back = convert(there, b, a);
          expect(Math.abs(back - v)).toBeLessThanOrEqual(Math.abs(v) * 1e-15 + 1e-12);
        },
      ),
      { numRuns: 2000 },
    );
  });

  it('same unit, current and voltage pass through', () => {
    expect(convert(12.5, 'A', 'A')).toBe(12.5);
    expect(convert(208, 'V', 'V')).toBe(208);
  });
});

describe('incompatible and unknown units', () => {
  it('refuses to convert between different quantities with a clear message', () => {
    expect(() => convert(1, 'A', 'V')).toThrow(CalculationInputError);
    expect(() => convert(1, 'A', 'V')).toThrow('Cannot convert A to V: current and voltage are different quantities');
    expect(() => convert(1, 'F', 'mm')).toThrow(/temperature and length/);
    expect(areCompatible('in', 'km')).toBe(true);
    expect(areCompatible('kg', 'km')).toBe(false);
  });

  it('refuses unknown units and non-finite values', () => {
    expect(() => convert(1, 'furlong', 'km')).toThrow(/Unknown unit "furlong"/);
    expect(() => convert(Number.NaN, 'F', 'C')).toThrow(CalculationInputError);
    expect(() => convert(Infinity, 'in', 'mm')).toThrow(CalculationInputError);
  });
});
