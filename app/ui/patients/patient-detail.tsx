import { useState } from 'react';
import { planChoiceSuffix } from '../../core/plan-choice.js';
import { displayBasis, displayDate, displayDateTime } from '../common/display.js';
import { agentPhasesText } from '../common/plan-labels.js';
import { useChannel } from '../common/use-channel.js';
import { useChangeNotices } from '../common/use-change-notices.js';
import { href } from '../shell/areas.js';
import { WeightsPanel } from './weights-panel.js';

function PatientPlans({ patientId }: { readonly patientId: number }) {
  const [load, reload] = useChannel('plans:for-patient', { patientId });
  useChangeNotices(
    (notice) => notice.kind === 'plans' && (notice.patientId === undefined || notice.patientId === patientId),
    reload,
  );
  if (load.state !== 'ready')
    return load.state === 'failed' ? <p className="form-error">{load.error.message}</p> : null;
  if (load.value.length === 0) return <p className="muted">No plans yet.</p>;
  return (
    <ul>
      {load.value.map((plan) => (
        <li key={plan.id}>
          <a href={href('plans', plan.id)}>
            {displayDate(plan.plannedFor)}: {agentPhasesText(plan)}
            {plan.label === '' ? '' : ` (${plan.label})`}
          </a>
          {planChoiceSuffix(plan)} · <a href={href('worksheets', plan.id)}>worksheet</a>
          {plan.openChecklistItems > 0 && (
            <span className="muted"> · checklist {plan.openChecklistItems} open</span>
          )}
        </li>
      ))}
    </ul>
  );
}

/** One bird: details with their history, weights with trend flags, procedure records. */
export function PatientDetailScreen({ patientId }: { readonly patientId: number }) {
  const [load, reload] = useChannel('patients:get', { id: patientId });
  // The details, weights and records shown; the weights form keeps what is being typed.
  useChangeNotices(
    (notice) =>
      notice.kind === 'species' ||
      (['patients', 'weights', 'procedure-records'].includes(notice.kind) &&
        (notice.patientId === undefined || notice.patientId === patientId)),
    reload,
  );
  const [showHistory, setShowHistory] = useState(false);
  if (load.state === 'loading') return <p aria-busy="true">Loading…</p>;
  if (load.state === 'failed')
    return (
      <p className="form-error" role="alert">
        {load.error.message}
      </p>
    );
  const detail = load.value;
  const { patient, species } = detail;
  const values = patient.values;
  return (
    <section className="screen" aria-labelledby="patient-title">
      <p>
        <a href={href('patients')}>← All patients</a>
      </p>
      <h1 id="patient-title">
        {values.name} <span className="muted">· {species?.values.commonName ?? values.speciesKey}</span>
      </h1>
      <div className="columns">
        <section className="panel" aria-labelledby="details-title">
          <h2 id="details-title">Details</h2>
          <dl className="details">
            <dt>Species</dt>
            <dd>
              {species === null
                ? values.speciesKey
                : `${species.values.commonName}${species.values.scientificName === '' ? '' : ` (${species.values.scientificName})`}`}
              {species !== null && (
                <span className="basis">
                  Typical adult mass {species.values.massMinG}-{species.values.massMaxG} g ·{' '}
                  {displayBasis(species.values.massBasis)}
                </span>
              )}
            </dd>
            <dt>Sex</dt>
            <dd>{values.sex}</dd>
            <dt>Hatch date / age</dt>
            <dd>{values.hatchDate === null ? values.ageText || '—' : displayDate(values.hatchDate)}</dd>
            <dt>Ring ID</dt>
            <dd>{values.ringId || '—'}</dd>
            <dt>Microchip ID</dt>
            <dd>{values.microchipId || '—'}</dd>
            <dt>Owner reference</dt>
            <dd>{values.ownerReference || '—'}</dd>
            <dt>Notes</dt>
            <dd>{values.notes || '—'}</dd>
          </dl>
          {species !== null && species.values.anatomyNotes.length > 0 && (
            <>
              <h3>Airway notes for the species</h3>
              <ul>
                {species.values.anatomyNotes.map((note) => (
                  <li key={note.text}>
                    {note.text}
                    <span className="basis">Basis: {displayBasis(note.basis)}</span>
                  </li>
                ))}
              </ul>
            </>
          )}
          <p className="form-actions">
            <a className="button-link secondary" href={href('patients', patient.id, 'edit')}>
              Correct details
            </a>
            {detail.history.length > 1 && (
              <button
                type="button"
                onClick={() => setShowHistory((value) => !value)}
                aria-expanded={showHistory}
              >
                {showHistory ? 'Hide' : 'Show'} history ({detail.history.length} versions)
              </button>
            )}
          </p>
          {showHistory && (
            <ol className="history" aria-label="History of the patient details">
              {detail.history.map((version) => (
                <li key={version.stamp.versionId}>
                  {displayDateTime(version.stamp.enteredAt)} by {version.stamp.enteredBy}
                  {version.stamp.reason !== '' && ` · why: ${version.stamp.reason}`} · name{' '}
                  {version.values.name}, species {version.values.speciesKey}, ring{' '}
                  {version.values.ringId || '—'}, microchip {version.values.microchipId || '—'}, owner{' '}
                  {version.values.ownerReference || '—'}
                </li>
              ))}
            </ol>
          )}
        </section>
        <section className="panel" aria-labelledby="procedures-title">
          <h2 id="procedures-title">Procedure records</h2>
          {detail.procedures.length === 0 ? (
            <p className="muted">No procedure records yet.</p>
          ) : (
            <ul>
              {detail.procedures.map((record) => (
                <li key={record.id}>
                  <a href={href('records', record.id)}>
                    {record.values.procedureName}, {displayDateTime(record.values.startedAt)}
                  </a>{' '}
                  {record.values.asaGrade !== null && (
                    <span className="muted">
                      ASA {record.values.asaGrade}
                      {record.values.emergency ? 'E' : ''}
                    </span>
                  )}
                </li>
              ))}
            </ul>
          )}
          <p>
            <a className="button-link" href={href('records', 'new', patient.id)}>
              New procedure record
            </a>
          </p>
          <h2>Anaesthetic plans</h2>
          <PatientPlans patientId={patient.id} />
          <p>
            <a className="button-link" href={href('plans', 'new', patient.id)}>
              New plan
            </a>
          </p>
        </section>
      </div>
      <WeightsPanel detail={detail} onChanged={reload} />
    </section>
  );
}
