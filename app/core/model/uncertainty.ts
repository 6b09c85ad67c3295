/**
 * Uncertainty of the induction and recovery times, from sampling the uncertain parameters over
 * stated ranges with a seeded generator (reproducible).
 *
 * Speed: each sample runs a breath-averaged version of the gas path (the same compartments and
 * flow rules with the breath's flows spread evenly over time; steps of 0.02 min after each change
 * growing to 1 min in steady periods; inspired gas taken
 * from the nominal breath-resolved run) instead of the breath-resolved run. The averaged model's
 * nominal milestones are scaled to the breath-resolved nominal ones, so the p50 stays close to
 * the deterministic prediction and the band shows the spread from the parameters.
 */
import {
  tissueGroups,
  airSacVolumeFraction,
  bloodVolumeFraction,
  cardiacOutputSpread,
  macRelativeSpread,
  ventilationSpread,
  ventilatoryDepressionSlope,
  lungVolumeFraction,
} from './parameters.js';
import type { Percentiles, PlanUncertainty, UncertaintyParameter } from './plan-types.js';
import { depressionQuantum, dialPctAt, type SimulationOutcome, type SimulationSetup } from './simulation.js';

/**
 * Mulberry32: a small, fast, seeded 32-bit generator. Returns a function giving numbers in [0, 1).
 * @param seed any integer
 */
export function seededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Percentile by linear interpolation between closest ranks (sorted copy of the values).
 * @param values sample values, at least one
 * @param fraction 0-1
 */
export function percentile(sorted: readonly number[], fraction: number): number {
  if (sorted.length === 0) return Number.NaN;
  const position = (sorted.length - 1) * fraction;
  const below = Math.floor(position);
  const above = Math.min(sorted.length - 1, below + 1);
  const low = sorted[below] as number;
  const high = sorted[above] as number;
  return low + (high - low) * (position - below);
}

/** Multipliers and values of one uncertainty sample. */
export type SampleParameters = {
  bloodGasPartition: number;
  cardiacOutputMultiple: number;
  tidalVolumeMultiple: number;
  breathsPerMinMultiple: number;
  airSacMultiple: number;
  lungMultiple: number;
  bloodVolumeMultiple: number;
  volumeMultiples: [number, number, number];
  flowFractions: [number, number, number];
  macMultiple: number;
  depressionSlope: number;
};

/**
 * Steps of the breath-averaged model: fine just after every change (dial step, start of IPPV) and
 * growing with the time since it, so that steady maintenance costs few steps. The backward-Euler
 * gas spaces are stable at any step and the tissue groups use their exact exponentials.
 */
export const averagedSteps = { minStepMin: 0.02, maxStepMin: 1, ageDivisor: 8 } as const;

/**
 * Step length at `timeMin`, `ageMin` after the last change and `toNextChangeMin` before the next.
 * @param ageMin minutes since the last change, >= 0
 * @param toNextChangeMin minutes to the next change or the end, > 0
 */
export function averagedStepMin(ageMin: number, toNextChangeMin: number): number {
  const step = Math.min(
    averagedSteps.maxStepMin,
    Math.max(averagedSteps.minStepMin, ageMin / averagedSteps.ageDivisor),
  );
  return Math.min(step, toNextChangeMin);
}

type AveragedResult = { inductionMin: number | null; recoveryMin: number | null };

/**
 * Where to record the brain partial pressure (vol %) of an averaged run: at each of `timesMin`
 * (ascending), linearly interpolated within the step that spans it. The run then goes on to the end
 * instead of stopping once its milestones are found.
 */
export type BrainCurve = { readonly timesMin: readonly number[]; readonly brainPct: Float64Array };

/**
 * Breath-averaged run of a plan with sampled parameters. Allocation-free apart from the result.
 * @param setup nominal setup of the breath-resolved run
 * @param inspiredGrid breath-averaged inspired fraction of the nominal run, one value per grid step
 * @param gridStepMin step of that grid, minutes
 * @param sample sampled parameters (nominal: all multiples 1)
 */
