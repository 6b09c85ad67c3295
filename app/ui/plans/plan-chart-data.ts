/**
 * What the planning chart and the worksheet chart draw, from a plan result: the depth view (the
 * brain as a multiple of the bird's MAC, with the planned depth and the recovery levels) and the
 * gas view (the agent in the airways, air sacs, blood and brain). Pure: tested in test/ui/plans.
 */
import { routeLabels } from '../../core/delivery.js';
import type { MilestoneId, PlanResult } from '../../core/model/plan-types.js';
import {
  evenStops,
  figureText,
  macMultipleSeries,
  niceTicks,
  stepValuesAt,
  type StepPoint,
  type Strip,
  type StripArea,
  type StripBand,
  type StripChartData,
  type StripLevel,
  type StripLine,
  type StripMarker,
  type StripSpan,
} from '../common/strip-chart-model.js';

/** The part of a plan result the charts read (a read-back snapshot fits too). */
export type ChartedPlan = Pick<
  PlanResult,
  'agent' | 'mac' | 'targetMacMultiple' | 'recoveryMacFraction' | 'phases' | 'timeline' | 'milestones'
> & {
  readonly uncertainty: Pick<PlanResult['uncertainty'], 'samples'> & {
    readonly brainBandPct?: PlanResult['uncertainty']['brainBandPct'] | undefined;
  };
};

/** A second plan drawn for comparison (its brain curve at its own MAC multiple). */
export type ComparedPlan = { readonly label: string; readonly result: ChartedPlan } | undefined;

export type PlanChartOptions = {
  /** The plan's dial steps, used when the result lists no phases (a plan saved before phases). */
  readonly schedule?: readonly { readonly atMin: number; readonly vaporPct: number }[] | undefined;
  readonly compareWith?: ComparedPlan;
  /**
   * A brain band in vol % to draw when the result carries none (an older saved plan), with the
   * words that say how it was made.
   */
  readonly fallbackBand?: {
    readonly lowPct: readonly number[];
    readonly highPct: readonly number[];
    readonly label: string;
  } | null;
};

/** Short names of the milestone levels, drawn at the right-hand edge of the depth strip. */
const levelNames: Readonly<Record<MilestoneId, string>> = {
  lossOfRighting: 'Righting lost',
  surgicalDepth: 'Planned depth',
  firstMovement: 'First movement',
  standing: 'Standing',
};

const levelDash: Readonly<Record<MilestoneId, number[]>> = {
  lossOfRighting: [6, 3],
  surgicalDepth: [2, 2],
  firstMovement: [10, 3, 2, 3],
  standing: [1, 3],
};

/** The milestone order of the key (the marks 1-4). */
const milestoneOrder: readonly MilestoneId[] = [
  'lossOfRighting',
  'surgicalDepth',
  'firstMovement',
  'standing',
];

/**
 * The dial over the plan as step points: the phases' steps in time order (a phase repeats the step
 * running at its start), or the plan's schedule when the result lists no phases.
 */
export function planDialSteps(
  result: Pick<ChartedPlan, 'phases'>,
  schedule?: readonly { readonly atMin: number; readonly vaporPct: number }[],
): StepPoint[] {
  const steps =
    result.phases.length > 0 ? result.phases.flatMap((phase) => phase.dialSteps) : [...(schedule ?? [])];
  const sorted = [...steps].sort((a, b) => a.atMin - b.atMin);
  const points: StepPoint[] = [];
  for (const step of sorted) {
    const last = points.at(-1);
    if (last !== undefined && Math.abs(last.minute - step.atMin) < 1e-9) points.pop();
    const before = points.at(-1);
    if (before !== undefined && before.value === step.vaporPct) continue;
    points.push({ minute: step.atMin, value: step.vaporPct });
  }
  return points;
}

/** Linear interpolation of a curve onto other minutes (null outside it). */
export function resample(
  fromX: readonly number[],
  values: readonly number[],
  toX: readonly number[],
): (number | null)[] {
  let at = 0;
  return toX.map((minute) => {
    const first = fromX[0];
    const last = fromX.at(-1);
    if (first === undefined || last === undefined || minute < first - 1e-9 || minute > last + 1e-9)
      return null;
    while (at + 1 < fromX.length && (fromX[at + 1] ?? Infinity) < minute) at += 1;
    const x0 = fromX[at] ?? minute;
    const x1 = fromX[at + 1] ?? x0;
    const v0 = values[at] ?? 0;
    const v1 = values[at + 1] ?? v0;
    return x1 === x0 ? v0 : v0 + ((v1 - v0) * (minute - x0)) / (x1 - x0);
  });
}

/** Stops for the cursor and the table: about one a minute, fewer on a long plan. */
function planStops(x: readonly number[]): number[] {
  const span = x.at(-1) ?? 0;
  return evenStops(x, span <= 90 ? 1 : span <= 240 ? 2 : 5);
}

