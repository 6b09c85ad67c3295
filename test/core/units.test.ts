import convert from 'convert-units';
import { describe, expect, it } from 'vitest';
import {
  cToF,
  formatMass,
  formatPressure,
  formatQuantity,
  fToC,
  gToKg,
  kgToG,
  kpaToMmHg,
  mmHgToKpa,
  ppmToMgPerM3,
  psiToBar,
  roundToSignificant,
} from '../../app/core/units.js';

/** Relative difference, so that one tolerance serves every magnitude. */
function relativeError(actual: number, expected: number): number {
  return expected === 0 ? Math.abs(actual) : Math.abs(actual - expected) / Math.abs(expected);
}

const samples = [0.001, 0.03, 1, 2.2, 37.5, 760, 12345];

describe('conversions agree with the convert-units library as referee', () => {
  it('converts grams and kilograms like convert-units', () => {
    for (const value of samples) {
      expect(relativeError(gToKg(value), convert(value).from('g').to('kg'))).toBeLessThan(1e-12);
      expect(relativeError(kgToG(value), convert(value).from('kg').to('g'))).toBeLessThan(1e-12);
    }
  });

  it('converts mmHg and kPa like convert-units torr (mmHg is taken equal to the torr)', () => {
    // convert-units has no mmHg; its torr (101325/760 Pa) is the referee. The conventional mmHg
    // differs from the torr by about 1.4e-7, which is why the torr stands in for it.
    for (const value of samples) {
      expect(relativeError(mmHgToKpa(value), convert(value).from('torr').to('kPa'))).toBeLessThan(1e-12);
      expect(relativeError(kpaToMmHg(value), convert(value).from('kPa').to('torr'))).toBeLessThan(1e-12);
    }
  });

  it('converts Celsius and Fahrenheit like convert-units', () => {
    for (const value of [-40, 0, 20, 25, 37, 38.3, 40.6, 100]) {
      expect(cToF(value)).toBeCloseTo(convert(value).from('C').to('F'), 10);
      expect(fToC(cToF(value))).toBeCloseTo(value, 10);
      expect(fToC(value)).toBeCloseTo(convert(value).from('F').to('C'), 10);
    }
  });

  it('converts psi to bar like convert-units within its rounded psi factor', () => {
    // convert-units stores 1 kPa = 0.14503768078 psi (rounded); the exact definition gives
    // 0.1450377377, a relative difference of about 4e-7.
    for (const value of samples) {
      expect(relativeError(psiToBar(value), convert(value).from('psi').to('bar'))).toBeLessThan(1e-6);
    }
  });
});

describe('reference values', () => {
  it('gives 16.15 mg/m3 for 2 ppm halothane at 25 C', () => {
    // ppm x MW / 24.45 at 25 C [published example: halothane 2 ppm = 16.15 mg/m3], MW 197.4
    expect(ppmToMgPerM3(2, 197.4)).toBeCloseTo(16.15, 2);
  });

  it('gives one standard atmosphere as 760 mmHg and 101.325 kPa', () => {
    // definition of the standard atmosphere (common practice)
    expect(mmHgToKpa(760)).toBeCloseTo(101.325, 10);
  });

  it('converts the acceptable cloacal temperature band to Fahrenheit', () => {
    // acceptable cloacal temperature 38.3-40.6 C [published, clinical reviews]; referee convert-units
    expect(cToF(38.3)).toBeCloseTo(convert(38.3).from('C').to('F'), 10);
    expect(cToF(40.6)).toBeCloseTo(105.08, 10);
  });
});

describe('display formatting', () => {
  it('always returns the number together with its unit', () => {
    expect(formatMass(32, 'g')).toEqual({ value: 32, unit: 'g', text: '32 g' });
    expect(formatMass(3250, 'kg')).toEqual({ value: 3.25, unit: 'kg', text: '3.25 kg' });
    expect(formatPressure(40, 'mmHg').text).toBe('40 mmHg');
    expect(formatPressure(40, 'kPa').text).toBe('5.33 kPa');
  });

  it('keeps whole units of large values instead of rounding them away', () => {
    expect(formatMass(1234.4, 'g').text).toBe('1234 g');
    expect(formatQuantity(0.01234, 'L').text).toBe('0.0123 L');
  });

  it('shows a dash for a value that is not a number', () => {
    expect(formatQuantity(Number.NaN, 'g').text).toBe('- g');
  });

  it('rounds to significant digits without exponent notation', () => {
    expect(roundToSignificant(0.00012345, 2)).toBe(0.00012);
    expect(roundToSignificant(98765, 2)).toBe(99000);
    expect(roundToSignificant(-2.346, 3)).toBe(-2.35);
  });
});
