import {
  calibratedFigureMeaning,
  calibrationPendingText,
  calibratedFigures,
  savedPlanCalibrationText,
} from '../../core/evidence/calibrated-figure.js';
import { clinicalMilestoneLines } from '../../core/clinical-milestones.js';
import type { PlanResult } from '../../core/model/plan-types.js';
import { displayDate, todayIso } from '../common/display.js';
import { useChannel } from '../common/use-channel.js';
import { useChangeNotices } from '../common/use-change-notices.js';
import { href } from '../shell/areas.js';
import './evidence.css';

/**
 * The population prediction beside the clinic's calibrated one, with its band and what it rests
 * on. A saved plan keeps the numbers it was saved with; the calibrated figure is today's.
 */
export function PlanCalibration({
  result,
  speciesKey,
  savedPlanId,
}: {
  readonly result: PlanResult;
  readonly speciesKey: string | undefined;
  readonly savedPlanId: number | null;
}) {
  const [load, reload] = useChannel('evidence:calibration', {});
  useChangeNotices((notice) => notice.kind === 'evidence', reload);
  const [savedLoad] = useChannel('plans:get', { id: savedPlanId ?? 1 });
  if (load.state !== 'ready' || speciesKey === undefined) return null;
  const saved = savedPlanId !== null && savedLoad.state === 'ready' ? savedLoad.value.plan.result : null;
  const savedLines = saved === null ? null : clinicalMilestoneLines(saved);
  const figures = calibratedFigures(result, speciesKey, load.value);
  const pendingText = calibrationPendingText(load.value.pending);
  if (figures.state !== 'on')
    return (
      <section className="panel evidence-plan" aria-labelledby="plan-calibration-title">
        <h2 id="plan-calibration-title">Your clinic’s calibration</h2>
        <p>
          {figures.text}{' '}
          <a href={href('evidence')}>
            {figures.state === 'off' ? 'Switch it on or see the records' : 'See the records'}
          </a>
        </p>
      </section>
    );
  return (
    <section className="panel evidence-plan" aria-labelledby="plan-calibration-title">
      <h2 id="plan-calibration-title">Population model and your clinic’s calibration</h2>
      <table className="evidence-table">
        <thead>
          <tr>
            <th scope="col">Milestone</th>
            <th scope="col">Population model</th>
            {savedLines !== null && <th scope="col">Saved with the plan</th>}
            <th scope="col">Calibrated on your records</th>
            <th scope="col">Rests on</th>
          </tr>
        </thead>
        <tbody>
          {figures.lines.map((line) => (
            <tr key={line.id}>
              <th scope="row">{line.population.label}</th>
              <td data-testid={`population-${line.id}`}>{line.population.minutesText}</td>
              {savedLines !== null && (
                <td>{savedLines.find((entry) => entry.id === line.id)?.minutesText ?? '—'}</td>
              )}
              <td data-testid={`calibrated-${line.id}`}>{line.calibratedText}</td>
              <td data-testid={`rests-on-${line.id}`}>{line.basis}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {pendingText !== null && (
        <p className="evidence-pending" role="status" data-testid="calibration-pending">
          {pendingText} They update when ready.
        </p>
      )}
      <p className="basis">
        {calibratedFigureMeaning}{' '}
        {savedLines !== null ? `${savedPlanCalibrationText(displayDate(todayIso()))} ` : ''}
        <a href={href('evidence')}>See every record that went in</a>
      </p>
    </section>
  );
}
