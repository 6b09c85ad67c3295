/**
 * A plan's phases: the plan's own route, breathing system and flow from minute 0, then each later
 * phase from its start (mask or chamber induction, then a tube). The one place that turns a plan
 * into its sequence of phases; the simulation, the budgets, the screens and the worksheet read it.
 */
import type { Circuit, Route } from '../delivery.js';
import type { ModelParameter } from './parameters.js';
import type { PlanInput, PlanScheduleStep } from './plan-types.js';

/** Room-air gap while the bird is moved between phases when the plan does not set one. */
export const defaultPhaseGapMin: ModelParameter = {
  value: 0.5,
  range: [0, 2],
  basis:
    'Assumption: intubating or refitting a mask on an induced bird takes about half a minute off the breathing system; set the gap for the bird and the hands in the room',
  kind: 'assumption',
};

export type ResolvedPlanPhase = {
  readonly index: number;
  readonly startMin: number;
  readonly gapMin: number;
  /** startMin + gapMin: the new route delivers from here. */
  readonly deliveryFromMin: number;
  readonly endMin: number;
  readonly route: Route;
  readonly circuit: Circuit;
  readonly freshGasLpm: number;
  readonly chamberVolumeL: number | undefined;
  readonly maskDeadSpaceMl: number | undefined;
  readonly maskLeakFraction: number | undefined;
  readonly circuitVolumeL: number | undefined;
  readonly dialSteps: readonly PlanScheduleStep[];
};

/**
 * Dial steps in effect during [startMin, endMin): the step running at startMin (moved to startMin),
 * then the later steps before endMin.
 */
export function dialStepsWithin(
  schedule: readonly PlanScheduleStep[],
  startMin: number,
  endMin: number,
): PlanScheduleStep[] {
  let running: PlanScheduleStep | undefined;
  const later: PlanScheduleStep[] = [];
  for (const step of schedule) {
    if (step.atMin <= startMin) running = step;
    else if (step.atMin < endMin) later.push(step);
  }
  return [...(running === undefined ? [] : [{ atMin: startMin, vaporPct: running.vaporPct }]), ...later];
}

/**
 * The plan as a sequence of phases, the first from minute 0.
 * @param input a validated plan
 * @param planEndMin end of the plan (last step plus the recovery window), min
 */
export function resolvePlanPhases(input: PlanInput, planEndMin: number): ResolvedPlanPhase[] {
  const changes = input.laterPhases ?? [];
  const firsts = [
    {
      startMin: 0,
      gapMin: 0,
      route: input.route,
      circuit: input.circuit,
      freshGasLpm: input.freshGasLpm,
      chamberVolumeL: input.chamberVolumeL,
      maskDeadSpaceMl: input.maskDeadSpaceMl,
      maskLeakFraction: input.maskLeakFraction,
      circuitVolumeL: input.circuitVolumeL,
    },
    ...changes.map((change) => ({ ...change, gapMin: change.gapMin ?? defaultPhaseGapMin.value })),
  ];
  return firsts.map((phase, index) => {
    const next = firsts[index + 1];
    const endMin = next === undefined ? planEndMin : Math.min(next.startMin, planEndMin);
    return {
      index,
      startMin: phase.startMin,
      gapMin: phase.gapMin,
      deliveryFromMin: Math.min(phase.startMin + phase.gapMin, endMin),
      endMin,
      route: phase.route,
      circuit: phase.circuit ?? 'nonRebreathing',
      freshGasLpm: phase.freshGasLpm,
      chamberVolumeL: phase.chamberVolumeL,
      maskDeadSpaceMl: phase.maskDeadSpaceMl,
      maskLeakFraction: phase.maskLeakFraction,
      circuitVolumeL: phase.circuitVolumeL,
      dialSteps: dialStepsWithin(input.schedule, phase.startMin, endMin),
    };
  });
}
