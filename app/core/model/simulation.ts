/**
 * The breath-resolved gas path and uptake simulation.
 *
 * Gas spaces (volumes fixed at end-expiration): trachea (dead space, a plug), posterior sacs,
 * parabronchial lung (constant volume), anterior sacs. One breath is an inspiration and an
 * expiration of equal length. Flow rules:
 *   inspiration: the trachea sends its old gas and then fresh gas to the posterior sacs (VT in
 *     all); the anterior sacs expand by a VT (a = 1 - posterior share) with gas from the lung
 *     outlet; the lung is refilled at its inlet by a VT from the posterior sacs.
 *   expiration: the posterior sacs send p VT through the lung; lung outflow (p VT) and the
 *     anterior sacs (a VT) leave through the trachea.
 * Within one phase every space sends on its start-of-phase gas first and, only once that is
 * spent, gas that arrived in the same phase (plug order). With these rules a parcel inspired in
 * one breath reaches the lung on the next expiration and leaves the airway on the expiration
 * after: the two-cycle passage is a consequence, not an input. The gas path is resolved once per
 * phase, so it has no step size.
 *
 * Exchange and uptake: the gas crossing the lung in a phase is cut into equal parcels, each
 * meeting the blood that flows in one exchange step (Piiper & Scheid cross-current model, then
 * the tissue groups and the venous pool: bodyExchangeStep in body-uptake.ts, the one
 * implementation). The exchange step is stable at any length and is kept short for accuracy
 * (bodyStepBound).
 *
 * Phases: the setup's first delivery runs from minute 0; each of laterDeliveries takes over at its
 * startMin (room air until its deliveryFromMin, while its own system fills from empty), with the
 * bird's gas spaces, blood, tissues and venous pool carried across. The delivery changes only at
 * those moments (DeliveryFactors, switchDelivery), at the first breath that starts at or after them.
 */
import {
  bodyBloodFlowMlMin,
  bodyContentMl,
  bodyExchangeFactorLength,
  bodyExchangeFactors,
  bodyExchangeStep,
  bodyState,
  type BodyModel,
} from './body-uptake.js';

export type GasPath = {
  readonly trachealVolumeMl: number;
  readonly lungVolumeMl: number;
  readonly anteriorSacsMl: number;
  readonly posteriorSacsMl: number;
  /** Share of each breath's expansion taken by the posterior sacs, 0-1. */
  readonly posteriorShare: number;
};

export type DeliverySetup = {
  /** 'open': fresh gas from a non-rebreathing system; 'mixed': a well-mixed chamber or circle. */
  readonly source: 'open' | 'mixed';
  readonly freshGasMlMin: number;
  /** Volume of the chamber or circle, mL ('mixed' only). */
  readonly mixedVolumeMl: number;
  /** Fresh gas flow, as a multiple of minute ventilation, below which an open system rebreathes. */
  readonly rebreathingFlowMultiple: number;
  /** How the gas reaches the bird. */
  readonly interface: 'direct' | 'mask' | 'airSacTube';
  readonly maskDeadSpaceMl: number;
  /**
   * Share of the mask's fresh gas that escapes to the room (waste gas and flow budgets only): room
   * air drawn into the breath follows from the flows instead (maskEntrainedShare).
   */
  readonly maskLeakFraction: number;
  /** The mask's dead space was entered for this plan (not sampled by the uncertainty run). */
  readonly maskDeadSpaceEntered?: boolean;
};

/**
 * A later delivery of a phased plan: from `startMin` the bird is off the previous route and
 * breathes room air (the gap, while it is intubated or the mask is fitted); from `deliveryFromMin`
 * it breathes from `delivery`. The new system is on the flowmeter from `startMin`, so a chamber,
 * circle or mask fills with fresh gas during the gap (it starts empty at `startMin`).
 */
export type TimedDelivery = {
  readonly startMin: number;
  /** startMin plus the gap on room air, min. */
  readonly deliveryFromMin: number;
  readonly delivery: DeliverySetup;
};

export type VentilationSetup = {
  readonly restingTidalVolumeMl: number;
  readonly restingBreathsPerMin: number;
  /** Fall in spontaneous minute ventilation per brain MAC multiple (1 / anaesthetic index). */
  readonly depressionSlope: number;
  /** Lowest fraction of resting minute ventilation kept. */
  readonly depressionFloor: number;
  /**
   * Share of the fall in minute ventilation taken by the rate (rate = V^share, tidal volume =
   * V^(1 - share)); absent or 0: only tidal volume falls. See depression.ts.
   */
  readonly rateShare?: number;
  /** Fall of cardiac output per brain MAC multiple (all group flows scaled alike); absent: none. */
  readonly cardiacSlope?: number;
  /** Lowest fraction of resting cardiac output kept. */
  readonly cardiacFloor?: number;
  /** IPPV periods in time order, not overlapping; null or empty: spontaneous throughout. */
  readonly ippv: readonly IppvPeriodSetup[] | null;
};

/**
 * One IPPV period: from the first breath that starts at or after `fromMin` until the first that
 * starts at or after `untilMin` (null: to the end), the set rate and tidal volume replace
 * spontaneous breathing.
 */
export type IppvPeriodSetup = {
  readonly fromMin: number;
  readonly untilMin: number | null;
  readonly breathsPerMin: number;
  readonly tidalVolumeMl: number;
};

export type ScheduleStep = { readonly atMin: number; readonly vaporPct: number };

/** Compartment values after each phase, passed to an optional observer (reused object). */
export type PhaseSnapshot = {
  phase: 'inspiration' | 'expiration';
  breathIndex: number;
  timeMin: number;
  inspiredFraction: number;
  trachea: number;
  posterior: number;
  lung: number;
  anterior: number;
  arterial: number;
  brain: number;
  /** Agent (mL vapour) that left the airway opening in this phase. */
  exhaledMl: number;
  /** Agent (mL vapour) held in the posterior sacs, lung, anterior sacs and trachea. */
  posteriorContentMl: number;
  lungContentMl: number;
  anteriorContentMl: number;
  tracheaContentMl: number;
};

