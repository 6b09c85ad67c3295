/**
 * The plan assembler: turns a validated plan into estimates, a simulated time course,
 * milestones, uncertainty bands, flows, budgets, waste gas and cautions.
 */
import { agents } from '../agents.js';
import {
  vaporiserDialLimitPct,
  liquidAgentMlForSchedule,
  liquidMlPerHour,
  saturatedConcentrationPct,
  vapourMlPerLiquidMl,
  type FreshGasInput,
} from '../budget/consumption.js';
import { oxygenBudget } from '../budget/oxygen.js';
import { nioshCeilingPpm, wasteGasExposure } from '../budget/waste-gas.js';
import type { Caution, CautionContext } from '../cautions.js';
import {
  cautionsByPhase,
  phaseCautionFields,
  phasedWasteGas,
  phaseFlowBudget,
  phaseSummaries,
  planFreshGas,
  practicalMinimumCautions,
  type PhaseDeliveries,
  type PhaseFlowBudget,
} from './phase-budgets.js';
import { deliveriesOf, phaseAt, resolvePlanPhases, type ResolvedPlanPhase } from './phases.js';
import type { SpeciesReference } from '../species-reference.js';
import {
  cardiacDepressionFloor,
  cardiacDepressionSlope,
  defaultAnaestheticIndex,
  ventilatoryRateShare,
  type DepressionRule,
} from './depression.js';
import {
  avianNormalBodyTemperatureC,
  macTemperatureCoefficient,
  macTemperatureFactor,
  solubilityTemperatureCoefficient,
  solubilityTemperatureFactor,
} from './temperature.js';
import { estimateRespiratory, type RespiratoryEstimates } from './allometry.js';
import type { BodyModel, TissueGroup } from './body-uptake.js';
import { ippvPeriodAt, ippvPeriodsOf } from './ippv-periods.js';
import { gasSpaceWash } from './milestones.js';
import {
  bloodVolumeFraction,
  defaultRecoveryMacFraction,
  defaultTargetMacMultiple,
  lossOfRightingMacFraction,
  posteriorSacShare,
  standingMacFraction,
  type ModelParameter,
  rebreathingFlowMultiple,
  tissueGroups,
  ventilatoryDepressionFloor,
} from './parameters.js';
import type {
  MilestoneDefinition,
  MilestoneId,
  MilestoneUncertainty,
  PlanInput,
  PlanMilestones,
  PlanResult,
  PlanTimeline,
  PlanUncertainty,
} from './plan-types.js';
import { simulate, type DeliverySetup, type SimulationOutcome, type SimulationSetup } from './simulation.js';

export { stepReleases } from './phase-budgets.js';
import {
  runUncertainty,
  type MilestoneBand,
  type UncertaintyInput,
  type UncertaintyRun,
} from './uncertainty.js';

/** Version of the model; stored with every computed plan. */
export const modelVersion = '3.1.0';

export type PlanTables = { readonly species: readonly SpeciesReference[] };

/** Default room for the waste-gas estimate when the plan gives none (assumption). */
export const defaultRoom = {
  volumeM3: 40,
  airChangesPerHour: 10,
  basis: 'Assumption: a 40 m3 treatment room with 10 air changes per hour',
} as const;

/** Default minutes simulated after the last vaporiser step. */
export const defaultRecoveryWindowMin = 30;

/** Default number of uncertainty samples and seed. */
export const defaultUncertainty = { samples: 200, seed: 1 } as const;

export type ResolvedMac = {
  readonly valuePct: number;
  readonly basis: string;
  readonly publishedForBird: boolean;
  readonly sdPct: number | null;
};

/**
 * MAC in use: the plan's value, else the species' published value, else the agent default.
 * @param input plan
 * @param species species row, if any
 */
export function resolveMac(input: PlanInput, species: SpeciesReference | undefined): ResolvedMac {
  return atBodyTemperature(normothermicMac(input, species), input.bodyTemperatureC);
}

function normothermicMac(input: PlanInput, species: SpeciesReference | undefined): ResolvedMac {
  if (input.macPct !== undefined)
    return { valuePct: input.macPct, basis: 'entered for this bird', publishedForBird: true, sdPct: null };
  const published = species?.macByAgent[input.agent];
  if (published !== undefined && species !== undefined) {
    return {
      valuePct: published.macPct,
      basis: `${species.commonName}: ${published.measure} ${String(published.macPct)} % (${published.basis})`,
      publishedForBird: true,
      sdPct: published.sdPct ?? null,
    };
  }
  const fallback = agents[input.agent].fallbackMacPct;
  return { valuePct: fallback.value, basis: fallback.basis, publishedForBird: false, sdPct: null };
}

/**
 * The MAC at the plan's body temperature: a normothermic MAC (published avian MACs were measured
 * at 39.5-41 C, an entered MAC is taken as normothermic too) lowered for a colder bird.
 */
