import { estimateRespiratory } from '../../../app/core/model/allometry.js';
import { buildSimulationSetup, resolveMac } from '../../../app/core/model/compute-plan.js';
import type { PlanInput } from '../../../app/core/model/plan-types.js';
import {
  simulate,
  type SimulationOutcome,
  type SimulationSetup,
} from '../../../app/core/model/simulation.js';

/** The simulation set-up of a plan, from its mass and any measured overrides, without a species table. */
export function setupFor(plan: PlanInput): SimulationSetup {
  return buildSimulationSetup(
    plan,
    estimateRespiratory(plan.bodyMassG, plan.overrides ?? {}),
    resolveMac(plan, undefined),
  );
}

/** Runs the breath-resolved simulation of a plan (see setupFor). */
export function runPlan(plan: PlanInput): SimulationOutcome {
  return simulate(setupFor(plan));
}

/** A 30 g bird on mask isoflurane for 2 h (the benchmark plan). */
export const twoHourBudgerigarPlan: PlanInput = {
  bodyMassG: 30,
  agent: 'isoflurane',
  route: 'mask',
  freshGasLpm: 1,
  schedule: [
    { atMin: 0, vaporPct: 4 },
    { atMin: 10, vaporPct: 2 },
    { atMin: 90, vaporPct: 0 },
  ],
  uncertainty: { samples: 0, seed: 1 },
};

/** The 2-h 30 g plan as a mask induction to 10 min, then 0.5 min on room air and a tube (the phased benchmark plan). */
export const twoHourBudgerigarPhasedPlan: PlanInput = {
  ...twoHourBudgerigarPlan,
  laterPhases: [{ startMin: 10, gapMin: 0.5, route: 'endotracheal', freshGasLpm: 0.5 }],
};

/** A 2.4 kg duck intubated on a non-rebreathing system for 2 h (90 min on, 30 min recovery). */
export const duckPlan: PlanInput = {
  bodyMassG: 2400,
  agent: 'isoflurane',
  route: 'endotracheal',
  freshGasLpm: 2,
  schedule: [
    { atMin: 0, vaporPct: 3 },
    { atMin: 10, vaporPct: 2 },
    { atMin: 90, vaporPct: 0 },
  ],
  uncertainty: { samples: 0, seed: 1 },
};