export type SimulationSetup = {
  readonly gasPath: GasPath;
  readonly body: BodyModel;
  /** The first delivery, from minute 0. */
  readonly delivery: DeliverySetup;
  /** Later deliveries of a phased plan, in time order; absent or empty: one delivery throughout. */
  readonly laterDeliveries?: readonly TimedDelivery[];
  readonly ventilation: VentilationSetup;
  readonly schedule: readonly ScheduleStep[];
  readonly endMin: number;
  readonly macPct: number;
  /** Brain partial pressure (vol %) that counts as induction. */
  readonly inductionBrainPct: number;
  /** Brain partial pressure (vol %) below which the bird is taken to be recovering. */
  readonly recoveryBrainPct: number;
  /** Range of the recovery threshold as [low, nominal, high], sampled by the uncertainty run; absent: not sampled. */
  readonly recoveryThresholdRange?: readonly [number, number, number];
  /** Time the vaporiser is turned off for good, or null. */
  readonly offMin: number | null;
  readonly sampleIntervalMin: number;
  /** Starting fraction in every gas space (washout runs); body starts empty. */
  readonly initialGasFraction?: number;
  /** Observer called after each phase; returning true ends the run early. */
  readonly onPhase?: (snapshot: PhaseSnapshot) => unknown;
  /**
   * Multiplier of the exchange steps per phase (default 1): 2 halves every exchange step, for the
   * convergence checks. Does not change the gas path, which is resolved per phase.
   */
  readonly substepRefinement?: number;
  /** Further brain levels whose crossing times are reported in milestoneMin, in the same order. */
  readonly milestoneBrainPct?: readonly MilestoneLevel[];
};

/**
 * A brain level to time: 'up' from the start as the brain rises through it; 'down' after the
 * vaporiser is off as the brain falls below it (minutes after the vaporiser is off).
 */
export type MilestoneLevel = {
  readonly brainPct: number;
  readonly direction: 'up' | 'down';
  /**
   * Range of the threshold as [low, nominal, high] (any unit: only ratios are used), sampled by the
   * uncertainty run; absent: the level moves only with the sampled MAC.
   */
  readonly thresholdRange?: readonly [number, number, number];
};

export type SimulationTimeline = {
  readonly timeMin: number[];
  /** Gas delivered to the bird: inspired at the airway opening, or the tube gas with an air-sac tube. */
  readonly inspiredPct: number[];
  readonly tracheaPct: number[];
  readonly posteriorSacsPct: number[];
  readonly parabronchialPct: number[];
  readonly anteriorSacsPct: number[];
  readonly arterialPct: number[];
  readonly brainPct: number[];
  readonly musclePct: number[];
  readonly fatPct: number[];
};

/** Running totals of agent, mL of vapour. */
export type AgentTotals = {
  /** Entered the bird: through the airway opening and the air-sac tube. */
  readonly deliveredToBirdMl: number;
  /** Left the bird: out of the airway opening and, with an air-sac tube, out of the trachea. */
  readonly exhaledMl: number;
  /** Handed from lung gas to blood. */
  readonly uptakeMl: number;
  /** Held in the bird's gas spaces at the end. */
  readonly gasStoredMl: number;
  /** Held in blood and tissues at the end. */
  readonly bodyStoredMl: number;
  /** Put out by the vaporiser: carrier flow x c / (1 - c) over the run (the liquid-use convention). */
  readonly vaporiserOutputMl: number;
};

export type SimulationOutcome = {
  readonly timeline: SimulationTimeline;
  readonly inductionMin: number | null;
  readonly recoveryMin: number | null;
  /** Crossing time of each of setup.milestoneBrainPct, min ('down': after the vaporiser is off), or null. */
  readonly milestoneMin: readonly (number | null)[];
  readonly peakBrainMacMultiple: number;
  /** Highest concentration delivered to the bird (inspired, or tube gas with an air-sac tube). */
  readonly peakInspiredPct: number;
  readonly lowestVentilationFraction: number;
  readonly breaths: number;
  readonly totals: AgentTotals;
  /** Tidal volume and rate at the time the vaporiser is turned off, for the washout run. */
  readonly atOff: { readonly tidalVolumeMl: number; readonly breathsPerMin: number } | null;
  /** Chamber or circle concentration (vol %) at induction, or at the end when never reached. */
  readonly mixedPctAtInduction: number;
  /**
   * Chamber or circle concentration (vol %) of each delivery (the first, then the later ones) when
   * its phase ends: when the bird is taken out for the next phase, or at the end of the run.
   */
  readonly mixedPctAtDeliveryEnd: readonly number[];
};

/**
 * Dial setting (vol %) in force at `timeMin`: the last step with atMin <= timeMin.
 * @param schedule steps sorted by atMin
 * @param timeMin minutes from the start
 */
export function dialPctAt(schedule: readonly ScheduleStep[], timeMin: number): number {
  let pct = 0;
  for (const step of schedule) {
    if (step.atMin <= timeMin) pct = step.vaporPct;
    else break;
  }
  return pct;
}

/**
 * Largest Q dt / V_blood (and Qi dt / (lambda_i Vi) of the fastest tissue group) of one exchange
 * step. The implicit step is stable at any length; this bound is for accuracy: with it, doubling
 * the steps moves no milestone by more than 1 % (convergence study in docs/model.md).
 */
export const bodyStepBound = 0.1;

/** Grid of the depression factors: ventilation and cardiac output move in steps of 0.1 % of resting. */
export const depressionQuantum = 0.001;

/** Calls of the simulation before the JavaScript engine keeps type feedback for it (V8: 8). */
const feedbackWarmCalls = 9;
let feedbackWarmed = false;