function atBodyTemperature(mac: ResolvedMac, bodyTemperatureC: number | undefined): ResolvedMac {
  if (bodyTemperatureC === undefined) return mac;
  const factor = macTemperatureFactor(bodyTemperatureC);
  if (factor === 1) return mac;
  return {
    valuePct: mac.valuePct * factor,
    basis: `${mac.basis}; x ${factor.toFixed(3)} for a body temperature of ${String(bodyTemperatureC)} C (${macTemperatureCoefficient.basis})`,
    publishedForBird: mac.publishedForBird,
    sdPct: mac.sdPct === null ? null : mac.sdPct * factor,
  };
}

/**
 * Body temperature of the plan: entered, else the normothermic avian value (assumption).
 * @param input plan
 */
export function planBodyTemperatureC(input: PlanInput): number {
  return input.bodyTemperatureC ?? avianNormalBodyTemperatureC.value;
}

/**
 * The depression rule of a plan: the species' published anaesthetic index (apnoea MAC multiple)
 * where there is one, else the default; the agent's split between rate and tidal volume.
 * @param agentId agent
 * @param species species row, if any
 */
export function depressionRuleOf(
  agentId: PlanInput['agent'],
  species: SpeciesReference | undefined,
): DepressionRule & { readonly anaestheticIndex: number; readonly basis: string } {
  const published = species?.apnoeaMacMultiple;
  const anaestheticIndex = published?.value ?? defaultAnaestheticIndex.value;
  return {
    anaestheticIndex,
    ventilationSlope: 1 / anaestheticIndex,
    ventilationFloor: ventilatoryDepressionFloor.value,
    rateShare: ventilatoryRateShare[agentId].value,
    cardiacSlope: cardiacDepressionSlope.value,
    cardiacFloor: cardiacDepressionFloor.value,
    basis:
      published !== undefined && species !== undefined
        ? `Spontaneous ventilation falls linearly with the brain MAC multiple to apnoea at ${anaestheticIndex.toFixed(2)} x MAC, the published ${species.commonName} value (${published.basis}; taken for every agent); split between rate and tidal volume: ${ventilatoryRateShare[agentId].basis}`
        : `Spontaneous ventilation falls linearly with the brain MAC multiple to apnoea at ${anaestheticIndex.toFixed(2)} x MAC (${defaultAnaestheticIndex.basis}); split between rate and tidal volume: ${ventilatoryRateShare[agentId].basis}`,
  };
}

/** Minute at which the vaporiser is turned off for good, or null when the schedule never ends at 0. */
export function vaporiserOffMin(schedule: PlanInput['schedule']): number | null {
  let index = schedule.length - 1;
  if (schedule[index]?.vaporPct !== 0) return null;
  while (index > 0 && schedule[index - 1]?.vaporPct === 0) index -= 1;
  if (index === 0) return null;
  return schedule[index]?.atMin ?? null;
}

/** End of the simulated period, min. */
export function planEndMin(input: PlanInput): number {
  const last = input.schedule[input.schedule.length - 1];
  return (last?.atMin ?? 0) + (input.recoveryWindowMin ?? defaultRecoveryWindowMin);
}

/**
 * The body model of a bird: blood pool and three tissue groups, agent partition coefficients.
 * @param bodyMassG body mass in g
 * @param cardiacOutputMlMin cardiac output in mL/min
 * @param agentId agent
 * @param bodyTemperatureC body temperature, C (30-44; default the normothermic avian value)
 */
export function buildBodyModel(
  bodyMassG: number,
  cardiacOutputMlMin: number,
  agentId: PlanInput['agent'],
  bodyTemperatureC: number = avianNormalBodyTemperatureC.value,
): BodyModel {
  const agent = agents[agentId];
  const partitions = [
    agent.vesselRichBloodPartition.value,
    agent.muscleBloodPartition.value,
    agent.fatBloodPartition.value,
  ];
  const groups = tissueGroups.map((group, index): TissueGroup => ({
    volumeMl: group.volumeFraction.value * bodyMassG,
    flowMlMin: group.flowFraction.value * cardiacOutputMlMin,
    tissueBloodPartition: partitions[index] as number,
  }));
  return {
    // Tissue/blood coefficients do not change with temperature; blood/gas (and so tissue/gas) does.
    bloodGasPartition: agent.bloodGasPartition.value * solubilityTemperatureFactor(agentId, bodyTemperatureC),
    bloodVolumeMl: bloodVolumeFraction.value * bodyMassG,
    groups: [groups[0] as TissueGroup, groups[1] as TissueGroup, groups[2] as TissueGroup],
  };
}

/**
 * Builds the simulation setup of a plan (exported for tests and the benchmark).
 * @param input validated plan
 * @param estimates respiratory estimates of the bird
 * @param mac MAC in use (at the plan's body temperature: resolveMac)
 * @param species species row, for its published anaesthetic index
 */
