/**
 * Uncertainty of the milestones and of the brain curve: the same breath-resolved simulation as
 * the point estimate (simulate), run once per sample with the uncertain parameters drawn over
 * their stated ranges by a seeded generator (reproducible).
 *
 * Distributions are centred on the nominal value: triangular with its mode at the nominal value
 * and its ends at the declared range; the MAC is normal with its published (or assumed) SD,
 * truncated at 2.5 SD. A sample that never reaches a milestone within the simulated window counts
 * as beyond the window: it stays in the percentiles (a percentile that falls among such samples
 * is reported as the window length) and the share that reached is reported with it.
 */
import {
  airSacVolumeFraction,
  bloodVolumeFraction,
  cardiacOutputSpread,
  defaultMaskDeadSpaceTidalMultiple,
  lungVolumeFraction,
  macRelativeSpread,
  posteriorSacShare,
  rebreathingFlowMultiple,
  tissueBloodPartitionSpread,
  tissueGroups,
  trachealVolumeSpread,
  ventilationSpread,
  ventilatoryDepressionFloor,
  type ModelParameter,
} from './parameters.js';
import {
  drawPhysiology,
  nominalSolubilityFactor,
  physiologyParameters,
  type PhysiologyContext,
} from './physiology-draws.js';
import type { Percentiles, PlanUncertainty, UncertaintyParameter } from './plan-types.js';
import { simulate, type DeliverySetup, type SimulationOutcome, type SimulationSetup } from './simulation.js';
import type { TissueGroup } from './body-uptake.js';

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
 * Percentile by linear interpolation between closest ranks.
 * @param sorted sample values sorted ascending, at least one (Infinity allowed)
 * @param fraction 0-1
 */
export function percentile(sorted: ArrayLike<number>, fraction: number): number {
  if (sorted.length === 0) return Number.NaN;
  const position = (sorted.length - 1) * fraction;
  const below = Math.floor(position);
  const above = Math.min(sorted.length - 1, below + 1);
  const low = sorted[below] as number;
  const high = sorted[above] as number;
  if (position === below || low === high) return low;
  return low + (high - low) * (position - below);
}

/**
 * Triangular draw on [low, high] with its mode at `mode` (clamped into the range); equal ends
 * give the value itself.
 * @param random generator of numbers in [0, 1)
 */
export function triangular(random: () => number, low: number, mode: number, high: number): number {
  if (!(high > low)) return low;
  const peak = Math.min(high, Math.max(low, mode));
  const u = random();
  const split = (peak - low) / (high - low);
  return u < split
    ? low + Math.sqrt(u * (high - low) * (peak - low))
    : high - Math.sqrt((1 - u) * (high - low) * (high - peak));
}

/** Triangular draw over a parameter's declared range with its mode at the parameter's value. */
function drawParameter(random: () => number, parameter: ModelParameter): number {
  return triangular(random, parameter.range[0], parameter.value, parameter.range[1]);
}

/** Sampled threshold over its nominal value (1 without a range). */
function thresholdMultiple(
  random: () => number,
  range: readonly [number, number, number] | undefined,
): number {
  if (range === undefined || range[1] <= 0) return 1;
  return triangular(random, range[0], range[1], range[2]) / range[1];
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
  /** Blood/gas range of the agent; the nominal value is the setup's. */
  readonly bloodGasRange: readonly [number, number];
  /**
   * The nominal brain curve (vol %) and its times; when given, the run also returns the
   * 5th-95th percentile band of the sampled brain curves at the same times.
   */
  readonly brainTimeline?: { readonly timeMin: readonly number[]; readonly brainPct: readonly number[] };
  /** Mask dead space entered for this plan (not sampled) rather than the default (sampled). */
  readonly maskEntered?: { readonly deadSpace: boolean };
  /**
   * The plan's agent, anaesthetic index and body temperature, for the depression, temperature and
   * lung-share draws (physiology-draws.ts); absent: those are not sampled.
   */
  readonly physiology?: PhysiologyContext;
};

