import { useMemo } from 'react';
import type { PlanResult } from '../../core/model/plan-types.js';
import { TimeChart, type ChartSeries } from '../common/time-chart.js';

export type CompareWith = { readonly label: string; readonly result: PlanResult } | undefined;

/**
 * The chart's series for a result. The band series are always there (empty without samples) so
 * that the chart keeps its shape while the quick and the full runs alternate.
 */
export function planChartSeries(result: PlanResult, compareWith: CompareWith): ChartSeries[] {
  const timeline = result.timeline;
  const x = timeline.timeMin;
  const depthPct = result.mac.valuePct * result.targetMacMultiple;
  const arousalPct = result.mac.valuePct * result.recoveryMacFraction.value;
  const constant = (value: number) => x.map(() => value);
  const band = result.uncertainty.brainBandPct;
  const bandUsable = band !== null && band.p5.length === x.length;
  const list: ChartSeries[] = [
    {
      label: 'Inspired',
      values: timeline.inspiredPct,
      stroke: 'var(--chart-grey)',
      dash: [10, 5],
      width: 1.5,
      scale: 'pct',
    },
    {
      label: 'Posterior air sacs',
      values: timeline.posteriorSacsPct,
      stroke: 'var(--chart-amber)',
      dash: [4, 3],
      width: 1.5,
      scale: 'pct',
    },
    {
      label: 'Parabronchial end gas',
      values: timeline.parabronchialPct,
      stroke: 'var(--chart-green)',
      dash: [1, 3],
      width: 2,
      scale: 'pct',
    },
    {
      label: 'Arterial',
      values: timeline.arterialPct,
      stroke: 'var(--chart-red)',
      dash: [8, 3, 2, 3],
      width: 1.5,
      scale: 'pct',
    },
    { label: 'Brain', values: timeline.brainPct, stroke: 'var(--chart-blue)', width: 3, scale: 'pct' },
    {
      label: 'Planned depth',
      values: constant(depthPct),
      stroke: 'var(--chart-ink)',
      dash: [2, 2],
      width: 1,
      scale: 'pct',
    },
    {
      label: 'Arousal threshold',
      values: constant(arousalPct),
      stroke: 'var(--chart-ink)',
      dash: [12, 4, 2, 4],
      width: 1,
      scale: 'pct',
    },
    // The shaded band lies between the two percentile curves (uPlot band between series).
    {
      label: 'Brain, 5th percentile',
      values: bandUsable ? band.p5 : x.map(() => null),
      stroke: 'var(--chart-band-line)',
      width: 1,
      scale: 'pct',
      bandTo: 8,
    },
    {
      label: 'Brain, 95th percentile',
      values: bandUsable ? band.p95 : x.map(() => null),
      stroke: 'var(--chart-band-line)',
      width: 1,
      scale: 'pct',
    },
  ];
  if (compareWith !== undefined && compareWith.result.timeline.timeMin.length === x.length) {
    // Drawn at the same MAC multiple on this plan's axis, so plans with different agents compare fairly.
    const scale = result.mac.valuePct / compareWith.result.mac.valuePct;
    list.push({
      label: `Brain, ${compareWith.label} (same MAC multiple)`,
      values: compareWith.result.timeline.brainPct.map((value) => value * scale),
      stroke: 'var(--chart-violet)',
      dash: [6, 2],
      width: 2.5,
      scale: 'pct',
    });
  }
  return list;
}

type Props = {
  readonly result: PlanResult;
  /** A second variant's brain curve, drawn for comparison. */
  readonly compareWith?: CompareWith;
  readonly height?: number;
};

/**
 * Predicted partial pressures over time (vol %), with lines at the planned depth and the
 * arousal threshold. Dash patterns keep the curves apart on a black-and-white printout.
 */
export function PlanChart({ result, compareWith, height = 300 }: Props) {
  const x = result.timeline.timeMin;
  const series = useMemo(() => planChartSeries(result, compareWith), [result, compareWith]);
  return (
    <TimeChart
      x={x}
      xLabel="Minutes from start"
      series={series}
      axes={[{ scale: 'pct', label: `${result.agent} (vol %)` }]}
      height={height}
      summary={`Predicted ${result.agent} partial pressures over ${Math.round(x.at(-1) ?? 0)} minutes: brain reaches ${result.milestones.peakBrainMacMultiple.toFixed(2)} times MAC at its peak; planned depth ${result.targetMacMultiple} × MAC, arousal threshold ${result.recoveryMacFraction.value} × MAC.`}
    />
  );
}