export function buildSimulationSetup(
  input: PlanInput,
  estimates: RespiratoryEstimates,
  mac: ResolvedMac,
  species?: SpeciesReference,
): SimulationSetup {
  const depression = depressionRuleOf(input.agent, species);
  const endMin = planEndMin(input);
  const deliveries = deliveriesOf(resolvePlanPhases(input, endMin), estimates.tidalVolumeMl.value);
  const ventilation = input.ventilation ?? { mode: 'spontaneous' as const };
  const targetMultiple = input.targetMacMultiple ?? defaultTargetMacMultiple.value;
  const recoveryFraction = input.recoveryMacFraction ?? defaultRecoveryMacFraction.value;
  return {
    gasPath: {
      trachealVolumeMl: estimates.trachealDeadSpaceMl.value,
      lungVolumeMl: estimates.lungVolumeMl.value,
      anteriorSacsMl: estimates.anteriorSacsMl.value,
      posteriorSacsMl: estimates.posteriorSacsMl.value,
      posteriorShare: posteriorSacShare.value,
    },
    body: buildBodyModel(
      input.bodyMassG,
      estimates.cardiacOutputMlMin.value,
      input.agent,
      planBodyTemperatureC(input),
    ),
    delivery: deliveries.first,
    ...(deliveries.later.length === 0 ? {} : { laterDeliveries: deliveries.later }),
    ventilation: {
      restingTidalVolumeMl: estimates.tidalVolumeMl.value,
      restingBreathsPerMin: estimates.breathsPerMin.value,
      depressionSlope: depression.ventilationSlope,
      depressionFloor: depression.ventilationFloor,
      rateShare: depression.rateShare,
      cardiacSlope: depression.cardiacSlope,
      cardiacFloor: depression.cardiacFloor,
      ippv: ventilation.mode === 'ippv' ? ippvPeriodsOf(ventilation) : null,
    },
    schedule: input.schedule,
    endMin,
    macPct: mac.valuePct,
    inductionBrainPct: targetMultiple * mac.valuePct,
    recoveryBrainPct: recoveryFraction * mac.valuePct,
    ...(input.recoveryMacFraction === undefined
      ? { recoveryThresholdRange: rangeOf(defaultRecoveryMacFraction) }
      : {}),
    // Order as read back in computePlan: loss of righting, standing.
    milestoneBrainPct: [
      {
        brainPct: lossOfRightingMacFraction.value * mac.valuePct,
        direction: 'up',
        thresholdRange: rangeOf(lossOfRightingMacFraction),
      },
      {
        brainPct: standingMacFraction.value * mac.valuePct,
        direction: 'down',
        thresholdRange: rangeOf(standingMacFraction),
      },
    ],
    offMin: vaporiserOffMin(input.schedule),
    sampleIntervalMin: Math.max(0.05, Math.ceil(endMin / 480 / 0.05) * 0.05),
  };
}

/** [low, nominal, high] of a parameter, for the uncertainty run. */
function rangeOf(parameter: ModelParameter): readonly [number, number, number] {
  return [parameter.range[0], parameter.value, parameter.range[1]];
}

/**
 * The clinical milestones' definitions for a plan.
 * @param targetMultiple planned depth, multiple of MAC
 * @param recoveryFraction first-movement threshold, fraction of MAC
 * @param recoveryEntered whether the plan entered its own recovery threshold
 */
export function milestoneDefinitions(
  targetMultiple: number,
  recoveryFraction: number,
  recoveryEntered: boolean,
): MilestoneDefinition[] {
  return [
    {
      id: 'lossOfRighting',
      label: 'Loss of righting',
      macMultiple: lossOfRightingMacFraction.value,
      when: 'rising',
      definition: `Light plane: the brain (vessel-rich group) rises through ${String(lossOfRightingMacFraction.value)} x MAC`,
      basis: lossOfRightingMacFraction.basis,
    },
    {
      id: 'surgicalDepth',
      label: 'Planned surgical depth',
      macMultiple: targetMultiple,
      when: 'rising',
      definition: `The brain reaches the planned depth of ${String(targetMultiple)} x MAC`,
      basis: defaultTargetMacMultiple.basis,
    },
    {
      id: 'firstMovement',
      label: 'First movement or head lift',
      macMultiple: recoveryFraction,
      when: 'falling',
      definition: `After the vaporiser is off, the brain falls below ${String(recoveryFraction)} x MAC`,
      basis: recoveryEntered ? 'entered for this plan' : defaultRecoveryMacFraction.basis,
    },
    {
      id: 'standing',
      label: 'Standing or perching',
      macMultiple: standingMacFraction.value,
      when: 'falling',
      definition: `After the vaporiser is off, the brain falls below ${String(standingMacFraction.value)} x MAC`,
      basis: standingMacFraction.basis,
    },
  ];
}

function roundTo(value: number, digits: number): number {
  const factor = 10 ** digits;
  return Math.round(value * factor) / factor;
}

function roundArray(values: readonly number[]): number[] {
  return values.map((value) => roundTo(value, 5));
}

