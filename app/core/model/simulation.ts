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
 * Within one phase a compartment's outflow has its start-of-phase composition (gas that arrives
 * in a phase does not leave in the same phase). With these rules alone a parcel inspired in one
 * breath reaches the lung on the next expiration and leaves the airway on the expiration after:
 * the two-cycle passage is a consequence, not an input. When a phase moves more gas through the
 * lung than the lung holds, the phase is cut into equal sub-steps.
 *
 * Exchange: gas entering the lung in a phase meets the blood that flows in the same phase, by the
 * Piiper & Scheid cross-current model with k = lambda Q dt / V_in.
 */
import { bodyBloodFlowMlMin, bodyContentMl, type BodyModel } from './body-uptake.js';

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
  readonly maskLeakFraction: number;
};

export type VentilationSetup = {
  readonly restingTidalVolumeMl: number;
  readonly restingBreathsPerMin: number;
  /** Fall in spontaneous tidal volume per brain MAC multiple. */
  readonly depressionSlope: number;
  /** Lowest fraction of resting tidal volume kept. */
  readonly depressionFloor: number;
  readonly ippv: {
    readonly fromMin: number;
    readonly breathsPerMin: number;
    readonly tidalVolumeMl: number;
  } | null;
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
  readonly delivery: DeliverySetup;
  readonly ventilation: VentilationSetup;
  readonly schedule: readonly ScheduleStep[];
  readonly endMin: number;
  readonly macPct: number;
  /** Brain partial pressure (vol %) that counts as induction. */
  readonly inductionBrainPct: number;
  /** Brain partial pressure (vol %) below which the bird is taken to be recovering. */
  readonly recoveryBrainPct: number;
  /** Time the vaporiser is turned off for good, or null. */
  readonly offMin: number | null;
  readonly sampleIntervalMin: number;
  /** Starting fraction in every gas space (washout runs); body starts empty. */
  readonly initialGasFraction?: number;
  /** Observer called after each phase; returning true ends the run early. */
  readonly onPhase?: (snapshot: PhaseSnapshot) => unknown;
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
  /** Put out by the vaporiser: fresh gas flow x dial setting over the run. */
  readonly vaporiserOutputMl: number;
};