/** One sampled set-up with the multipliers drawn for it. */
type Draw = { readonly setup: SimulationSetup; readonly macMultiple: number };

function drawSetup(
  input: UncertaintyInput,
  random: () => number,
  macRelativeSd: number,
  maskDefaults: { deadSpace: boolean },
): Draw {
  const { setup } = input;
  const gas = setup.gasPath;
  const body = setup.body;
  const physiology =
    input.physiology === undefined
      ? undefined
      : drawPhysiology((parameter) => drawParameter(random, parameter), input.physiology);
  // The agent's range is at 37 C: draw there, then apply the (sampled) temperature factor.
  const temperatureFactor = input.physiology === undefined ? 1 : nominalSolubilityFactor(input.physiology);
  const lambda =
    triangular(
      random,
      input.bloodGasRange[0],
      body.bloodGasPartition / temperatureFactor,
      input.bloodGasRange[1],
    ) *
    temperatureFactor *
    (physiology?.solubilityMultiple ?? 1);
  const cardiac =
    (body.groups[0].flowMlMin + body.groups[1].flowMlMin + body.groups[2].flowMlMin) *
    drawParameter(random, cardiacOutputSpread);
  const tidalMultiple = drawParameter(random, ventilationSpread);
  const rateMultiple = drawParameter(random, ventilationSpread);
  const sacs =
    ((gas.anteriorSacsMl + gas.posteriorSacsMl) * drawParameter(random, airSacVolumeFraction)) /
    airSacVolumeFraction.value;
  const share = drawParameter(random, posteriorSacShare);
  const lung =
    ((gas.lungVolumeMl * drawParameter(random, lungVolumeFraction)) / lungVolumeFraction.value) *
    (physiology?.lungShareMultiple ?? 1);
  const trachea = gas.trachealVolumeMl * drawParameter(random, trachealVolumeSpread);
  const bloodVolume =
    (body.bloodVolumeMl * drawParameter(random, bloodVolumeFraction)) / bloodVolumeFraction.value;
  const flows = [0, 0, 0];
  let flowTotal = 0;
  const groups: TissueGroup[] = [];
  for (let index = 0; index < 3; index += 1) {
    const parameters = tissueGroups[index];
    const group = body.groups[index] as TissueGroup;
    if (parameters === undefined) throw new Error('three tissue groups expected');
    const volume =
      (group.volumeMl * drawParameter(random, parameters.volumeFraction)) / parameters.volumeFraction.value;
    const flow = drawParameter(random, parameters.flowFraction);
    flows[index] = flow;
    flowTotal += flow;
    groups.push({
      volumeMl: volume,
      flowMlMin: 0,
      tissueBloodPartition: group.tissueBloodPartition * drawParameter(random, tissueBloodPartitionSpread),
    });
  }
  const sampledGroups = groups.map((group, index) => ({
    ...group,
    flowMlMin: (cardiac * (flows[index] as number)) / flowTotal,
  }));
  const macMultiple = Math.max(0.3, 1 + macRelativeSd * normal(random)) * (physiology?.macMultiple ?? 1);
  const slope = setup.ventilation.depressionSlope * (physiology?.ventilationSlopeMultiple ?? 1);
  const floor = drawParameter(random, ventilatoryDepressionFloor);
  const rebreathing = drawParameter(random, rebreathingFlowMultiple);
  const maskDeadSpaceMultiple =
    drawParameter(random, defaultMaskDeadSpaceTidalMultiple) / defaultMaskDeadSpaceTidalMultiple.value;
  const delivery = setup.delivery;
  // Every phase of a phased plan breathes through the same sampled bird: one rebreathing multiple
  // and one dead-space multiple for every mask whose dead space was not entered.
  const sampleLater = (phaseDelivery: DeliverySetup): DeliverySetup => ({
    ...phaseDelivery,
    rebreathingFlowMultiple: rebreathing,
    maskDeadSpaceMl:
      phaseDelivery.interface === 'mask' && phaseDelivery.maskDeadSpaceEntered !== true
        ? phaseDelivery.maskDeadSpaceMl * maskDeadSpaceMultiple
        : phaseDelivery.maskDeadSpaceMl,
  });
  return {
    macMultiple,
    setup: {
      ...setup,
      gasPath: {
        trachealVolumeMl: trachea,
        lungVolumeMl: lung,
        anteriorSacsMl: sacs * (1 - share),
        posteriorSacsMl: sacs * share,
        posteriorShare: share,
      },
      body: {
        bloodGasPartition: lambda,
        bloodVolumeMl: bloodVolume,
        groups: [
          sampledGroups[0] as TissueGroup,
          sampledGroups[1] as TissueGroup,
          sampledGroups[2] as TissueGroup,
        ],
      },
      delivery: {
        ...delivery,
        rebreathingFlowMultiple: rebreathing,
        maskDeadSpaceMl: maskDefaults.deadSpace
          ? delivery.maskDeadSpaceMl * maskDeadSpaceMultiple
          : delivery.maskDeadSpaceMl,
      },
      ...(setup.laterDeliveries === undefined
        ? {}
        : {
            laterDeliveries: setup.laterDeliveries.map((later) => ({
              ...later,
              delivery: sampleLater(later.delivery),
            })),
          }),
      ventilation: {
        ...setup.ventilation,
        restingTidalVolumeMl: setup.ventilation.restingTidalVolumeMl * tidalMultiple,
        restingBreathsPerMin: setup.ventilation.restingBreathsPerMin * rateMultiple,
        depressionSlope: slope,
        depressionFloor: floor,
        ...(physiology === undefined
          ? {}
          : {
              rateShare: physiology.rateShare,
              cardiacSlope: physiology.cardiacSlope,
              cardiacFloor: physiology.cardiacFloor,
            }),
      },
      macPct: setup.macPct * macMultiple,
      inductionBrainPct: setup.inductionBrainPct * macMultiple,
      recoveryBrainPct:
        setup.recoveryBrainPct * macMultiple * thresholdMultiple(random, setup.recoveryThresholdRange),
      ...(setup.milestoneBrainPct === undefined
        ? {}
        : {
            milestoneBrainPct: setup.milestoneBrainPct.map((level) => ({
              ...level,
              brainPct: level.brainPct * macMultiple * thresholdMultiple(random, level.thresholdRange),
            })),
          }),
      onPhase: undefined,
    },
  };
}

