import { Fragment, useCallback, useMemo, useState } from 'react';
import { checklistItems } from '../../contract/checklist.js';
import type { EmergencyDrug } from '../../contract/drug-channels.js';
import type { PlanDetail } from '../../contract/plan-records.js';
import type { PlanInput, PlanResult } from '../../contract/plan.js';
import type { ClinicSettings } from '../../contract/settings.js';
import { agents } from '../../core/agents.js';
import { cToF, formatPressure } from '../../core/units.js';
import {
  asaMortality,
  asaMortalityText,
  emergencyCard,
  minutesText,
  minutesWithRangeText,
  monitoringColumns,
  monitoringRows,
  openChecklistItems,
  plannedEndMin,
} from '../../core/worksheet.js';
import { displayMass, plainBasis } from '../common/display.js';
import { circuitLabels, routeLabels } from '../../core/delivery.js';
import { estimateRows, figure } from './labels.js';
import { WorksheetChart } from './worksheet-chart.js';
import './worksheet.css';

export const deferralText =
  'Tidewing is a planning aid. Every figure on this sheet is an estimate from population equations and assumptions, with its basis shown; this bird can differ. ' +
  'The responsible licensed veterinarian decides on the anaesthetic, any drug and dose, and the monitoring, under local regulations. Watch the bird, not the plan.';

function Row({ label, children }: { readonly label: string; readonly children: React.ReactNode }) {
  return (
    <tr>
      <th scope="row">{label}</th>
      <td>{children}</td>
    </tr>
  );
}

function scheduleText(input: PlanInput): string {
  return input.schedule
    .map(
      (step) => `${figure(step.atMin)} min: ${figure(step.vaporPct)} %${step.vaporPct === 0 ? ' (off)' : ''}`,
    )
    .join('; ');
}

function ventilationText(input: PlanInput): string {
  const ventilation = input.ventilation ?? { mode: 'spontaneous' as const };
  if (ventilation.mode === 'spontaneous') return 'Spontaneous breathing';
  return `IPPV ${figure(ventilation.breathsPerMin)} breaths/min, ${figure(ventilation.tidalVolumeMl)} mL tidal volume${ventilation.fromMin === undefined ? '' : ` from ${figure(ventilation.fromMin)} min`}`;
}

function cylinderText(input: PlanInput): string {
  const cylinder = input.cylinder;
  if (cylinder === undefined) return 'not given';
  if (cylinder.kind === 'content') return `${figure(cylinder.contentL)} L of oxygen`;
  if (cylinder.kind === 'waterCapacity')
    return `${figure(cylinder.waterCapacityL)} L water capacity at ${figure(cylinder.pressureBar)} bar`;
  const names = {
    'us-e': 'US E cylinder',
    'metric-2l-200bar': '2 L cylinder at 200 bar',
    'metric-10l-200bar': '10 L cylinder at 200 bar',
  } as const;
  const gauge =
    cylinder.gaugePressureBar !== undefined
      ? `, gauge ${figure(cylinder.gaugePressureBar)} bar`
      : cylinder.gaugePressurePsi !== undefined
        ? `, gauge ${figure(cylinder.gaugePressurePsi)} psi`
        : ', full';
  return `${names[cylinder.presetId]}${gauge}`;
}

function deliveryDetails(input: PlanInput): string[] {
  const details: string[] = [];
  if (input.chamberVolumeL !== undefined) details.push(`chamber ${figure(input.chamberVolumeL)} L`);
  if (input.circuitVolumeL !== undefined) details.push(`circle volume ${figure(input.circuitVolumeL)} L`);
  if (input.maskDeadSpaceMl !== undefined)
    details.push(`mask dead space ${figure(input.maskDeadSpaceMl)} mL`);
  if (input.maskLeakFraction !== undefined)
    details.push(`mask leak ${figure(input.maskLeakFraction * 100)} %`);
  return details;
}

function temperatureRangeText(settings: ClinicSettings): string {
  // Acceptable cloacal temperature 38.3-40.6 C (published clinical reviews).
  return settings.temperatureUnit === 'C' ? '38.3-40.6 °C' : `${figure(cToF(38.3))}-${figure(cToF(40.6))} °F`;
}

function etco2RangeText(settings: ClinicSettings): string {
  // EtCO2 target 30-45 mmHg (published clinical reviews).
  return `${formatPressure(30, settings.pressureUnit, 2).value}-${formatPressure(45, settings.pressureUnit, 2).text}`;
}