export function runAveraged(
  setup: SimulationSetup,
  inspiredGrid: Float64Array,
  gridStepMin: number,
  sample: SampleParameters,
  curve?: BrainCurve,
): AveragedResult {
  const gas = setup.gasPath;
  const vt0 = setup.ventilation.restingTidalVolumeMl * sample.tidalVolumeMultiple;
  const rate0 = setup.ventilation.restingBreathsPerMin * sample.breathsPerMinMultiple;
  const deadSpace = gas.trachealVolumeMl;
  const lungVolume = gas.lungVolumeMl * sample.lungMultiple;
  const posteriorVolume = gas.posteriorSacsMl * sample.airSacMultiple;
  const anteriorVolume = gas.anteriorSacsMl * sample.airSacMultiple;
  const pShare = gas.posteriorShare;
  const aShare = 1 - pShare;
  const body = setup.body;
  const cardiac =
    (body.groups[0].flowMlMin + body.groups[1].flowMlMin + body.groups[2].flowMlMin) *
    sample.cardiacOutputMultiple;
  const q0 = cardiac * sample.flowFractions[0];
  const q1 = cardiac * sample.flowFractions[1];
  const q2 = cardiac * sample.flowFractions[2];
  const v0 = body.groups[0].volumeMl * sample.volumeMultiples[0] * body.groups[0].tissueBloodPartition;
  const v1 = body.groups[1].volumeMl * sample.volumeMultiples[1] * body.groups[1].tissueBloodPartition;
  const v2 = body.groups[2].volumeMl * sample.volumeMultiples[2] * body.groups[2].tissueBloodPartition;
  const bloodVolume = body.bloodVolumeMl * sample.bloodVolumeMultiple;
  const lambda = sample.bloodGasPartition;
  const mac = (setup.macPct * sample.macMultiple) / 100;
  const inductionLevel = (setup.inductionBrainPct / setup.macPct) * mac;
  const recoveryLevel = (setup.recoveryBrainPct / setup.macPct) * mac;
  const tube = setup.delivery.interface === 'airSacTube';
  const tubeFlow = tube ? setup.delivery.freshGasMlMin : 0;
  const ippv = setup.ventilation.ippv;
  const offMin = setup.offMin;

  const depressionFloor = setup.ventilation.depressionFloor;
  const depressionSlope = sample.depressionSlope;
  const ippvFrom = ippv === null ? Number.POSITIVE_INFINITY : ippv.fromMin;
  const schedule = setup.schedule;

  let posterior = 0;
  let lung = 0;
  let anterior = 0;
  let exhaledMix = 0;
  let venous = 0;
  let brain = 0;
  let muscle = 0;
  let fat = 0;
  let inductionMin: number | null = null;
  let recoveryMin: number | null = null;
  let tidal = 0;
  let ventilation = 0;
  let deadShare = 0;
  let throughLung = 0;
  let endFactor = 1;
  let arterialFactor = 1;
  let rPosterior = 0;
  let rLung = 0;
  let rAnterior = 0;
  const lastGrid = inspiredGrid.length - 1;
  const endMin = setup.endMin;
  let curveIndex = 0;
  const curveTimes = curve?.timesMin ?? [];
  // Times at which the inputs change: dial steps and the start of IPPV.
  const changes: number[] = schedule.map((entry) => entry.atMin);
  if (ippv !== null) changes.push(ippv.fromMin);
  changes.sort((a, b) => a - b);
  let changeIndex = 0;
  let lastChange = 0;
  let dt = 0;
  let e0 = 1;
  let e1 = 1;
  let e2 = 1;
  let venousGain = 0;
  let venousLoss = 1;
  let time = 0;
  while (time < endMin - 1e-9) {
    while (changeIndex < changes.length && (changes[changeIndex] as number) <= time + 1e-9) {
      lastChange = changes[changeIndex] as number;
      changeIndex += 1;
    }
    const nextChange = changeIndex < changes.length ? (changes[changeIndex] as number) : endMin;
    const step = averagedStepMin(time - lastChange, Math.min(nextChange, endMin) - time);
    if (step !== dt) {
      dt = step;
      e0 = Math.exp((-q0 * dt) / v0);
      e1 = Math.exp((-q1 * dt) / v1);
      e2 = Math.exp((-q2 * dt) / v2);
      venousGain = dt / bloodVolume;
      venousLoss = 1 + (cardiac * dt) / bloodVolume;
      tidal = -1;
    }
    let nextTidal: number;
    let rate: number;
    if (time >= ippvFrom && ippv !== null) {
      nextTidal = ippv.tidalVolumeMl;
      rate = ippv.breathsPerMin;
    } else {
      const depression = Math.max(depressionFloor, 1 - (depressionSlope * brain) / mac);
      const depressionUsed = Math.round(depression / depressionQuantum) * depressionQuantum;
      nextTidal = vt0 * depressionUsed;
      rate = rate0;
    }
    if (nextTidal !== tidal || nextTidal * rate !== ventilation) {
      tidal = nextTidal;
      ventilation = tidal * rate;
      deadShare = Math.min(1, deadSpace / tidal);
      throughLung = ventilation + tubeFlow;
      const k = (lambda * cardiac) / throughLung;
      endFactor = Math.exp(-k);
      arterialFactor = k > 1e-12 ? -Math.expm1(-k) / k : 1;
      rPosterior = (throughLung * dt) / posteriorVolume;
      rLung = (throughLung * dt) / lungVolume;
      rAnterior = (aShare * ventilation * dt) / anteriorVolume;
    }
    const gridIndex = Math.min(lastGrid, Math.floor(time / gridStepMin));
    const inspired = inspiredGrid[gridIndex] as number;
    const tubeGas = tube ? dialPctAt(schedule, time) / 100 : 0;
    const tracheal = (1 - deadShare) * inspired + deadShare * exhaledMix;
    const inflow = (ventilation * tracheal + tubeFlow * tubeGas) / throughLung;
    posterior = (posterior + rPosterior * inflow) / (1 + rPosterior);
    const endGas = venous + (posterior - venous) * endFactor;
    const arterial = venous + (posterior - venous) * arterialFactor;
    lung = (lung + rLung * endGas) / (1 + rLung);
    anterior = (anterior + rAnterior * lung) / (1 + rAnterior);
    exhaledMix = pShare * lung + aShare * anterior;
    const brainBefore = brain;
    brain = arterial + (brain - arterial) * e0;
    muscle = arterial + (muscle - arterial) * e1;
    fat = arterial + (fat - arterial) * e2;
    venous = (venous + venousGain * (q0 * brain + q1 * muscle + q2 * fat)) / venousLoss;
    const end = time + dt;
    if (curve !== undefined) {
      while (curveIndex < curveTimes.length && (curveTimes[curveIndex] as number) <= end + 1e-9) {
        const at = curveTimes[curveIndex] as number;
        const fraction = dt > 0 ? Math.min(1, Math.max(0, (at - time) / dt)) : 1;
        curve.brainPct[curveIndex] = (brainBefore + (brain - brainBefore) * fraction) * 100;
        curveIndex += 1;
      }
    }
    if (inductionMin === null && brain >= inductionLevel) {
      inductionMin = time + (dt * (inductionLevel - brainBefore)) / (brain - brainBefore || 1);
      if (offMin === null && curve === undefined) break;
    }
    if (offMin !== null && recoveryMin === null && end >= offMin - 1e-9 && brain < recoveryLevel) {
      const crossing =
        brainBefore >= recoveryLevel && time >= offMin - 1e-9
          ? time + (dt * (brainBefore - recoveryLevel)) / (brainBefore - brain)
          : end;
      recoveryMin = Math.max(0, crossing - offMin);
      if (curve === undefined) break;
    }
    time = end;
  }
  if (curve !== undefined)
    for (; curveIndex < curveTimes.length; curveIndex += 1) curve.brainPct[curveIndex] = brain * 100;
  return { inductionMin, recoveryMin };
}