/** A milestone's band over the samples, with the share of samples that reached it. */
export type MilestoneBand = {
  /** Percentiles; a percentile among samples beyond the window is the window length. Null without samples. */
  readonly percentiles: Percentiles | null;
  /** Samples that reached the milestone within the window. */
  readonly reached: number;
  /** Share of samples that reached it, 0-1 (1 without samples). */
  readonly reachedShare: number;
  /** "not reached by N % of birds like this" when some samples did not reach it, else null. */
  readonly note: string | null;
};

/**
 * Band of one milestone. Samples that did not reach it are beyond the window (Infinity).
 * @param values crossing times, min, Infinity when not reached
 * @param windowMin length of the window the milestone is timed in, min
 */
export function milestoneBand(values: number[], windowMin: number): MilestoneBand {
  if (values.length === 0) return { percentiles: null, reached: 0, reachedShare: 1, note: null };
  values.sort((a, b) => a - b);
  const reached = values.filter((value) => Number.isFinite(value)).length;
  const share = reached / values.length;
  const notReachedPct = Math.round((1 - share) * 100);
  const note =
    reached < values.length
      ? `not reached by ${String(notReachedPct === 0 ? '<1' : notReachedPct)} % of birds like this`
      : null;
  if (reached === 0) return { percentiles: null, reached, reachedShare: share, note };
  const capped = (fraction: number) => Math.min(windowMin, percentile(values, fraction));
  return {
    percentiles: { p5: capped(0.05), p50: capped(0.5), p95: capped(0.95) },
    reached,
    reachedShare: share,
    note,
  };
}

