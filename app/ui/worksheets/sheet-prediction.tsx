import type { PlanResult } from '../../contract/plan.js';
import { minutesText, minutesWithRangeText } from '../../core/worksheet.js';
import { figure } from './labels.js';
import { Row } from './sheet-row.js';
import { WorksheetChart } from './worksheet-chart.js';

/** The predicted course: the chart (which reports when drawn) and the milestones with their ranges. */
export function PredictionSection({
  result,
  onDrawn,
}: {
  readonly result: PlanResult;
  readonly onDrawn: () => void;
}) {
  return (
    <section className="ws-section" aria-labelledby="ws-prediction">
      <h2 id="ws-prediction">Predicted course</h2>
      <WorksheetChart result={result} onDrawn={onDrawn} />
      <table className="ws-facts ws-milestones">
        <tbody>
          <Row label="Predicted induction (time to planned depth)">
            <strong>
              {minutesWithRangeText(result.milestones.inductionMin, result.uncertainty.inductionMin)}
            </strong>
          </Row>
          <Row label="Vaporiser off">
            {result.milestones.vaporiserOffMin === null
              ? 'not in the schedule'
              : `at ${figure(result.milestones.vaporiserOffMin)} min`}
          </Row>
          <Row label="Predicted recovery (after vaporiser off)">
            <strong>
              {minutesWithRangeText(result.milestones.recoveryMin, result.uncertainty.recoveryMin)}
            </strong>
          </Row>
          <Row label="Air sacs 95 % washed in">
            {result.milestones.airSacWashin95Breaths === null
              ? 'not reached'
              : `${figure(result.milestones.airSacWashin95Breaths, 2)} breaths (${minutesText(result.milestones.airSacWashin95Min)})`}
          </Row>
          <Row label="Air sacs 95 % washed out">
            {result.milestones.airSacWashout95Breaths === null
              ? 'not reached'
              : `${figure(result.milestones.airSacWashout95Breaths, 2)} breaths (${minutesText(result.milestones.airSacWashout95Min)})`}
          </Row>
          <Row label="Deepest predicted level">
            {figure(result.milestones.peakBrainMacMultiple, 2)} x MAC in the brain
          </Row>
          <Row label="Lowest predicted breathing">
            {figure(result.milestones.lowestVentilationFraction * 100, 2)} % of resting ventilation
          </Row>
        </tbody>
      </table>
      <p className="ws-basis">
        {result.milestones.basis} Ranges are the 5th to 95th percentiles of {result.uncertainty.samples} model
        runs with sampled parameters ({result.uncertainty.method}).
      </p>
    </section>
  );
}
