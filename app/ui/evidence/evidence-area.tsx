import { useMemo, useState } from 'react';
import type { EvidenceFilter, EvidenceRow } from '../../contract/evidence-channels.js';
import { agentIds, agentLabels } from '../../core/agents.js';
import { routeLabels, routes } from '../../core/delivery.js';
import {
  evidenceMilestoneIds,
  milestoneEvents,
  type EvidenceMilestoneId,
} from '../../core/evidence/observed.js';
import { api } from '../common/bridge.js';
import { downloadText } from '../common/download.js';
import { ScrollRegion } from '../common/scroll-region.js';
import { useChannel } from '../common/use-channel.js';
import { useChangeNotices } from '../common/use-change-notices.js';
import { useInitialsGate } from '../common/initials-gate.js';
import { href } from '../shell/areas.js';
import { CalibrationPanel } from './calibration-panel.js';
import { EvidenceChart } from './evidence-chart.js';
import { mergeFilter } from './evidence-filter.js';
import { evidenceCountsText, tableMinutesText as minutes } from './evidence-text.js';
import './evidence.css';

/** Rows shown at first; the rest on request, so a clinic of thousands of records opens quickly. */
const firstRows = 200;

/** "312 records still being compared" (the clinic's completed records whose rows are not ready yet). */
export const pendingWords = (pending: number) =>
  `${pending} ${pending === 1 ? 'record' : 'records'} still being compared with the model`;

/** "Observed vs predicted": the clinic's completed records beside the model, filterable, with CSV. */
export function EvidenceArea() {
  const [filter, setFilter] = useState<EvidenceFilter>({});
  const [milestone, setMilestone] = useState<EvidenceMilestoneId>('standing');
  const [showAll, setShowAll] = useState(false);
  const [load, reload] = useChannel('evidence:list', filter);
  const [calibrationLoad, reloadCalibration] = useChannel('evidence:calibration', {});
  const [speciesLoad] = useChannel('species:list', {});
  const [message, setMessage] = useState<string | null>(null);
  const label = milestoneEvents[milestone].label;
  // Rows computed in the background (or on another workstation), exclusions and the switch; a
  // record that ended or was corrected (its row is stored before that notice).
  useChangeNotices(
    (notice) => notice.kind === 'evidence' || notice.kind === 'procedure-records',
    () => {
      reload();
      reloadCalibration();
    },
  );

  function update(change: Partial<EvidenceFilter>) {
    setFilter(mergeFilter(filter, change));
  }

  async function exportCsv() {
    const answer = await api.invoke('evidence:export-csv', filter);
    if (answer.ok) downloadText(answer.value.fileName, answer.value.csv, 'text/csv;charset=utf-8');
    setMessage(
      answer.ok
        ? `Exported ${answer.value.rows} records.${answer.value.pending > 0 ? ` ${pendingWords(answer.value.pending)} not in the file yet.` : ''}`
        : `Export failed: ${answer.error.message}`,
    );
  }

  const rows = useMemo(() => (load.state === 'ready' ? load.value.rows : []), [load]);
  const shown = useMemo(() => (showAll ? rows : rows.slice(0, firstRows)), [rows, showAll]);

  return (
    <section className="screen evidence" aria-labelledby="evidence-title">
      <h1 id="evidence-title">Observed vs predicted</h1>
      <p>
        Each completed procedure record beside what the model predicts for what was given: the logged dial,
        flow, intubation, IPPV and heart rate. Induction and intubation are timed from the first dial above 0;
        first movement and standing from the vaporiser off. A record with a missing event is skipped for that
        milestone and counted, never filled in.
      </p>
      <form
        className="evidence-filters"
        onSubmit={(event) => event.preventDefault()}
        aria-label="Filter the records"
      >
        <label>
          Species{' '}
          <select
            value={filter.speciesKey ?? ''}
            onChange={(event) => update({ speciesKey: event.target.value })}
          >
            <option value="">All</option>
            {speciesLoad.state === 'ready' &&
              speciesLoad.value.map((species) => (
                <option key={species.key} value={species.key}>
                  {species.values.commonName}
                </option>
              ))}
          </select>
        </label>
        <label>
          Agent{' '}
          <select
            value={filter.agent ?? ''}
            onChange={(event) =>
              update({ agent: (event.target.value || undefined) as EvidenceFilter['agent'] })
            }
          >
            <option value="">All</option>
            {agentIds.map((agent) => (
              <option key={agent} value={agent}>
                {agentLabels[agent]}
              </option>
            ))}
          </select>
        </label>
        <label>
          Airway{' '}
          <select
            value={filter.route ?? ''}
            onChange={(event) =>
              update({ route: (event.target.value || undefined) as EvidenceFilter['route'] })
            }
          >
            <option value="">All</option>
            {routes.map((route) => (
              <option key={route} value={route}>
                {routeLabels[route]}
              </option>
            ))}
          </select>
        </label>
        <label>
          Staff{' '}
          <input
            size={6}
            value={filter.staffInitials ?? ''}
            onChange={(event) => update({ staffInitials: event.target.value })}
          />
        </label>
        <label>
          From{' '}
          <input
            type="date"
            value={filter.from ?? ''}
            onChange={(event) => update({ from: event.target.value })}
          />
        </label>
        <label>
          To{' '}
          <input
            type="date"
            value={filter.to ?? ''}
            onChange={(event) => update({ to: event.target.value })}
          />
        </label>
        <label>
          Milestone{' '}
          <select
            value={milestone}
            onChange={(event) => setMilestone(event.target.value as EvidenceMilestoneId)}
          >
            {evidenceMilestoneIds.map((id) => (
              <option key={id} value={id}>
                {milestoneEvents[id].label}
              </option>
            ))}
          </select>
        </label>
        <button type="button" onClick={() => void exportCsv()}>
          Export CSV
        </button>
      </form>
      {message !== null && <p role="status">{message}</p>}
      {load.state === 'loading' && <p aria-busy="true">Reading the records…</p>}
      {load.state === 'failed' && (
        <p className="form-error" role="alert">
          {load.error.message}
        </p>
      )}
      {load.state === 'ready' && (
        <>
          <p className="evidence-counts" role="status">
            {evidenceCountsText(load.value.counts)}
          </p>
          {load.value.counts.pending > 0 && (
            <p className="evidence-pending" role="status" aria-live="polite">
              {pendingWords(load.value.counts.pending)}; the list fills in as they are ready. The counts, the
              chart and the calibration rest on the {load.value.counts.completed} records ready so far.
            </p>
          )}
          <div className="evidence-body">
            <EvidenceChart rows={rows} milestone={milestone} label={label} />
            <EvidenceTable
              rows={shown}
              milestone={milestone}
              label={label}
              onChanged={() => {
                reload();
                reloadCalibration();
              }}
            />
          </div>
          {!showAll && rows.length > firstRows && (
            <button type="button" onClick={() => setShowAll(true)}>
              Show all {rows.length} records
            </button>
          )}
        </>
      )}
      {calibrationLoad.state === 'ready' && (
        <CalibrationPanel calibration={calibrationLoad.value} onChanged={reloadCalibration} />
      )}
    </section>
  );
}