/**
 * Seed of one sample's own generator, from the run's seed and the sample's index (a 32-bit
 * integer hash), so that each sample's draws depend only on these two and any range of samples
 * can be run apart from the others (a pool of workers) with the same result as one run.
 * @param seed the run's seed, any integer
 * @param index the sample's index, 0 or more
 */
export function sampleSeed(seed: number, index: number): number {
  let hash = (seed >>> 0) ^ Math.imul(index + 1, 0x9e3779b9);
  hash = Math.imul(hash ^ (hash >>> 16), 0x85ebca6b);
  hash = Math.imul(hash ^ (hash >>> 13), 0xc2b2ae35);
  return (hash ^ (hash >>> 16)) >>> 0;
}

/**
 * The raw results of samples [from, to) of an uncertainty run: what `mergeUncertainty` turns
 * into bands. Plain typed arrays, so a worker can hand them over without copying.
 */
export type UncertaintySlice = {
  readonly from: number;
  readonly to: number;
  /** Induction time of each sample, min; Infinity when not reached. */
  readonly inductionMin: Float64Array;
  /** Recovery time of each sample, min (Infinity when not reached); empty without a vaporiser-off time. */
  readonly recoveryMin: Float64Array;
  /** Per milestone level of the setup, the crossing time of each sample, min (Infinity when not reached). */
  readonly milestoneMin: readonly Float64Array[];
  /** Brain curves at the nominal timeline's times, sample-major; empty without a timeline. */
  readonly brainPct: Float64Array;
};

/** Time points of the brain band the run returns (0 without a timeline or samples). */
function bandPoints(input: UncertaintyInput): number {
  const timeline = input.brainTimeline;
  return timeline === undefined || input.samples === 0 ? 0 : timeline.timeMin.length;
}

/**
 * Runs samples [from, to) of the uncertainty run; each sample draws from its own generator
 * (`sampleSeed(input.seed, index)`), so slices run anywhere merge to the whole run exactly.
 * @param input nominal setup and outcome, sample count (0-5000) and seed
 * @param from first sample index, 0 to input.samples
 * @param to one past the last sample index, from to input.samples
 */
export function runUncertaintySlice(input: UncertaintyInput, from: number, to: number): UncertaintySlice {
  if (!(Number.isInteger(from) && Number.isInteger(to) && from >= 0 && from <= to && to <= input.samples))
    throw new Error(`sample range ${String(from)}-${String(to)} is outside 0-${String(input.samples)}`);
  const { setup } = input;
  const macRelativeSd = input.macSdPct !== null ? input.macSdPct / setup.macPct : macRelativeSpread.value;
  const maskDefaults = maskDefaultsOf(input);
  const count = to - from;
  const levelCount = setup.milestoneBrainPct?.length ?? 0;
  const points = bandPoints(input);
  const slice = {
    from,
    to,
    inductionMin: new Float64Array(count),
    recoveryMin: new Float64Array(setup.offMin === null ? 0 : count),
    milestoneMin: Array.from({ length: levelCount }, () => new Float64Array(count)),
    brainPct: new Float64Array(points * count),
  };
  for (let offset = 0; offset < count; offset += 1) {
    const random = seededRandom(sampleSeed(input.seed, from + offset));
    const draw = drawSetup(input, random, macRelativeSd, maskDefaults);
    const result = simulate(draw.setup);
    slice.inductionMin[offset] = result.inductionMin ?? Number.POSITIVE_INFINITY;
    if (setup.offMin !== null) slice.recoveryMin[offset] = result.recoveryMin ?? Number.POSITIVE_INFINITY;
    for (let level = 0; level < levelCount; level += 1)
      (slice.milestoneMin[level] as Float64Array)[offset] =
        result.milestoneMin[level] ?? Number.POSITIVE_INFINITY;
    const brain = result.timeline.brainPct;
    for (let point = 0; point < points; point += 1)
      slice.brainPct[offset * points + point] = brain[point] ?? 0;
  }
  return slice;
}