export type SheetProps = {
  readonly detail: PlanDetail;
  readonly drugs: readonly EmergencyDrug[];
  readonly appVersion: string;
  readonly settings: ClinicSettings;
  readonly printedAt: Date;
};

/** The sheet itself: every section, laid out for A4 or US Letter. */
export function Sheet({ detail, drugs, appVersion, settings, printedAt }: SheetProps) {
  const [drawn, setDrawn] = useState(false);
  const onDrawn = useCallback(() => setDrawn(true), []);
  const { plan, patient, species, weightTrendText } = detail;
  const input = plan.input;
  const result: PlanResult = plan.result;
  const agent = agents[input.agent];
  const card = useMemo(
    () =>
      emergencyCard(
        drugs.map((drug) => drug.values),
        input.bodyMassG,
      ),
    [drugs, input.bodyMassG],
  );
  const recoveryWindowMin =
    input.recoveryWindowMin ?? result.oxygen.durationMin - (input.schedule.at(-1)?.atMin ?? 0);
  const endMin = plannedEndMin(
    result.milestones.vaporiserOffMin,
    recoveryWindowMin,
    result.oxygen.durationMin,
  );
  const rows = monitoringRows(input.schedule, endMin);
  const columns = monitoringColumns(settings.temperatureUnit, settings.pressureUnit);
  const checklistLines = checklistItems.map((item) => ({
    label: item.label,
    state: plan.checklist.items[item.key],
  }));
  const open = openChecklistItems(checklistLines, plan.checklist.asaGrade);
  const patientName = patient?.values.name ?? input.patientName ?? `Quick plan ${plan.id}`;
  const depthPct = result.targetMacMultiple * result.mac.valuePct;
  const arousalPct = result.recoveryMacFraction.value * result.mac.valuePct;
  const sheetClass = settings.paperSize === 'Letter' ? 'sheet-letter' : 'sheet-a4';

  return (
    <article
      className={`worksheet ${sheetClass}`}
      data-ready={drawn ? 'true' : 'false'}
      data-paper={settings.paperSize}
      aria-labelledby="worksheet-title"
    >
      <header className="ws-header">
        <div>
          <p className="ws-clinic">
            {settings.clinicName === '' ? 'Clinic name not set' : settings.clinicName}
          </p>
          {settings.addressLine !== '' && <p className="ws-address">{settings.addressLine}</p>}
        </div>
        <div className="ws-title-block">
          <h1 id="worksheet-title">Pre-procedure anaesthetic worksheet</h1>
          <p>
            Plan {plan.id}
            {plan.label === '' ? '' : ` “${plan.label}”`} for {plan.plannedFor}
            {plan.checklist.emergency ? ' · EMERGENCY' : ''}
          </p>
        </div>
      </header>

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

      <section className="ws-section ws-cautions" aria-labelledby="ws-cautions">
        <h2 id="ws-cautions">Cautions</h2>
        {result.cautions.length === 0 ? (
          <p>The model raised no caution for this plan.</p>
        ) : (
          <ul>
            {result.cautions.map((caution) => (
              <li key={caution.code} className={`ws-caution ws-${caution.severity}`}>
                <strong>
                  {caution.severity === 'danger'
                    ? 'DANGER'
                    : caution.severity === 'warning'
                      ? 'WARNING'
                      : 'NOTICE'}
                  :
                </strong>{' '}
                {caution.message}
                <br />
                <span className="ws-basis">Why: {caution.reason}</span>
              </li>
            ))}
          </ul>
        )}
        <p className="ws-deferral">{deferralText}</p>
      </section>

      <section className="ws-section" aria-labelledby="ws-plan">
        <h2 id="ws-plan">The plan</h2>
        <table className="ws-facts">
          <tbody>
            <Row label="Agent">
              {agent.displayName}; MAC used {figure(result.mac.valuePct)} %{' '}
              <span className="ws-basis">({plainBasis(result.mac.basis)})</span>
            </Row>
            <Row label="Route and circuit">
              {routeLabels[input.route]}
              {input.circuit === undefined ? '' : `, ${circuitLabels[input.circuit]}`}
              {deliveryDetails(input).length === 0 ? '' : ` (${deliveryDetails(input).join(', ')})`}
            </Row>
            <Row label="Fresh gas flow set">{figure(input.freshGasLpm)} L/min oxygen</Row>
            <Row label="Vaporiser schedule">{scheduleText(input)}</Row>
            <Row label="Ventilation">{ventilationText(input)}</Row>
            <Row label="Planned depth">
              {figure(result.targetMacMultiple)} x MAC = {figure(depthPct)} % in the brain
            </Row>
            <Row label="Recovery threshold">
              {figure(result.recoveryMacFraction.value)} x MAC = {figure(arousalPct)} %{' '}
              <span className="ws-basis">({result.recoveryMacFraction.basis})</span>
            </Row>
            <Row label="Recovery window">{figure(recoveryWindowMin)} min after the last vaporiser step</Row>
            <Row label="Scavenging and room">
              {result.wasteGas.scavenging ? 'Scavenged' : 'Not scavenged'}; room{' '}
              {figure(result.wasteGas.roomVolumeM3)} m³, {figure(result.wasteGas.airChangesPerHour)} air
              changes/h
            </Row>
            <Row label="Oxygen cylinder">{cylinderText(input)}</Row>
          </tbody>
        </table>
      </section>

      <section className="ws-section" aria-labelledby="ws-prediction">
        <h2 id="ws-prediction">Predicted course</h2>
        <WorksheetChart result={result} onDrawn={onDrawn} />
        <table className="ws-facts ws-milestones">
          <tbody>
            <Row label="Predicted induction (time to planned depth)">
              <strong>
                {minutesWithRangeText(result.milestones.inductionMin, result.uncertainty.inductionMin)}
              </strong>
            </Row>
            <Row label="Vaporiser off">
              {result.milestones.vaporiserOffMin === null
                ? 'not in the schedule'
                : `at ${figure(result.milestones.vaporiserOffMin)} min`}
            </Row>
            <Row label="Predicted recovery (after vaporiser off)">
              <strong>
                {minutesWithRangeText(result.milestones.recoveryMin, result.uncertainty.recoveryMin)}
              </strong>
            </Row>
            <Row label="Air sacs 95 % washed in">
              {result.milestones.airSacWashin95Breaths === null
                ? 'not reached'
                : `${figure(result.milestones.airSacWashin95Breaths, 2)} breaths (${minutesText(result.milestones.airSacWashin95Min)})`}
            </Row>
            <Row label="Air sacs 95 % washed out">
              {result.milestones.airSacWashout95Breaths === null
                ? 'not reached'
                : `${figure(result.milestones.airSacWashout95Breaths, 2)} breaths (${minutesText(result.milestones.airSacWashout95Min)})`}
            </Row>
            <Row label="Deepest predicted level">
              {figure(result.milestones.peakBrainMacMultiple, 2)} x MAC in the brain
            </Row>
            <Row label="Lowest predicted breathing">
              {figure(result.milestones.lowestVentilationFraction * 100, 2)} % of resting ventilation
            </Row>
          </tbody>
        </table>
        <p className="ws-basis">
          {result.milestones.basis} Ranges are the 5th to 95th percentiles of {result.uncertainty.samples}{' '}
          model runs with sampled parameters ({result.uncertainty.method}).
        </p>
      </section>

      <section className="ws-section" aria-labelledby="ws-supplies">
        <h2 id="ws-supplies">Flows, agent, oxygen and waste gas</h2>
        <table className="ws-facts">
          <tbody>
            <Row label="Fresh gas flow">
              recommended <strong>{figure(result.flows.recommendedLpm, 2)} L/min</strong> (at least{' '}
              {figure(result.flows.minimumLpm, 2)} L/min); set{' '}
              <strong>{figure(input.freshGasLpm, 2)} L/min</strong>
              {input.freshGasLpm < result.flows.minimumLpm ? (
                <strong className="ws-open"> · BELOW THE MINIMUM</strong>
              ) : (
                ''
              )}
              <br />
              <span className="ws-basis">
                {result.flows.rule}. {result.flows.basis}
                {result.flows.rebreathing ? ` Rebreathing: ${result.flows.rebreathingReason}` : ''}
                {result.flows.chamberTimeTo95Min === null
                  ? ''
                  : ` Chamber reaches 95 % of the dial in ${figure(result.flows.chamberTimeTo95Min, 2)} min.`}
              </span>
            </Row>
            <Row label={`Liquid ${agent.displayName.toLowerCase()}`}>
              <strong>{figure(result.consumption.liquidMl, 2)} mL</strong> for the plan;{' '}
              {figure(result.consumption.liquidMlPerHour, 2)} mL/h at{' '}
              {figure(result.consumption.maintenanceVaporPct)} % maintenance
              <br />
              <span className="ws-basis">
                1 mL of liquid gives {figure(result.consumption.vapourMlPerLiquidMl)} mL of vapour.{' '}
                {result.consumption.basis}
              </span>
            </Row>
            <Row label="Oxygen">
              <strong>{figure(result.oxygen.usedL, 2)} L</strong> over {figure(result.oxygen.durationMin)} min
              {result.oxygen.cylinderContentL === null
                ? ''
                : `; cylinder holds ${figure(result.oxygen.cylinderContentL)} L`}
              {result.oxygen.enduranceMin === null
                ? ''
                : `, lasts ${figure(result.oxygen.enduranceMin)} min at this flow`}
              {result.oxygen.suffices === false ? (
                <strong className="ws-open"> · NOT ENOUGH OXYGEN</strong>
              ) : (
                ''
              )}
              <br />
              <span className="ws-basis">{result.oxygen.basis}</span>
            </Row>
            <Row label="Waste gas in the room">
              peak {figure(result.wasteGas.peakPpm, 2)} ppm; highest 1 h mean{' '}
              {figure(result.wasteGas.highestHourMeanPpm, 2)} ppm against the{' '}
              {figure(result.wasteGas.ceilingPpm)} ppm ceiling (NIOSH 1977)
              {result.wasteGas.exceedsCeiling ? (
                <strong className="ws-open"> · ABOVE THE CEILING</strong>
              ) : (
                ''
              )}
              <br />
              <span className="ws-basis">
                {figure(result.wasteGas.releasedVapourMl, 2)} mL of vapour released. {result.wasteGas.basis}
              </span>
            </Row>
          </tbody>
        </table>
      </section>

      <section className="ws-section" aria-labelledby="ws-estimates">
        <h2 id="ws-estimates">Estimates for this bird</h2>
        <table className="ws-grid-table ws-estimates">
          <thead>
            <tr>
              <th scope="col">Quantity</th>
              <th scope="col" className="number">
                Value
              </th>
              <th scope="col">Basis</th>
            </tr>
          </thead>
          <tbody>
            {estimateRows.map((row) => {
              const estimate = result.estimates[row.key];
              return (
                <tr key={row.key}>
                  <th scope="row">{row.label}</th>
                  <td className="number">
                    {figure(estimate.value)} {row.unit}
                  </td>
                  <td className="ws-basis">{plainBasis(estimate.basis)}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </section>

      <section className="ws-section ws-emergency ws-break-before" aria-labelledby="ws-emergency">
        <h2 id="ws-emergency">Emergency card for {displayMass(input.bodyMassG, settings.massUnit)}</h2>
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
                        <span className="ws-basis ws-block">
                          under 0.1 mL: consider diluting to measure it
                        </span>
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
          Volume = clinic dose (mg/kg) x {figure(input.bodyMassG / 1000, 3)} kg / concentration (mg/mL), 3
          significant figures. Doses and sources are the clinic’s own; check them before giving any drug.
        </p>
      </section>

      <section className="ws-section ws-monitoring" aria-labelledby="ws-monitoring">
        <h2 id="ws-monitoring">
          Monitoring record · {patientName} · {displayMass(input.bodyMassG, settings.massUnit)}
        </h2>
        <p className="ws-small">
          A row every 5 min from 0 to {figure(endMin)} min. Targets to watch: EtCO2 {etco2RangeText(settings)}
          , cloacal temperature {temperatureRangeText(settings)}; apnoea of 10-15 s calls for action. Pulse
          oximetry and indirect blood pressure are unreliable in birds.
        </p>
        <table className="ws-monitoring-grid">
          <thead>
            <tr>
              {columns.map((column) => (
                <th scope="col" key={column}>
                  {column}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((row) => (
              <tr key={row.timeMin}>
                <th scope="row">{row.timeMin}</th>
                <td className="ws-planned">{figure(row.plannedVaporPct)}</td>
                {columns.slice(2).map((column) => (
                  <td key={column} />
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </section>

      <footer className="ws-footer">
        Tidewing {appVersion} · model {plan.modelVersion} · plan {plan.id} version {plan.stamp.versionId}{' '}
        saved by {plan.stamp.enteredBy} · printed{' '}
        {printedAt.toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' })}
      </footer>
    </article>
  );
}
