/**
 * The budgets of a phased plan, phase by phase: each phase's flow recommendation and rebreathing
 * check for its own route and breathing system (and the set ventilation when IPPV runs in it),
 * its oxygen and liquid agent, its waste-gas releases at their real times, and the cautions that
 * belong to its route. A plan with one phase gives the same figures as before phases existed.
 */
import { routeLabels } from '../delivery.js';
import {
  liquidAgentMlForSchedule,
  vapourFlowMlPerMin,
  type FlowStep,
  type FreshGasInput,
} from '../budget/consumption.js';
import {
  chamberTimeToFractionMin,
  practicalMinimumFlowLpm,
  rebreathingCheck,
  recommendFreshGas,
  type FreshGasRecommendation,
  type RebreathingCheck,
} from '../budget/flows.js';
import { wasteGasRelease, type RoomRelease, type WasteGasSourceAmount } from '../budget/waste-gas.js';
import { collectCautions, type Caution, type CautionContext } from '../cautions.js';
import type { RespiratoryEstimates } from './allometry.js';
import { ippvPeriodsOf } from './ippv-periods.js';
import type { ResolvedPlanPhase } from './phases.js';
import type { PlanFlows, PlanInput, PlanPhaseSummary, PlanScheduleStep } from './plan-types.js';
import type { DeliverySetup } from './simulation.js';

/** Each phase's own delivery as the simulation ran it (the first, then the later ones). */
export type PhaseDeliveries = readonly DeliverySetup[];

export type PhaseFlowBudget = {
  readonly recommendation: FreshGasRecommendation;
  readonly rebreathing: RebreathingCheck;
  readonly flows: PlanFlows;
};

/**
 * Minute ventilation the flow rules of a phase follow: the set IPPV ventilation when IPPV runs
 * through the whole phase from its delivery on (the largest set ventilation when several periods
 * follow one another), the larger of set and resting when IPPV runs in part of the phase (or, in
 * the last phase, starts at all: a plan's only phase keeps the rule it had before phases), and
 * the resting estimate when IPPV does not run in the phase. Kept within the rules' 0.1-100000
 * mL/min.
 */
export function phaseMinuteVentilationMlMin(
  input: PlanInput,
  estimates: RespiratoryEstimates,
  phase: ResolvedPlanPhase,
  isLast: boolean,
): number {
  const resting = estimates.minuteVentilationMlMin.value;
  const running = ippvPeriodsOf(input.ventilation).filter(
    (period) =>
      (period.fromMin < phase.endMin || period.fromMin <= phase.deliveryFromMin || isLast) &&
      (period.untilMin === null || period.untilMin > phase.deliveryFromMin),
  );
  let minute = resting;
  if (running.length > 0) {
    // IPPV covers the phase when the periods leave no spontaneous minute from delivery to end.
    let coveredTo = phase.deliveryFromMin;
    for (const period of running)
      if (period.fromMin <= coveredTo) coveredTo = Math.max(coveredTo, period.untilMin ?? Infinity);
    const set = Math.max(...running.map((period) => period.tidalVolumeMl * period.breathsPerMin));
    minute = coveredTo >= phase.endMin ? set : Math.max(set, resting);
  }
  return Math.min(100000, Math.max(0.1, minute));
}

/**
 * The flow recommendation, the rebreathing check and the chamber's wash-in time of one phase.
 * @param delivery the phase's delivery as simulated (its mask leak, default or entered)
 */