/**
 * Runs the breath-resolved simulation of one plan.
 * Deterministic; allocates only the timeline arrays and two small typed arrays. Spontaneous
 * minute ventilation (split between rate and tidal volume) and cardiac output follow the
 * depression rule (depression.ts) rounded to 0.1 % of resting (depressionQuantum), monotone step
 * functions of the brain partial pressure, so that exchange factors are recomputed only when the
 * breath or the output changes.
 *
 * Speed note: the JavaScript engine starts keeping type feedback for a function only after a few
 * calls. If the first call is a whole plan, the long loop is optimised during that call without
 * feedback for the start of the function, and in some processes the function then stays in
 * slower code (the 2-h plan took 2-4 ms instead of under 1 ms in 3 to 5 of 14 fresh processes).
 * So the first call in a process first runs the same setup a few times with no time to simulate
 * (no breath, results discarded), which made every one of 14 processes fast.
 * @param setup the bird, delivery, ventilation, vaporiser schedule and thresholds
 */
export function simulate(setup: SimulationSetup): SimulationOutcome {
  if (!feedbackWarmed) {
    feedbackWarmed = true;
    // Same shape as the caller's setup; with no time to simulate the loop (and any observer) never runs.
    const empty: SimulationSetup = { ...setup, endMin: 0 };
    for (let call = 0; call < feedbackWarmCalls; call += 1) simulateRun(empty);
  }
  return simulateRun(setup);
}

/**
 * Share of each breath drawn as room air around a face mask: the part of the inspiratory flow
 * above the fresh gas flow. Inspiratory flow is taken as a half sine over an inspiration of half
 * the breath (I:E 1:1, assumption), so its peak is pi x the minute ventilation; with
 * r = FGF / peak below 1 the share above FGF is (2 sqrt(1 - r^2) - r (pi - 2 asin r)) / 2, and 0
 * once the fresh gas flow meets the peak.
 * @param freshGasMlMin fresh gas flow into the mask, mL/min, >= 0
 * @param minuteVentilationMlMin tidal volume x rate, mL/min, > 0
 * @returns share 0-1 of each breath that is room air
 */
export function maskEntrainedShare(freshGasMlMin: number, minuteVentilationMlMin: number): number {
  const peak = Math.PI * minuteVentilationMlMin;
  if (!(peak > 0)) return 0;
  const ratio = freshGasMlMin / peak;
  if (ratio >= 1) return 0;
  return (2 * Math.sqrt(1 - ratio * ratio) - ratio * (Math.PI - 2 * Math.asin(ratio))) / 2;
}

/**
 * Agent (mL) in the slice [fromMl, toMl] of a compartment's outflow in one phase when the
 * outflow is taken first from the compartment's start-of-phase gas (`heldMl` mL at fraction
 * `held`) and, beyond it, from the gas arriving in the phase at fraction `arriving` (plug order).
 */
function plugSliceMl(heldMl: number, held: number, arriving: number, fromMl: number, toMl: number): number {
  if (toMl <= heldMl) return (toMl - fromMl) * held;
  if (fromMl >= heldMl) return (toMl - fromMl) * arriving;
  return (heldMl - fromMl) * held + (toMl - heldMl) * arriving;
}

/**
 * Agent (mL) in the slice [fromMl, toMl] of a sequence of equal parcels of `parcelMl` mL whose
 * cumulative agent contents are `prefix` (prefix[j] = agent in the first j parcels).
 */
function parcelSliceMl(
  prefix: Float64Array,
  count: number,
  parcelMl: number,
  fromMl: number,
  toMl: number,
): number {
  return (
    cumulativeParcelMl(prefix, count, parcelMl, toMl) - cumulativeParcelMl(prefix, count, parcelMl, fromMl)
  );
}

function cumulativeParcelMl(prefix: Float64Array, count: number, parcelMl: number, atMl: number): number {
  if (atMl <= 0) return 0;
  const position = atMl / parcelMl;
  const whole = Math.min(count, Math.floor(position));
  const base = prefix[whole] as number;
  if (whole >= count) return base;
  return base + (position - whole) * ((prefix[whole + 1] as number) - base);
}

