import { checklistItems } from '../../contract/checklist.js';
import type { PlanDetail } from '../../contract/plan-records.js';
import type { ClinicSettings } from '../../contract/settings.js';
import { asaMortality, asaMortalityText, openChecklistItems } from '../../core/worksheet.js';
import { displayMass } from '../common/display.js';
import { Row } from './sheet-row.js';

/** The patient, the weight used, the ASA grade with its published mortality, and the checklist. */
export function PatientSection({
  detail,
  settings,
  patientName,
}: {
  readonly detail: PlanDetail;
  readonly settings: ClinicSettings;
  readonly patientName: string;
}) {
  const { plan, patient, species, weightTrendText } = detail;
  const input = plan.input;
  const checklistLines = checklistItems.map((item) => ({
    label: item.label,
    state: plan.checklist.items[item.key],
  }));
  const open = openChecklistItems(checklistLines, plan.checklist.asaGrade);
  return (
    <section className="ws-section ws-patient" aria-labelledby="ws-patient">
      <h2 id="ws-patient">Patient</h2>
      <table className="ws-facts">
        <tbody>
          <Row label="Patient">
            <strong className="ws-patient-name">{patientName}</strong>
            {patient !== null && patient.values.ringId !== '' ? ` · ring ${patient.values.ringId}` : ''}
            {patient !== null && patient.values.microchipId !== ''
              ? ` · chip ${patient.values.microchipId}`
              : ''}
            {patient !== null ? ` · ${patient.values.sex}` : ''}
          </Row>
          <Row label="Species">
            {species === null
              ? (input.speciesId ?? 'not given')
              : `${species.values.commonName}${species.values.scientificName === '' ? '' : ` (${species.values.scientificName})`}`}
          </Row>
          <Row label="Weight for this plan">
            <strong>{displayMass(input.bodyMassG, settings.massUnit)}</strong>
            {weightTrendText !== null && <span className="ws-trend"> · {weightTrendText}</span>}
          </Row>
          <Row label="ASA grade">
            {plan.checklist.asaGrade === null ? (
              <strong className="ws-open">NOT SET</strong>
            ) : (
              <strong>ASA {plan.checklist.asaGrade}</strong>
            )}
            <span className="ws-small">
              {' '}
              ·{' '}
              {plan.checklist.asaGrade === null
                ? `published death within 48 h by grade: ${Object.entries(asaMortality.percentByGrade)
                    .map(([grade, percent]) => `ASA ${grade} ${String(percent)} %`)
                    .join(', ')} (${asaMortality.source})`
                : asaMortalityText(plan.checklist.asaGrade).replace(/^ASA \d: /, '')}
            </span>
          </Row>
        </tbody>
      </table>
      <h3>Pre-anaesthetic checklist</h3>
      <ul className="ws-checklist">
        {checklistLines.map((line) => (
          <li key={line.label} className={line.state === 'open' ? 'ws-open-item' : undefined}>
            <span className="ws-box" aria-hidden="true">
              {line.state === 'done' ? '✔' : line.state === 'not applicable' ? '–' : ''}
            </span>{' '}
            {line.label}: {line.state === 'open' ? <strong>OPEN</strong> : line.state}
          </li>
        ))}
      </ul>
      <p className={open.length === 0 ? 'ws-small' : 'ws-open-summary'}>
        {open.length === 0
          ? 'All checklist items are done or not applicable.'
          : `Still open: ${open.join(', ')}.`}
      </p>
      {plan.checklist.notes !== '' && <p className="ws-small">Checklist notes: {plan.checklist.notes}</p>}
    </section>
  );
}