export function phaseFlowBudget(
  input: PlanInput,
  estimates: RespiratoryEstimates,
  phase: ResolvedPlanPhase,
  isLast: boolean,
  delivery: DeliverySetup,
): PhaseFlowBudget {
  const route = phase.route;
  const minuteVentilation = phaseMinuteVentilationMlMin(input, estimates, phase, isLast);
  const maskLeak = route === 'mask' ? { maskLeakFraction: delivery.maskLeakFraction } : {};
  const recommendation = recommendFreshGas({
    route,
    circuit: phase.circuit,
    bodyMassG: input.bodyMassG,
    minuteVentilationMlMin: minuteVentilation,
    ...(phase.chamberVolumeL === undefined ? {} : { chamberVolumeL: phase.chamberVolumeL }),
    ...(phase.circuitVolumeL === undefined ? {} : { circuitVolumeL: phase.circuitVolumeL }),
    ...maskLeak,
  });
  const rebreathing = rebreathingCheck({
    circuit: phase.circuit,
    freshGasLpm: phase.freshGasLpm,
    minuteVentilationMlMin: minuteVentilation,
    bodyMassG: input.bodyMassG,
    route,
    ...maskLeak,
  });
  const chamberTime =
    route === 'chamber' && phase.chamberVolumeL !== undefined
      ? chamberTimeToFractionMin(phase.chamberVolumeL, phase.freshGasLpm)
      : null;
  return {
    recommendation,
    rebreathing,
    flows: {
      recommendedLpm: recommendation.recommendedLpm,
      minimumLpm: recommendation.minimumLpm,
      rule: recommendation.rule,
      basis: recommendation.basis,
      rebreathing: rebreathing.rebreathing,
      rebreathingReason: rebreathing.reason,
      chamberTimeTo95Min: chamberTime,
    },
  };
}

/** The plan's fresh gas flow: one number for a single phase, else one flowmeter step per phase. */
export function planFreshGas(phases: readonly ResolvedPlanPhase[]): FreshGasInput {
  if (phases.length === 1) return (phases[0] as ResolvedPlanPhase).freshGasLpm;
  return phases.map((phase): FlowStep => ({ atMin: phase.startMin, freshGasLpm: phase.freshGasLpm }));
}

/** The phase's dial steps with minutes counted from the phase's start. */
function stepsFromPhaseStart(phase: ResolvedPlanPhase): PlanScheduleStep[] {
  return phase.dialSteps.map((step) => ({ atMin: step.atMin - phase.startMin, vaporPct: step.vaporPct }));
}

/**
 * The phases as the result reports them, each with its flows, oxygen (its flow over its minutes,
 * the gap included: the new system is on the flowmeter while the bird is moved) and liquid agent.
 * Over the phases these sum to the whole plan's oxygen and liquid.
 */
export function phaseSummaries(
  input: PlanInput,
  phases: readonly ResolvedPlanPhase[],
  flows: readonly PhaseFlowBudget[],
  temperatureC: number,
): PlanPhaseSummary[] {
  return phases.map((phase, index) => ({
    index: phase.index,
    startMin: phase.startMin,
    gapMin: phase.gapMin,
    deliveryFromMin: phase.deliveryFromMin,
    endMin: phase.endMin,
    route: phase.route,
    circuit: phase.circuit,
    freshGasLpm: phase.freshGasLpm,
    dialSteps: phase.dialSteps,
    flows: (flows[index] as PhaseFlowBudget).flows,
    oxygenUsedL: phase.freshGasLpm * (phase.endMin - phase.startMin),
    liquidMl: liquidAgentMlForSchedule({
      agent: input.agent,
      schedule: stepsFromPhaseStart(phase),
      freshGasLpm: phase.freshGasLpm,
      endMin: phase.endMin - phase.startMin,
      temperatureC,
    }),
  }));
}

/**
 * Releases of waste gas to the room, one per vaporiser step that is on, at that step's rate: the
 * vapour the vaporiser puts out in the step (carrier flow x c / (1 - c) x duration), scaled so
 * that the steps together release `totalMl`.
 * @param schedule vaporiser steps sorted by atMin
 * @param freshGasLpm carrier flow, L/min
 * @param endMin end of the plan, min
 * @param totalMl vapour released to the room by the steady sources (exhaust, mask leak), mL
 */
export function stepReleases(
  schedule: PlanInput['schedule'],
  freshGasLpm: number,
  endMin: number,
  totalMl: number,
): RoomRelease[] {
  const steps = schedule.map((step, index) => {
    const until = Math.min(endMin, schedule[index + 1]?.atMin ?? endMin);
    const durationMin = Math.max(0, until - step.atMin);
    const vapourMl = step.vaporPct > 0 ? vapourFlowMlPerMin(freshGasLpm, step.vaporPct) * durationMin : 0;
    return { startMin: step.atMin, durationMin, vapourMl };
  });
  const delivered = steps.reduce((sum, step) => sum + step.vapourMl, 0);
  if (!(delivered > 0) || !(totalMl > 0)) return [];
  return steps
    .filter((step) => step.vapourMl > 0 && step.durationMin > 0)
    .map((step) => ({ ...step, vapourMl: (totalMl * step.vapourMl) / delivered }));
}

