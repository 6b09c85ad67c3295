import { clinicalMilestoneLines } from '../../core/clinical-milestones.js';
import type { EvidenceMilestoneId } from '../../core/evidence/observed.js';
import type { PlanResult } from '../../core/model/plan-types.js';
import { useChannel } from '../common/use-channel.js';
import { useChangeNotices } from '../common/use-change-notices.js';
import { href } from '../shell/areas.js';
import './evidence.css';

const verbs: Readonly<Record<EvidenceMilestoneId, string>> = {
  lossOfRighting: 'lose righting',
  surgicalDepth: 'reach surgical depth',
  firstMovement: 'first move',
  standing: 'stand',
};

const factorWords = (factor: number, verb: string) =>
  Math.abs(factor - 1) < 0.05
    ? `${verb} about when the population model says`
    : factor > 1
      ? `${verb} ${factor.toFixed(1)}x later than the population model`
      : `${verb} ${(1 / factor).toFixed(1)}x sooner than the population model`;

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
  const calibration = load.value;
  const saved = savedPlanId !== null && savedLoad.state === 'ready' ? savedLoad.value.plan.result : null;
  const savedLines = saved === null ? null : clinicalMilestoneLines(saved);
  const lines = clinicalMilestoneLines(result);
  if (!calibration.on)
    return (
      <section className="panel evidence-plan" aria-labelledby="plan-calibration-title">
        <h2 id="plan-calibration-title">Your clinic’s calibration</h2>
        <p>
          Calibration is off: the population model alone.{' '}
          <a href={href('evidence')}>Switch it on or see the records</a>
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
            <th scope="col">Calibrated on your records (90 %)</th>
            <th scope="col">Rests on</th>
          </tr>
        </thead>
        <tbody>
          {lines.map((line) => {
            const milestone = calibration.milestones.find((entry) => entry.id === line.id);
            const species = milestone?.species.find((entry) => entry.speciesKey === speciesKey);
            const savedLine = savedLines?.find((entry) => entry.id === line.id);
            return (
              <tr key={line.id}>
                <th scope="row">{line.label}</th>
                <td data-testid={`population-${line.id}`}>{line.minutesText}</td>
                {savedLines !== null && <td>{savedLine?.minutesText ?? '—'}</td>}
                <td data-testid={`calibrated-${line.id}`}>
                  {species === undefined || line.minutes === null
                    ? '—'
                    : `${(line.minutes * species.factor).toFixed(1)} min (${(line.minutes * species.band90.low).toFixed(1)} to ${(line.minutes * species.band90.high).toFixed(1)})`}
                </td>
                <td data-testid={`rests-on-${line.id}`}>
                  {species === undefined
                    ? 'no calibration'
                    : species.speciesRecords > 0
                      ? `calibrated on ${species.speciesRecords} of your ${species.speciesName.toLowerCase()} records; your ${species.speciesName.toLowerCase()}s ${factorWords(species.factor, verbs[line.id])}`
                      : species.clinicRecords > 0
                        ? `no ${species.speciesName.toLowerCase()} records yet: follows your ${species.groupRecords} records of ${species.groupName.toLowerCase()} and ${species.clinicRecords} of the clinic`
                        : 'no records yet: the population model'}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      {calibration.pending > 0 && (
        <p className="evidence-pending" role="status" data-testid="calibration-pending">
          Calibrated on the records compared so far: {calibration.pending} more{' '}
          {calibration.pending === 1 ? 'record is' : 'records are'} still being compared with the model and
          not in these figures yet; they update when ready.
        </p>
      )}
      <p className="basis">
        The calibrated figure is the population prediction times your clinic’s observed / predicted factor for
        this species, shrunk towards its group of species and the whole clinic when records are few; the band
        is for your typical bird of the species.{' '}
        {savedLines !== null
          ? 'A saved plan keeps the numbers it was saved with; the calibrated figure is today’s. '
          : ''}
        <a href={href('evidence')}>See every record that went in</a>
      </p>
    </section>
  );
}