function simulateRun(setup: SimulationSetup): SimulationOutcome {
  const { gasPath, body, delivery, ventilation, schedule } = setup;
  const deadSpace = gasPath.trachealVolumeMl;
  const lungVolume = gasPath.lungVolumeMl;
  const posteriorVolume = gasPath.posteriorSacsMl;
  const anteriorVolume = gasPath.anteriorSacsMl;
  const pShare = gasPath.posteriorShare;
  const aShare = 1 - pShare;
  const bloodFlow = bodyBloodFlowMlMin(body);
  const bloodVolume = body.bloodVolumeMl;
  let fastestTissueRate = 0;
  for (const group of body.groups) {
    const rate = group.flowMlMin / (group.tissueBloodPartition * group.volumeMl);
    if (rate > fastestTissueRate) fastestTissueRate = rate;
  }
  // Exchange steps per minute that keep Q dt / V_blood and the fastest tissue's Qi dt / (lambda_i Vi)
  // at or below bodyStepBound (accuracy; the step itself is stable at any length).
  const stepsPerMin = Math.max(bloodFlow / bloodVolume, fastestTissueRate) / bodyStepBound;
  // The delivery in use; it changes only at a phase's start and at the end of its gap.
  const laterDeliveries = setup.laterDeliveries ?? [];
  const route = newDeliveryFactors(delivery, laterDeliveries);
  const mixedAtDeliveryEnd: number[] = [];
  // Copies of the delivery's values for the breath loop, refreshed when it changes.
  let nextChangeMin = route.nextChangeMin;
  let onBird = route.onBird;
  let mixed = route.mixed;
  let mixedVolume = route.mixedVolumeMl;
  let mask = route.mask;
  let maskVolume = route.maskVolumeMl;
  // Off the bird (the gap) an air-sac tube delivers nothing.
  let tube = onBird && route.tube;
  const mac = setup.macPct / 100;
  // The IPPV period running or next (undefined after the last), and the minute it ends.
  const ippvPeriods = ventilation.ippv ?? [];
  let ippvIndex = 0;
  let ippv = ippvPeriods[0];
  let ippvUntil = ippv?.untilMin ?? Number.POSITIVE_INFINITY;
  const restingTidal = ventilation.restingTidalVolumeMl;
  const restingRate = ventilation.restingBreathsPerMin;
  const depressionSlope = ventilation.depressionSlope;
  const depressionFloor = ventilation.depressionFloor;
  const rateShare = ventilation.rateShare ?? 0;
  const cardiacSlope = ventilation.cardiacSlope ?? 0;
  const cardiacFloor = ventilation.cardiacFloor ?? 1;
  // Depressed rate fraction of the last minute-ventilation fraction (the power is taken only when it changes).
  let splitFor = -1;
  let rateFraction = 1;

  const initial = setup.initialGasFraction ?? 0;
  let trachea = initial;
  let posterior = initial;
  let lung = initial;
  let anterior = initial;
  let mixedGas = mixed ? initial : 0;
  let maskGas = initial;
  let lastExhaled = initial;
  const state = new Float64Array(bodyState.length);
  let prefix = new Float64Array(17);

  let deliveredToBird = 0;
  let exhaled = 0;
  let uptake = 0;
  let vaporiserOutput = 0;

  const endMin = setup.endMin;
  const sampleInterval = setup.sampleIntervalMin;
  const sampleCount = Math.floor(endMin / sampleInterval + 1e-9) + 1;
  const timeline: SimulationTimeline = {
    timeMin: [],
    inspiredPct: [],
    tracheaPct: [],
    posteriorSacsPct: [],
    parabronchialPct: [],
    anteriorSacsPct: [],
    arterialPct: [],
    brainPct: [],
    musclePct: [],
    fatPct: [],
  };
  let sampled = 0;
  let nextSample = 0;

  const offMin = setup.offMin;
  const milestones = newBrainMilestones(setup);
  let peakInspired = 0;
  let lowestVentilation = 1;
  let atOff: { tidalVolumeMl: number; breathsPerMin: number } | null = null;
  const observer = setup.onPhase;
  const snapshot: PhaseSnapshot = {
    phase: 'inspiration',
    breathIndex: 0,
    timeMin: 0,
    inspiredFraction: 0,
    trachea: 0,
    posterior: 0,
    lung: 0,
    anterior: 0,
    arterial: 0,
    brain: 0,
    exhaledMl: 0,
    posteriorContentMl: 0,
    lungContentMl: 0,
    anteriorContentMl: 0,
    tracheaContentMl: 0,
  };
  let stopRequested = false;

  // Factors kept while the breath stays the same.
  const factors = newBreathFactors();
  let scheduleIndex = 0;

  let time = 0;
  let breath = 0;
  while (time < endMin - 1e-12 && !stopRequested) {
    if (time >= nextChangeMin - 1e-9) {
      while (time >= route.nextChangeMin - 1e-9) {
        const leaving = route.mixed ? mixedGas : 0;
        if (switchDelivery(route, laterDeliveries)) {
          // The bird left a system: note its chamber or circle content; the next system starts empty.
          mixedAtDeliveryEnd.push(leaving);
          mixedGas = 0;
          maskGas = 0;
        }
      }
      factors.tidalMl = -1;
      nextChangeMin = route.nextChangeMin;
      onBird = route.onBird;
      mixed = route.mixed;
      mixedVolume = route.mixedVolumeMl;
      mask = route.mask;
      maskVolume = route.maskVolumeMl;
      tube = onBird && route.tube;
    }
    const brainBefore = state[1] as number;
    breathStartBody[0] = state[bodyState.arterial] as number;
    breathStartBody[1] = brainBefore;
    breathStartBody[2] = state[bodyState.muscle] as number;
    breathStartBody[3] = state[bodyState.fat] as number;
    let tidal: number;
    let rate: number;
    while (ippv !== undefined && time >= ippvUntil) {
      ippvIndex += 1;
      ippv = ippvPeriods[ippvIndex];
      ippvUntil = ippv?.untilMin ?? Number.POSITIVE_INFINITY;
    }
    if (ippv !== undefined && time >= ippv.fromMin) {
      tidal = ippv.tidalVolumeMl;
      rate = ippv.breathsPerMin;
    } else {
      const depression = Math.max(depressionFloor, 1 - (depressionSlope * brainBefore) / mac);
      const depressionUsed = Math.round(depression / depressionQuantum) * depressionQuantum;
      if (depressionUsed < lowestVentilation) lowestVentilation = depressionUsed;
      if (depressionUsed !== splitFor) {
        splitFor = depressionUsed;
        rateFraction = rateShare > 0 ? depressionUsed ** rateShare : 1;
      }
      tidal = (restingTidal * depressionUsed) / rateFraction;
      rate = restingRate * rateFraction;
    }
    // Depressed cardiac output, on the same grid; it scales every group's flow alike.
    const cardiac =
      cardiacSlope > 0
        ? Math.round(Math.max(cardiacFloor, 1 - (cardiacSlope * brainBefore) / mac) / depressionQuantum) *
          depressionQuantum
        : 1;
    if (offMin !== null && atOff === null && time >= offMin)
      atOff = { tidalVolumeMl: tidal, breathsPerMin: rate };
    if (tidal !== factors.tidalMl || rate !== factors.breathsPerMin || cardiac !== factors.flowScale) {
      setBreathFactors(factors, setup, route, tidal, rate, stepsPerMin, cardiac);
      if (prefix.length < factors.substeps + 1) prefix = new Float64Array(factors.substeps + 1);
    }
    const {
      substeps,
      phaseMin,
      tubePerPhase,
      inspiratoryLungFlow,
      expiratoryLungFlow,
      freshDecay,
      maskDecay,
      freshShare,
      entrained,
      inspiratory: inspiratoryFactors,
      expiratory: expiratoryFactors,
    } = factors;
    while (scheduleIndex + 1 < schedule.length && (schedule[scheduleIndex + 1] as ScheduleStep).atMin <= time)
      scheduleIndex += 1;
    const currentStep = schedule[scheduleIndex];
    const fresh = currentStep !== undefined && currentStep.atMin <= time ? currentStep.vaporPct / 100 : 0;
    // The flowmeter sets the carrier: the vaporiser adds c / (1 - c) of it as vapour (as in consumption.ts).
    const vapourPerCarrier = fresh < 1 ? fresh / (1 - fresh) : fresh;

    // Source gas offered at the airway opening during this inspiration (off the bird: what the
    // system holds or is fed, which the bird does not breathe).
    const source = mixed ? mixedGas : onBird ? freshShare * fresh + (1 - freshShare) * lastExhaled : fresh;
    let inspired: number;
    if (tube || !onBird) {
      // An air-sac tube: the trachea breathes room air; in the gap the bird breathes room air.
      inspired = 0;
    } else if (mask) {
      const fromMask = tidal < maskVolume ? tidal : maskVolume;
      inspired = (1 - entrained) * ((fromMask * maskGas + (tidal - fromMask) * source) / tidal);
    } else {
      inspired = source;
    }
    const tubeGas = tube ? (mixed ? mixedGas : fresh) : 0;
    // With an air-sac tube the gas delivered to the bird is the tube gas; the trachea breathes room air.
    const delivered = tube ? tubeGas : inspired;
    if (delivered > peakInspired) peakInspired = delivered;

    // Inspiration. The trachea sends its old gas, then inspired gas, to the posterior sacs.
    let toPosterior: number;
    if (tidal >= deadSpace) {
      toPosterior = deadSpace * trachea + (tidal - deadSpace) * inspired;
      trachea = inspired;
    } else {
      toPosterior = tidal * trachea;
      trachea += (tidal * (inspired - trachea)) / deadSpace;
    }
    deliveredToBird += tidal * inspired + tubePerPhase * tubeGas;
    let arriving = (toPosterior + tubePerPhase * tubeGas) / (tidal + tubePerPhase);
    let lungOut = exchangePhase(
      state,
      inspiratoryFactors,
      substeps,
      prefix,
      posteriorVolume,
      posterior,
      arriving,
      inspiratoryLungFlow,
      lung,
      lungVolume,
    );
    uptake += phaseResult[0] as number;
    posterior =
      (posteriorVolume * posterior + toPosterior + tubePerPhase * tubeGas - (phaseResult[1] as number)) /
      (posteriorVolume + pShare * tidal);
    lung = phaseResult[2] as number;
    // The anterior sacs fill with the lung's outflow; tube flow leaves the lung to the room.
    let exhaledThisPhase = tubePerPhase > 0 ? (lungOut * tubePerPhase) / inspiratoryLungFlow : 0;
    anterior = (anteriorVolume * anterior + lungOut - exhaledThisPhase) / (anteriorVolume + aShare * tidal);
    exhaled += exhaledThisPhase;
    vaporiserOutput += route.freshFlowMlMin * phaseMin * vapourPerCarrier;
    if (mixed) mixedGas = fresh + (mixedGas - fresh) * freshDecay;
    if (mask && onBird)
      maskGas = tidal >= maskVolume ? source : ((maskVolume - tidal) * maskGas + tidal * source) / maskVolume;
    time += phaseMin;
    if (observer !== undefined) {
      fillSnapshot(
        snapshot,
        'inspiration',
        breath,
        time,
        inspired,
        exhaledThisPhase,
        trachea,
        posterior,
        lung,
        anterior,
        state,
      );
      setContents(snapshot, gasPath, tidal);
      if (observer(snapshot) === true) stopRequested = true;
    }

    // Expiration: the posterior sacs send p VT (and the tube flow) through the lung.
    const posteriorFull = posteriorVolume + pShare * tidal;
    arriving = tubeGas;
    deliveredToBird += tubePerPhase * tubeGas;
    lungOut = exchangePhase(
      state,
      expiratoryFactors,
      substeps,
      prefix,
      posteriorFull,
      posterior,
      arriving,
      expiratoryLungFlow,
      lung,
      lungVolume,
    );
    uptake += phaseResult[0] as number;
    posterior =
      (posteriorFull * posterior + tubePerPhase * tubeGas - (phaseResult[1] as number)) / posteriorVolume;
    lung = phaseResult[2] as number;
    // Lung outflow (p VT) and the shrinking anterior sacs (a VT) leave through the trachea.
    const lungToRoom = tubePerPhase > 0 ? (lungOut * tubePerPhase) / expiratoryLungFlow : 0;
    const lungToTrachea = lungOut - lungToRoom;
    const expiredMix = lungToTrachea + aShare * tidal * anterior;
    const expiredFraction = tidal > 0 ? expiredMix / tidal : 0;
    let openingOut: number;
    if (tidal >= deadSpace) {
      openingOut = deadSpace * trachea + (tidal - deadSpace) * expiredFraction;
      trachea = expiredFraction;
    } else {
      openingOut = tidal * trachea;
      trachea += (tidal * (expiredFraction - trachea)) / deadSpace;
    }
    exhaledThisPhase = openingOut + lungToRoom;
    exhaled += exhaledThisPhase;
    if (tidal > 0) lastExhaled = openingOut / tidal;
    vaporiserOutput += route.freshFlowMlMin * phaseMin * vapourPerCarrier;
    if (mixed) {
      // Exhaled gas returns to the chamber or circle and displaces the same volume to the vent.
      if (onBird && !tube)
        mixedGas =
          tidal >= mixedVolume
            ? openingOut / tidal
            : (mixedGas * (mixedVolume - tidal) + openingOut) / mixedVolume;
      mixedGas = fresh + (mixedGas - fresh) * freshDecay;
    }
    if (mask) {
      if (onBird)
        maskGas =
          tidal >= maskVolume
            ? expiredFraction
            : ((maskVolume - tidal) * maskGas + tidal * expiredFraction) / maskVolume;
      maskGas = source + (maskGas - source) * maskDecay;
    }
    time += phaseMin;
    breath += 1;
    if (observer !== undefined) {
      fillSnapshot(
        snapshot,
        'expiration',
        breath - 1,
        time,
        inspired,
        exhaledThisPhase,
        trachea,
        posterior,
        lung,
        anterior,
        state,
      );
      setContents(snapshot, gasPath, 0);
      if (observer(snapshot) === true) stopRequested = true;
    }

    trackBrainMilestones(milestones, time - 2 * phaseMin, time, brainBefore, state[1] as number, mixedGas);
    while (sampled < sampleCount && time >= nextSample - 1e-9) {
      // Body channels at the sample time itself (linear within the breath), so that plans with
      // different breaths are compared at the same instant; gas channels at the breath's end.
      const breathStart = time - 2 * phaseMin;
      const within = Math.min(1, Math.max(0, (nextSample - breathStart) / (2 * phaseMin)));
      recordSample(timeline, nextSample, delivered, trachea, posterior, lung, anterior, state, within);
      sampled += 1;
      nextSample = sampled * sampleInterval;
    }
  }
  while (sampled < sampleCount) {
    recordSample(timeline, nextSample, 0, trachea, posterior, lung, anterior, state, 1);
    sampled += 1;
    nextSample = sampled * sampleInterval;
  }
  mixedAtDeliveryEnd.push(route.mixed ? mixedGas : 0);
  while (mixedAtDeliveryEnd.length < laterDeliveries.length + 1) mixedAtDeliveryEnd.push(0);
  const gasStored =
    trachea * deadSpace + posterior * posteriorVolume + lung * lungVolume + anterior * anteriorVolume;
  return {
    timeline,
    inductionMin: milestones.inductionMin,
    recoveryMin: offMin === null ? null : milestones.recoveryMin,
    milestoneMin: milestones.crossings,
    peakBrainMacMultiple: milestones.peakBrainMac,
    peakInspiredPct: peakInspired * 100,
    lowestVentilationFraction: lowestVentilation,
    breaths: breath,
    totals: {
      deliveredToBirdMl: deliveredToBird,
      exhaledMl: exhaled,
      uptakeMl: uptake,
      gasStoredMl: gasStored,
      bodyStoredMl: bodyContentMl(body, state),
      vaporiserOutputMl: vaporiserOutput,
    },
    atOff,
    mixedPctAtInduction: (milestones.mixedAtInduction >= 0 ? milestones.mixedAtInduction : mixedGas) * 100,
    mixedPctAtDeliveryEnd: mixedAtDeliveryEnd.map((fraction) => fraction * 100),
  };
}