/** A later mask phase with its default dead space also samples the dead-space multiple. */
function laterMaskDefaultOf(input: UncertaintyInput): boolean {
  return (input.setup.laterDeliveries ?? []).some(
    (later) => later.delivery.interface === 'mask' && later.delivery.maskDeadSpaceEntered !== true,
  );
}

function maskDefaultsOf(input: UncertaintyInput): { deadSpace: boolean } {
  return {
    deadSpace: input.setup.delivery.interface === 'mask' && input.maskEntered?.deadSpace !== true,
  };
}

export type UncertaintyRun = Omit<PlanUncertainty, 'milestones'> & {
  /** Bands of setup.milestoneBrainPct, in the same order. */
  readonly milestoneBands: readonly MilestoneBand[];
};

/**
 * Bands from slices that together cover samples 0 to input.samples once each (in any order):
 * equal to `runUncertainty(input)`.
 * @param input the same input the slices were run with
 * @param slices from `runUncertaintySlice`
 */
export function mergeUncertainty(
  input: UncertaintyInput,
  slices: readonly UncertaintySlice[],
): UncertaintyRun {
  const { setup } = input;
  const ordered = [...slices].sort((a, b) => a.from - b.from);
  let covered = 0;
  for (const slice of ordered) {
    if (slice.from !== covered)
      throw new Error(`samples ${String(covered)}-${String(slice.from)} missing or run twice`);
    covered = slice.to;
  }
  if (covered !== input.samples)
    throw new Error(`slices cover ${String(covered)} of ${String(input.samples)} samples`);
  const levelCount = setup.milestoneBrainPct?.length ?? 0;
  const points = bandPoints(input);
  const joined = (pick: (slice: UncertaintySlice) => Float64Array, width = 1): Float64Array => {
    const all = new Float64Array(input.samples * width);
    for (const slice of ordered) all.set(pick(slice), slice.from * width);
    return all;
  };
  const inductions = Array.from(joined((slice) => slice.inductionMin));
  const recoveries = setup.offMin === null ? [] : Array.from(joined((slice) => slice.recoveryMin));
  const levelTimes = Array.from({ length: levelCount }, (_, level) =>
    Array.from(joined((slice) => slice.milestoneMin[level] as Float64Array)),
  );
  const curves = joined((slice) => slice.brainPct, points);
  const macRelativeSd = input.macSdPct !== null ? input.macSdPct / setup.macPct : macRelativeSpread.value;
  const recoveryWindow = setup.offMin === null ? 0 : setup.endMin - setup.offMin;
  const induction = milestoneBand(inductions, setup.endMin);
  const recovery = milestoneBand(recoveries, recoveryWindow);
  const milestoneBands = levelTimes.map((values, level) =>
    milestoneBand(
      values,
      setup.milestoneBrainPct?.[level]?.direction === 'down' ? recoveryWindow : setup.endMin,
    ),
  );
  return {
    samples: input.samples,
    seed: input.seed,
    brainBandPct: points === 0 ? null : bandOf(curves, input.samples, points),
    inductionMin: induction.percentiles,
    recoveryMin: recovery.percentiles,
    inductionReached: induction.reached,
    recoveryReached: recovery.reached,
    inductionReachedShare: induction.reachedShare,
    recoveryReachedShare: recovery.reachedShare,
    inductionNote: induction.note,
    recoveryNote: recovery.note,
    parameters: sampledParameters(input, macRelativeSd, {
      deadSpace: maskDefaultsOf(input).deadSpace || laterMaskDefaultOf(input),
    }),
    method:
      "Each sample is a full run of the same breath-resolved model as the point estimate, with the parameters drawn from triangular distributions (mode at the nominal value, ends at the stated range; MAC: normal, truncated at 2.5 SD), drawn the same way each time for the same plan (each sample from the plan's seed and its own number). Samples that do not reach a milestone within the simulated window count as beyond it",
    milestoneBands,
  };
}

