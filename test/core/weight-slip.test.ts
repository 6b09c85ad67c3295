import { describe, expect, it } from 'vitest';
import { weightSlipReasons } from '../../app/core/weight-trend.js';

// Typical adult cockatiel 80-125 g: the project's editable species table (common practice).
const cockatiel = { minG: 80, maxG: 125, speciesName: 'Cockatiel' };
const last = { weighedOn: '2026-11-20', massG: 95 };

describe('weights asked about before saving', () => {
  it('asks about a tenfold slip, naming the last weight and the species range', () => {
    const reasons = weightSlipReasons(950, last, cockatiel);
    // (950 - 95) / 95 = 900 % (arithmetic)
    expect(reasons[0]).toBe('950 g is 900 % more than the last weight, 95 g on 2026-11-20.');
    expect(reasons[1]).toMatch(/outside the typical Cockatiel range \(80-125 g\)/);
  });

  it('asks about a change of more than a fifth, either way', () => {
    // (70 - 95) / 95 = -26 % (arithmetic)
    expect(weightSlipReasons(70, last, null)).toEqual([
      '70 g is 26 % less than the last weight, 95 g on 2026-11-20.',
    ]);
    // 114 g is exactly 20 % more: not asked
    expect(weightSlipReasons(114, last, null)).toEqual([]);
  });

  it('says nothing for an ordinary weight, or a first weight inside the range', () => {
    expect(weightSlipReasons(96, last, cockatiel)).toEqual([]);
    expect(weightSlipReasons(96, null, cockatiel)).toEqual([]);
  });

  it('asks about a first weight outside the species range', () => {
    expect(weightSlipReasons(9.5, null, cockatiel)).toHaveLength(1);
  });
});