function timelineOf(outcome: SimulationOutcome, intervalMin: number): PlanTimeline {
  const t = outcome.timeline;
  return {
    sampleIntervalMin: intervalMin,
    timeMin: t.timeMin,
    inspiredPct: roundArray(t.inspiredPct),
    tracheaPct: roundArray(t.tracheaPct),
    posteriorSacsPct: roundArray(t.posteriorSacsPct),
    parabronchialPct: roundArray(t.parabronchialPct),
    anteriorSacsPct: roundArray(t.anteriorSacsPct),
    arterialPct: roundArray(t.arterialPct),
    brainPct: roundArray(t.brainPct),
    musclePct: roundArray(t.musclePct),
    fatPct: roundArray(t.fatPct),
  };
}

export type PlanOptions = {
  /**
   * The plan's uncertainty run when already made (by a pool of workers running
   * `runUncertaintySlice` on `planUncertaintyInput(input, tables)`, merged by `mergeUncertainty`);
   * computed here otherwise.
   */
  readonly sampled?: UncertaintyRun;
};

/** The point estimate's set-up and run, shared by the plan and its uncertainty input. */
function nominalRun(input: PlanInput, tables: PlanTables) {
  const species =
    input.speciesId === undefined ? undefined : tables.species.find((row) => row.id === input.speciesId);
  const estimates = estimateRespiratory(input.bodyMassG, input.overrides ?? {});
  const mac = resolveMac(input, species);
  const setup = buildSimulationSetup(input, estimates, mac, species);
  return { species, estimates, mac, setup, outcome: simulate(setup) };
}

function uncertaintyInputOf(
  input: PlanInput,
  setup: SimulationSetup,
  outcome: SimulationOutcome,
  mac: ResolvedMac,
  species: SpeciesReference | undefined,
): UncertaintyInput {
  return {
    setup,
    outcome,
    macSdPct: mac.sdPct,
    samples: input.uncertainty?.samples ?? defaultUncertainty.samples,
    seed: input.uncertainty?.seed ?? defaultUncertainty.seed,
    bloodGasRange: agents[input.agent].bloodGasRange,
    brainTimeline: outcome.timeline,
    maskEntered: { deadSpace: input.maskDeadSpaceMl !== undefined },
    physiology: {
      agent: input.agent,
      anaestheticIndexPublished: species?.apnoeaMacMultiple !== undefined,
      bodyTemperatureC: input.bodyTemperatureC ?? null,
    },
  };
}

/**
 * The input of a plan's uncertainty run, as `computePlan` makes it: for running its samples in
 * slices elsewhere (`runUncertaintySlice`) and merging them (`mergeUncertainty`).
 * @param input a plan validated by planInputSchema (app/contract/plan.ts)
 * @param tables the species reference
 */
export function planUncertaintyInput(input: PlanInput, tables: PlanTables): UncertaintyInput {
  const { species, mac, setup, outcome } = nominalRun(input, tables);
  return uncertaintyInputOf(input, setup, outcome, mac, species);
}

/** The air-sac wash times: properties of the gas spaces (an insoluble tracer), not of the agent's course. */
type AirSacWashKey =
  'airSacWashin95Breaths' | 'airSacWashin95Min' | 'airSacWashout95Breaths' | 'airSacWashout95Min';

/**
 * What a plan predicts for the bird: the MAC in use, the time course, the milestones (all but the
 * air-sac wash times) and their uncertainty, without the flows, budgets, waste gas and cautions.
 * The same values as those fields of `computePlan` (which builds its answer on this one), for
 * callers that read nothing else: the forecast that follows the log and the clinic's
 * observed-beside-predicted rows.
 */
export type PlanCourse = Pick<PlanResult, 'mac' | 'timeline' | 'uncertainty'> & {
  readonly milestones: Omit<PlanMilestones, AirSacWashKey>;
};

/**
 * Computes what a plan predicts for the bird (see PlanCourse). Pure and deterministic.
 * @param input a plan validated by planInputSchema (app/contract/plan.ts)
 * @param tables the species reference
 */
export function computePlanCourse(
  input: PlanInput,
  tables: PlanTables,
  options: PlanOptions = {},
): PlanCourse {
  return courseRun(input, tables, options).course;
}

