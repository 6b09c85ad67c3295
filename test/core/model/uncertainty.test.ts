import { describe, expect, it } from 'vitest';
import { computePlan } from '../../../app/core/model/compute-plan.js';
import { milestoneBand, percentile, seededRandom, triangular } from '../../../app/core/model/uncertainty.js';
import { speciesReference } from '../../../app/core/species-reference.js';
import { twoHourBudgerigarPlan } from './plan-fixtures.js';

describe('seeded random numbers', () => {
  it('repeat for the same seed and differ between seeds, within [0, 1)', () => {
    const first = seededRandom(42);
    const second = seededRandom(42);
    const other = seededRandom(43);
    const a = Array.from({ length: 100 }, () => first());
    const b = Array.from({ length: 100 }, () => second());
    const c = Array.from({ length: 100 }, () => other());
    expect(a).toEqual(b);
    expect(a).not.toEqual(c);
    for (const value of a) {
      expect(value).toBeGreaterThanOrEqual(0);
      expect(value).toBeLessThan(1);
    }
    // A uniform generator has mean 1/2 (common practice check of a generator); 10,000 draws give SE 0.003
    const many = seededRandom(7);
    let sum = 0;
    for (let index = 0; index < 10000; index += 1) sum += many();
    expect(sum / 10000).toBeCloseTo(0.5, 1);
  });
});

describe('percentiles', () => {
  it('interpolate between closest ranks', () => {
    const sorted = [1, 2, 3, 4, 5];
    expect(percentile(sorted, 0)).toBe(1);
    expect(percentile(sorted, 0.5)).toBe(3);
    expect(percentile(sorted, 1)).toBe(5);
    expect(percentile(sorted, 0.05)).toBeCloseTo(1.2, 12);
  });
});

describe('uncertainty of the milestones', () => {
  const plan = { ...twoHourBudgerigarPlan, speciesId: 'budgerigar', uncertainty: { samples: 150, seed: 5 } };
  const result = computePlan(plan, { species: speciesReference });

  it('is reproducible for a seed', () => {
    expect(computePlan(plan, { species: speciesReference }).uncertainty).toEqual(result.uncertainty);
    const other = computePlan(
      { ...plan, uncertainty: { samples: 150, seed: 6 } },
      { species: speciesReference },
    ).uncertainty;
    expect(other.inductionMin).not.toEqual(result.uncertainty.inductionMin);
  });
  it('orders p5 <= p50 <= p95 and brackets the deterministic prediction', () => {
    const induction = result.uncertainty.inductionMin;
    const recovery = result.uncertainty.recoveryMin;
    expect(induction).not.toBeNull();
    expect(recovery).not.toBeNull();
    for (const band of [induction, recovery]) {
      if (band === null) continue;
      expect(band.p5).toBeLessThanOrEqual(band.p50);
      expect(band.p50).toBeLessThanOrEqual(band.p95);
      expect(band.p95).toBeGreaterThan(band.p5);
    }
    expect(result.milestones.inductionMin ?? Number.NaN).toBeGreaterThanOrEqual(induction?.p5 ?? Infinity);
    expect(result.milestones.inductionMin ?? Number.NaN).toBeLessThanOrEqual(induction?.p95 ?? -Infinity);
    expect(result.milestones.recoveryMin ?? Number.NaN).toBeGreaterThanOrEqual(recovery?.p5 ?? Infinity);
    expect(result.milestones.recoveryMin ?? Number.NaN).toBeLessThanOrEqual(recovery?.p95 ?? -Infinity);
  });
  it('states the range and basis of every sampled parameter', () => {
    expect(result.uncertainty.parameters.length).toBeGreaterThanOrEqual(10);
    for (const parameter of result.uncertainty.parameters) {
      expect(parameter.low).toBeLessThanOrEqual(parameter.high);
      expect(parameter.basis.length).toBeGreaterThan(10);
    }
  });
});

