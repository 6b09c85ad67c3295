/**
 * A plan's phases: the plan's own route, breathing system and flow from minute 0, then each later
 * phase from its start (mask or chamber induction, then a tube). The one place that turns a plan
 * into its sequence of phases; the simulation, the budgets, the screens and the worksheet read it.
 */
import type { Circuit, Route } from '../delivery.js';
import {
  defaultMaskDeadSpaceTidalMultiple,
  defaultMaskLeakFraction,
  rebreathingFlowMultiple,
  type ModelParameter,
} from './parameters.js';
import type { PlanInput, PlanScheduleStep } from './plan-types.js';
import type { DeliverySetup, TimedDelivery } from './simulation.js';

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

/**
 * What the simulation needs of a phase's route and breathing system: an open (non-rebreathing)
 * or mixed (chamber, circle) source, its flow and volume, and the interface (mask, tube, air-sac
 * tube). The chamber defaults to 1 L and the circle to 3 L when the plan gives none (the contract
 * asks for both).
 * @param phase a resolved phase
 * @param restingTidalVolumeMl the bird's tidal volume, mL (sets a mask's default dead space)
 */
export function deliverySetupOf(phase: ResolvedPlanPhase, restingTidalVolumeMl: number): DeliverySetup {
  const mixed = phase.route === 'chamber' || phase.circuit === 'circle';
  return {
    source: mixed ? 'mixed' : 'open',
    freshGasMlMin: phase.freshGasLpm * 1000,
    mixedVolumeMl:
      phase.route === 'chamber' ? (phase.chamberVolumeL ?? 1) * 1000 : (phase.circuitVolumeL ?? 3) * 1000,
    rebreathingFlowMultiple: rebreathingFlowMultiple.value,
    interface: phase.route === 'mask' ? 'mask' : phase.route === 'airSacTube' ? 'airSacTube' : 'direct',
    maskDeadSpaceMl: phase.maskDeadSpaceMl ?? defaultMaskDeadSpaceTidalMultiple.value * restingTidalVolumeMl,
    maskLeakFraction: phase.maskLeakFraction ?? defaultMaskLeakFraction.value,
    ...(phase.maskDeadSpaceMl === undefined ? {} : { maskDeadSpaceEntered: true }),
  };
}

/**
 * The simulation's deliveries of a plan: the first phase's from minute 0 and each later phase's
 * with the minute it starts and the minute its gap on room air ends.
 */
export function deliveriesOf(
  phases: readonly ResolvedPlanPhase[],
  restingTidalVolumeMl: number,
): { readonly first: DeliverySetup; readonly later: readonly TimedDelivery[] } {
  const [first, ...later] = phases;
  if (first === undefined) throw new RangeError('a plan has at least one phase');
  return {
    first: deliverySetupOf(first, restingTidalVolumeMl),
    later: later.map((phase) => ({
      startMin: phase.startMin,
      deliveryFromMin: phase.deliveryFromMin,
      delivery: deliverySetupOf(phase, restingTidalVolumeMl),
    })),
  };
}

/** The phase running at `timeMin` (the last that started at or before it). */
export function phaseAt<T extends { readonly startMin: number }>(phases: readonly T[], timeMin: number): T {
  let found = phases[0];
  for (const phase of phases) if (phase.startMin <= timeMin) found = phase;
  if (found === undefined) throw new RangeError('a plan has at least one phase');
  return found;
}