function EvidenceTable({
  rows,
  milestone,
  label,
  onChanged,
}: {
  readonly rows: readonly EvidenceRow[];
  readonly milestone: EvidenceMilestoneId;
  readonly label: string;
  readonly onChanged: () => void;
}) {
  const { gate, withInitials } = useInitialsGate();
  const [leaving, setLeaving] = useState<number | null>(null);
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);

  function setExcluded(recordId: number, excluded: boolean, why: string) {
    withInitials((enteredBy) => {
      void (async () => {
        const answer = await api.invoke('evidence:exclude', {
          recordId,
          excluded,
          meta: { enteredBy, reason: why },
        });
        if (!answer.ok) {
          setError(answer.error.message);
          return;
        }
        setError(null);
        setLeaving(null);
        setReason('');
        onChanged();
      })();
    });
  }

  return (
    <div className="evidence-table-panel">
      {gate}
      {error !== null && (
        <p className="form-error" role="alert">
          {error}
        </p>
      )}
      <ScrollRegion label={`Records: ${label}, observed and predicted`}>
        <table className="evidence-table">
          <thead>
            <tr>
              <th scope="col">Record</th>
              <th scope="col">Day</th>
              <th scope="col">Bird</th>
              <th scope="col">Agent, airway, staff</th>
              <th scope="col">Observed (min)</th>
              <th scope="col">Predicted (min)</th>
              <th scope="col">Observed / predicted</th>
              <th scope="col">Calibration</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((row) => {
              const entry = row.milestones.find((candidate) => candidate.id === milestone);
              return (
                <tr key={row.recordId}>
                  <th scope="row">
                    <a href={href('records', row.recordId)}>{row.recordId}</a>
                  </th>
                  <td>{row.startedAt.slice(0, 10)}</td>
                  <td>
                    {row.patientName} ({row.speciesName})
                  </td>
                  <td>
                    {agentLabels[row.agent]}, {row.airway}, {row.staffInitials}
                  </td>
                  {row.skipped !== null ? (
                    <td colSpan={3}>Skipped: {row.skipped}</td>
                  ) : entry?.ratio == null ? (
                    <td colSpan={3}>Skipped: {entry?.skipped ?? 'not compared'}</td>
                  ) : (
                    <>
                      <td>{minutes(entry.observedMin)}</td>
                      <td>{minutes(entry.predictedMin)}</td>
                      <td>{`x${entry.ratio.toFixed(2)}`}</td>
                    </>
                  )}
                  <td>
                    {row.exclusion !== null ? (
                      <>
                        Left out: {row.exclusion.reason} ({row.exclusion.enteredBy}){' '}
                        <button
                          type="button"
                          onClick={() => setExcluded(row.recordId, false, 'taken back in')}
                        >
                          Take back in
                        </button>
                      </>
                    ) : leaving === row.recordId ? (
                      <span className="evidence-leave">
                        <label>
                          Reason{' '}
                          <input
                            value={reason}
                            onChange={(event) => setReason(event.target.value)}
                            size={18}
                          />
                        </label>{' '}
                        <button type="button" onClick={() => setExcluded(row.recordId, true, reason)}>
                          Leave out
                        </button>{' '}
                        <button type="button" onClick={() => setLeaving(null)}>
                          Cancel
                        </button>
                      </span>
                    ) : (
                      <button
                        type="button"
                        onClick={() => setLeaving(row.recordId)}
                        aria-label={`Leave out record ${row.recordId}`}
                      >
                        Leave out
                      </button>
                    )}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </ScrollRegion>
    </div>
  );
}