describe('uncertainty band on the brain curve', () => {
  const plan = { ...twoHourBudgerigarPlan, speciesId: 'budgerigar', uncertainty: { samples: 100, seed: 3 } };
  const result = computePlan(plan, { species: speciesReference });
  const band = result.uncertainty.brainBandPct;

  it('gives a 5th and a 95th percentile at every timeline point, ordered and starting from no agent', () => {
    expect(band).not.toBeNull();
    if (band === null) return;
    expect(band.p5).toHaveLength(result.timeline.timeMin.length);
    expect(band.p95).toHaveLength(result.timeline.timeMin.length);
    expect(band.p5[0]).toBe(0);
    band.p5.forEach((low, index) => expect(low).toBeLessThanOrEqual((band.p95[index] as number) + 1e-9));
    expect(Math.max(...band.p95.map((high, index) => high - (band.p5[index] as number)))).toBeGreaterThan(
      0.05,
    );
  });

  it('contains the drawn brain curve at nearly every point', () => {
    if (band === null) return;
    const inside = result.timeline.brainPct.filter(
      (value, index) =>
        value >= (band.p5[index] as number) - 1e-6 && value <= (band.p95[index] as number) + 1e-6,
    ).length;
    expect(inside / result.timeline.brainPct.length).toBeGreaterThan(0.95);
  });

  it('is absent when no samples are asked for', () => {
    const quick = computePlan(
      { ...plan, uncertainty: { samples: 0, seed: 3 } },
      { species: speciesReference },
    );
    expect(quick.uncertainty.brainBandPct).toBeNull();
  });
});

describe('triangular draws', () => {
  it('stay within the range and centre on the nominal value (mean (low + mode + high) / 3)', () => {
    // Mean of a triangular distribution is (a + b + c) / 3 [common practice, textbook property]
    const random = seededRandom(11);
    let sum = 0;
    const count = 20000;
    for (let index = 0; index < count; index += 1) {
      const value = triangular(random, 0.7, 1, 1.4);
      expect(value).toBeGreaterThanOrEqual(0.7);
      expect(value).toBeLessThanOrEqual(1.4);
      sum += value;
    }
    expect(sum / count).toBeCloseTo((0.7 + 1 + 1.4) / 3, 2);
    expect(triangular(random, 2, 2, 2)).toBe(2);
  });
});

describe('an honest band', () => {
  it('counts samples that never reach a milestone as beyond the window and says how many', () => {
    const values = [1, 2, 3, Infinity, Infinity];
    const band = milestoneBand(values, 30);
    expect(band.reached).toBe(3);
    expect(band.reachedShare).toBeCloseTo(0.6, 12);
    expect(band.note).toBe('not reached by 40 % of birds like this');
    // The 95th percentile falls among the unreached samples: reported as the window length.
    expect(band.percentiles?.p95).toBe(30);
    expect(band.percentiles?.p50).toBe(3);
    const all = milestoneBand([1, 2, 3], 30);
    expect(all.note).toBeNull();
    expect(all.reachedShare).toBe(1);
  });

  it('reports the share reached for a plan whose maintenance sits near the planned depth', () => {
    const plan = {
      ...twoHourBudgerigarPlan,
      speciesId: 'budgerigar',
      uncertainty: { samples: 60, seed: 2 },
      targetMacMultiple: 1.5,
    };
    const result = computePlan(plan, { species: speciesReference });
    const u = result.uncertainty;
    expect(u.inductionReachedShare).toBeCloseTo(u.inductionReached / u.samples, 12);
    expect(u.inductionReachedShare).toBeLessThan(1);
    expect(u.inductionNote).toMatch(/^not reached by \d+ % of birds like this$/);
    expect(result.cautions.map((caution) => caution.code)).toContain('induction-not-reached-by-some');
    const surgical = u.milestones.find((milestone) => milestone.id === 'surgicalDepth');
    expect(surgical?.note).toBe(u.inductionNote);
  });

  it('samples every declared range, tissue coefficients, dead space and the milestone thresholds included', () => {
    const result = computePlan(
      { ...twoHourBudgerigarPlan, uncertainty: { samples: 2, seed: 1 } },
      { species: speciesReference },
    );
    const names = result.uncertainty.parameters.map((parameter) => parameter.name);
    for (const name of [
      'bloodGasPartition',
      'cardiacOutputMultiple',
      'tidalVolumeMultiple',
      'breathsPerMinMultiple',
      'airSacVolumeFraction',
      'posteriorSacShare',
      'lungVolumeFraction',
      'trachealVolumeMultiple',
      'bloodVolumeFraction',
      'vesselRichVolumeFraction',
      'vesselRichFlowFraction',
      'muscleVolumeFraction',
      'muscleFlowFraction',
      'fatVolumeFraction',
      'fatFlowFraction',
      'tissueBloodPartitionMultiple',
      'macMultiple',
      'anaestheticIndex',
      'depressionFloor',
      'ventilatoryRateShare',
      'cardiacDepressionSlope',
      'cardiacDepressionFloor',
      'exchangingLungShare',
      'normalBodyTemperatureC',
      'solubilityTemperatureCoefficient',
      'macTemperatureCoefficient',
      'rebreathingFlowMultiple',
      'maskDeadSpaceTidalMultiple',
      'lossOfRightingMacFraction',
      'recoveryMacFraction',
      'standingMacFraction',
    ])
      expect(names).toContain(name);
  });
});
