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

  it('moves no milestone of phased plans by more than 1 % when the exchange steps are doubled', () => {
    // Mask then tube with IPPV, chamber then mask, and a circle after a mask, each with a room-air gap.
    const phased: PlanInput[] = [
      {
        bodyMassG: 430,
        agent: 'isoflurane',
        route: 'mask',
        freshGasLpm: 1,
        schedule: [
          { atMin: 0, vaporPct: 5 },
          { atMin: 2, vaporPct: 3 },
          { atMin: 6, vaporPct: 2 },
          { atMin: 60, vaporPct: 0 },
        ],
        laterPhases: [{ startMin: 6, gapMin: 0.5, route: 'endotracheal', freshGasLpm: 0.6 }],
        ventilation: { mode: 'ippv', breathsPerMin: 8, tidalVolumeMl: 12, fromMin: 6.5 },
        recoveryWindowMin: 60,
      },
      {
        bodyMassG: 95,
        agent: 'isoflurane',
        route: 'chamber',
        chamberVolumeL: 3,
        freshGasLpm: 2,
        schedule: [
          { atMin: 0, vaporPct: 5 },
          { atMin: 6, vaporPct: 2.5 },
          { atMin: 40, vaporPct: 0 },
        ],
        laterPhases: [{ startMin: 6, gapMin: 0.5, route: 'mask', freshGasLpm: 1 }],
        recoveryWindowMin: 60,
      },
      {
        bodyMassG: 4000,
        agent: 'sevoflurane',
        route: 'mask',
        freshGasLpm: 3,
        schedule: [
          { atMin: 0, vaporPct: 7 },
          { atMin: 8, vaporPct: 3.5 },
          { atMin: 60, vaporPct: 0 },
        ],
        laterPhases: [
          {
            startMin: 8,
            gapMin: 1,
            route: 'endotracheal',
            circuit: 'circle',
            circuitVolumeL: 3,
            freshGasLpm: 1,
          },
        ],
        recoveryWindowMin: 90,
      },
    ];
    const moved: string[] = [];
    let compared = 0;
    phased.forEach((plan, planIndex) => {
      const setup = buildSimulationSetup(
        plan,
        estimateRespiratory(plan.bodyMassG, plan.overrides ?? {}),
        resolveMac(plan, undefined),
      );
      expect(setup.laterDeliveries?.length).toBe(1);
      const base = milestonesOf(simulate(setup));
      const doubled = milestonesOf(simulate({ ...setup, substepRefinement: 2 }));
      base.forEach((value, index) => {
        const other = doubled[index] ?? null;
        const name = `phased plan ${String(planIndex)}, milestone ${String(index)}`;
        if (value === null || other === null) {
          if (value !== other) moved.push(`${name}: ${String(value)} vs ${String(other)}`);
          return;
        }
        compared += 1;
        if (Math.abs(value - other) > 0.01 * Math.abs(other) + 1e-9)
          moved.push(`${name}: ${String(value)} vs ${String(other)}`);
      });
    });
    expect(moved).toEqual([]);
    expect(compared).toBeGreaterThanOrEqual(10);
  });
});
