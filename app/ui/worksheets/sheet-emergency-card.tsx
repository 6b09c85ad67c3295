import { Fragment, useMemo } from 'react';
import type { EmergencyDrug } from '../../contract/drug-channels.js';
import type { ClinicSettings } from '../../contract/settings.js';
import { emergencyCard } from '../../core/worksheet.js';
import { displayMass } from '../common/display.js';
import { figure } from './labels.js';

/** The clinic's emergency drugs as volumes to draw up for this bird's mass. */
export function EmergencyCardSection({
  drugs,
  bodyMassG,
  massUnit,
}: {
  readonly drugs: readonly EmergencyDrug[];
  readonly bodyMassG: number;
  readonly massUnit: ClinicSettings['massUnit'];
}) {
  const card = useMemo(
    () =>
      emergencyCard(
        drugs.map((drug) => drug.values),
        bodyMassG,
      ),
    [drugs, bodyMassG],
  );
  return (
    <section className="ws-section ws-emergency" aria-labelledby="ws-emergency">
      <h2 id="ws-emergency">Emergency card for {displayMass(bodyMassG, massUnit)}</h2>
      {card.length === 0 ? (
        <p className="ws-open-summary">
          No emergency drugs entered. Add your clinic’s drugs, concentrations, doses and their sources in
          Settings; Tidewing ships no doses.
        </p>
      ) : (
        <table className="ws-grid-table ws-card-table">
          <thead>
            <tr>
              <th scope="col">Drug (route)</th>
              <th scope="col" className="number">
                Concentration
              </th>
              <th scope="col">Clinic dose</th>
              <th scope="col" className="ws-volume">
                Volume to draw up
              </th>
              <th scope="col">Source of the dose</th>
            </tr>
          </thead>
          <tbody>
            {card.map((line) => (
              <Fragment key={line.name}>
                <tr>
                  <th scope="row">
                    {line.name} ({line.route})
                  </th>
                  <td className="number">{figure(line.concentrationMgPerMl)} mg/mL</td>
                  <td>{line.doseText}</td>
                  <td className="ws-volume">
                    <strong>{line.volumeText}</strong>
                    {line.smallVolume && (
                      <span className="ws-basis ws-block">under 0.1 mL: consider diluting to measure it</span>
                    )}
                  </td>
                  <td className="ws-basis">{line.doseSource}</td>
                </tr>
                {line.notes !== '' && (
                  <tr className="ws-card-notes">
                    <td colSpan={5}>
                      {line.name}: {line.notes}
                    </td>
                  </tr>
                )}
              </Fragment>
            ))}
          </tbody>
        </table>
      )}
      <p className="ws-basis">
        Volumes: the clinic’s dose (mg/kg) for {figure(bodyMassG / 1000, 3)} kg, divided by the concentration
        (mg/mL), to 3 significant figures. Doses and sources are the clinic’s own; check them before giving
        any drug.
      </p>
    </section>
  );
}
