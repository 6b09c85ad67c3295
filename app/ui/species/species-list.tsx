import type { Species } from '../../contract/records.js';
import { agentIds, agents } from '../../core/agents.js';
import { displayBasis } from '../common/display.js';
import { useChannel } from '../common/use-channel.js';
import { href } from '../shell/areas.js';
import { ScrollRegion } from '../common/scroll-region.js';

function MacCell({
  species,
  agent,
}: {
  readonly species: Species;
  readonly agent: (typeof agentIds)[number];
}) {
  const mac = species.values.mac[agent];
  if (mac === null) return <span className="muted">not published</span>;
  return (
    <>
      {mac.macPct} %{mac.sdPct === null ? '' : ` ± ${mac.sdPct}`}
      {mac.measure !== 'MAC' && ` (${mac.measure})`}
      <span className="basis">{displayBasis(mac.basis)}</span>
      {mac.note !== null && <span className="basis">{mac.note}</span>}
    </>
  );
}

/** The species reference with the source of every value on view. */
export function SpeciesListScreen() {
  const [load] = useChannel('species:list', {});
  return (
    <section className="screen" aria-labelledby="species-title">
      <h1 id="species-title">Species</h1>
      <p className="lead">
        Typical values with their sources. Typical masses are editable typical ranges, not norms. Edits keep
        the earlier value and its source in the history.
      </p>
      <p className="flag notice">
        Every bird has complete tracheal rings: use an uncuffed tube or leave the cuff down (Elliott 2014,
        WSAVA proceedings). Species notes below add to this.
      </p>
      <p>
        <a className="button-link" href={href('species', 'new')}>
          Add species
        </a>
      </p>
      {load.state === 'loading' && <p aria-busy="true">Loading…</p>}
      {load.state === 'failed' && (
        <p className="form-error" role="alert">
          {load.error.message}
        </p>
      )}
      {load.state === 'ready' && (
        <ScrollRegion label="Species reference">
          <table className="data-table species-table">
            <thead>
              <tr>
                <th>Species</th>
                <th>Typical adult mass</th>
                {agentIds.map((agent) => (
                  <th key={agent}>MAC, {agents[agent].displayName} (vol %)</th>
                ))}
                <th>Apnoea</th>
                <th>Airway notes</th>
              </tr>
            </thead>
            <tbody>
              {load.value.map((species) => (
                <tr key={species.key}>
                  <td>
                    <a href={href('species', species.key)}>{species.values.commonName}</a>
                    <span className="basis">
                      <i>{species.values.scientificName}</i>
                    </span>
                    <span className="basis">
                      {species.origin === 'clinic'
                        ? 'added by the clinic'
                        : species.stamp.correctsId === null
                          ? 'Tidewing reference'
                          : 'edited by the clinic'}
                    </span>
                  </td>
                  <td>
                    {species.values.massMinG}-{species.values.massMaxG} g
                    <span className="basis">{displayBasis(species.values.massBasis)}</span>
                  </td>
                  {agentIds.map((agent) => (
                    <td key={agent}>
                      <MacCell species={species} agent={agent} />
                    </td>
                  ))}
                  <td>
                    {species.values.apnoeaMacMultiple === null ? (
                      <span className="muted">—</span>
                    ) : (
                      <>
                        above {Number(species.values.apnoeaMacMultiple.value.toFixed(2))} MAC
                        <span className="basis">{displayBasis(species.values.apnoeaMacMultiple.basis)}</span>
                      </>
                    )}
                  </td>
                  <td>
                    <ul className="compact">
                      {species.values.anatomyNotes
                        .filter((note) => note.code !== 'complete-tracheal-rings')
                        .map((note) => (
                          <li key={note.text}>
                            {note.text}
                            <span className="basis">{displayBasis(note.basis)}</span>
                          </li>
                        ))}
                    </ul>
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