/** The room-air gaps of later phases, and the phase changes as marks across the strips. */
function phaseMarks(result: ChartedPlan): { markers: StripMarker[]; spans: StripSpan[] } {
  if (result.phases.length <= 1) return { markers: [], spans: [] };
  const markers: StripMarker[] = result.phases.map((phase) => ({
    atMin: phase.startMin,
    mark: routeLabels[phase.route],
    shortMark: `P${String(phase.index + 1)}`,
    label:
      phase.index === 0
        ? `Phase 1 from the start: ${routeLabels[phase.route]}`
        : `Phase ${String(phase.index + 1)} from ${figureText(phase.startMin, 1)} min: ${routeLabels[phase.route]}${
            phase.gapMin > 0 ? ` after ${figureText(phase.gapMin, 1)} min on room air` : ''
          }`,
    kind: 'phase',
  }));
  const spans = result.phases
    .filter((phase) => phase.index > 0 && phase.deliveryFromMin > phase.startMin)
    .map((phase) => ({
      fromMin: phase.startMin,
      toMin: phase.deliveryFromMin,
      label: 'Room air while the bird is moved to the next route',
    }));
  return { markers, spans };
}

/** The dial strip shared by both views. */
function dialStrip(x: readonly number[], steps: readonly StepPoint[]): Strip {
  const highest = Math.max(5, ...steps.map((step) => step.value));
  const range = { min: 0, max: Math.ceil(highest) };
  const line: StripLine = {
    id: 'dial',
    label: 'Vaporiser dial',
    unit: '%',
    values: stepValuesAt(steps, x),
    digits: 1,
    steps: true,
    stroke: 'var(--chart-amber)',
    width: 2.5,
  };
  return { id: 'dial', title: 'Vaporiser dial (%)', range, ticks: [0, range.max], weight: 1, lines: [line] };
}

function minutesText(value: number): string {
  return `${figureText(value, 1)} min`;
}

/** Where each clinical milestone falls on the depth strip (minutes from the start). */
function milestoneMarks(result: ChartedPlan): StripMarker[] {
  const m = result.milestones;
  const off = m.vaporiserOffMin;
  const at: Readonly<Record<MilestoneId, number | null>> = {
    lossOfRighting: m.lossOfRightingMin,
    surgicalDepth: m.surgicalDepthMin,
    firstMovement: off === null || m.firstMovementMin === null ? null : off + m.firstMovementMin,
    standing: off === null || m.standingMin === null ? null : off + m.standingMin,
  };
  return milestoneOrder.flatMap((id, index) => {
    const definition = m.definitions.find((entry) => entry.id === id);
    const minute = at[id];
    if (definition === undefined || minute === null) return [];
    const after =
      definition.when === 'falling' && off !== null && m.vaporiserOffMin !== null
        ? ` (${minutesText(minute - off)} after the vaporiser is off)`
        : '';
    return [
      {
        atMin: minute,
        mark: String(index + 1),
        label: `${definition.label}: ${figureText(definition.macMultiple, 2)} × MAC at ${minutesText(minute)}${after}`,
        kind: 'milestone' as const,
        stripId: 'depth',
        value: definition.macMultiple,
      },
    ];
  });
}

/**
 * The depth view: the brain as a multiple of the bird's MAC over time, the planned depth and the
 * waking zone shaded, each milestone level named, the 5-95 % band of the model runs as a lighter
 * area, the milestones marked; the dial as steps on its own strip below; phase changes across both.
 */