export type SimulationOutcome = {
  readonly timeline: SimulationTimeline;
  readonly inductionMin: number | null;
  readonly recoveryMin: number | null;
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
  /** Breath-averaged inspired fraction on a fixed grid, for the uncertainty run. */
  readonly inspiredGrid: Float64Array;
  readonly inspiredGridStepMin: number;
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

/** Step of the inspired-concentration grid kept for the uncertainty run, minutes. */
export const inspiredGridStepMin = 0.05;

/**
 * Most sub-steps per phase. Beyond it (tube flows or measured tidal volumes many times the lung
 * volume) the sacs mix before they empty and the lung washes out exponentially, which stays
 * stable and conserves agent at any flow but no longer keeps the start-of-phase rule.
 */
export const maxSubsteps = 16;

/** Grid of the depression factor: spontaneous tidal volume moves in steps of 0.1 % of resting. */
export const depressionQuantum = 0.001;

/** Calls of the simulation before the JavaScript engine keeps type feedback for it (V8: 8). */
const feedbackWarmCalls = 9;
let feedbackWarmed = false;

/**
 * Runs the breath-resolved simulation of one plan.
 * Deterministic; allocates only the timeline arrays and two small typed arrays. Spontaneous
 * tidal volume follows the depression rule rounded to 0.1 % of resting (depressionQuantum), a
 * monotone step function of the brain partial pressure, so that exchange factors are recomputed
 * only when the breath changes.
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

function simulateRun(setup: SimulationSetup): SimulationOutcome {
  const { gasPath, body, delivery, ventilation, schedule } = setup;
  const deadSpace = gasPath.trachealVolumeMl;
  const lungVolume = gasPath.lungVolumeMl;
  const posteriorVolume = gasPath.posteriorSacsMl;
  const anteriorVolume = gasPath.anteriorSacsMl;
  const pShare = gasPath.posteriorShare;
  const aShare = 1 - pShare;
  const lambda = body.bloodGasPartition;
  const group0 = body.groups[0];
  const group1 = body.groups[1];
  const group2 = body.groups[2];
  const q0 = group0.flowMlMin;
  const q1 = group1.flowMlMin;
  const q2 = group2.flowMlMin;
  const capacity0 = group0.tissueBloodPartition * group0.volumeMl;
  const capacity1 = group1.tissueBloodPartition * group1.volumeMl;
  const capacity2 = group2.tissueBloodPartition * group2.volumeMl;
  const bloodFlow = bodyBloodFlowMlMin(body);
  const bloodVolume = body.bloodVolumeMl;
  const freshFlow = delivery.freshGasMlMin;
  const mixed = delivery.source === 'mixed';
  const mixedVolume = delivery.mixedVolumeMl;
  const mask = delivery.interface === 'mask';
  const tube = delivery.interface === 'airSacTube';
  const maskVolume = Math.max(delivery.maskDeadSpaceMl, 1e-9);
  const leak = mask ? delivery.maskLeakFraction : 0;
  const rebreathingMultiple = delivery.rebreathingFlowMultiple;
  const mac = setup.macPct / 100;
  const ippv = ventilation.ippv;
  const ippvFrom = ippv === null ? Number.POSITIVE_INFINITY : ippv.fromMin;
  const restingTidal = ventilation.restingTidalVolumeMl;
  const restingRate = ventilation.restingBreathsPerMin;
  const depressionSlope = ventilation.depressionSlope;
  const depressionFloor = ventilation.depressionFloor;

  const initial = setup.initialGasFraction ?? 0;
  let trachea = initial;
  let posterior = initial;
  let lung = initial;
  let anterior = initial;
  let mixedGas = mixed ? initial : 0;
  let maskGas = initial;
  let lastExhaled = initial;
  let arterial = 0;
  let venous = 0;
  let brain = 0;
  let muscle = 0;
  let fat = 0;

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
  const gridLength = Math.ceil(endMin / inspiredGridStepMin) + 1;
  const inspiredGrid = new Float64Array(gridLength);
  const gridWeight = new Float64Array(gridLength);

  let inductionMin: number | null = null;
  let recoveryMin: number | null = null;
  let peakBrain = 0;
  let peakInspired = 0;
  let lowestVentilation = 1;
  let atOff: { tidalVolumeMl: number; breathsPerMin: number } | null = null;
  let mixedAtInduction = -1;
  const inductionLevel = setup.inductionBrainPct / 100;
  const recoveryLevel = setup.recoveryBrainPct / 100;
  const offMin = setup.offMin;
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

  // Factors cached while the breath stays the same.
  let cachedTidal = -1;
  let cachedRate = -1;
  let substeps = 1;
  let stepMin = 0;
  let phaseMin = 0;
  let stepTidal = 0;
  let stepTube = 0;
  let decay0 = 1;
  let decay1 = 1;
  let decay2 = 1;
  let inspiratoryLungFlow = 0;
  let expiratoryLungFlow = 0;
  let inspiratoryEndFactor = 1;
  let inspiratoryArterialFactor = 1;
  let expiratoryEndFactor = 1;
  let expiratoryArterialFactor = 1;
  let freshDecay = 1;
  let maskDecay = 1;
  let freshShare = 1;
  let overflow = false;
  let inspiratoryLungWash = 1;
  let expiratoryLungWash = 1;
  let scheduleIndex = 0;

  let time = 0;
  let breath = 0;
  while (time < endMin - 1e-12 && !stopRequested) {
    const brainBefore = brain;
    let tidal: number;
    let rate: number;
    if (time >= ippvFrom && ippv !== null) {
      tidal = ippv.tidalVolumeMl;
      rate = ippv.breathsPerMin;
    } else {
      const depression = Math.max(depressionFloor, 1 - (depressionSlope * brainBefore) / mac);
      const depressionUsed = Math.round(depression / depressionQuantum) * depressionQuantum;
      if (depressionUsed < lowestVentilation) lowestVentilation = depressionUsed;
      tidal = restingTidal * depressionUsed;
      rate = restingRate;
    }
    if (offMin !== null && atOff === null && time >= offMin)
      atOff = { tidalVolumeMl: tidal, breathsPerMin: rate };
    if (tidal !== cachedTidal || rate !== cachedRate) {
      cachedTidal = tidal;
      cachedRate = rate;
      phaseMin = 0.5 / rate;
      const tubeFlowPerPhase = tube ? freshFlow * phaseMin : 0;
      const needed = Math.max(
        1,
        Math.ceil((Math.max(aShare, pShare) * tidal + tubeFlowPerPhase) / lungVolume - 1e-12),
      );
      overflow = needed > maxSubsteps;
      substeps = overflow ? maxSubsteps : needed;
      stepMin = phaseMin / substeps;
      stepTidal = tidal / substeps;
      stepTube = tubeFlowPerPhase / substeps;
      decay0 = Math.exp((-q0 * stepMin) / capacity0);
      decay1 = Math.exp((-q1 * stepMin) / capacity1);
      decay2 = Math.exp((-q2 * stepMin) / capacity2);
      const bloodPerStep = lambda * bloodFlow * stepMin;
      inspiratoryLungFlow = aShare * stepTidal + stepTube;
      expiratoryLungFlow = pShare * stepTidal + stepTube;
      inspiratoryEndFactor = crossCurrentEndFactor(bloodPerStep, inspiratoryLungFlow);
      inspiratoryArterialFactor = crossCurrentArterialFactor(bloodPerStep, inspiratoryLungFlow);
      expiratoryEndFactor = crossCurrentEndFactor(bloodPerStep, expiratoryLungFlow);
      expiratoryArterialFactor = crossCurrentArterialFactor(bloodPerStep, expiratoryLungFlow);
      inspiratoryLungWash = Math.exp(-inspiratoryLungFlow / lungVolume);
      expiratoryLungWash = Math.exp(-expiratoryLungFlow / lungVolume);
      freshDecay = mixed ? Math.exp((-freshFlow * phaseMin) / mixedVolume) : 1;
      maskDecay = mask ? Math.exp((-freshFlow * phaseMin) / maskVolume) : 1;
      freshShare = Math.min(1, freshFlow / (rebreathingMultiple * tidal * rate));
    }
    while (scheduleIndex + 1 < schedule.length && (schedule[scheduleIndex + 1] as ScheduleStep).atMin <= time)
      scheduleIndex += 1;
    const currentStep = schedule[scheduleIndex];
    const fresh = currentStep !== undefined && currentStep.atMin <= time ? currentStep.vaporPct / 100 : 0;

    // Source gas offered at the airway opening during this inspiration.
    const source = mixed ? mixedGas : freshShare * fresh + (1 - freshShare) * lastExhaled;
    let inspired: number;
    if (tube) {
      inspired = 0;
    } else if (mask) {
      const fromMask = tidal < maskVolume ? tidal : maskVolume;
      inspired = (1 - leak) * ((fromMask * maskGas + (tidal - fromMask) * source) / tidal);
    } else {
      inspired = source;
    }
    const tubeGas = tube ? (mixed ? mixedGas : fresh) : 0;
    // With an air-sac tube the gas delivered to the bird is the tube gas; the trachea breathes room air.
    const delivered = tube ? tubeGas : inspired;
    if (delivered > peakInspired) peakInspired = delivered;

    // Inspiration.
    let exhaledThisPhase = 0;
    for (let sub = 0; sub < substeps; sub += 1) {
      let toPosterior: number;
      if (stepTidal >= deadSpace) {
        toPosterior = deadSpace * trachea + (stepTidal - deadSpace) * inspired;
        trachea = inspired;
      } else {
        toPosterior = stepTidal * trachea;
        trachea += (stepTidal * (inspired - trachea)) / deadSpace;
      }
      deliveredToBird += stepTidal * inspired + stepTube * tubeGas;
      // Posterior sacs gain tracheal and tube gas and lose a VT (+ tube flow) of their start-of-step gas.
      const posteriorBefore = posteriorVolume + pShare * stepTidal * sub;
      let lungInlet = posterior;
      if (overflow) {
        lungInlet =
          (posteriorBefore * posterior + toPosterior + stepTube * tubeGas) /
          (posteriorBefore + stepTidal + stepTube);
        posterior = lungInlet;
      } else {
        posterior =
          (posteriorBefore * posterior + toPosterior + stepTube * tubeGas - inspiratoryLungFlow * lungInlet) /
          (posteriorBefore + pShare * stepTidal);
      }
      const endGas = venous + (lungInlet - venous) * inspiratoryEndFactor;
      arterial = venous + (lungInlet - venous) * inspiratoryArterialFactor;
      uptake += inspiratoryLungFlow * (lungInlet - endGas);
      let lungOutlet = lung;
      if (overflow) {
        const next = endGas + (lung - endGas) * inspiratoryLungWash;
        lungOutlet = (inspiratoryLungFlow * endGas - lungVolume * (next - lung)) / inspiratoryLungFlow;
        lung = next;
      } else {
        lung += (inspiratoryLungFlow * (endGas - lungOutlet)) / lungVolume;
      }
      // Anterior sacs fill with start-of-step lung gas; tube flow leaves the lung to the room.
      const anteriorBefore = anteriorVolume + aShare * stepTidal * sub;
      anterior =
        (anteriorBefore * anterior + aShare * stepTidal * lungOutlet) / (anteriorBefore + aShare * stepTidal);
      exhaledThisPhase += stepTube * lungOutlet;
      // Body: tissues by their exact exponential, venous pool by conservation.
      const brainNext = arterial + (brain - arterial) * decay0;
      const muscleNext = arterial + (muscle - arterial) * decay1;
      const fatNext = arterial + (fat - arterial) * decay2;
      const tissueGain =
        capacity0 * (brainNext - brain) + capacity1 * (muscleNext - muscle) + capacity2 * (fatNext - fat);
      venous += (bloodFlow * stepMin * (arterial - venous) - tissueGain) / bloodVolume;
      brain = brainNext;
      muscle = muscleNext;
      fat = fatNext;
    }
    exhaled += exhaledThisPhase;
    vaporiserOutput += freshFlow * phaseMin * fresh;
    if (mixed) mixedGas = fresh + (mixedGas - fresh) * freshDecay;
    if (mask)
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
        arterial,
        brain,
      );
      setContents(snapshot, gasPath, tidal);
      if (observer(snapshot) === true) stopRequested = true;
    }

    // Expiration.
    exhaledThisPhase = 0;
    let openingOut = 0;
    let expiredMixTotal = 0;
    for (let sub = 0; sub < substeps; sub += 1) {
      const posteriorFull = posteriorVolume + pShare * stepTidal * (substeps - sub);
      let lungInlet = posterior;
      if (overflow) {
        lungInlet = (posteriorFull * posterior + stepTube * tubeGas) / (posteriorFull + stepTube);
        posterior = lungInlet;
      } else {
        posterior =
          (posteriorFull * posterior + stepTube * tubeGas - expiratoryLungFlow * lungInlet) /
          (posteriorFull - pShare * stepTidal);
      }
      deliveredToBird += stepTube * tubeGas;
      const endGas = venous + (lungInlet - venous) * expiratoryEndFactor;
      arterial = venous + (lungInlet - venous) * expiratoryArterialFactor;
      uptake += expiratoryLungFlow * (lungInlet - endGas);
      let lungOutlet = lung;
      if (overflow) {
        const next = endGas + (lung - endGas) * expiratoryLungWash;
        lungOutlet = (expiratoryLungFlow * endGas - lungVolume * (next - lung)) / expiratoryLungFlow;
        lung = next;
      } else {
        lung += (expiratoryLungFlow * (endGas - lungOutlet)) / lungVolume;
      }
      // The anterior sacs shrink; their gas keeps its composition.
      const expiredMix = pShare * stepTidal * lungOutlet + aShare * stepTidal * anterior;
      const expiredFraction = stepTidal > 0 ? expiredMix / stepTidal : 0;
      expiredMixTotal += expiredMix;
      let out: number;
      if (stepTidal >= deadSpace) {
        out = deadSpace * trachea + (stepTidal - deadSpace) * expiredFraction;
        trachea = expiredFraction;
      } else {
        out = stepTidal * trachea;
        trachea += (stepTidal * (expiredFraction - trachea)) / deadSpace;
      }
      openingOut += out;
      exhaledThisPhase += out + stepTube * lungOutlet;
      const brainNext = arterial + (brain - arterial) * decay0;
      const muscleNext = arterial + (muscle - arterial) * decay1;
      const fatNext = arterial + (fat - arterial) * decay2;
      const tissueGain =
        capacity0 * (brainNext - brain) + capacity1 * (muscleNext - muscle) + capacity2 * (fatNext - fat);
      venous += (bloodFlow * stepMin * (arterial - venous) - tissueGain) / bloodVolume;
      brain = brainNext;
      muscle = muscleNext;
      fat = fatNext;
    }
    exhaled += exhaledThisPhase;
    if (tidal > 0) lastExhaled = openingOut / tidal;
    vaporiserOutput += freshFlow * phaseMin * fresh;
    if (mixed) {
      // Exhaled gas returns to the chamber or circle and displaces the same volume to the vent.
      if (!tube)
        mixedGas =
          tidal >= mixedVolume
            ? openingOut / tidal
            : (mixedGas * (mixedVolume - tidal) + openingOut) / mixedVolume;
      mixedGas = fresh + (mixedGas - fresh) * freshDecay;
    }
    if (mask) {
      const expiredTail = tidal > 0 ? expiredMixTotal / tidal : maskGas;
      maskGas =
        tidal >= maskVolume
          ? expiredTail
          : ((maskVolume - tidal) * maskGas + tidal * expiredTail) / maskVolume;
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
        arterial,
        brain,
      );
      setContents(snapshot, gasPath, 0);
      if (observer(snapshot) === true) stopRequested = true;
    }

    // Breath-averaged inspired fraction on a fixed grid, indexed by the breath's start.
    const gridIndex = Math.min(gridLength - 1, Math.floor((time - 2 * phaseMin) / inspiredGridStepMin));
    inspiredGrid[gridIndex] = (inspiredGrid[gridIndex] as number) + inspired;
    gridWeight[gridIndex] = (gridWeight[gridIndex] as number) + 1;

    if (brain / mac > peakBrain) peakBrain = brain / mac;
    if (inductionMin === null && brain >= inductionLevel && inductionLevel > 0) {
      inductionMin = interpolateCrossing(time - 2 * phaseMin, brainBefore, time, brain, inductionLevel);
      mixedAtInduction = mixedGas;
    }
    if (offMin !== null && recoveryMin === null && time >= offMin && brain < recoveryLevel) {
      const crossing =
        brainBefore >= recoveryLevel
          ? interpolateCrossing(time - 2 * phaseMin, brainBefore, time, brain, recoveryLevel)
          : time;
      recoveryMin = Math.max(0, crossing - offMin);
    }
    while (sampled < sampleCount && time >= nextSample - 1e-9) {
      recordSample(
        timeline,
        nextSample,
        delivered,
        trachea,
        posterior,
        lung,
        anterior,
        arterial,
        brain,
        muscle,
        fat,
      );
      sampled += 1;
      nextSample = sampled * sampleInterval;
    }
  }
  while (sampled < sampleCount) {
    recordSample(timeline, nextSample, 0, trachea, posterior, lung, anterior, arterial, brain, muscle, fat);
    sampled += 1;
    nextSample = sampled * sampleInterval;
  }
  // Fill empty grid cells from their neighbours (breaths longer than the grid step).
  let last = 0;
  for (let index = 0; index < gridLength; index += 1) {
    const weight = gridWeight[index] as number;
    if (weight > 0) last = (inspiredGrid[index] as number) / weight;
    inspiredGrid[index] = last;
  }
  const bodyState = new Float64Array([venous, brain, muscle, fat]);
  const gasStored =
    trachea * deadSpace + posterior * posteriorVolume + lung * lungVolume + anterior * anteriorVolume;
  return {
    timeline,
    inductionMin,
    recoveryMin: offMin === null ? null : recoveryMin,
    peakBrainMacMultiple: peakBrain,
    peakInspiredPct: peakInspired * 100,
    lowestVentilationFraction: lowestVentilation,
    breaths: breath,
    totals: {
      deliveredToBirdMl: deliveredToBird,
      exhaledMl: exhaled,
      uptakeMl: uptake,
      gasStoredMl: gasStored,
      bodyStoredMl: bodyContentMl(body, bodyState),
      vaporiserOutputMl: vaporiserOutput,
    },
    atOff,
    mixedPctAtInduction: (mixedAtInduction >= 0 ? mixedAtInduction : mixedGas) * 100,
    inspiredGrid,
    inspiredGridStepMin,
  };
}

/**
 * End-gas factor e^-k of the cross-current model for one step, k = lambda Q dt / V_in. No inflow:
 * the gas does not move.
 */
function crossCurrentEndFactor(bloodCapacityMl: number, inflowMl: number): number {
  return inflowMl <= 0 ? 1 : Math.exp(-bloodCapacityMl / inflowMl);
}

/** Arterial factor (1 - e^-k)/k of the cross-current model; no inflow: blood leaves at venous level. */
function crossCurrentArterialFactor(bloodCapacityMl: number, inflowMl: number): number {
  if (inflowMl <= 0) return 0;
  const k = bloodCapacityMl / inflowMl;
  return k < 1e-12 ? 1 : -Math.expm1(-k) / k;
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
  arterial: number,
  brain: number,
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
  target.arterial = arterial;
  target.brain = brain;
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
  arterial: number,
  brain: number,
  muscle: number,
  fat: number,
): void {
  timeline.timeMin.push(Math.round(atMin * 1e6) / 1e6);
  timeline.inspiredPct.push(inspired * 100);
  timeline.tracheaPct.push(trachea * 100);
  timeline.posteriorSacsPct.push(posterior * 100);
  timeline.parabronchialPct.push(lung * 100);
  timeline.anteriorSacsPct.push(anterior * 100);
  timeline.arterialPct.push(arterial * 100);
  timeline.brainPct.push(brain * 100);
  timeline.musclePct.push(muscle * 100);
  timeline.fatPct.push(fat * 100);
}

function interpolateCrossing(t0: number, v0: number, t1: number, v1: number, level: number): number {
  if (v1 === v0) return t1;
  const fraction = (level - v0) / (v1 - v0);
  return t0 + Math.min(1, Math.max(0, fraction)) * (t1 - t0);
}
