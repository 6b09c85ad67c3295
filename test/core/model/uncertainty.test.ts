import { describe, expect, it } from 'vitest';
import { computePlan } from '../../../app/core/model/compute-plan.js';
import { percentile, seededRandom } from '../../../app/core/model/uncertainty.js';
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
