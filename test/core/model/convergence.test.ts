import { describe, expect, it } from 'vitest';
import { estimateRespiratory } from '../../../app/core/model/allometry.js';
import { buildSimulationSetup, resolveMac } from '../../../app/core/model/compute-plan.js';
import type { MeasuredOverrides } from '../../../app/core/model/allometry.js';
import type { PlanInput } from '../../../app/core/model/plan-types.js';
import { simulate, type SimulationOutcome } from '../../../app/core/model/simulation.js';

/** The four clinical milestones of an outcome: loss of righting, surgical depth, first movement, standing. */
function milestonesOf(outcome: SimulationOutcome): (number | null)[] {
  return [
    outcome.milestoneMin[0] ?? null,
    outcome.inductionMin,
    outcome.recoveryMin,
    outcome.milestoneMin[1] ?? null,
  ];
}

const masses = [10, 100, 1000, 10000];
const ventilations = ['spontaneous', 1, 10, 60] as const;
const circulations = ['estimate', 'heartRate', 'cardiacOutput'] as const;

/**
 * A plan of the sweep: isoflurane 4 % for 15 min then 2.5 % to 60 min on a tube. IPPV moves 1.5 x
 * the resting minute ventilation, within the plan form's limit of 10 x the resting tidal volume;
 * the heart-rate override is 1.8 x the resting rate, the cardiac-output override half the resting output.
 */
function sweepPlan(
  bodyMassG: number,
  ventilation: (typeof ventilations)[number],
  circulation: (typeof circulations)[number],
): PlanInput {
  const resting = estimateRespiratory(bodyMassG);
  const minuteVentilation = resting.tidalVolumeMl.value * resting.breathsPerMin.value;
  const overrides: MeasuredOverrides =
    circulation === 'heartRate'
      ? { heartRatePerMin: resting.heartRatePerMin.value * 1.8 }
      : circulation === 'cardiacOutput'
        ? { cardiacOutputMlMin: resting.cardiacOutputMlMin.value * 0.5 }
        : {};
  return {
    bodyMassG,
    agent: 'isoflurane',
    route: 'endotracheal',
    freshGasLpm: Math.max(0.5, (3 * minuteVentilation) / 1000),
    overrides,
    ...(ventilation === 'spontaneous'
      ? {}
      : {
          ventilation: {
            mode: 'ippv' as const,
            breathsPerMin: ventilation,
            tidalVolumeMl: Math.min(
              (1.5 * minuteVentilation) / ventilation,
              10 * resting.tidalVolumeMl.value,
            ),
          },
        }),
    schedule: [
      { atMin: 0, vaporPct: 4 },
      { atMin: 15, vaporPct: 2.5 },
      { atMin: 60, vaporPct: 0 },
    ],
    recoveryWindowMin: 90,
    uncertainty: { samples: 0, seed: 1 },
  };
}

describe('convergence in the exchange step', () => {
  // Requirement of the model issue: no milestone moves by more than 1 % when the steps are doubled,
  // across 10 g to 10 kg, spontaneous breathing and IPPV at 1-60/min, with heart rate or cardiac output overrides.
  it('moves no clinical milestone by more than 1 % when the exchange steps per phase are doubled (48 plans)', () => {
    const moved: string[] = [];
    let compared = 0;
    for (const mass of masses)
      for (const ventilation of ventilations)
        for (const circulation of circulations) {
          const plan = sweepPlan(mass, ventilation, circulation);
          const setup = buildSimulationSetup(
            plan,
            estimateRespiratory(mass, plan.overrides ?? {}),
            resolveMac(plan, undefined),
          );
          const base = milestonesOf(simulate(setup));
          const doubled = milestonesOf(simulate({ ...setup, substepRefinement: 2 }));
          base.forEach((value, index) => {
            const other = doubled[index] ?? null;
            const name = `${String(mass)} g, ${String(ventilation)}, ${circulation}, milestone ${String(index)}`;
            if (value === null || other === null) {
              if (value !== other) moved.push(`${name}: ${String(value)} vs ${String(other)}`);
              return;
            }
            compared += 1;
            if (Math.abs(value - other) > 0.01 * Math.abs(other) + 1e-9)
              moved.push(`${name}: ${String(value)} vs ${String(other)}`);
          });
        }
    expect(moved).toEqual([]);
    // Most of the 192 milestones are reached, so the comparison is not empty.
    expect(compared).toBeGreaterThan(150);
  });
});