/**
 * The delivery in use and what follows from it, kept in one object that changes only at a
 * phase's start (the bird leaves the system: room air) and at the end of its gap (the bird is on
 * the new system), never within a breath.
 */
type DeliveryFactors = {
  delivery: DeliverySetup;
  /** 0 for the first delivery, k for the k-th later one. */
  index: number;
  /** False during a phase's gap: the bird breathes room air while the new system fills. */
  onBird: boolean;
  mixed: boolean;
  mask: boolean;
  tube: boolean;
  freshFlowMlMin: number;
  mixedVolumeMl: number;
  maskVolumeMl: number;
  /** Minute of the next change: the end of this gap, or the start of the next phase. */
  nextChangeMin: number;
};

function newDeliveryFactors(first: DeliverySetup, later: readonly TimedDelivery[]): DeliveryFactors {
  const factors: DeliveryFactors = {
    delivery: first,
    index: 0,
    onBird: true,
    mixed: false,
    mask: false,
    tube: false,
    freshFlowMlMin: 0,
    mixedVolumeMl: 1,
    maskVolumeMl: 1e-9,
    nextChangeMin: Number.POSITIVE_INFINITY,
  };
  setDelivery(factors, first, 0, true, later[0]?.startMin ?? Number.POSITIVE_INFINITY);
  return factors;
}

