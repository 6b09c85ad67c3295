import { readFileSync, readdirSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { planInputSchema } from '../../../app/contract/plan.js';
import { computePlan } from '../../../app/core/model/compute-plan.js';
import type { PlanMilestones } from '../../../app/core/model/plan-types.js';
import { speciesReference } from '../../../app/core/species-reference.js';

/**
 * Regression values, not truth: the milestones of every example plan as this model version
 * computes them (2026-12-02, after the stable one-engine rewrite). They pin the whole prediction,
 * so that any change of physics, parameter or threshold shows up here and is either a bug or a
 * deliberate change that updates these numbers in the same commit, with the reason. Whether the
 * numbers are right is the business of the validation table (test/validation/).
 */
const pinned: Record<string, Partial<Record<keyof PlanMilestones, number>>> = {
  'dora-pekin-duck-endotracheal-sevoflurane.json': {
    lossOfRightingMin: 1.184,
    surgicalDepthMin: 3.651,
    firstMovementMin: 4.076,
    standingMin: 9.179,
    peakBrainMacMultiple: 1.384,
    airSacWashin95Min: 3.737,
  },
  'kiwi-cockatiel-chamber-isoflurane.json': {
    lossOfRightingMin: 1.404,
    surgicalDepthMin: 3.021,
    firstMovementMin: 6.615,
    standingMin: 14.15,
    peakBrainMacMultiple: 1.624,
    airSacWashin95Min: 1.738,
  },
  // Updated with the mask entrainment from fresh gas flow against peak inspiratory flow: at 1 L/min
  // the 32 g bird draws no room air (formerly a fixed 10 % of every breath).
  'pip-budgerigar-mask-isoflurane.json': {
    lossOfRightingMin: 0.4457,
    surgicalDepthMin: 1.685,
    firstMovementMin: 3.687,
    standingMin: 13.17,
    peakBrainMacMultiple: 1.344,
    airSacWashin95Min: 1.36,
  },
  // A phased plan (added with phases, 2026-12-02): mask induction, 0.5 min on room air while
  // intubated, then the tube with IPPV. Regression values of this model version, not truth.
  'sable-african-grey-mask-then-tube-isoflurane.json': {
    lossOfRightingMin: 0.6765,
    surgicalDepthMin: 1.694,
    firstMovementMin: 4.282,
    standingMin: 21.15,
    peakBrainMacMultiple: 1.383,
    airSacWashin95Min: 2.506,
  },
};

/** Relative tolerance of a pinned value: rounding of the pins plus room for harmless refactoring. */
const tolerance = 0.02;

const examplesDirectory = fileURLToPath(new URL('../../../examples/plans/', import.meta.url));
const exampleFiles = readdirSync(examplesDirectory).filter((name) => name.endsWith('.json'));

describe('regression values of the example plans (not truth)', () => {
  it('pin every example plan', () => {
    expect(exampleFiles.sort()).toEqual(Object.keys(pinned).sort());
  });

  for (const file of Object.keys(pinned)) {
    it(`keeps the milestones of ${file} within 2 % of the pinned values`, () => {
      const plan = planInputSchema.parse(JSON.parse(readFileSync(`${examplesDirectory}${file}`, 'utf8')));
      const result = computePlan(
        { ...plan, uncertainty: { samples: 0, seed: 1 } },
        { species: speciesReference },
      );
      const moved: string[] = [];
      for (const [key, expected] of Object.entries(pinned[file] ?? {})) {
        const actual = result.milestones[key as keyof PlanMilestones];
        if (typeof actual !== 'number' || Math.abs(actual - expected) > tolerance * Math.abs(expected))
          moved.push(`${key}: ${String(actual)} (pinned ${String(expected)})`);
      }
      expect(moved).toEqual([]);
    });
  }
});
