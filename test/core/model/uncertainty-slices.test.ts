import { describe, expect, it } from 'vitest';
import { computePlan, planUncertaintyInput } from '../../../app/core/model/compute-plan.js';
import {
  mergeUncertainty,
  runUncertainty,
  runUncertaintySlice,
  sampleSeed,
} from '../../../app/core/model/uncertainty.js';
import { speciesReference } from '../../../app/core/species-reference.js';
import { twoHourBudgerigarPlan } from './plan-fixtures.js';

const tables = { species: speciesReference };
const plan = { ...twoHourBudgerigarPlan, speciesId: 'budgerigar', uncertainty: { samples: 40, seed: 9 } };
const input = planUncertaintyInput(plan, tables);

describe('uncertainty run in slices (a pool of workers)', () => {
  it('gives each sample a seed of its own from the run seed and its index', () => {
    const seeds = Array.from({ length: 1000 }, (_, index) => sampleSeed(9, index));
    expect(new Set(seeds).size).toBe(1000);
    expect(sampleSeed(9, 17)).toBe(seeds[17]);
    expect(sampleSeed(10, 17)).not.toBe(seeds[17]);
    for (const seed of seeds) expect(Number.isInteger(seed) && seed >= 0 && seed < 2 ** 32).toBe(true);
  });

  it('runs a sample the same whatever slice it is in: its draws depend only on the seed and its index', () => {
    const whole = runUncertaintySlice(input, 0, 12);
    const part = runUncertaintySlice(input, 5, 9);
    expect(Array.from(part.inductionMin)).toEqual(Array.from(whole.inductionMin.subarray(5, 9)));
    expect(Array.from(part.recoveryMin)).toEqual(Array.from(whole.recoveryMin.subarray(5, 9)));
    const points = input.outcome.timeline.timeMin.length;
    expect(part.brainPct.length).toBe(4 * points);
    expect(Array.from(part.brainPct)).toEqual(Array.from(whole.brainPct.subarray(5 * points, 9 * points)));
    part.milestoneMin.forEach((times, level) =>
      expect(Array.from(times)).toEqual(
        Array.from((whole.milestoneMin[level] as Float64Array).subarray(5, 9)),
      ),
    );
  });

  it('merges slices, in any order, to exactly the single-thread run', () => {
    const single = runUncertainty(input);
    const slices = [
      runUncertaintySlice(input, 27, 40),
      runUncertaintySlice(input, 0, 13),
      runUncertaintySlice(input, 13, 13),
      runUncertaintySlice(input, 13, 27),
    ];
    const merged = mergeUncertainty(input, slices);
    expect(merged).toEqual(single);
    expect(merged.brainBandPct).not.toBeNull();
    expect(merged.inductionMin).not.toBeNull();
  });

  it('gives the same plan from merged slices as computePlan alone (the pool and the command line agree)', () => {
    const sampled = mergeUncertainty(input, [
      runUncertaintySlice(input, 0, 21),
      runUncertaintySlice(input, 21, 40),
    ]);
    expect(computePlan(plan, tables, { sampled })).toEqual(computePlan(plan, tables));
  });

  it('refuses slices that leave samples out or run one twice, and a run made for another seed', () => {
    const first = runUncertaintySlice(input, 0, 20);
    expect(() => mergeUncertainty(input, [first])).toThrow(/cover 20 of 40/);
    expect(() => mergeUncertainty(input, [first, runUncertaintySlice(input, 19, 40)])).toThrow(
      /missing or run twice/,
    );
    expect(() => runUncertaintySlice(input, 30, 41)).toThrow(/outside 0-40/);
    const sampled = mergeUncertainty(input, [first, runUncertaintySlice(input, 20, 40)]);
    expect(() =>
      computePlan({ ...plan, uncertainty: { samples: 40, seed: 10 } }, tables, { sampled }),
    ).toThrow(/another sample count or seed/);
  });
});
