import { useState } from 'react';
import type { CalibrationView } from '../../contract/evidence-channels.js';
import { api } from '../common/bridge.js';
import { useInitialsGate } from '../common/initials-gate.js';
import { ScrollRegion } from '../common/scroll-region.js';
import { href } from '../shell/areas.js';
import { calibrationMilestoneHeading, calibrationSwitchText, factorText } from './evidence-text.js';

/** The clinic's calibration per milestone and species, the switch, and every record that went in. */
export function CalibrationPanel({
  calibration,
  onChanged,
}: {
  readonly calibration: CalibrationView;
  readonly onChanged: () => void;
}) {
  const { gate, withInitials } = useInitialsGate();
  const [message, setMessage] = useState<string | null>(null);

  function toggle() {
    const reason = calibration.on
      ? 'switched off from the evidence view'
      : 'switched on from the evidence view';
    withInitials((enteredBy) => {
      void (async () => {
        const answer = await api.invoke('evidence:set-calibration', {
          on: !calibration.on,
          meta: { enteredBy, reason },
        });
        setMessage(answer.ok ? null : answer.error.message);
        if (answer.ok) onChanged();
      })();
    });
  }

  return (
    <section className="evidence-calibration" aria-labelledby="calibration-title">
      <h2 id="calibration-title">Calibration on your records</h2>
      <p>
        {calibrationSwitchText(calibration)}{' '}
        <button type="button" onClick={toggle}>
          {calibration.on ? 'Switch calibration off' : 'Switch calibration on'}
        </button>
      </p>
      {gate}
      {message !== null && (
        <p className="form-error" role="alert">
          {message}
        </p>
      )}
      {calibration.pending > 0 && (
        <p className="evidence-pending" role="status">
          Rests on the records compared so far: {calibration.pending}{' '}
          {calibration.pending === 1 ? 'record is' : 'records are'} still being compared with the model and
          not in these figures yet.
        </p>
      )}
      <p className="basis">{calibration.method}</p>
      <p className="basis">{calibration.priorBasis}</p>
      {calibration.milestones.map((milestone) => {
        const withRecords = milestone.species.filter((entry) => entry.speciesRecords > 0);
        return (
          <div key={milestone.id}>
            <h3>{calibrationMilestoneHeading(milestone)}</h3>
            {withRecords.length === 0 ? (
              <p>No species has records of this milestone yet.</p>
            ) : (
              <ScrollRegion label={`${milestone.label}: calibration per species`}>
                <table className="evidence-table">
                  <thead>
                    <tr>
                      <th scope="col">Species</th>
                      <th scope="col">Records (species / group / clinic)</th>
                      <th scope="col">Observed / population model</th>
                      <th scope="col">90 % band</th>
                    </tr>
                  </thead>
                  <tbody>
                    {withRecords.map((entry) => (
                      <tr key={entry.speciesKey}>
                        <th scope="row">{entry.speciesName}</th>
                        <td>
                          {entry.speciesRecords} / {entry.groupRecords} ({entry.groupName}) /{' '}
                          {entry.clinicRecords}
                        </td>
                        <td>{factorText(entry.factor)}</td>
                        <td>
                          {factorText(entry.band90.low)} to {factorText(entry.band90.high)}
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </ScrollRegion>
            )}
          </div>
        );
      })}
      <details>
        <summary>Every record that went in ({calibration.recordsIn.length})</summary>
        <ul className="evidence-records-in">
          {calibration.recordsIn.map((entry) => (
            <li key={entry.recordId}>
              <a href={href('records', entry.recordId)}>Record {entry.recordId}</a> ({entry.milestones.length}{' '}
              milestones)
            </li>
          ))}
        </ul>
      </details>
    </section>
  );
}
