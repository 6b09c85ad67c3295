import { useEffect, useState } from 'react';
import type { Species } from '../../contract/records.js';
import { agentIds, agents } from '../../core/agents.js';
import { api } from '../common/bridge.js';
import { displayBasis, displayDateTime } from '../common/display.js';
import { href } from '../shell/areas.js';

function origin(species: Species): string {
  if (species.origin === 'clinic') return 'Added by the clinic';
  return species.stamp.correctsId === null
    ? 'Tidewing reference'
    : 'Tidewing reference, edited by the clinic';
}

/** A value and its whole source, never shortened: the clinic reads the citation before relying on it. */
function Row({
  label,
  value,
  basis,
}: {
  readonly label: string;
  readonly value: string;
  readonly basis?: string;
}) {
  return (
    <div>
      <dt>{label}</dt>
      <dd>
        {value}
        {basis !== undefined && <span className="basis species-source">Source: {displayBasis(basis)}</span>}
      </dd>
    </div>
  );
}

/**
 * One species as the clinic reads it: every value with its whole source, read-only. Editing is
 * a deliberate step (the Edit link opens the form, which asks for a reason and keeps the history).
 */
export function SpeciesViewScreen({ speciesKey }: { readonly speciesKey: string }) {
  const [history, setHistory] = useState<Species[] | null>(null);
  const [failure, setFailure] = useState<string | null>(null);

  useEffect(() => {
    void api.invoke('species:history', { key: speciesKey }).then((answer) => {
      if (!answer.ok) return setFailure(answer.error.message);
      if (answer.value.length === 0) return setFailure(`There is no species "${speciesKey}".`);
      setHistory(answer.value);
    });
  }, [speciesKey]);

  const current = history?.[0];
  if (history === null || current === undefined)
    return <p aria-busy={failure === null}>{failure ?? 'Loading…'}</p>;
  const values = current.values;
  return (
    <section className="screen" aria-labelledby="species-view-title">
      <p>
        <a href={href('species')}>← All species</a>
      </p>
      <div className="species-view-head">
        <h1 id="species-view-title">{values.commonName}</h1>
        <a className="button-link" href={href('species', speciesKey, 'edit')}>
          Edit {values.commonName}
        </a>
      </div>
      <p className="lead">
        {values.scientificName !== '' && <i>{values.scientificName}</i>}
        {values.scientificName !== '' && ' · '}
        {origin(current)} · last changed {displayDateTime(current.stamp.enteredAt)} by{' '}
        {current.stamp.enteredBy}
      </p>
      <dl className="species-values">
        <Row
          label="Typical adult mass"
          value={`${values.massMinG}-${values.massMaxG} g`}
          basis={values.massBasis}
        />
        {agentIds.map((agent) => {
          const mac = values.mac[agent];
          const label = `${mac?.measure ?? 'MAC'} of ${agents[agent].displayName}`;
          return mac === null ? (
            <Row key={agent} label={label} value="not given; the plan uses the agent's fallback" />
          ) : (
            <Row
              key={agent}
              label={label}
              value={`${mac.macPct} %${mac.sdPct === null ? '' : ` (SD ${mac.sdPct} %)`}${mac.note === null || mac.note === '' ? '' : `, ${mac.note}`}`}
              basis={mac.basis}
            />
          );
        })}
        {values.heartRate !== null && (
          <Row
            label="Resting heart rate"
            value={`${values.heartRate.min}-${values.heartRate.max} /min`}
            basis={values.heartRate.basis}
          />
        )}
        {values.breathsPerMin !== null && (
          <Row
            label="Resting breathing rate"
            value={`${values.breathsPerMin.min}-${values.breathsPerMin.max} /min`}
            basis={values.breathsPerMin.basis}
          />
        )}
        {values.apnoeaMacMultiple !== null && (
          <Row
            label="Apnoea reported above"
            value={`${Number(values.apnoeaMacMultiple.value.toFixed(2))} × MAC`}
            basis={values.apnoeaMacMultiple.basis}
          />
        )}
      </dl>
      {values.anatomyNotes.length > 0 && (
        <section className="panel" aria-labelledby="species-notes-title">
          <h2 id="species-notes-title">Airway and anatomy notes</h2>
          <ul className="species-notes">
            {values.anatomyNotes.map((note, index) => (
              <li key={index}>
                {note.text}
                <span className="basis species-source">Source: {displayBasis(note.basis)}</span>
              </li>
            ))}
          </ul>
        </section>
      )}
      <section className="panel" aria-labelledby="species-view-history-title">
        <h2 id="species-view-history-title">History</h2>
        <ol className="history">
          {history.map((version) => (
            <li key={version.stamp.versionId}>
              {displayDateTime(version.stamp.enteredAt)} by {version.stamp.enteredBy}
              {version.stamp.reason !== '' && ` · why: ${version.stamp.reason}`}
            </li>
          ))}
        </ol>
      </section>
    </section>
  );
}
