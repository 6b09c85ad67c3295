import { useCallback, useState } from 'react';
import type { EmergencyDrug } from '../../contract/drug-channels.js';
import type { CalibrationView } from '../../contract/evidence-channels.js';
import type { PlanDetail } from '../../contract/plan-records.js';
import type { PlanResult } from '../../contract/plan.js';
import type { ClinicSettings } from '../../contract/settings.js';
import { calibratedFigures, calibrationPendingText } from '../../core/evidence/calibrated-figure.js';
import { cautionsForPatient } from '../../core/patient-cautions.js';
import { planChoiceIn, planChoiceSuffix } from '../../core/plan-choice.js';
import { runningHeaderLines } from '../../core/worksheet.js';
import { displayDate, displayDateTime, setClinicDateFormat, todayIso } from '../common/display.js';
import { paperClass, usePrintedRunningLines } from '../common/printed-pages.js';
import { CautionsSection } from './sheet-cautions.js';
import { EmergencyCardSection } from './sheet-emergency-card.js';
import { EstimatesSection } from './sheet-estimates.js';
import { MonitoringSection } from './sheet-monitoring.js';
import { PatientSection } from './sheet-patient.js';
import { PlanSection } from './sheet-plan.js';
import { PredictionSection } from './sheet-prediction.js';
import { SummarySection } from './sheet-summary.js';
import { SuppliesSection } from './sheet-supplies.js';
import './worksheet.css';

export type SheetProps = {
  readonly detail: PlanDetail;
  readonly drugs: readonly EmergencyDrug[];
  readonly appVersion: string;
  readonly settings: ClinicSettings;
  readonly printedAt: Date;
  /**
   * The clinic's calibration as read now (printed beside the saved figures, dated), or null when
   * it could not be read.
   */
  readonly calibration: CalibrationView | null;
};

/** Ring, microchip or the clinic's record number: what tells this bird from another on paper. */
export function patientIdentifier(detail: PlanDetail): string {
  const patient = detail.patient;
  if (patient === null) return `quick plan ${String(detail.plan.id)}`;
  if (patient.values.ringId !== '') return `ring ${patient.values.ringId}`;
  if (patient.values.microchipId !== '') return `chip ${patient.values.microchipId}`;
  return `patient ${String(patient.id)}`;
}

/**
 * The sheet itself, laid out for A4 or US Letter: page 1 the prep-room summary with the emergency
 * card, then the detail pages, then the monitoring grid; every page carries the clinic, bird,
 * identifier, date, plan version and "page n of N" in its margins. Plain hooks only: print.html
 * renders it through Preact's compatibility layer.
 */
export function Sheet({ detail, drugs, appVersion, settings, printedAt, calibration }: SheetProps) {
  setClinicDateFormat(settings.dateFormat);
  const [drawn, setDrawn] = useState(false);
  const onDrawn = useCallback(() => setDrawn(true), []);
  const { plan, patient } = detail;
  const input = plan.input;
  // Cautions for the other sex are left out once the patient's sex is known.
  const result: PlanResult = {
    ...plan.result,
    cautions: cautionsForPatient(plan.result.cautions, patient?.values.sex ?? null),
  };
  // The saved figures stay as saved; the calibrated figure beside them is today's.
  const sheetCalibration = {
    figures:
      calibration === null
        ? null
        : calibratedFigures(plan.result, input.speciesId ?? patient?.values.speciesKey, calibration),
    dateText: displayDate(todayIso(printedAt)),
    pendingText: calibrationPendingText(calibration?.pending),
  };
  const recoveryWindowMin =
    input.recoveryWindowMin ?? result.oxygen.durationMin - (input.schedule.at(-1)?.atMin ?? 0);
  const patientName = patient?.values.name ?? input.patientName ?? `Quick plan ${plan.id}`;
  const sheetClass = paperClass(settings.paperSize);
  const identifier = patientIdentifier(detail);
  // Of a saved comparison, whether this is the plan the clinic will use or its alternative.
  const choice = planChoiceSuffix(planChoiceIn(plan.id, detail.comparison));
  const running = runningHeaderLines({
    clinicName: settings.clinicName,
    patientName,
    identifier,
    dateText: displayDate(plan.plannedFor),
    planId: plan.id,
    planVersionId: plan.stamp.versionId,
  });
  usePrintedRunningLines(running.who, running.which, 'Tidewing anaesthetic worksheet');

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
          <h1 id="worksheet-title">Anaesthetic worksheet: prep-room summary</h1>
          <p>
            Plan {plan.id}
            {plan.label === '' ? '' : ` “${plan.label}”`} for {displayDate(plan.plannedFor)}
            {choice}
            {plan.checklist.emergency ? ' · EMERGENCY' : ''}
          </p>
        </div>
      </header>

      <SummarySection
        detail={detail}
        settings={settings}
        patientName={patientName}
        identifier={identifier}
        result={result}
        calibrated={sheetCalibration.figures?.state === 'on' ? sheetCalibration.figures.lines : []}
      />
      <EmergencyCardSection drugs={drugs} bodyMassG={input.bodyMassG} massUnit={settings.massUnit} />

      <div className="ws-break-before">
        <PatientSection detail={detail} settings={settings} patientName={patientName} />
      </div>
      <CautionsSection result={result} />
      <PlanSection input={input} result={result} recoveryWindowMin={recoveryWindowMin} />
      <PredictionSection
        result={result}
        schedule={input.schedule}
        onDrawn={onDrawn}
        calibration={sheetCalibration}
      />
      <SuppliesSection input={input} result={result} />
      <EstimatesSection result={result} />
      <MonitoringSection
        input={input}
        result={result}
        settings={settings}
        patientName={patientName}
        recoveryWindowMin={recoveryWindowMin}
      />

      <footer className="ws-footer">
        Tidewing {appVersion} · model {plan.modelVersion} · plan {plan.id} version {plan.stamp.versionId}{' '}
        saved by {plan.stamp.enteredBy} · printed {displayDateTime(printedAt)}
      </footer>
    </article>
  );
}