/**
 * p5 / p50 / p95 of induction and recovery times (and of any further milestone levels of the
 * setup) over sampled parameters, each sample a full run of the same simulation as the point
 * estimate, and the 5th-95th percentile band of the brain curve when a timeline is given. One
 * thread; a pool of workers runs `runUncertaintySlice` over parts and `mergeUncertainty` instead.
 * @param input nominal setup and outcome, sample count (0-5000) and seed
 */
export function runUncertainty(input: UncertaintyInput): UncertaintyRun {
  return mergeUncertainty(input, [runUncertaintySlice(input, 0, input.samples)]);
}

function sampledParameters(
  input: UncertaintyInput,
  macRelativeSd: number,
  maskDefaults: { deadSpace: boolean },
): UncertaintyParameter[] {
  const of = (name: string, parameter: ModelParameter, note = ''): UncertaintyParameter => ({
    name,
    low: parameter.range[0],
    high: parameter.range[1],
    basis: `${parameter.basis}${note}`,
  });
  return [
    {
      name: 'bloodGasPartition',
      low: input.bloodGasRange[0],
      high: input.bloodGasRange[1],
      basis: 'Human blood/gas range of the agent (see app/core/agents.ts); assumption for birds',
    },
    of('cardiacOutputMultiple', cardiacOutputSpread),
    of('tidalVolumeMultiple', ventilationSpread),
    of('breathsPerMinMultiple', ventilationSpread),
    of('airSacVolumeFraction', airSacVolumeFraction),
    of('posteriorSacShare', posteriorSacShare),
    of('lungVolumeFraction', lungVolumeFraction),
    of('trachealVolumeMultiple', trachealVolumeSpread),
    of('bloodVolumeFraction', bloodVolumeFraction),
    ...tissueGroups.flatMap((group) => [
      of(`${group.id}VolumeFraction`, group.volumeFraction),
      of(`${group.id}FlowFraction`, group.flowFraction, ' (fractions renormalised to sum 1)'),
    ]),
    of('tissueBloodPartitionMultiple', tissueBloodPartitionSpread),
    {
      name: 'macMultiple',
      low: Math.max(0.3, 1 - 2.5 * macRelativeSd),
      high: 1 + 2.5 * macRelativeSd,
      basis:
        input.macSdPct !== null
          ? 'Normal with the published SD of the MAC in use, truncated at 2.5 SD'
          : `${macRelativeSpread.basis}; normal, truncated at 2.5 SD`,
    },
    of('depressionFloor', ventilatoryDepressionFloor),
    ...(input.physiology === undefined ? [] : physiologyParameters(input.physiology)),
    of('rebreathingFlowMultiple', rebreathingFlowMultiple),
    ...(maskDefaults.deadSpace ? [of('maskDeadSpaceTidalMultiple', defaultMaskDeadSpaceTidalMultiple)] : []),
  ];
}

/** 5th and 95th percentile at each time point of sample curves stored sample-major. */
function bandOf(curves: Float64Array, samples: number, points: number): { p5: number[]; p95: number[] } {
  const p5: number[] = [];
  const p95: number[] = [];
  const column = new Float64Array(samples);
  for (let point = 0; point < points; point += 1) {
    for (let index = 0; index < samples; index += 1) column[index] = curves[index * points + point] as number;
    column.sort();
    p5.push(Math.round(percentile(column, 0.05) * 1e5) / 1e5);
    p95.push(Math.round(percentile(column, 0.95) * 1e5) / 1e5);
  }
  return { p5, p95 };
}