/** The nominal run and what follows from it for the bird: the first part of computePlan. */
function courseRun(input: PlanInput, tables: PlanTables, options: PlanOptions) {
  const run = nominalRun(input, tables);
  const { species, mac, setup, outcome } = run;
  const offMin = setup.offMin;
  const uncertaintyInput = uncertaintyInputOf(input, setup, outcome, mac, species);
  const sampled = options.sampled ?? runUncertainty(uncertaintyInput);
  if (sampled.samples !== uncertaintyInput.samples || sampled.seed !== uncertaintyInput.seed)
    throw new Error('the uncertainty run given was made for another sample count or seed');
  const [rightingBand, standingBand] = sampled.milestoneBands;
  const bandOf = (id: MilestoneId, band: MilestoneBand | undefined): MilestoneUncertainty => ({
    id,
    percentiles: band?.percentiles ?? null,
    reachedShare: band?.reachedShare ?? 1,
    note: band?.note ?? null,
  });
  const thresholdParameters = [
    { name: 'lossOfRightingMacFraction', parameter: lossOfRightingMacFraction },
    ...(input.recoveryMacFraction === undefined
      ? [{ name: 'recoveryMacFraction', parameter: defaultRecoveryMacFraction }]
      : []),
    { name: 'standingMacFraction', parameter: standingMacFraction },
  ].map(({ name, parameter }) => ({
    name,
    low: parameter.range[0],
    high: parameter.range[1],
    basis: parameter.basis,
  }));
  const uncertainty: PlanUncertainty = {
    samples: sampled.samples,
    seed: sampled.seed,
    brainBandPct: sampled.brainBandPct,
    inductionMin: sampled.inductionMin,
    recoveryMin: sampled.recoveryMin,
    inductionReached: sampled.inductionReached,
    recoveryReached: sampled.recoveryReached,
    inductionReachedShare: sampled.inductionReachedShare,
    recoveryReachedShare: sampled.recoveryReachedShare,
    inductionNote: sampled.inductionNote,
    recoveryNote: sampled.recoveryNote,
    parameters: [...sampled.parameters, ...thresholdParameters],
    method: sampled.method,
    milestones: [
      bandOf('lossOfRighting', rightingBand),
      {
        id: 'surgicalDepth',
        percentiles: sampled.inductionMin,
        reachedShare: sampled.inductionReachedShare,
        note: sampled.inductionNote,
      },
      {
        id: 'firstMovement',
        percentiles: sampled.recoveryMin,
        reachedShare: sampled.recoveryReachedShare,
        note: sampled.recoveryNote,
      },
      bandOf('standing', standingBand),
    ],
  };

  const course: PlanCourse = {
    mac: { valuePct: mac.valuePct, basis: mac.basis },
    timeline: timelineOf(outcome, setup.sampleIntervalMin),
    milestones: {
      inductionMin: outcome.inductionMin,
      recoveryMin: outcome.recoveryMin,
      vaporiserOffMin: offMin,
      peakBrainMacMultiple: outcome.peakBrainMacMultiple,
      lowestVentilationFraction: outcome.lowestVentilationFraction,
      lossOfRightingMin: outcome.milestoneMin[0] ?? null,
      surgicalDepthMin: outcome.inductionMin,
      firstMovementMin: outcome.recoveryMin,
      standingMin: outcome.milestoneMin[1] ?? null,
      definitions: milestoneDefinitions(
        input.targetMacMultiple ?? defaultTargetMacMultiple.value,
        input.recoveryMacFraction ?? defaultRecoveryMacFraction.value,
        input.recoveryMacFraction !== undefined,
      ),
      basis:
        'Induction (planned surgical depth): brain (vessel-rich group) reaches the target MAC multiple; loss of righting: brain rises through the light-plane fraction of MAC; recovery (first movement or head lift): brain falls below the recovery fraction of MAC after the vaporiser is off; standing or perching: brain falls below the standing fraction of MAC; a recovery milestone is timed only for a brain that was above its level; air-sac wash times: both sac groups within 5 % of a step of an insoluble tracer at the airway opening, at the ventilation of induction (wash-in) and of the moment the vaporiser goes off (washout)',
    },
    uncertainty,
  };
  return { ...run, course };
}

/**
 * Computes a whole plan. Pure and deterministic: the same input and tables give the same result.
 * @param input a plan validated by planInputSchema (app/contract/plan.ts)
 * @param tables the species reference
 */
