import { href } from '../shell/areas.js';
import { useChannel } from '../common/use-channel.js';
import { useChangeNotices } from '../common/use-change-notices.js';
import { asaText } from './record-form.js';
import { ScrollRegion } from '../common/scroll-region.js';
import { displayDateTime, displayLaterTime } from '../common/display.js';

/** The most recent procedure records, newest first, each linking to its live screen. */
export function RecentRecords() {
  const [recent, reload] = useChannel('procedures:recent', { limit: 50 });
  useChangeNotices((notice) => notice.kind === 'procedure-records' || notice.kind === 'patients', reload);
  return (
    <section className="screen" aria-labelledby="records-title">
      <h1 id="records-title">Procedure records</h1>
      <p className="lead">
        Start a record from a patient’s page, or{' '}
        <a href={href('records', 'new')}>choose a patient for a new procedure record</a>.
      </p>
      {recent.state === 'loading' && <p aria-busy="true">Loading records…</p>}
      {recent.state === 'failed' && (
        <p className="form-error" role="alert">
          Records could not be loaded: {recent.error.message}{' '}
          <button type="button" onClick={reload}>
            Try again
          </button>
        </p>
      )}
      {recent.state === 'ready' && recent.value.length === 0 && <p>No procedure records yet.</p>}
      {recent.state === 'ready' && recent.value.length > 0 && (
        <ScrollRegion label="Recent procedure records">
          <table className="record-table record-recent">
            <thead>
              <tr>
                <th scope="col">Patient</th>
                <th scope="col">Species</th>
                <th scope="col">Procedure</th>
                <th scope="col">Start</th>
                <th scope="col">ASA</th>
                <th scope="col">Status</th>
              </tr>
            </thead>
            <tbody>
              {recent.value.map(({ record, patientName, speciesName }) => (
                <tr key={record.id}>
                  <td>
                    <a href={href('records', record.id)}>{patientName}</a>
                  </td>
                  <td>{speciesName ?? record.patientId}</td>
                  <td>{record.values.procedureName}</td>
                  <td>{displayDateTime(record.values.startedAt)}</td>
                  <td>{asaText(record.values)}</td>
                  <td>
                    {record.values.endedAt === null
                      ? 'open'
                      : `ended ${displayLaterTime(record.values.startedAt, record.values.endedAt)}`}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      )}
    </section>
  );
}