export type PhasedWasteGas = {
  /** Vapour reaching the room by source, summed over the phases, in the order first met. */
  readonly sources: readonly WasteGasSourceAmount[];
  readonly releasedVapourMl: number;
  /** Every release at its time: each phase's steady sources step by step, each chamber opening as a puff. */
  readonly releases: readonly RoomRelease[];
  readonly basis: string;
};

/**
 * Waste gas of each phase at its real times. A mask leaks while it is on (the phase's steps,
 * at each step's rate); a chamber's content is released as a puff when the bird is taken out:
 * at the next phase's start with the content the simulation holds then, or, in a plan whose only
 * phase is the chamber, at induction (when the bird is taken out to be worked on). The gap's
 * fresh gas leaves by the new system's exhaust.
 * @param mixedPctAtPhaseEnd chamber or circle content (vol %) of each phase when it ended
 * @param inductionMin time of induction, or null
 */
export function phasedWasteGas(
  input: PlanInput,
  phases: readonly ResolvedPlanPhase[],
  deliveries: PhaseDeliveries,
  mixedPctAtPhaseEnd: readonly number[],
  mixedPctAtInduction: number,
  inductionMin: number | null,
): PhasedWasteGas {
  const scavenging = input.scavenging ?? false;
  const single = phases.length === 1;
  const sources: WasteGasSourceAmount[] = [];
  const releases: RoomRelease[] = [];
  let basis = '';
  phases.forEach((phase, index) => {
    const delivery = deliveries[index] as DeliverySetup;
    const schedule = single ? input.schedule : stepsFromPhaseStart(phase);
    const durationMin = phase.endMin - phase.startMin;
    const chamber = phase.route === 'chamber' && phase.chamberVolumeL !== undefined;
    const release = wasteGasRelease({
      agent: input.agent,
      route: phase.route,
      schedule,
      freshGasLpm: phase.freshGasLpm,
      endMin: durationMin,
      scavenging,
      ...(chamber
        ? {
            chamberVolumeL: phase.chamberVolumeL,
            chamberConcentrationAtOpeningPct: Math.max(
              0,
              single ? mixedPctAtInduction : (mixedPctAtPhaseEnd[index] ?? 0),
            ),
          }
        : {}),
      ...(phase.route === 'mask' ? { maskLeakFraction: delivery.maskLeakFraction } : {}),
    });
    basis = release.basis;
    for (const source of release.sources) {
      const same = sources.findIndex((kept) => kept.source === source.source);
      if (same < 0) sources.push(source);
      else {
        const kept = sources[same] as WasteGasSourceAmount;
        sources[same] = {
          source: kept.source,
          vapourMl: kept.vapourMl + source.vapourMl,
          basis: kept.basis === source.basis ? kept.basis : `${kept.basis}; ${source.basis}`,
        };
      }
    }
    const opened = release.sources.find((source) => source.source === 'chamberOpened');
    const steady = release.sources
      .filter((source) => source.source !== 'chamberOpened')
      .reduce((sum, source) => sum + source.vapourMl, 0);
    for (const step of stepReleases(schedule, phase.freshGasLpm, durationMin, steady))
      releases.push(single ? step : { ...step, startMin: step.startMin + phase.startMin });
    if (opened !== undefined) {
      const openedAt = single ? (inductionMin ?? phase.endMin) : phase.endMin;
      releases.push({ startMin: openedAt, durationMin: 0, vapourMl: opened.vapourMl });
    }
  });
  return {
    sources,
    releasedVapourMl: sources.reduce((sum, source) => sum + source.vapourMl, 0),
    releases,
    basis: single
      ? basis
      : `${basis}; each phase's release at its own times: a mask's leak while it is on, a chamber's content when the bird is taken out at the next phase's start`,
  };
}