export function computePlan(input: PlanInput, tables: PlanTables, options: PlanOptions = {}): PlanResult {
  const { species, estimates, mac, setup, outcome, course } = courseRun(input, tables, options);
  const offMin = setup.offMin;
  const uncertainty = course.uncertainty;
  const phases = resolvePlanPhases(input, setup.endMin);
  const phaseDeliveries = [setup.delivery, ...(setup.laterDeliveries ?? []).map((later) => later.delivery)];
  // The air-sac wash times follow the route at induction (the first phase) and when the vaporiser goes off.
  const tubeFlowAt = (timeMin: number): number => {
    const phase = phaseAt(phases, timeMin);
    return phase.route === 'airSacTube' ? (phaseDeliveries[phase.index] as DeliverySetup).freshGasMlMin : 0;
  };

  // Gas-space wash times: ventilation at induction and at the moment the vaporiser goes off.
  const ippvAtStart = ippvPeriodAt(setup.ventilation.ippv ?? [], 0);
  const startVentilation =
    ippvAtStart !== null
      ? { tidal: ippvAtStart.tidalVolumeMl, rate: ippvAtStart.breathsPerMin }
      : { tidal: estimates.tidalVolumeMl.value, rate: estimates.breathsPerMin.value };
  const washIn = gasSpaceWash({
    gasPath: setup.gasPath,
    body: setup.body,
    tidalVolumeMl: startVentilation.tidal,
    breathsPerMin: startVentilation.rate,
    direction: 'in',
    airSacTubeMlMin: tubeFlowAt(0),
  });
  const offVentilation = outcome.atOff ?? {
    tidalVolumeMl: startVentilation.tidal,
    breathsPerMin: startVentilation.rate,
  };
  const washOut = gasSpaceWash({
    gasPath: setup.gasPath,
    body: setup.body,
    tidalVolumeMl: offVentilation.tidalVolumeMl,
    breathsPerMin: offVentilation.breathsPerMin,
    direction: 'out',
    airSacTubeMlMin: tubeFlowAt(offMin ?? 0),
  });

  const { inductionMin, recoveryMin, vaporiserOffMin, ...courseMilestones } = course.milestones;

  // Flows: each phase's own rule for its route and breathing system; the plan's are the first phase's.
  const phaseFlows = phases.map((phase, index) =>
    phaseFlowBudget(
      input,
      estimates,
      phase,
      index === phases.length - 1,
      phaseDeliveries[index] as DeliverySetup,
    ),
  );
  const { flows } = phaseFlows[0] as PhaseFlowBudget;

  const temperatureC = input.vaporiserTemperatureC ?? 20;
  const endMin = setup.endMin;
  const freshGas = planFreshGas(phases);
  const consumption = consumptionOf(input, phases, freshGas, endMin, temperatureC);
  const oxygen = oxygenOf(input, freshGas, endMin);
  const scavenging = input.scavenging ?? false;
  const wasteGas = wasteGasOf(input, phases, phaseDeliveries, outcome);

  // Cautions.
  const highestDialPct = input.schedule.reduce((peak, step) => Math.max(peak, step.vaporPct), 0);
  const cautionContext: CautionContext = {
    bodyMassG: input.bodyMassG,
    ...(species === undefined
      ? {}
      : {
          speciesName: species.commonName,
          speciesMassRangeG: { minG: species.typicalMassG.minG, maxG: species.typicalMassG.maxG },
          anatomyNotes: species.anatomyNotes,
        }),
    ...(species?.apnoeaMacMultiple === undefined ? {} : { apnoeaMacMultiple: species.apnoeaMacMultiple }),
    agent: input.agent,
    highestDialPct,
    saturatedPct: saturatedConcentrationPct(input.agent, temperatureC),
    temperatureC,
    scavenging,
    predictedPeakBrainMacMultiple: outcome.peakBrainMacMultiple,
    peakInspiredMacMultiple: outcome.peakInspiredPct / mac.valuePct,
    macIsPublishedForBird: mac.publishedForBird,
    wasteGasPeakPpm: wasteGas.peakPpm,
    wasteGasHourMeanPpm: wasteGas.highestHourMeanPpm,
    ventilationMode: input.ventilation?.mode ?? 'spontaneous',
  };
  // The route's cautions per phase (the rebreathing limit, a chamber's own minimum and time in it).
  const phaseCautionContexts = phases.map((_, index) =>
    phaseCautionFields(phases, index, phaseFlows[index] as PhaseFlowBudget, outcome.inductionMin),
  );
  const cautions: Caution[] = [
    ...cautionsByPhase(cautionContext, phases, phaseCautionContexts),
    ...modelCautions(input, outcome, offMin, endMin, species),
    ...bandCautions(uncertainty),
    ...budgetCautions(input),
    ...practicalMinimumCautions(phases, phaseFlows),
  ];
  if (input.speciesId !== undefined && species === undefined) {
    cautions.push({
      code: 'unknown-species',
      severity: 'notice',
      message: `No species "${input.speciesId}" in the reference: mass range and published MAC are not checked`,
      reason:
        'The species reference has no row with this id; the agent default MAC is used unless one is entered',
    });
  }

  const phaseResults = phaseSummaries(input, phases, phaseFlows, temperatureC);

  const totals = outcome.totals;
  return {
    modelVersion,
    patientName: input.patientName ?? null,
    speciesId: species?.id ?? null,
    agent: input.agent,
    mac: course.mac,
    targetMacMultiple: input.targetMacMultiple ?? defaultTargetMacMultiple.value,
    recoveryMacFraction:
      input.recoveryMacFraction === undefined
        ? { value: defaultRecoveryMacFraction.value, basis: defaultRecoveryMacFraction.basis }
        : { value: input.recoveryMacFraction, basis: 'entered for this plan' },
    estimates,
    phases: phaseResults,
    timeline: course.timeline,
    milestones: {
      inductionMin,
      recoveryMin,
      vaporiserOffMin,
      airSacWashin95Breaths: washIn.breaths,
      airSacWashin95Min: washIn.minutes,
      airSacWashout95Breaths: washOut.breaths,
      airSacWashout95Min: washOut.minutes,
      ...courseMilestones,
    },
    uncertainty,
    flows,
    consumption,
    oxygen,
    wasteGas,
    cautions,
    massBalance: {
      deliveredToBirdMl: totals.deliveredToBirdMl,
      exhaledMl: totals.exhaledMl,
      uptakeMl: totals.uptakeMl,
      gasStoredMl: totals.gasStoredMl,
      bodyStoredMl: totals.bodyStoredMl,
      vaporiserOutputMl: totals.vaporiserOutputMl,
    },
    assumptions: [
      'Blood/gas and tissue/blood partition coefficients are human values; none measured in birds was found',
      'Tissue group volumes and blood flows are mammalian fractions applied to the bird',
      depressionRuleOf(input.agent, species).basis,
      cardiacDepressionSlope.basis,
      `Body temperature ${String(planBodyTemperatureC(input))} C${input.bodyTemperatureC === undefined ? ` (not entered: ${avianNormalBodyTemperatureC.basis})` : ' (entered)'}: blood/gas and tissue/gas coefficients x ${solubilityTemperatureFactor(input.agent, planBodyTemperatureC(input)).toFixed(3)} of their 37 C values (${solubilityTemperatureCoefficient[input.agent].basis}); tissue/blood unchanged (Anesth Analg, July 2001, July 2001)`,
      rebreathingFlowMultiple.basis,
      posteriorSacShare.basis,
      'Within one phase of a breath, gas that enters a space does not leave it in the same phase',
    ],
  };
}

