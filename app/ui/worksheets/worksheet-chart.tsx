import { useEffect, useMemo, useRef } from 'react';
import type { PlanResult } from '../../contract/plan.js';
import { brainBand } from '../../core/worksheet.js';
import { TimeChart, type ChartSeries } from '../common/time-chart.js';
import { figure } from './labels.js';

type Line = {
  readonly label: string;
  readonly stroke: string;
  readonly dash: readonly number[];
  readonly width: number;
};

// Black and grey with distinct dash patterns, so the curves stay apart on a black-and-white copy.
const lines = {
  inspired: { label: 'Inspired', stroke: '#000000', dash: [2, 3], width: 1.5 },
  posteriorSacs: { label: 'Posterior air sacs', stroke: '#404040', dash: [10, 4], width: 1.5 },
  parabronchial: { label: 'Parabronchial', stroke: '#404040', dash: [6, 3, 2, 3], width: 1.5 },
  arterial: { label: 'Arterial', stroke: '#202020', dash: [3, 3], width: 2 },
  brain: { label: 'Brain', stroke: '#000000', dash: [], width: 3 },
  depth: { label: 'Planned depth', stroke: '#000000', dash: [14, 3, 3, 3], width: 1 },
  arousal: { label: 'Arousal threshold', stroke: '#000000', dash: [14, 3, 3, 3, 3, 3], width: 1 },
} as const satisfies Record<string, Line>;

function KeySample({ line }: { readonly line: Line }) {
  return (
    <svg width="40" height="10" viewBox="0 0 40 10" aria-hidden="true" focusable="false">
      <line
        x1="0"
        y1="5"
        x2="40"
        y2="5"
        stroke={line.stroke}
        strokeWidth={line.width}
        strokeDasharray={line.dash.length === 0 ? undefined : line.dash.join(' ')}
      />
    </svg>
  );
}

type Props = { readonly result: PlanResult; readonly onDrawn: () => void };

type PercentileCurves = { readonly p5: readonly number[]; readonly p95: readonly number[] };

function modelBand(uncertainty: PlanResult['uncertainty']): PercentileCurves | null {
  const loose: unknown = uncertainty;
  const band = (loose as { brainBandPct?: PercentileCurves | null }).brainBandPct;
  return band === undefined || band === null || !Array.isArray(band.p5) || !Array.isArray(band.p95)
    ? null
    : band;
}

/** The predicted partial pressures over time, with the planned depth and the arousal threshold. */
export function WorksheetChart({ result, onDrawn }: Props) {
  const { timeline, milestones, uncertainty, mac } = result;
  const depthPct = result.targetMacMultiple * mac.valuePct;
  const arousalPct = result.recoveryMacFraction.value * mac.valuePct;
  const band = useMemo((): {
    lowPct: readonly number[];
    highPct: readonly number[];
    fromModel: boolean;
  } | null => {
    // Newer model versions report percentile curves of the brain; older snapshots only the
    // ranges of the times, from which an approximate band is drawn.
    const reported = modelBand(uncertainty);
    if (reported !== null && reported.p5.length === timeline.timeMin.length)
      return { lowPct: reported.p5, highPct: reported.p95, fromModel: true };
    const approximate = brainBand(
      timeline.timeMin,
      timeline.brainPct,
      milestones.vaporiserOffMin,
      uncertainty.inductionMin,
      uncertainty.recoveryMin,
    );
    return approximate === null ? null : { ...approximate, fromModel: false };
  }, [timeline, milestones.vaporiserOffMin, uncertainty]);
  const series = useMemo((): ChartSeries[] => {
    const constant = (value: number) => timeline.timeMin.map(() => value);
    const list: ChartSeries[] = [
      { ...lines.inspired, values: timeline.inspiredPct },
      { ...lines.posteriorSacs, values: timeline.posteriorSacsPct },
      { ...lines.parabronchial, values: timeline.parabronchialPct },
      { ...lines.arterial, values: timeline.arterialPct },
      { ...lines.brain, values: timeline.brainPct },
      { ...lines.depth, values: constant(depthPct) },
      { ...lines.arousal, values: constant(arousalPct) },
    ];
    if (band !== null) {
      list.push({ label: 'Brain band low', stroke: '#8c8c8c', width: 0.5, values: band.lowPct });
      list.push({
        label: 'Brain band high',
        stroke: '#8c8c8c',
        width: 0.5,
        values: band.highPct,
        bandTo: list.length - 1,
      });
    }
    return list;
  }, [timeline, depthPct, arousalPct, band]);

  const wrapper = useRef<HTMLDivElement | null>(null);
  useEffect(() => {
    // Two frames: uPlot commits its first drawing on the frame after setData.
    let second = 0;
    const first = window.requestAnimationFrame(() => {
      second = window.requestAnimationFrame(() => {
        if (wrapper.current?.querySelector('canvas') !== null) onDrawn();
      });
    });
    return () => {
      window.cancelAnimationFrame(first);
      window.cancelAnimationFrame(second);
    };
  }, [series, onDrawn]);

  const summary = `Predicted agent partial pressures in vol % over ${figure(timeline.timeMin.at(-1) ?? 0, 2)} min: brain reaches the planned depth of ${figure(depthPct)} % at ${
    milestones.inductionMin === null ? 'no time in the plan' : `${figure(milestones.inductionMin, 2)} min`
  }.`;
  return (
    <div className="worksheet-chart" ref={wrapper}>
      <TimeChart
        x={timeline.timeMin}
        xLabel="Time (min)"
        series={series}
        axes={[{ scale: 'y', label: 'Agent (vol %)' }]}
        height={250}
        summary={summary}
      />
      <ul className="chart-key">
        {Object.values(lines).map((line) => (
          <li key={line.label}>
            <KeySample line={line} /> {line.label}
            {line === lines.depth
              ? ` (${figure(result.targetMacMultiple)} x MAC = ${figure(depthPct)} %)`
              : ''}
            {line === lines.arousal
              ? ` (${figure(result.recoveryMacFraction.value)} x MAC = ${figure(arousalPct)} %)`
              : ''}
          </li>
        ))}
        {band !== null && (
          <li>
            <svg width="40" height="10" viewBox="0 0 40 10" aria-hidden="true" focusable="false">
              <rect x="0" y="1" width="40" height="8" fill="#c8c8c8" stroke="#8c8c8c" strokeWidth="0.5" />
            </svg>{' '}
            {band.fromModel
              ? `Brain 5-95 % band over ${String(uncertainty.samples)} model runs with sampled parameters`
              : 'Brain 5-95 % band (approximate: the curve stretched in time by the ranges of the predicted times; an assumption)'}
          </li>
        )}
      </ul>
    </div>
  );
}