export function depthChartData(result: ChartedPlan, options: PlanChartOptions = {}): StripChartData {
  const x = result.timeline.timeMin;
  const macPct = result.mac.valuePct;
  const brain = macMultipleSeries(result.timeline.brainPct, macPct);
  const reported = result.uncertainty.brainBandPct;
  const band =
    reported !== undefined && reported !== null && reported.p5.length === x.length
      ? {
          low: macMultipleSeries(reported.p5, macPct),
          high: macMultipleSeries(reported.p95, macPct),
          label: `Brain, 5-95 % of ${String(result.uncertainty.samples)} model runs with sampled parameters`,
        }
      : options.fallbackBand !== undefined &&
          options.fallbackBand !== null &&
          options.fallbackBand.lowPct.length === x.length
        ? {
            low: macMultipleSeries(options.fallbackBand.lowPct, macPct),
            high: macMultipleSeries(options.fallbackBand.highPct, macPct),
            label: options.fallbackBand.label,
          }
        : null;
  const compared = options.compareWith;
  const comparedValues =
    compared === undefined
      ? null
      : resample(
          compared.result.timeline.timeMin,
          macMultipleSeries(compared.result.timeline.brainPct, compared.result.mac.valuePct),
          x,
        );
  const definitions = result.milestones.definitions;
  const levelOf = (id: MilestoneId) => definitions.find((entry) => entry.id === id)?.macMultiple;
  const target = result.targetMacMultiple;
  const highest = Math.max(
    target * 1.25,
    ...brain,
    ...(band?.high ?? []),
    ...(comparedValues ?? []).map((value) => value ?? 0),
  );
  const range = { min: 0, max: Math.max(2, Math.ceil((highest * 1.05) / 0.5) * 0.5) };
  const firstMovement = levelOf('firstMovement') ?? result.recoveryMacFraction.value;
  const standing = levelOf('standing');
  const bands: StripBand[] = [
    {
      id: 'planned-depth',
      label: `Planned depth: ${figureText(target, 2)} × MAC and deeper`,
      from: target,
      to: range.max,
      fill: 'var(--chart-depth-fill)',
    },
    {
      id: 'waking',
      label:
        standing === undefined
          ? `Waking: below first movement (${figureText(firstMovement, 2)} × MAC)`
          : `Waking: from first movement (${figureText(firstMovement, 2)} × MAC) to standing (${figureText(standing, 2)} × MAC)`,
      from: standing ?? 0,
      to: firstMovement,
      fill: 'var(--chart-recovery-fill)',
    },
  ];
  const levels: StripLevel[] = milestoneOrder.flatMap((id) => {
    const value = id === 'surgicalDepth' ? target : levelOf(id);
    if (value === undefined) return [];
    return [
      {
        id,
        label: `${levelNames[id]} ${figureText(value, 2)}×`,
        value,
        stroke: 'var(--chart-ink)',
        dash: levelDash[id],
        width: 1,
      },
    ];
  });
  const lines: StripLine[] = [
    {
      id: 'brain',
      label: 'Brain',
      unit: '× MAC',
      values: brain,
      digits: 2,
      stroke: 'var(--chart-blue)',
      width: 3,
    },
  ];
  if (comparedValues !== null && compared !== undefined)
    lines.push({
      id: 'compared',
      label: `Brain, ${compared.label}`,
      unit: '× MAC',
      values: comparedValues,
      digits: 2,
      stroke: 'var(--chart-violet)',
      dash: [7, 3],
      width: 2.5,
    });
  const area: StripArea | undefined =
    band === null
      ? undefined
      : {
          label: band.label,
          low: band.low,
          high: band.high,
          fill: 'var(--chart-band-fill)',
          edge: { stroke: 'var(--chart-band-line)', dash: [3, 3], width: 1 },
        };
  const depth: Strip = {
    id: 'depth',
    title: `Brain level (× the bird’s MAC of ${figureText(macPct, 2)} % ${result.agent})`,
    range,
    ticks: niceTicks(range, 4),
    weight: 4,
    lines,
    bands,
    levels,
    ...(area === undefined ? {} : { area }),
  };
  const phases = phaseMarks(result);
  return {
    x,
    xMax: x.at(-1) ?? 0,
    xLabel: 'Minutes from the start',
    strips: [depth, dialStrip(x, planDialSteps(result, options.schedule))],
    markers: [...phases.markers, ...milestoneMarks(result)],
    spans: phases.spans,
    stops: planStops(x),
  };
}

/**
 * The gas view: the agent (vol %) as breathed in, in the posterior air sacs, at the gas-exchange
 * surface, in arterial blood and in the brain, with the bird's MAC marked; the dial below.
 */
export function gasChartData(result: ChartedPlan, options: PlanChartOptions = {}): StripChartData {
  const t = result.timeline;
  const x = t.timeMin;
  const lines: StripLine[] = [
    {
      id: 'inspired',
      label: 'Breathed in',
      values: t.inspiredPct,
      stroke: 'var(--chart-grey)',
      dash: [10, 5],
      width: 1.5,
    },
    {
      id: 'posteriorSacs',
      label: 'Posterior air sacs',
      values: t.posteriorSacsPct,
      stroke: 'var(--chart-amber)',
      dash: [4, 3],
      width: 1.5,
    },
    {
      id: 'parabronchial',
      label: 'Gas-exchange surface',
      values: t.parabronchialPct,
      stroke: 'var(--chart-green)',
      dash: [1, 3],
      width: 2,
    },
    {
      id: 'arterial',
      label: 'Arterial blood',
      values: t.arterialPct,
      stroke: 'var(--chart-red)',
      dash: [8, 3, 2, 3],
      width: 1.5,
    },
    { id: 'brain', label: 'Brain', values: t.brainPct, stroke: 'var(--chart-blue)', width: 3 },
  ].map((line) => ({ ...line, unit: '%', digits: 2 }));
  const highest = Math.max(
    result.mac.valuePct * result.targetMacMultiple,
    ...t.inspiredPct,
    ...t.posteriorSacsPct,
  );
  const range = { min: 0, max: Math.max(1, Math.ceil(highest * 1.05)) };
  const gas: Strip = {
    id: 'gas',
    title: `${result.agent} (vol %)`,
    range,
    ticks: niceTicks(range, 4),
    weight: 4,
    lines,
    levels: [
      {
        id: 'mac',
        label: `MAC ${figureText(result.mac.valuePct, 2)} %`,
        value: result.mac.valuePct,
        stroke: 'var(--chart-ink)',
        dash: [2, 2],
        width: 1,
      },
    ],
  };
  const phases = phaseMarks(result);
  return {
    x,
    xMax: x.at(-1) ?? 0,
    xLabel: 'Minutes from the start',
    strips: [gas, dialStrip(x, planDialSteps(result, options.schedule))],
    markers: phases.markers,
    spans: phases.spans,
    stops: planStops(x),
  };
}