/** Nominal sample: every multiple 1, parameters at their stated values. */
export function nominalSample(setup: SimulationSetup): SampleParameters {
  return {
    bloodGasPartition: setup.body.bloodGasPartition,
    cardiacOutputMultiple: 1,
    tidalVolumeMultiple: 1,
    breathsPerMinMultiple: 1,
    airSacMultiple: 1,
    lungMultiple: 1,
    bloodVolumeMultiple: 1,
    volumeMultiples: [1, 1, 1],
    flowFractions: [
      tissueGroups[0]?.flowFraction.value ?? 0.75,
      tissueGroups[1]?.flowFraction.value ?? 0.2,
      tissueGroups[2]?.flowFraction.value ?? 0.05,
    ],
    macMultiple: 1,
    depressionSlope: setup.ventilation.depressionSlope,
  };
}

function uniform(random: () => number, low: number, high: number): number {
  return low + (high - low) * random();
}

/** Standard normal by Box-Muller, truncated to +/-2.5 SD. */
function normal(random: () => number): number {
  const u = Math.max(random(), 1e-12);
  const v = random();
  const z = Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  return Math.max(-2.5, Math.min(2.5, z));
}

export type UncertaintyInput = {
  readonly setup: SimulationSetup;
  readonly outcome: SimulationOutcome;
  /** Standard deviation of the MAC in use, vol %, where published; else macRelativeSpread applies. */
  readonly macSdPct: number | null;
  readonly samples: number;
  readonly seed: number;
  readonly bloodGasRange: readonly [number, number];
  /**
   * The breath-resolved brain curve (vol %) and its times; when given, the run also returns the
   * 5th-95th percentile band around it.
   */
  readonly brainTimeline?: { readonly timeMin: readonly number[]; readonly brainPct: readonly number[] };
};

