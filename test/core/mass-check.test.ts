import { describe, expect, it } from 'vitest';
import { collectCautions } from '../../app/core/cautions.js';
import { checkMassAgainstRange, unitSlipRule } from '../../app/core/mass-check.js';
import { massRangeFlags } from '../../app/core/weight-trend.js';

// Typical adult masses [common practice, owner-facing sources]: budgerigar 25-35 g (exhibition
// 30-60 g), canary 12-30 g, macaws 900-1600 g.
const budgerigar = { minG: 25, maxG: 60 };
const canary = { minG: 12, maxG: 30 };
const macaw = { minG: 900, maxG: 1600 };

describe('one g/kg unit-slip rule', () => {
  it('is silent inside the typical range and at its edges', () => {
    for (const massG of [25, 40, 60]) expect(checkMassAgainstRange(massG, budgerigar).verdict).toBe('within');
  });

  it('calls a kilogram figure typed as grams a likely slip and names the mass meant', () => {
    // 34 kg typed where 34 g was meant: a budgerigar is 25-60 g [common practice]
    expect(checkMassAgainstRange(34000, budgerigar)).toEqual({
      verdict: 'unit-slip',
      severity: 'danger',
      slip: 'kg-as-g',
      meantG: 34,
    });
  });

  it('calls a gram figure typed as kilograms a likely slip the other way', () => {
    // 0.032 kg = 32 g, inside the budgerigar range [common practice]
    expect(checkMassAgainstRange(0.032, budgerigar)).toMatchObject({
      verdict: 'unit-slip',
      slip: 'g-as-kg',
      meantG: 32,
    });
    // 1.2 kg macaw entered as 1.2 g
    expect(checkMassAgainstRange(1.2, macaw)).toMatchObject({ verdict: 'unit-slip', meantG: 1200 });
  });

  it('keeps the tolerance of the rule: a corrected mass up to twice outside the range is a slip', () => {
    expect(unitSlipRule.toleranceFactor.value).toBe(2);
    expect(unitSlipRule.toleranceFactor.kind).toBe('assumption');
    // 60 kg typed for a 60 g range top: corrected 60 g sits at the edge -> slip
    expect(checkMassAgainstRange(120_000, budgerigar).verdict).toBe('unit-slip');
    // corrected 121 g is more than twice the 60 g top -> not explained by a slip
    expect(checkMassAgainstRange(121_000, budgerigar).verdict).toBe('outside');
  });

  it('calls a 1,300 g budgerigar outside the range, not a slip: 1.3 g is no budgerigar either', () => {
    // 1300 g is within the macaw range (900-1600 g [common practice]): a wrong species or weight.
    expect(checkMassAgainstRange(1300, budgerigar)).toMatchObject({
      verdict: 'outside',
      severity: 'warning',
      direction: 'heavier',
    });
  });

  it('gives the weights panel and the plan cautions the same verdict and severity', () => {
    for (const massG of [1300, 34000, 0.032, 80, 41, 3000, 25000]) {
      for (const range of [budgerigar, canary]) {
        const check = checkMassAgainstRange(massG, range);
        const panel = massRangeFlags(massG, { ...range, speciesName: 'bird' });
        const plan = collectCautions({ bodyMassG: massG, speciesMassRangeG: range, speciesName: 'bird' });
        if (check.verdict === 'within') {
          expect(panel).toEqual([]);
          expect(plan).toEqual([]);
        } else {
          expect(panel.map((flag) => flag.severity)).toEqual([check.severity]);
          expect(plan.map((caution) => caution.severity)).toEqual([check.severity]);
          const slip = check.verdict === 'unit-slip';
          expect(panel[0]?.code).toBe(slip ? 'weight-unit-slip' : 'weight-outside-species-range');
          expect(plan[0]?.code).toBe(slip ? 'mass-unit-slip' : 'mass-outside-species-range');
        }
      }
    }
  });

  it('refuses a mass that is not a positive number', () => {
    expect(() => checkMassAgainstRange(0, budgerigar)).toThrow(RangeError);
    expect(() => checkMassAgainstRange(Number.NaN, budgerigar)).toThrow(RangeError);
  });
});
