import type { PlanResult } from '../../contract/plan.js';
import { clinicalMilestoneLines, type ClinicalMilestoneLine } from '../../core/clinical-milestones.js';
import {
  calibratedFigureMeaning,
  savedPlanCalibrationText,
  type CalibratedFigures,
  type CalibratedLine,
} from '../../core/evidence/calibrated-figure.js';
import { minutesText } from '../../core/worksheet.js';
import { figure } from './labels.js';
import { Row } from './sheet-row.js';
import { WorksheetChart } from './worksheet-chart.js';

/** The clinic's calibration as read when the sheet was drawn, or null when it could not be read. */
export type SheetCalibration = {
  readonly figures: CalibratedFigures | null;
  /** The day it was read, in the clinic's date format. */
  readonly dateText: string;
  /** Completed records still being compared when it was read (calibrationPendingText), or null. */
  readonly pendingText: string | null;
};

/**
 * One predicted milestone: minutes, 5-95 % range and not-reached note, with a footnote mark that
 * points at its definition under the table (on paper) and the definition on hover (on screen);
 * under it, the clinic's calibrated figure and what it rests on, when the calibration covers it.
 */
function MilestoneRow({
  line,
  mark,
  calibrated,
}: {
  readonly line: ClinicalMilestoneLine;
  readonly mark: number;
  readonly calibrated: CalibratedLine | undefined;
}) {
  return (
    <tr data-milestone={line.id}>
      <th scope="row" title={line.definition}>
        {line.label}
        <sup aria-hidden="true">{mark}</sup>
      </th>
      <td>
        <strong>{line.minutesText}</strong>
        {line.minutes === null ? '' : line.from === 'start' ? ' from start' : ' after vaporiser off'}
        {line.rangeText === null ? '' : ` (5-95 % range ${line.rangeText})`}
        {line.note === null ? '' : `; ${line.note}`}
        {calibrated !== undefined && (
          <span className="ws-block ws-small ws-calibrated" data-calibrated={calibrated.id}>
            Your clinic: <strong>{calibrated.calibratedText}</strong>; {calibrated.basis}
          </span>
        )}
      </td>
    </tr>
  );
}

/** The predicted course: the chart (which reports when drawn) and the milestones with their ranges. */
export function PredictionSection({
  result,
  schedule,
  onDrawn,
  calibration,
}: {
  readonly result: PlanResult;
  /** The plan's dial steps (drawn when the result lists no phases). */
  readonly schedule?: readonly { readonly atMin: number; readonly vaporPct: number }[];
  readonly onDrawn: () => void;
  readonly calibration: SheetCalibration;
}) {
  const lines = clinicalMilestoneLines(result);
  const figures = calibration.figures;
  const calibratedOf = (line: ClinicalMilestoneLine) =>
    figures?.state === 'on' ? figures.lines.find((entry) => entry.id === line.id) : undefined;
  return (
    <section className="ws-section" aria-labelledby="ws-prediction">
      <h2 id="ws-prediction">Predicted course</h2>
      <WorksheetChart result={result} schedule={schedule} onDrawn={onDrawn} />
      <table className="ws-facts ws-milestones">
        <tbody>
          {lines
            .filter((line) => line.from === 'start')
            .map((line) => (
              <MilestoneRow
                key={line.id}
                line={line}
                mark={lines.indexOf(line) + 1}
                calibrated={calibratedOf(line)}
              />
            ))}
          <Row label="Vaporiser off">
            {result.milestones.vaporiserOffMin === null
              ? 'not in the schedule'
              : `at ${figure(result.milestones.vaporiserOffMin)} min`}
          </Row>
          {lines
            .filter((line) => line.from === 'vaporiser off')
            .map((line) => (
              <MilestoneRow
                key={line.id}
                line={line}
                mark={lines.indexOf(line) + 1}
                calibrated={calibratedOf(line)}
              />
            ))}
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
      <p className="ws-small ws-calibration-note" data-calibration={figures?.state ?? 'unread'}>
        <strong>Your clinic’s calibration ({calibration.dateText}):</strong>{' '}
        {figures === null
          ? 'could not be read when this sheet was drawn: the population model alone.'
          : figures.state === 'on'
            ? `${calibratedFigureMeaning} ${savedPlanCalibrationText(calibration.dateText)}${calibration.pendingText === null ? '' : ` ${calibration.pendingText}`}`
            : figures.text}
      </p>
      <ol className="ws-basis ws-milestone-definitions" aria-label="What each predicted milestone means">
        {lines.map((line) => (
          <li key={line.id}>{line.definition}</li>
        ))}
      </ol>
      <p className="ws-basis">
        {result.milestones.basis} Ranges are the 5th to 95th percentiles of {result.uncertainty.samples} model
        runs with sampled parameters ({result.uncertainty.method}).
      </p>
    </section>
  );
}