function modelCautions(
  input: PlanInput,
  outcome: SimulationOutcome,
  offMin: number | null,
  endMin: number,
  species: SpeciesReference | undefined,
): Caution[] {
  const cautions: Caution[] = [];
  if (outcome.inductionMin === null && input.schedule.some((step) => step.vaporPct > 0)) {
    cautions.push({
      code: 'target-depth-not-reached',
      severity: 'warning',
      message: 'The planned depth is not reached with this schedule',
      reason: `Model prediction: the brain never reaches ${String(input.targetMacMultiple ?? defaultTargetMacMultiple.value)} x MAC before ${endMin.toFixed(0)} min (estimate, see docs/model.md)`,
    });
  }
  const recoveryFraction = input.recoveryMacFraction ?? defaultRecoveryMacFraction.value;
  if (offMin !== null && outcome.recoveryMin === null && outcome.peakBrainMacMultiple < recoveryFraction) {
    cautions.push({
      code: 'recovery-level-never-reached',
      severity: 'notice',
      message:
        'No recovery time: the brain never reaches the recovery level, so the bird is not predicted to be anaesthetised',
      reason: `Model prediction: the brain peaks at ${outcome.peakBrainMacMultiple.toFixed(2)} x MAC, below the recovery level of ${recoveryFraction.toFixed(2)} x MAC (estimate, see docs/model.md)`,
    });
  } else if (offMin !== null && outcome.recoveryMin === null) {
    cautions.push({
      code: 'recovery-not-within-window',
      severity: 'notice',
      message: 'Recovery is not predicted within the simulated window after the vaporiser is off',
      reason:
        'Model prediction: lengthen recoveryWindowMin to see the recovery time (estimate, see docs/model.md)',
    });
  }
  if (outcome.lowestVentilationFraction <= ventilatoryDepressionFloor.value + 1e-9) {
    cautions.push({
      code: 'ventilation-at-model-floor',
      severity: 'danger',
      message: 'Predicted breathing falls to the model floor: expect apnoea; be ready to ventilate',
      reason: `${ventilatoryDepressionFloor.basis}; ${depressionRuleOf(input.agent, species).basis}`,
    });
  }
  return cautions;
}

/** Cautions for milestones that some sampled birds do not reach within the simulated window. */
function bandCautions(uncertainty: PlanResult['uncertainty']): Caution[] {
  const cautions: Caution[] = [];
  const windowText = 'within the simulated window (a sample counts as beyond the window)';
  if (uncertainty.inductionNote !== null)
    cautions.push({
      code: 'induction-not-reached-by-some',
      severity: 'warning',
      message: `Planned depth ${uncertainty.inductionNote}`,
      reason: `${String(uncertainty.samples - uncertainty.inductionReached)} of ${String(uncertainty.samples)} model runs with sampled parameters do not reach the planned depth ${windowText}`,
    });
  if (uncertainty.recoveryNote !== null)
    cautions.push({
      code: 'recovery-not-reached-by-some',
      severity: 'notice',
      message: `Recovery ${uncertainty.recoveryNote} within the simulated window`,
      reason: `${String(uncertainty.samples - uncertainty.recoveryReached)} of ${String(uncertainty.samples)} model runs with sampled parameters do not recover ${windowText}`,
    });
  return cautions;
}

/** Cautions of the budgets: a dial above the agent's vaporiser (a flow below the practical minimum: per phase). */
function budgetCautions(input: PlanInput): Caution[] {
  const cautions: Caution[] = [];
  const limit = vaporiserDialLimitPct[input.agent];
  const highest = input.schedule.reduce((peak, step) => Math.max(peak, step.vaporPct), 0);
  if (highest > limit.value)
    cautions.push({
      code: 'dial-above-vaporiser-limit',
      severity: 'warning',
      message: `The schedule's dial setting ${String(highest)} % is above the ${String(limit.value)} % that a ${input.agent} vaporiser can be set to: lower the step in the vaporiser schedule`,
      reason: limit.basis,
    });
  return cautions;
}

/**
 * Liquid agent used by the plan's schedule and per hour at the maintenance dial (at the flow of
 * the phase in which that dial step runs).
 * @param input plan
 * @param phases the plan's phases
 * @param freshGas the flow: one number, or one flowmeter step per phase
 * @param endMin end of the simulated period, min
 * @param temperatureC vaporiser temperature, C
 */
