import { describe, expect, it } from 'vitest';
import { bodyMassUnit } from '../../../app/core/units.js';
import { displayMass } from '../../../app/ui/common/display.js';

describe('body mass on screen and paper', () => {
  it('shows grams below 1 kg even when the clinic prefers kg: a cockatiel is 95 g, not 0.095 kg', () => {
    expect(displayMass(95, 'kg')).toBe('95 g');
    expect(displayMass(32.4, 'kg')).toBe('32.4 g');
    expect(displayMass(999, 'kg')).toBe('999 g');
    expect(bodyMassUnit(95, 'kg')).toBe('g');
  });

  it('follows the preference from 1 kg up', () => {
    expect(displayMass(2400, 'kg')).toBe('2.4 kg');
    expect(displayMass(1000, 'kg')).toBe('1 kg');
    expect(displayMass(2400, 'g')).toBe('2400 g (2.4 kg)');
    expect(displayMass(95, 'g')).toBe('95 g');
    expect(bodyMassUnit(2400, 'kg')).toBe('kg');
    expect(bodyMassUnit(2400, 'g')).toBe('g');
  });
});
