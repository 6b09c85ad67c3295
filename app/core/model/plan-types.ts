/**
 * The plan the model reads and the result it returns, as plain data. The contract
 * (app/contract/plan.ts) validates JSON into PlanInput and describes PlanResult with zod; the two
 * are checked against each other at compile time there.
 */
import type { AgentId } from '../agents.js';
import type { CylinderSpec } from '../budget/oxygen.js';
import type { Circuit, Route } from '../budget/flows.js';
import type { Caution } from '../cautions.js';
import type { MeasuredOverrides, RespiratoryEstimates } from './allometry.js';
import type { AgentTotals } from './simulation.js';

/**
 * A later IPPV period: the ventilator runs from `fromMin` until `untilMin` (absent: to the end of
 * the plan) at its own settings; the bird breathes spontaneously (depressed) between periods.
 */
export type PlanIppvPeriod = {
  readonly fromMin: number;
  readonly untilMin?: number | undefined;
  readonly breathsPerMin: number;
  readonly tidalVolumeMl: number;
};

/**
 * Spontaneous breathing throughout, or IPPV in one or more periods. The plan's own IPPV fields are
 * the first period: from `fromMin` (absent: 0) until `untilMin` (absent: the end of the plan);
 * `laterPeriods` follow it in time order (app/core/model/ippv-periods.ts resolves them).
 */
export type PlanVentilation =
  | { readonly mode: 'spontaneous' }
  | {
      readonly mode: 'ippv';
      readonly breathsPerMin: number;
      readonly tidalVolumeMl: number;
      readonly fromMin?: number | undefined;
      readonly untilMin?: number | undefined;
      readonly laterPeriods?: readonly PlanIppvPeriod[] | undefined;
    };

export type PlanScheduleStep = { readonly atMin: number; readonly vaporPct: number };

/**
 * A later phase of the plan: from `startMin` the bird is moved to another route or breathing
 * system (intubated after a mask or chamber induction, or moved from a chamber to a mask). The
 * plan's own route, circuit and flow fields are the first phase, from minute 0. The vaporiser
 * schedule stays one list of steps at minutes from the start; each phase shows the steps that
 * fall within it.
 */
export type PlanPhaseChange = {
  /** Minute the move starts (the bird leaves the previous route), > 0. */
  readonly startMin: number;
  /** Minutes on room air while the bird is moved (intubation, mask fitting); absent: the default gap. */
  readonly gapMin?: number | undefined;
  readonly route: Route;
  readonly circuit?: Circuit | undefined;
  readonly freshGasLpm: number;
  readonly chamberVolumeL?: number | undefined;
  readonly maskDeadSpaceMl?: number | undefined;
  readonly maskLeakFraction?: number | undefined;
  readonly circuitVolumeL?: number | undefined;
};

/** One phase of a computed plan, the first included (a single-route plan has one). */
export type PlanPhaseSummary = {
  /** 0 for the first phase. */
  readonly index: number;
  /** Minute the phase starts (0 for the first); the bird is on room air until deliveryFromMin. */
  readonly startMin: number;
  readonly gapMin: number;
  readonly deliveryFromMin: number;
  /** Minute the next phase starts, or the end of the plan. */
  readonly endMin: number;
  readonly route: Route;
  readonly circuit: Circuit;
  readonly freshGasLpm: number;
  /** Dial steps in effect during the phase: the one running at its start (at startMin), then any later. */
  readonly dialSteps: readonly PlanScheduleStep[];
  /** Flow recommendation for this phase's route and breathing system. */
  readonly flows: PlanFlows;
  /** Oxygen used during the phase, L. */
  readonly oxygenUsedL: number;
  /** Liquid agent used during the phase, mL. */
  readonly liquidMl: number;
};