function setDelivery(
  factors: DeliveryFactors,
  delivery: DeliverySetup,
  index: number,
  onBird: boolean,
  nextChangeMin: number,
): void {
  factors.delivery = delivery;
  factors.index = index;
  factors.onBird = onBird;
  factors.mixed = delivery.source === 'mixed';
  factors.mask = delivery.interface === 'mask';
  factors.tube = delivery.interface === 'airSacTube';
  factors.freshFlowMlMin = delivery.freshGasMlMin;
  factors.mixedVolumeMl = delivery.mixedVolumeMl;
  factors.maskVolumeMl = Math.max(delivery.maskDeadSpaceMl, 1e-9);
  factors.nextChangeMin = nextChangeMin;
}

/**
 * Moves `factors` to the next change: the bird goes onto the system at the end of a gap, or
 * leaves it for the next delivery's gap (which may be empty, then the next call ends it).
 * @returns true when the bird left a system (its gas is then released and the next starts empty)
 */
function switchDelivery(factors: DeliveryFactors, later: readonly TimedDelivery[]): boolean {
  if (!factors.onBird) {
    factors.onBird = true;
    factors.nextChangeMin = later[factors.index]?.startMin ?? Number.POSITIVE_INFINITY;
    return false;
  }
  const next = later[factors.index];
  if (next === undefined) {
    factors.nextChangeMin = Number.POSITIVE_INFINITY;
    return false;
  }
  setDelivery(factors, next.delivery, factors.index + 1, false, next.deliveryFromMin);
  return true;
}

/**
 * What changes only when the breath does (tidal volume or rate): phase length, exchange
 * sub-steps and their body factors, the circuit's decays and shares. Kept in one object that the
 * run updates in place, so a steady breath costs nothing.
 */
