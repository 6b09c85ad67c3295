import { useId, useMemo, useState } from 'react';
import type { PlanResult } from '../../core/model/plan-types.js';
import { StripChart } from '../common/strip-chart.js';
import { figureText } from '../common/strip-chart-model.js';
import { depthChartData, gasChartData, type ComparedPlan } from './plan-chart-data.js';

export type CompareWith = ComparedPlan;

type View = 'depth' | 'gas';

const viewNames: Readonly<Record<View, string>> = {
  depth: 'Depth (× MAC)',
  gas: 'Gas in the airways and air sacs',
};

type Props = {
  readonly result: PlanResult;
  /** A second variant's brain curve, drawn for comparison. */
  readonly compareWith?: CompareWith;
  /** The plan's dial steps, for a result that lists no phases. */
  readonly schedule?: readonly { readonly atMin: number; readonly vaporPct: number }[];
  readonly height?: number;
};

/**
 * The planning chart. It leads with depth: the brain as a multiple of the bird's MAC against the
 * planned depth and the levels at which a bird wakes, the dial as steps below. A second view shows
 * the agent in the airways, the air sacs, the blood and the brain.
 */
export function PlanChart({ result, compareWith, schedule, height = 330 }: Props) {
  const [view, setView] = useState<View>('depth');
  const name = useId();
  const data = useMemo(
    () =>
      view === 'depth'
        ? depthChartData(result, { compareWith, schedule })
        : gasChartData(result, { compareWith, schedule }),
    [view, result, compareWith, schedule],
  );
  const spanText = `${figureText(result.timeline.timeMin.at(-1) ?? 0, 0)} minutes`;
  const summary =
    view === 'depth'
      ? `Predicted brain level over ${spanText}, as a multiple of the bird’s MAC: deepest ${figureText(result.milestones.peakBrainMacMultiple, 2)} × MAC; planned depth ${figureText(result.targetMacMultiple, 2)} × MAC; first movement below ${figureText(result.recoveryMacFraction.value, 2)} × MAC. The vaporiser dial is drawn as steps below.`
      : `Predicted ${result.agent} in vol % over ${spanText}: as breathed in, in the posterior air sacs, at the gas-exchange surface, in arterial blood and in the brain; the vaporiser dial below.`;
  return (
    <div className="plan-chart">
      <fieldset className="chart-views">
        <legend className="visually-hidden">Chart view</legend>
        {(Object.keys(viewNames) as View[]).map((key) => (
          <label key={key} className={view === key ? 'chart-view chart-view-current' : 'chart-view'}>
            <input
              type="radio"
              name={name}
              value={key}
              checked={view === key}
              onChange={() => setView(key)}
            />{' '}
            {viewNames[key]}
          </label>
        ))}
      </fieldset>
      <StripChart
        data={data}
        label={
          view === 'depth'
            ? 'Predicted depth over time'
            : 'Predicted gas in the airways and air sacs over time'
        }
        summary={summary}
        height={height}
      />
    </div>
  );
}
