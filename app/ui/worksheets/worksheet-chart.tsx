import { useMemo } from 'react';
import type { PlanResult } from '../../contract/plan.js';
import { brainBand } from '../../core/worksheet.js';
import { StripChart } from '../common/strip-chart.js';
import { depthChartData } from '../plans/plan-chart-data.js';
import { figure } from './labels.js';

type Props = {
  readonly result: PlanResult;
  /** The plan's dial steps, for a plan saved before the result listed its phases. */
  readonly schedule?: readonly { readonly atMin: number; readonly vaporPct: number }[];
  readonly onDrawn: () => void;
};

/**
 * The depth chart on paper: the same chart as the planning screen's depth view (the brain as a
 * multiple of the bird's MAC, the planned depth and waking zone shaded, the milestones marked,
 * the dial as steps below), drawn at a fixed width in the worksheet's black and greys, with every
 * line told apart by its dash.
 */
export function WorksheetChart({ result, schedule, onDrawn }: Props) {
  const { timeline, milestones, uncertainty } = result;
  const fallbackBand = useMemo(() => {
    // A plan saved before the model reported the brain's percentile curves: an approximate band
    // from the ranges of the predicted times.
    const approximate = brainBand(
      timeline.timeMin,
      timeline.brainPct,
      milestones.vaporiserOffMin,
      uncertainty.inductionMin,
      uncertainty.recoveryMin,
    );
    return approximate === null
      ? null
      : {
          ...approximate,
          label:
            'Brain, 5-95 % band (approximate: the curve stretched in time by the ranges of the predicted times; an assumption)',
        };
  }, [timeline, milestones.vaporiserOffMin, uncertainty]);
  const data = useMemo(
    () => depthChartData(result, { schedule, fallbackBand }),
    [result, schedule, fallbackBand],
  );
  const summary = `Predicted brain level over ${figure(timeline.timeMin.at(-1) ?? 0, 2)} min as a multiple of the bird’s MAC (${figure(result.mac.valuePct)} % ${result.agent}): the planned depth of ${figure(result.targetMacMultiple)} × MAC is reached at ${
    milestones.inductionMin === null ? 'no time in the plan' : `${figure(milestones.inductionMin, 2)} min`
  }; the vaporiser dial below.`;
  return (
    <div className="worksheet-chart">
      <StripChart
        data={data}
        label="Predicted depth over time"
        summary={summary}
        height={250}
        interactive={false}
        onDrawn={onDrawn}
      />
    </div>
  );
}
