import type { ProcedureEntryValues } from '../../contract/records.js';
import { clockText } from './clock-time.js';
import { recoveryMilestones } from './monitoring.js';

/** The recovery milestones (vaporiser off to standing) with their clock times and minutes after gas off. */
export function Milestones({
  entries,
}: {
  readonly entries: readonly { readonly values: ProcedureEntryValues }[];
}) {
  const milestones = recoveryMilestones(entries);
  return (
    <dl className="record-milestones" aria-label="Recovery milestones">
      {milestones.map((milestone) => (
        <div
          key={milestone.eventType}
          className={milestone.at === null ? 'record-milestone-pending' : 'record-milestone-done'}
        >
          <dt>{milestone.label}</dt>
          <dd>
            {milestone.at === null ? '—' : clockText(milestone.at)}
            {milestone.minutesAfterGasOff !== null &&
              milestone.eventType !== 'vaporiserOff' &&
              ` (+${milestone.minutesAfterGasOff} min)`}
          </dd>
        </div>
      ))}
    </dl>
  );
}
