import { useMemo } from 'react';
import type { PlanResult } from '../../core/model/plan-types.js';
import { TimeChart, type ChartSeries } from '../common/time-chart.js';

type Props = {
  readonly result: PlanResult;
  /** A second variant's brain curve, drawn for comparison. */
  readonly compareWith?: { readonly label: string; readonly result: PlanResult } | undefined;
  readonly height?: number;
};

/**
 * Predicted partial pressures over time (vol %), with lines at the planned depth and the
 * arousal threshold. Dash patterns keep the curves apart on a black-and-white printout.
 */
export function PlanChart({ result, compareWith, height = 300 }: Props) {
  const timeline = result.timeline;
  const depthPct = result.mac.valuePct * result.targetMacMultiple;
  const arousalPct = result.mac.valuePct * result.recoveryMacFraction.value;
  const x = timeline.timeMin;
  const series = useMemo<ChartSeries[]>(() => {
    const constant = (value: number) => x.map(() => value);
    const list: ChartSeries[] = [
      { label: 'Inspired', values: timeline.inspiredPct, stroke: '#6b7480', dash: [10, 5], width: 1.5, scale: 'pct' },
      { label: 'Posterior air sacs', values: timeline.posteriorSacsPct, stroke: '#b7791f', dash: [4, 3], width: 1.5, scale: 'pct' },
      { label: 'Parabronchial end gas', values: timeline.parabronchialPct, stroke: '#2f855a', dash: [1, 3], width: 2, scale: 'pct' },
      { label: 'Arterial', values: timeline.arterialPct, stroke: '#8a1c1c', dash: [8, 3, 2, 3], width: 1.5, scale: 'pct' },
      { label: 'Brain', values: timeline.brainPct, stroke: '#1f4e79', width: 3, scale: 'pct' },
      { label: `Planned depth (${result.targetMacMultiple} × MAC)`, values: constant(depthPct), stroke: '#1b1f24', dash: [2, 2], width: 1, scale: 'pct' },
      { label: `Arousal threshold (${result.recoveryMacFraction.value} × MAC)`, values: constant(arousalPct), stroke: '#1b1f24', dash: [12, 4, 2, 4], width: 1, scale: 'pct' },
    ];
    const band = result.uncertainty.brainBandPct;
    if (band !== null && band.p5.length === x.length) {
      // The shaded band lies between the two percentile curves (uPlot band between series).
      list.push({ label: 'Brain, 5th percentile', values: band.p5, stroke: 'rgba(31, 78, 121, 0.4)', width: 1, scale: 'pct', bandTo: list.length + 1 });
      list.push({ label: 'Brain, 95th percentile', values: band.p95, stroke: 'rgba(31, 78, 121, 0.4)', width: 1, scale: 'pct' });
    }
    if (compareWith !== undefined && compareWith.result.timeline.timeMin.length === x.length) {
      // Drawn at the same MAC multiple on this plan's axis, so plans with different agents compare fairly.
      const scale = result.mac.valuePct / compareWith.result.mac.valuePct;
      list.push({
        label: `Brain, ${compareWith.label} (same MAC multiple)`,
        values: compareWith.result.timeline.brainPct.map((value) => value * scale),
        stroke: '#6b46c1',
        dash: [6, 2],
        width: 2.5,
        scale: 'pct',
      });
    }
    return list;
  }, [timeline, x, depthPct, arousalPct, result, compareWith]);
  return (
    <TimeChart
      x={x}
      xLabel="Minutes from start"
      series={series}
      axes={[{ scale: 'pct', label: `${result.agent} (vol %)` }]}
      height={height}
      summary={`Predicted ${result.agent} partial pressures over ${Math.round(x.at(-1) ?? 0)} minutes: brain reaches ${(result.milestones.peakBrainMacMultiple).toFixed(2)} times MAC at its peak.`}
    />
  );
}