export type PlanInput = {
  /** Free text shown on the worksheet (the bird's name). */
  readonly patientName?: string | undefined;
  /** Body mass in g, 5-15000. */
  readonly bodyMassG: number;
  readonly speciesId?: string | undefined;
  readonly overrides?: MeasuredOverrides | undefined;
  readonly agent: AgentId;
  /** MAC for this bird, vol %; else the species' published value, else the agent default. */
  readonly macPct?: number | undefined;
  readonly route: Route;
  readonly circuit?: Circuit | undefined;
  readonly freshGasLpm: number;
  readonly chamberVolumeL?: number | undefined;
  readonly maskDeadSpaceMl?: number | undefined;
  readonly maskLeakFraction?: number | undefined;
  readonly circuitVolumeL?: number | undefined;
  /** Vaporiser steps, sorted by atMin, the first at 0. */
  readonly schedule: readonly PlanScheduleStep[];
  /** Phases after the first (mask or chamber induction, then a tube), in time order; absent: one phase. */
  readonly laterPhases?: readonly PlanPhaseChange[] | undefined;
  readonly ventilation?: PlanVentilation | undefined;
  readonly targetMacMultiple?: number | undefined;
  readonly recoveryMacFraction?: number | undefined;
  /** Minutes simulated after the last schedule step. */
  readonly recoveryWindowMin?: number | undefined;
  readonly scavenging?: boolean | undefined;
  readonly room?: { readonly volumeM3: number; readonly airChangesPerHour: number } | undefined;
  readonly cylinder?: CylinderSpec | undefined;
  readonly vaporiserTemperatureC?: number | undefined;
  /**
   * Expected or measured body (cloacal) temperature during the plan, C (30-44); absent: the
   * normothermic avian value (app/core/model/temperature.ts). Changes solubility and MAC.
   */
  readonly bodyTemperatureC?: number | undefined;
  readonly uncertainty?: { readonly samples: number; readonly seed: number } | undefined;
};

/** The bird's estimates as the plan reports them: the allometry's, each with its basis. */
export type PlanEstimates = RespiratoryEstimates;

export type PlanTimeline = {
  readonly sampleIntervalMin: number;
  readonly timeMin: readonly number[];
  readonly inspiredPct: readonly number[];
  readonly tracheaPct: readonly number[];
  readonly posteriorSacsPct: readonly number[];
  readonly parabronchialPct: readonly number[];
  readonly anteriorSacsPct: readonly number[];
  readonly arterialPct: readonly number[];
  readonly brainPct: readonly number[];
  readonly musclePct: readonly number[];
  readonly fatPct: readonly number[];
};

export type PlanMilestones = {
  /** Minutes from the start until the brain reaches the target depth; null if never. */
  readonly inductionMin: number | null;
  /** Minutes after the vaporiser is turned off until the brain falls below the arousal threshold; null if not within the window or never off. */
  readonly recoveryMin: number | null;
  readonly vaporiserOffMin: number | null;
  readonly airSacWashin95Breaths: number | null;
  readonly airSacWashin95Min: number | null;
  readonly airSacWashout95Breaths: number | null;
  readonly airSacWashout95Min: number | null;
  readonly peakBrainMacMultiple: number;
  /** Lowest spontaneous ventilation as a fraction of resting (anaesthetic depression). */
  readonly lowestVentilationFraction: number;
  readonly basis: string;
  /** Minutes from the start until loss of righting (light plane); null if never. */
  readonly lossOfRightingMin: number | null;
  /** Minutes from the start until the planned surgical depth (the same as inductionMin); null if never. */
  readonly surgicalDepthMin: number | null;
  /** Minutes after the vaporiser is off until first movement or head lift (the same as recoveryMin). */
  readonly firstMovementMin: number | null;
  /** Minutes after the vaporiser is off until standing or perching; null if not within the window. */
  readonly standingMin: number | null;
  /** Each clinical milestone's definition: its brain threshold and the basis of that threshold. */
  readonly definitions: readonly MilestoneDefinition[];
};

export type MilestoneId = 'lossOfRighting' | 'surgicalDepth' | 'firstMovement' | 'standing';

export type MilestoneDefinition = {
  readonly id: MilestoneId;
  readonly label: string;
  /** Brain level as a multiple of the MAC in use. */
  readonly macMultiple: number;
  /** 'rising' from the start, or 'falling' after the vaporiser is off. */
  readonly when: 'rising' | 'falling';
  readonly definition: string;
  readonly basis: string;
};