/** A phase named for the clinic: "Phase 2 (Endotracheal tube, from 6 min)". */
export function phaseName(phase: ResolvedPlanPhase): string {
  return `Phase ${String(phase.index + 1)} (${routeLabels[phase.route]}, from ${formatMin(phase.startMin)} min)`;
}

function formatMin(value: number): string {
  return String(Number(value.toFixed(1)));
}

/** The fields of a caution context that belong to one phase's route and breathing system. */
type PhaseCautionFields = Pick<
  CautionContext,
  'route' | 'circuit' | 'freshGasLpm' | 'minimumFreshGasLpm' | 'chamberExposureMin' | 'chamberMoveTo'
>;

/**
 * The route's own caution fields of one phase: its flow against its rebreathing limit (a chamber
 * against its own minimum), and for a chamber the time spent in it: until induction in a plan
 * whose only phase is the chamber, else until the next phase takes the bird out.
 */
export function phaseCautionFields(
  phases: readonly ResolvedPlanPhase[],
  index: number,
  flow: PhaseFlowBudget,
  inductionMin: number | null,
): PhaseCautionFields {
  const phase = phases[index] as ResolvedPlanPhase;
  const next = phases[index + 1];
  const chamber = phase.route === 'chamber';
  return {
    route: phase.route,
    circuit: phase.circuit,
    freshGasLpm: phase.freshGasLpm,
    minimumFreshGasLpm: chamber ? flow.recommendation.minimumLpm : flow.rebreathing.rebreathingBelowLpm,
    ...(chamber
      ? {
          chamberExposureMin:
            phases.length === 1 ? (inductionMin ?? phase.endMin) : phase.endMin - phase.deliveryFromMin,
        }
      : {}),
    ...(chamber && next !== undefined
      ? { chamberMoveTo: { routeLabel: routeLabels[next.route], atMin: next.startMin } }
      : {}),
  };
}

/**
 * The cautions of a plan: with one phase, those of the whole context as before phases; with
 * several, the plan's own cautions once and each phase's route cautions (flows, rebreathing,
 * breathing system, chamber time, tube) named with their phase. Most severe first.
 * @param general the context without the route's fields
 * @param phaseFields each phase's route fields (phaseCautionFields)
 */
export function cautionsByPhase(
  general: CautionContext,
  phases: readonly ResolvedPlanPhase[],
  phaseFields: readonly PhaseCautionFields[],
): Caution[] {
  if (phases.length === 1) return collectCautions({ ...general, ...phaseFields[0] });
  const perPhase = phases.flatMap((phase, index) =>
    collectCautions({ bodyMassG: general.bodyMassG, ...phaseFields[index] }).map((caution) => ({
      ...caution,
      message: `${phaseName(phase)}: ${caution.message}`,
    })),
  );
  return sortBySeverity([...collectCautions(general), ...perPhase]);
}

const severityRank = { danger: 0, warning: 1, notice: 2 } as const;

function sortBySeverity(cautions: readonly Caution[]): Caution[] {
  return cautions
    .map((caution, index) => ({ caution, index }))
    .sort((a, b) => severityRank[a.caution.severity] - severityRank[b.caution.severity] || a.index - b.index)
    .map(({ caution }) => caution);
}

/** Cautions of a phase's flow below the practical minimum (named with its phase in a phased plan). */
export function practicalMinimumCautions(
  phases: readonly ResolvedPlanPhase[],
  flows: readonly PhaseFlowBudget[],
): Caution[] {
  const cautions: Caution[] = [];
  phases.forEach((phase, index) => {
    if (phase.freshGasLpm >= practicalMinimumFlowLpm.value) return;
    const minimumLpm = (flows[index] as PhaseFlowBudget).recommendation.minimumLpm;
    cautions.push({
      code: 'flow-below-practical-minimum',
      severity: 'notice',
      message: `${phases.length === 1 ? '' : `${phaseName(phase)}: `}Fresh gas flow ${String(phase.freshGasLpm)} L/min is below the practical minimum of ${String(practicalMinimumFlowLpm.value)} L/min: set at least ${minimumLpm.toFixed(2)} L/min`,
      reason: practicalMinimumFlowLpm.basis,
    });
  });
  return cautions;
}