type BreathFactors = {
  tidalMl: number;
  breathsPerMin: number;
  /** Cardiac output as a fraction of the body model's (depression). */
  flowScale: number;
  phaseMin: number;
  substeps: number;
  tubePerPhase: number;
  inspiratoryLungFlow: number;
  expiratoryLungFlow: number;
  freshDecay: number;
  maskDecay: number;
  freshShare: number;
  entrained: number;
  readonly inspiratory: Float64Array;
  readonly expiratory: Float64Array;
};

function newBreathFactors(): BreathFactors {
  return {
    tidalMl: -1,
    breathsPerMin: -1,
    flowScale: -1,
    phaseMin: 0,
    substeps: 1,
    tubePerPhase: 0,
    inspiratoryLungFlow: 0,
    expiratoryLungFlow: 0,
    freshDecay: 1,
    maskDecay: 1,
    freshShare: 1,
    entrained: 0,
    inspiratory: new Float64Array(bodyExchangeFactorLength),
    expiratory: new Float64Array(bodyExchangeFactorLength),
  };
}

/**
 * Recomputes `factors` for a breath of `tidal` mL at `rate` /min and a cardiac output of
 * `flowScale` times the body model's, with at least `stepsPerMin` exchange steps per minute (the
 * accuracy bound, set at the undepressed flows, so it holds as they fall) times the setup's
 * sub-step refinement.
 */
function setBreathFactors(
  factors: BreathFactors,
  setup: SimulationSetup,
  route: DeliveryFactors,
  tidal: number,
  rate: number,
  stepsPerMin: number,
  flowScale: number,
): void {
  const { body, gasPath } = setup;
  const delivery = route.delivery;
  const freshFlow = delivery.freshGasMlMin;
  const phaseMin = 0.5 / rate;
  const refinement = Math.max(1, Math.round(setup.substepRefinement ?? 1));
  const substeps = refinement * Math.max(1, Math.ceil(phaseMin * stepsPerMin - 1e-9));
  // In a gap the tube is not yet connected and the mask not yet on: no tube flow, no room air drawn past a mask.
  const tubePerPhase = route.onBird && route.tube ? freshFlow * phaseMin : 0;
  const stepMin = phaseMin / substeps;
  factors.tidalMl = tidal;
  factors.breathsPerMin = rate;
  factors.flowScale = flowScale;
  factors.phaseMin = phaseMin;
  factors.substeps = substeps;
  factors.tubePerPhase = tubePerPhase;
  factors.inspiratoryLungFlow = (1 - gasPath.posteriorShare) * tidal + tubePerPhase;
  factors.expiratoryLungFlow = gasPath.posteriorShare * tidal + tubePerPhase;
  bodyExchangeFactors(body, factors.inspiratoryLungFlow / substeps, stepMin, factors.inspiratory, flowScale);
  bodyExchangeFactors(body, factors.expiratoryLungFlow / substeps, stepMin, factors.expiratory, flowScale);
  const mask = delivery.interface === 'mask';
  factors.freshDecay =
    delivery.source === 'mixed' ? Math.exp((-freshFlow * phaseMin) / delivery.mixedVolumeMl) : 1;
  factors.maskDecay = mask ? Math.exp((-freshFlow * phaseMin) / Math.max(delivery.maskDeadSpaceMl, 1e-9)) : 1;
  factors.freshShare = Math.min(1, freshFlow / (delivery.rebreathingFlowMultiple * tidal * rate));
  factors.entrained = mask && route.onBird ? maskEntrainedShare(freshFlow, tidal * rate) : 0;
}

/** The brain's crossings of the milestone levels, followed breath by breath. */
type BrainMilestones = {
  readonly mac: number;
  readonly inductionLevel: number;
  readonly recoveryLevel: number;
  readonly offMin: number | null;
  readonly levels: readonly MilestoneLevel[];
  readonly crossings: (number | null)[];
  inductionMin: number | null;
  recoveryMin: number | null;
  /** Deepest brain level so far, multiple of MAC. */
  peakBrainMac: number;
  /** Chamber or circle fraction when induction was reached; -1 before. */
  mixedAtInduction: number;
};

function newBrainMilestones(setup: SimulationSetup): BrainMilestones {
  const levels = setup.milestoneBrainPct ?? [];
  return {
    mac: setup.macPct / 100,
    inductionLevel: setup.inductionBrainPct / 100,
    recoveryLevel: setup.recoveryBrainPct / 100,
    offMin: setup.offMin,
    levels,
    crossings: levels.map(() => null),
    inductionMin: null,
    recoveryMin: null,
    peakBrainMac: 0,
    mixedAtInduction: -1,
  };
}

/**
 * After a breath from `breathStart` to `time` (min) that took the brain from `brainBefore` to
 * `brain` (fractions): records the peak and every level crossed, interpolated within the breath.
 * Recovery levels count only after the vaporiser is off and for a brain that was that deep.
 */
function trackBrainMilestones(
  tracker: BrainMilestones,
  breathStart: number,
  time: number,
  brainBefore: number,
  brain: number,
  mixedGas: number,
): void {
  const { mac, inductionLevel, recoveryLevel, offMin } = tracker;
  if (brain / mac > tracker.peakBrainMac) tracker.peakBrainMac = brain / mac;
  const peak = tracker.peakBrainMac * mac;
  if (tracker.inductionMin === null && brain >= inductionLevel && inductionLevel > 0) {
    tracker.inductionMin = interpolateCrossing(breathStart, brainBefore, time, brain, inductionLevel);
    tracker.mixedAtInduction = mixedGas;
  }
  if (
    offMin !== null &&
    tracker.recoveryMin === null &&
    time >= offMin &&
    brain < recoveryLevel &&
    peak >= recoveryLevel
  ) {
    const crossing =
      brainBefore >= recoveryLevel
        ? interpolateCrossing(breathStart, brainBefore, time, brain, recoveryLevel)
        : time;
    tracker.recoveryMin = Math.max(0, crossing - offMin);
  }
  const { levels, crossings } = tracker;
  for (let index = 0; index < levels.length; index += 1) {
    if (crossings[index] !== null) continue;
    const level = levels[index] as MilestoneLevel;
    const at = level.brainPct / 100;
    if (level.direction === 'up') {
      if (brain >= at && at > 0)
        crossings[index] = interpolateCrossing(breathStart, brainBefore, time, brain, at);
    } else if (offMin !== null && time >= offMin && brain < at && peak >= at) {
      const crossing =
        brainBefore >= at ? interpolateCrossing(breathStart, brainBefore, time, brain, at) : time;
      crossings[index] = Math.max(0, crossing - offMin);
    }
  }
}