function consumptionOf(
  input: PlanInput,
  phases: readonly ResolvedPlanPhase[],
  freshGas: FreshGasInput,
  endMin: number,
  temperatureC: number,
): PlanResult['consumption'] {
  const nonZero = input.schedule.filter((step) => step.vaporPct > 0);
  const maintenanceStep = nonZero[nonZero.length - 1];
  const maintenanceVaporPct = maintenanceStep?.vaporPct ?? 0;
  const maintenanceFlowLpm = phaseAt(phases, maintenanceStep?.atMin ?? 0).freshGasLpm;
  const consumption = {
    vapourMlPerLiquidMl: vapourMlPerLiquidMl(input.agent, temperatureC),
    liquidMl: liquidAgentMlForSchedule({
      agent: input.agent,
      schedule: input.schedule,
      freshGasLpm: freshGas,
      endMin,
      temperatureC,
    }),
    maintenanceVaporPct,
    liquidMlPerHour: liquidMlPerHour({
      agent: input.agent,
      vaporPct: maintenanceVaporPct,
      freshGasLpm: maintenanceFlowLpm,
      temperatureC,
    }),
    basis:
      "Fresh gas flow x dial setting over the schedule, divided by the vapour each mL of liquid gives (derived from the agent's density and molecular weight)",
  };
  return consumption;
}

/**
 * Oxygen used over the planned time and, with a cylinder, its endurance.
 * @param input plan
 * @param freshGas the flow: one number, or one flowmeter step per phase
 * @param endMin end of the simulated period, min
 */
function oxygenOf(input: PlanInput, freshGas: FreshGasInput, endMin: number): PlanResult['oxygen'] {
  const oxygenUsedL =
    typeof freshGas === 'number'
      ? freshGas * endMin
      : freshGas.reduce(
          (sum, step, index) =>
            sum + step.freshGasLpm * (Math.min(endMin, freshGas[index + 1]?.atMin ?? endMin) - step.atMin),
          0,
        );
  const oxygen =
    input.cylinder === undefined
      ? {
          durationMin: endMin,
          usedL: oxygenUsedL,
          cylinderContentL: null,
          enduranceMin: null,
          suffices: null,
          basis: 'Fresh gas flow x planned time (vaporiser schedule plus recovery window); no cylinder given',
        }
      : (() => {
          const budget = oxygenBudget({
            freshGasLpm: freshGas,
            durationMin: endMin,
            cylinder: input.cylinder,
          });
          return {
            durationMin: endMin,
            usedL: budget.usedL,
            cylinderContentL: budget.cylinderContentL,
            enduranceMin: budget.enduranceMin,
            suffices: budget.suffices,
            basis: budget.basis,
          };
        })();
  return oxygen;
}

/**
 * Waste gas released to the room and the room concentration it gives: each phase's vaporiser
 * steps at their own rates, a chamber opened as a puff when the bird is taken out
 * (phasedWasteGas in phase-budgets.ts).
 * @param input plan
 * @param phases the plan's phases
 * @param deliveries each phase's delivery as simulated
 * @param outcome the simulation outcome (chamber content at each phase's end and at induction)
 */
function wasteGasOf(
  input: PlanInput,
  phases: readonly ResolvedPlanPhase[],
  deliveries: PhaseDeliveries,
  outcome: SimulationOutcome,
): PlanResult['wasteGas'] {
  const scavenging = input.scavenging ?? false;
  const room = input.room ?? {
    volumeM3: defaultRoom.volumeM3,
    airChangesPerHour: defaultRoom.airChangesPerHour,
  };
  const release = phasedWasteGas(
    input,
    phases,
    deliveries,
    outcome.mixedPctAtDeliveryEnd,
    outcome.mixedPctAtInduction,
    outcome.inductionMin,
  );
  const extraReleases = release.releases;
  const exposure = wasteGasExposure({
    agent: input.agent,
    // Everything is released step by step (extraReleases), none spread over the whole plan.
    releasedVapourMl: 0,
    releaseDurationMin: 0,
    extraReleases,
    roomVolumeM3: room.volumeM3,
    airChangesPerHour: room.airChangesPerHour,
  });
  const wasteGas = {
    scavenging,
    roomVolumeM3: room.volumeM3,
    airChangesPerHour: room.airChangesPerHour,
    sources: release.sources.map((source) => ({
      source: source.source,
      vapourMl: source.vapourMl,
      basis: source.basis,
    })),
    releasedVapourMl: release.releasedVapourMl,
    peakPpm: exposure.peakPpm,
    highestHourMeanPpm: exposure.highestHourMeanPpm,
    ceilingPpm: nioshCeilingPpm.value,
    exceedsCeiling: exposure.exceedsCeiling,
    basis: `${release.basis}; ${exposure.basis}${input.room === undefined ? `; ${defaultRoom.basis}` : ''}`,
  };
  return wasteGas;
}
