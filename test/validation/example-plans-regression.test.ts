/**
 * Regression pins for the example plans in examples/plans/. These are REGRESSION VALUES, NOT
 * TRUTH: they were recorded from model 1.0.0 so that any change to the engine that moves a
 * milestone is seen and judged (against the published table in published-observations.ts),
 * not slipped through. When a deliberate model change moves them, re-record the values here in
 * the same commit and say why in its message (docs/validation.md, "Regression pins").
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { planInputSchema } from '../../app/contract/plan.js';
import { computePlan } from '../../app/core/model/compute-plan.js';
import { speciesReference } from '../../app/core/species-reference.js';

/** Relative tolerance on minutes and MAC multiples: above the 1 % convergence target of issue 11. */
const relativeTolerance = 0.03;
/** Breath counts may move by one breath when the sub-stepping changes. */
const breathTolerance = 1;

type Pins = {
  readonly inductionMin: number;
  readonly recoveryMin: number;
  readonly airSacWashin95Breaths: number;
  readonly airSacWashout95Breaths: number;
  readonly peakBrainMacMultiple: number;
};

/** Recorded from model 1.0.0 (regression values, not truth). */
const pins: Readonly<Record<string, Pins>> = {
  'dora-pekin-duck-endotracheal-sevoflurane': {
    inductionMin: 3.648,
    recoveryMin: 4.075,
    airSacWashin95Breaths: 49,
    airSacWashout95Breaths: 35,
    peakBrainMacMultiple: 1.384,
  },
  'kiwi-cockatiel-chamber-isoflurane': {
    inductionMin: 3.02,
    recoveryMin: 6.614,
    airSacWashin95Breaths: 62,
    airSacWashout95Breaths: 179,
    peakBrainMacMultiple: 1.624,
  },
  'pip-budgerigar-mask-isoflurane': {
    inductionMin: 2.6,
    recoveryMin: 2.906,
    airSacWashin95Breaths: 68,
    airSacWashout95Breaths: 119,
    peakBrainMacMultiple: 1.262,
  },
};

function expectNear(actual: number | null, pinned: number, what: string): void {
  expect(actual, `${what} is not reached`).not.toBeNull();
  const value = actual ?? Number.NaN;
  expect(
    Math.abs(value - pinned) / pinned,
    `${what}: ${String(value)} against pinned ${String(pinned)}`,
  ).toBeLessThanOrEqual(relativeTolerance);
}

describe('example plans: regression pins (regression values, not truth)', () => {
  it.each(Object.entries(pins))('%s keeps its milestones within the stated tolerance', (name, pinned) => {
    const json: unknown = JSON.parse(readFileSync(join('examples', 'plans', `${name}.json`), 'utf8'));
    // The milestones are point estimates; the uncertainty samples do not change them.
    const plan = planInputSchema.parse({ ...(json as object), uncertainty: { samples: 0, seed: 1 } });
    const milestones = computePlan(plan, { species: speciesReference }).milestones;
    expectNear(milestones.inductionMin, pinned.inductionMin, 'inductionMin');
    expectNear(milestones.recoveryMin, pinned.recoveryMin, 'recoveryMin');
    expectNear(milestones.peakBrainMacMultiple, pinned.peakBrainMacMultiple, 'peakBrainMacMultiple');
    expect(
      Math.abs((milestones.airSacWashin95Breaths ?? Number.NaN) - pinned.airSacWashin95Breaths),
    ).toBeLessThanOrEqual(breathTolerance);
    expect(
      Math.abs((milestones.airSacWashout95Breaths ?? Number.NaN) - pinned.airSacWashout95Breaths),
    ).toBeLessThanOrEqual(breathTolerance);
  });
});