/**
 * p5 / p50 / p95 of induction and recovery times over sampled parameters.
 * @param input nominal setup and outcome, sample count (0-5000) and seed
 */
export function runUncertainty(input: UncertaintyInput): PlanUncertainty {
  const { setup, outcome } = input;
  const nominal = nominalSample(setup);
  const nominalAveraged = runAveraged(setup, outcome.inspiredGrid, outcome.inspiredGridStepMin, nominal);
  const inductionScale = scaleOf(outcome.inductionMin, nominalAveraged.inductionMin);
  const recoveryScale = scaleOf(outcome.recoveryMin, nominalAveraged.recoveryMin);
  const random = seededRandom(input.seed);
  const macRelativeSd = input.macSdPct !== null ? input.macSdPct / setup.macPct : macRelativeSpread.value;
  const nominalAirSac = airSacVolumeFraction.value;
  const nominalLung = lungVolumeFraction.value;
  const nominalBlood = bloodVolumeFraction.value;
  const inductions: number[] = [];
  const recoveries: number[] = [];
  const sample = nominalSample(setup);
  // The band: each sample's averaged brain curve relative to the nominal averaged curve, applied to
  // the breath-resolved curve, so the band is centred on what the screen draws.
  const timeline = input.brainTimeline;
  const points = timeline === undefined || input.samples === 0 ? 0 : timeline.timeMin.length;
  const nominalCurve =
    points === 0
      ? null
      : { timesMin: (timeline as NonNullable<typeof timeline>).timeMin, brainPct: new Float64Array(points) };
  if (nominalCurve !== null)
    runAveraged(setup, outcome.inspiredGrid, outcome.inspiredGridStepMin, nominal, nominalCurve);
  const sampleCurve =
    nominalCurve === null
      ? undefined
      : { timesMin: nominalCurve.timesMin, brainPct: new Float64Array(points) };
  const curves = new Float64Array(points * input.samples);
  for (let index = 0; index < input.samples; index += 1) {
    sample.bloodGasPartition = uniform(random, input.bloodGasRange[0], input.bloodGasRange[1]);
    sample.cardiacOutputMultiple = uniform(
      random,
      cardiacOutputSpread.range[0],
      cardiacOutputSpread.range[1],
    );
    sample.tidalVolumeMultiple = uniform(random, ventilationSpread.range[0], ventilationSpread.range[1]);
    sample.breathsPerMinMultiple = uniform(random, ventilationSpread.range[0], ventilationSpread.range[1]);
    sample.airSacMultiple =
      uniform(random, airSacVolumeFraction.range[0], airSacVolumeFraction.range[1]) / nominalAirSac;
    sample.lungMultiple =
      uniform(random, lungVolumeFraction.range[0], lungVolumeFraction.range[1]) / nominalLung;
    sample.bloodVolumeMultiple =
      uniform(random, bloodVolumeFraction.range[0], bloodVolumeFraction.range[1]) / nominalBlood;
    let flowTotal = 0;
    for (let group = 0; group < 3; group += 1) {
      const parameters = tissueGroups[group];
      if (parameters === undefined) continue;
      sample.volumeMultiples[group] =
        uniform(random, parameters.volumeFraction.range[0], parameters.volumeFraction.range[1]) /
        parameters.volumeFraction.value;
      const flow = uniform(random, parameters.flowFraction.range[0], parameters.flowFraction.range[1]);
      sample.flowFractions[group] = flow;
      flowTotal += flow;
    }
    for (let group = 0; group < 3; group += 1)
      sample.flowFractions[group] = (sample.flowFractions[group] as number) / flowTotal;
    sample.macMultiple = Math.max(0.3, 1 + macRelativeSd * normal(random));
    sample.depressionSlope = uniform(
      random,
      ventilatoryDepressionSlope.range[0],
      ventilatoryDepressionSlope.range[1],
    );
    const result = runAveraged(setup, outcome.inspiredGrid, outcome.inspiredGridStepMin, sample, sampleCurve);
    if (sampleCurve !== undefined && nominalCurve !== null && timeline !== undefined) {
      for (let point = 0; point < points; point += 1) {
        const reference = nominalCurve.brainPct[point] as number;
        const resolved = timeline.brainPct[point] as number;
        const own = sampleCurve.brainPct[point] as number;
        curves[index * points + point] = reference > 1e-9 ? resolved * (own / reference) : own;
      }
    }
    if (result.inductionMin !== null) inductions.push(result.inductionMin * inductionScale);
    if (result.recoveryMin !== null) recoveries.push(result.recoveryMin * recoveryScale);
  }
  const parameters: UncertaintyParameter[] = [
    {
      name: 'bloodGasPartition',
      low: input.bloodGasRange[0],
      high: input.bloodGasRange[1],
      basis: 'Human blood/gas range of the agent (see app/core/agents.ts); assumption for birds',
    },
    {
      name: 'cardiacOutputMultiple',
      low: cardiacOutputSpread.range[0],
      high: cardiacOutputSpread.range[1],
      basis: cardiacOutputSpread.basis,
    },
    {
      name: 'tidalVolumeMultiple',
      low: ventilationSpread.range[0],
      high: ventilationSpread.range[1],
      basis: ventilationSpread.basis,
    },
    {
      name: 'breathsPerMinMultiple',
      low: ventilationSpread.range[0],
      high: ventilationSpread.range[1],
      basis: ventilationSpread.basis,
    },
    {
      name: 'airSacVolumeFraction',
      low: airSacVolumeFraction.range[0],
      high: airSacVolumeFraction.range[1],
      basis: airSacVolumeFraction.basis,
    },
    {
      name: 'lungVolumeFraction',
      low: lungVolumeFraction.range[0],
      high: lungVolumeFraction.range[1],
      basis: lungVolumeFraction.basis,
    },
    {
      name: 'bloodVolumeFraction',
      low: bloodVolumeFraction.range[0],
      high: bloodVolumeFraction.range[1],
      basis: bloodVolumeFraction.basis,
    },
    ...tissueGroups.flatMap((group) => [
      {
        name: `${group.id}VolumeFraction`,
        low: group.volumeFraction.range[0],
        high: group.volumeFraction.range[1],
        basis: group.volumeFraction.basis,
      },
      {
        name: `${group.id}FlowFraction`,
        low: group.flowFraction.range[0],
        high: group.flowFraction.range[1],
        basis: `${group.flowFraction.basis} (fractions renormalised to sum 1)`,
      },
    ]),
    {
      name: 'macMultiple',
      low: Math.max(0.3, 1 - 2.5 * macRelativeSd),
      high: 1 + 2.5 * macRelativeSd,
      basis:
        input.macSdPct !== null
          ? 'Normal with the published SD of the MAC in use, truncated at 2.5 SD'
          : `${macRelativeSpread.basis}; normal, truncated at 2.5 SD`,
    },
    {
      name: 'depressionSlope',
      low: ventilatoryDepressionSlope.range[0],
      high: ventilatoryDepressionSlope.range[1],
      basis: ventilatoryDepressionSlope.basis,
    },
  ];
  return {
    samples: input.samples,
    seed: input.seed,
    brainBandPct: points === 0 ? null : bandOf(curves, input.samples, points),
    inductionMin: summarise(inductions),
    recoveryMin: summarise(recoveries),
    inductionReached: inductions.length,
    recoveryReached: recoveries.length,
    parameters,
    method:
      'Uniform sampling over the stated ranges (MAC: truncated normal) with a seeded Mulberry32 generator; each sample runs the breath-averaged gas path (steps of 0.02 min after each dial change growing to 1 min in steady periods, inspired gas from the nominal run), scaled so that its nominal milestones equal the breath-resolved ones',
  };
}

/** 5th and 95th percentile at each time point of sample curves stored sample-major. */
function bandOf(curves: Float64Array, samples: number, points: number): { p5: number[]; p95: number[] } {
  const p5: number[] = [];
  const p95: number[] = [];
  const column = new Float64Array(samples);
  for (let point = 0; point < points; point += 1) {
    for (let index = 0; index < samples; index += 1) column[index] = curves[index * points + point] as number;
    column.sort();
    p5.push(Math.round(percentile(column as unknown as number[], 0.05) * 1e5) / 1e5);
    p95.push(Math.round(percentile(column as unknown as number[], 0.95) * 1e5) / 1e5);
  }
  return { p5, p95 };
}

function scaleOf(resolved: number | null, averaged: number | null): number {
  if (resolved === null || averaged === null || averaged <= 0) return 1;
  return resolved / averaged;
}

function summarise(values: number[]): Percentiles | null {
  if (values.length === 0) return null;
  values.sort((a, b) => a - b);
  return { p5: percentile(values, 0.05), p50: percentile(values, 0.5), p95: percentile(values, 0.95) };
}