/**
 * Side results of exchangePhase: [agent handed to blood (mL), agent that left the sacs (mL), lung
 * fraction at the end]. A typed array, because doubles kept in module-level variables are boxed and
 * every write would allocate.
 */
const phaseResult = new Float64Array(3);

/** Arterial, brain, muscle and fat fractions at the start of the current breath (for the samples). */
const breathStartBody = new Float64Array(4);

/**
 * One phase of gas through the parabronchial lung. `flowMl` mL leave the upstream sacs
 * (`sacMl` mL at fraction `sac` at the start of the phase, topped up by gas at `arriving`) in
 * plug order and cross the lung in `substeps` equal parcels, each meeting the blood of one
 * exchange step (bodyExchangeStep). The lung (`lungMl` at `lung`) sends the same volume on in plug
 * order: first its start-of-phase gas, then the earliest parcels. Writes the agent handed to blood,
 * the agent that left the sacs and the lung fraction at the end into phaseResult.
 * @returns agent (mL) that left the lung outlet in the phase
 */
function exchangePhase(
  state: Float64Array,
  factors: Float64Array,
  substeps: number,
  prefix: Float64Array,
  sacMl: number,
  sac: number,
  arriving: number,
  flowMl: number,
  lung: number,
  lungMl: number,
): number {
  const parcelMl = flowMl / substeps;
  let inletTotal = 0;
  let endTotal = 0;
  prefix[0] = 0;
  for (let sub = 0; sub < substeps; sub += 1) {
    const inletMl = plugSliceMl(sacMl, sac, arriving, sub * parcelMl, (sub + 1) * parcelMl);
    const inlet = parcelMl > 0 ? inletMl / parcelMl : 0;
    const endGas = bodyExchangeStep(state, factors, inlet);
    inletTotal += inletMl;
    endTotal += parcelMl * endGas;
    prefix[sub + 1] = endTotal;
  }
  phaseResult[0] = inletTotal - endTotal;
  phaseResult[1] = inletTotal;
  if (flowMl <= 0) {
    phaseResult[2] = lung;
    return 0;
  }
  if (flowMl <= lungMl) {
    phaseResult[2] = ((lungMl - flowMl) * lung + endTotal) / lungMl;
    return flowMl * lung;
  }
  const passedMl = flowMl - lungMl;
  phaseResult[2] = parcelSliceMl(prefix, substeps, parcelMl, passedMl, flowMl) / lungMl;
  return lungMl * lung + parcelSliceMl(prefix, substeps, parcelMl, 0, passedMl);
}

function fillSnapshot(
  target: PhaseSnapshot,
  phase: 'inspiration' | 'expiration',
  breathIndex: number,
  timeMin: number,
  inspiredFraction: number,
  exhaledMl: number,
  trachea: number,
  posterior: number,
  lung: number,
  anterior: number,
  body: Float64Array,
): void {
  target.phase = phase;
  target.breathIndex = breathIndex;
  target.timeMin = timeMin;
  target.inspiredFraction = inspiredFraction;
  target.exhaledMl = exhaledMl;
  target.trachea = trachea;
  target.posterior = posterior;
  target.lung = lung;
  target.anterior = anterior;
  target.arterial = body[bodyState.arterial] as number;
  target.brain = body[bodyState.vesselRich] as number;
}

function setContents(target: PhaseSnapshot, gasPath: GasPath, expansionMl: number): void {
  target.tracheaContentMl = target.trachea * gasPath.trachealVolumeMl;
  target.lungContentMl = target.lung * gasPath.lungVolumeMl;
  target.posteriorContentMl =
    target.posterior * (gasPath.posteriorSacsMl + gasPath.posteriorShare * expansionMl);
  target.anteriorContentMl =
    target.anterior * (gasPath.anteriorSacsMl + (1 - gasPath.posteriorShare) * expansionMl);
}

function recordSample(
  timeline: SimulationTimeline,
  atMin: number,
  inspired: number,
  trachea: number,
  posterior: number,
  lung: number,
  anterior: number,
  body: Float64Array,
  within: number,
): void {
  timeline.timeMin.push(Math.round(atMin * 1e6) / 1e6);
  timeline.inspiredPct.push(inspired * 100);
  timeline.tracheaPct.push(trachea * 100);
  timeline.posteriorSacsPct.push(posterior * 100);
  timeline.parabronchialPct.push(lung * 100);
  timeline.anteriorSacsPct.push(anterior * 100);
  const start = breathStartBody;
  const at = (index: number, channel: number): number =>
    ((start[index] as number) + ((body[channel] as number) - (start[index] as number)) * within) * 100;
  timeline.arterialPct.push(at(0, bodyState.arterial));
  timeline.brainPct.push(at(1, bodyState.vesselRich));
  timeline.musclePct.push(at(2, bodyState.muscle));
  timeline.fatPct.push(at(3, bodyState.fat));
}

function interpolateCrossing(t0: number, v0: number, t1: number, v1: number, level: number): number {
  if (v1 === v0) return t1;
  const fraction = (level - v0) / (v1 - v0);
  return t0 + Math.min(1, Math.max(0, fraction)) * (t1 - t0);
}