export type Percentiles = { readonly p5: number; readonly p50: number; readonly p95: number };

export type UncertaintyParameter = {
  readonly name: string;
  readonly low: number;
  readonly high: number;
  readonly basis: string;
};

export type PlanUncertainty = {
  readonly samples: number;
  readonly seed: number;
  /** 5th and 95th percentile of the brain partial pressure (vol %) at each timeline point; null without samples. */
  readonly brainBandPct: { readonly p5: readonly number[]; readonly p95: readonly number[] } | null;
  readonly inductionMin: Percentiles | null;
  readonly recoveryMin: Percentiles | null;
  /** Samples in which the milestone was reached, out of `samples`. */
  readonly inductionReached: number;
  readonly recoveryReached: number;
  /** Share of samples that reached the milestone within the window, 0-1 (1 without samples). */
  readonly inductionReachedShare: number;
  readonly recoveryReachedShare: number;
  /** "not reached by N % of birds like this" when some samples did not reach it, else null. */
  readonly inductionNote: string | null;
  readonly recoveryNote: string | null;
  readonly parameters: readonly UncertaintyParameter[];
  readonly method: string;
  /** Band of every clinical milestone, with the share of samples that reached it. */
  readonly milestones: readonly MilestoneUncertainty[];
};

export type MilestoneUncertainty = {
  readonly id: MilestoneId;
  /** Percentiles; a percentile among samples beyond the window is the window length. */
  readonly percentiles: Percentiles | null;
  readonly reachedShare: number;
  /** "not reached by N % of birds like this" when some samples did not reach it, else null. */
  readonly note: string | null;
};

export type PlanFlows = {
  readonly recommendedLpm: number;
  readonly minimumLpm: number;
  readonly rule: string;
  readonly basis: string;
  readonly rebreathing: boolean;
  readonly rebreathingReason: string;
  readonly chamberTimeTo95Min: number | null;
};

export type PlanConsumption = {
  readonly vapourMlPerLiquidMl: number;
  readonly liquidMl: number;
  readonly maintenanceVaporPct: number;
  readonly liquidMlPerHour: number;
  readonly basis: string;
};

export type PlanOxygen = {
  readonly durationMin: number;
  readonly usedL: number;
  readonly cylinderContentL: number | null;
  readonly enduranceMin: number | null;
  readonly suffices: boolean | null;
  readonly basis: string;
};

export type PlanWasteGas = {
  readonly scavenging: boolean;
  readonly roomVolumeM3: number;
  readonly airChangesPerHour: number;
  readonly sources: readonly { readonly source: string; readonly vapourMl: number; readonly basis: string }[];
  readonly releasedVapourMl: number;
  readonly peakPpm: number;
  readonly highestHourMeanPpm: number;
  readonly ceilingPpm: number;
  readonly exceedsCeiling: boolean;
  readonly basis: string;
};

/** The agent's mass balance over the plan: the simulation's running totals. */
export type PlanMassBalance = AgentTotals;

export type PlanResult = {
  readonly modelVersion: string;
  readonly patientName: string | null;
  readonly speciesId: string | null;
  readonly agent: AgentId;
  readonly mac: { readonly valuePct: number; readonly basis: string };
  readonly targetMacMultiple: number;
  readonly recoveryMacFraction: { readonly value: number; readonly basis: string };
  readonly estimates: PlanEstimates;
  /** The plan's phases, the first included; old saved results read back with none. */
  readonly phases: readonly PlanPhaseSummary[];
  readonly timeline: PlanTimeline;
  readonly milestones: PlanMilestones;
  readonly uncertainty: PlanUncertainty;
  readonly flows: PlanFlows;
  readonly consumption: PlanConsumption;
  readonly oxygen: PlanOxygen;
  readonly wasteGas: PlanWasteGas;
  readonly cautions: readonly Caution[];
  readonly massBalance: PlanMassBalance;
  readonly assumptions: readonly string[];
};
