import { describe, expect, it } from 'vitest';
import { vaporiserDialLimitPct, vapourFlowMlPerMin } from '../../../app/core/budget/consumption.js';
import { computePlan, stepReleases } from '../../../app/core/model/compute-plan.js';
import type { PlanInput } from '../../../app/core/model/plan-types.js';
import { speciesReference } from '../../../app/core/species-reference.js';

const tables = { species: speciesReference };

const chamberPlan: PlanInput = {
  bodyMassG: 95,
  agent: 'isoflurane',
  route: 'chamber',
  chamberVolumeL: 2,
  freshGasLpm: 2,
  schedule: [
    { atMin: 0, vaporPct: 5 },
    { atMin: 10, vaporPct: 0 },
  ],
  recoveryWindowMin: 60,
  uncertainty: { samples: 0, seed: 1 },
};

describe('waste gas released while the vaporiser is on', () => {
  it('releases each step at its own rate and nothing after the vaporiser is off', () => {
    const releases = stepReleases(
      [
        { atMin: 0, vaporPct: 4 },
        { atMin: 10, vaporPct: 2 },
        { atMin: 40, vaporPct: 0 },
      ],
      1,
      70,
      1000,
    );
    expect(releases.map((release) => [release.startMin, release.durationMin])).toEqual([
      [0, 10],
      [10, 30],
    ]);
    const total = releases.reduce((sum, release) => sum + release.vapourMl, 0);
    expect(total).toBeCloseTo(1000, 9);
    // Shares follow carrier x c / (1 - c) x duration [derived from the vaporiser output convention]
    const first = vapourFlowMlPerMin(1, 4) * 10;
    const second = vapourFlowMlPerMin(1, 2) * 30;
    expect((releases[0]?.vapourMl ?? 0) / total).toBeCloseTo(first / (first + second), 12);
  });

  it('gives a higher room peak than spreading the same vapour over the whole plan', () => {
    // Same release volume over 10 min instead of 70 min: the room peak must rise (well-mixed room,
    // tau = V / ventilation [published, time constant]).
    const result = computePlan(chamberPlan, tables);
    const released = result.wasteGas.releasedVapourMl;
    const roomM3 = result.wasteGas.roomVolumeM3;
    const ventilationM3PerMin = (result.wasteGas.airChangesPerHour * roomM3) / 60;
    // Steady state of the whole-plan spread: mL/min over m3/min is ppm; the plan's peak must exceed it.
    const spreadSteadyPpm = released / 70 / ventilationM3PerMin;
    expect(result.wasteGas.peakPpm).toBeGreaterThan(spreadSteadyPpm);
  });
});

describe('dial limits of each agent', () => {
  it('are 5 % isoflurane, 8 % sevoflurane and 18 % desflurane', () => {
    // Vaporiser dial ranges (common practice, as stated in the model issue)
    expect(vaporiserDialLimitPct.isoflurane.value).toBe(5);
    expect(vaporiserDialLimitPct.sevoflurane.value).toBe(8);
    expect(vaporiserDialLimitPct.desflurane.value).toBe(18);
  });

  it('raise a caution above the limit and none at it', () => {
    const above = computePlan(
      {
        ...chamberPlan,
        schedule: [
          { atMin: 0, vaporPct: 12 },
          { atMin: 10, vaporPct: 0 },
        ],
      },
      tables,
    );
    expect(above.cautions.map((caution) => caution.code)).toContain('dial-above-vaporiser-limit');
    const at = computePlan(chamberPlan, tables);
    expect(at.cautions.map((caution) => caution.code)).not.toContain('dial-above-vaporiser-limit');
    const sevoflurane = computePlan(
      {
        ...chamberPlan,
        agent: 'sevoflurane',
        schedule: [
          { atMin: 0, vaporPct: 8 },
          { atMin: 10, vaporPct: 0 },
        ],
      },
      tables,
    );
    expect(sevoflurane.cautions.map((caution) => caution.code)).not.toContain('dial-above-vaporiser-limit');
  });
});

describe('flows under IPPV', () => {
  it('follow the set ventilation, not the resting one', () => {
    const base: PlanInput = {
      bodyMassG: 1000,
      agent: 'isoflurane',
      route: 'endotracheal',
      freshGasLpm: 1,
      schedule: [
        { atMin: 0, vaporPct: 2 },
        { atMin: 30, vaporPct: 0 },
      ],
      uncertainty: { samples: 0, seed: 1 },
    };
    const resting = computePlan(base, tables);
    const ippv = computePlan(
      { ...base, ventilation: { mode: 'ippv', breathsPerMin: 20, tidalVolumeMl: 40 } },
      tables,
    );
    // 3 x VE (common practice): 3 x 40 mL x 20/min = 2.4 L/min
    expect(ippv.flows.recommendedLpm).toBeCloseTo(2.4, 9);
    expect(ippv.flows.recommendedLpm).toBeGreaterThan(resting.flows.recommendedLpm);
  });
});

describe('a vaporiser left at zero', () => {
  it('gives finite numbers everywhere', () => {
    const result = computePlan({ ...chamberPlan, schedule: [{ atMin: 0, vaporPct: 0 }] }, tables);
    const bad: string[] = [];
    const walk = (value: unknown, path: string): void => {
      if (typeof value === 'number' && !Number.isFinite(value)) bad.push(path);
      else if (Array.isArray(value)) value.forEach((item, index) => walk(item, `${path}[${String(index)}]`));
      else if (value !== null && typeof value === 'object')
        for (const [key, item] of Object.entries(value)) walk(item, `${path}.${key}`);
    };
    walk(result, 'result');
    expect(bad).toEqual([]);
    expect(result.massBalance.vaporiserOutputMl).toBe(0);
  });

  it('agrees with the liquid-use convention: vaporiser output = carrier x c / (1 - c)', () => {
    const result = computePlan(
      {
        ...chamberPlan,
        route: 'endotracheal',
        schedule: [
          { atMin: 0, vaporPct: 4 },
          { atMin: 10, vaporPct: 0 },
        ],
      },
      tables,
    );
    // carrier 2 L/min x 0.04 / 0.96 x 10 min [derived]; the simulation changes the dial at the
    // first breath that starts at or after 10 min, so it may run on for at most one breath.
    const expected = vapourFlowMlPerMin(2, 4) * 10;
    const oneBreathMl = vapourFlowMlPerMin(2, 4) / result.estimates.breathsPerMin.value;
    expect(result.massBalance.vaporiserOutputMl).toBeGreaterThanOrEqual(expected - 1e-9);
    expect(result.massBalance.vaporiserOutputMl).toBeLessThanOrEqual(expected + oneBreathMl);
  });
});
