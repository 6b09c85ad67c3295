import { useEffect, useRef, useState } from 'react';
import type { PatientSummary } from '../../contract/records.js';
import { api } from '../common/bridge.js';
import { isSearchShortcut } from '../common/keyboard.js';
import { displayDate, displayMass } from '../common/display.js';
import { useClinicSettings } from '../common/settings-context.js';
import { href } from '../shell/areas.js';
import { useChangeNotices } from '../common/use-change-notices.js';
import { ScrollRegion } from '../common/scroll-region.js';

/** Search the clinic's birds by any identifier; Enter opens the first match. */
export function PatientListScreen() {
  const settings = useClinicSettings();
  const [query, setQuery] = useState('');
  const [results, setResults] = useState<{ patients: PatientSummary[]; total: number } | null>(null);
  const [error, setError] = useState<string | null>(null);
  const searchBox = useRef<HTMLInputElement | null>(null);
  // A new or corrected patient, or a new weight (the latest mass), asks the search again.
  const [generation, setGeneration] = useState(0);
  useChangeNotices(
    (notice) => notice.kind === 'patients' || notice.kind === 'weights',
    () => setGeneration((value) => value + 1),
  );

  useEffect(() => {
    let live = true;
    const timer = window.setTimeout(() => {
      void api.invoke('patients:search', { query, limit: 100 }).then((answer) => {
        if (!live) return;
        if (answer.ok) {
          setResults(answer.value);
          setError(null);
        } else setError(answer.error.message);
      });
    }, 120);
    return () => {
      live = false;
      window.clearTimeout(timer);
    };
  }, [query, generation]);

  useEffect(() => {
    function onKey(event: KeyboardEvent) {
      // Only when not typing in a field: "/" typed in a box (a date, a note) stays in the box.
      if (isSearchShortcut(event, document.activeElement as HTMLElement | null)) {
        event.preventDefault();
        searchBox.current?.focus();
      }
    }
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);

  const first = results?.patients[0];
  return (
    <section className="screen" aria-labelledby="patients-title">
      <h1 id="patients-title">Patients</h1>
      <div className="toolbar">
        <div className="field">
          <label htmlFor="patient-search">Search (name or ID, species, ring, microchip, owner)</label>
          <input
            id="patient-search"
            ref={searchBox}
            type="search"
            value={query}
            autoFocus
            placeholder="Type to search; / jumps here"
            aria-describedby="patient-search-hint"
            onChange={(event) => setQuery(event.target.value)}
            onKeyDown={(event) => {
              if (event.key === 'Enter' && first !== undefined)
                window.location.hash = href('patients', first.id);
            }}
          />
          <p id="patient-search-hint" className="hint">
            One or two letters find names, rings and microchips starting with them; three or more find them
            anywhere.
          </p>
        </div>
        <a className="button-link" href={href('patients', 'new')}>
          New patient
        </a>
      </div>
      {error !== null && (
        <p className="form-error" role="alert">
          {error}
        </p>
      )}
      {results === null ? (
        <p aria-busy="true">Searching…</p>
      ) : results.total === 0 ? (
        <p className="muted">No patients yet. Add the first bird with New patient.</p>
      ) : (
        <>
          <p className="muted" role="status">
            {query.trim() === ''
              ? `Latest of ${results.total} patients.`
              : `${results.patients.length} match${results.patients.length === 1 ? '' : 'es'} of ${results.total} patients.`}
          </p>
          <ScrollRegion label="Patients found">
            <table className="data-table">
              <thead>
                <tr>
                  <th>Name or ID</th>
                  <th>Species</th>
                  <th>Ring</th>
                  <th>Microchip</th>
                  <th>Owner reference</th>
                  <th className="number">Latest weight</th>
                </tr>
              </thead>
              <tbody>
                {results.patients.map((patient) => (
                  <tr key={patient.id}>
                    <td>
                      <a href={href('patients', patient.id)}>{patient.name}</a>
                    </td>
                    <td>{patient.speciesName ?? patient.speciesKey}</td>
                    <td>{patient.ringId}</td>
                    <td>{patient.microchipId}</td>
                    <td>{patient.ownerReference}</td>
                    <td className="number">
                      {patient.latestMassG === null
                        ? '—'
                        : `${displayMass(patient.latestMassG, settings.massUnit)} (${patient.latestWeighedOn === null ? '' : displayDate(patient.latestWeighedOn)})`}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
        </>
      )}
    </section>
  );
}
