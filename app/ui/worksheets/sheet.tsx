import { useCallback, useState } from 'react';
import type { EmergencyDrug } from '../../contract/drug-channels.js';
import type { PlanDetail } from '../../contract/plan-records.js';
import type { PlanResult } from '../../contract/plan.js';
import type { ClinicSettings } from '../../contract/settings.js';
import { CautionsSection } from './sheet-cautions.js';
import { EmergencyCardSection } from './sheet-emergency-card.js';
import { EstimatesSection } from './sheet-estimates.js';
import { MonitoringSection } from './sheet-monitoring.js';
import { PatientSection } from './sheet-patient.js';
import { PlanSection } from './sheet-plan.js';
import { PredictionSection } from './sheet-prediction.js';
import { SuppliesSection } from './sheet-supplies.js';
import './worksheet.css';

export type SheetProps = {
  readonly detail: PlanDetail;
  readonly drugs: readonly EmergencyDrug[];
  readonly appVersion: string;
  readonly settings: ClinicSettings;
  readonly printedAt: Date;
};

/**
 * The sheet itself: every section, laid out for A4 or US Letter. Plain hooks only: print.html
 * renders it through Preact's compatibility layer.
 */
export function Sheet({ detail, drugs, appVersion, settings, printedAt }: SheetProps) {
  const [drawn, setDrawn] = useState(false);
  const onDrawn = useCallback(() => setDrawn(true), []);
  const { plan, patient } = detail;
  const input = plan.input;
  const result: PlanResult = plan.result;
  const recoveryWindowMin =
    input.recoveryWindowMin ?? result.oxygen.durationMin - (input.schedule.at(-1)?.atMin ?? 0);
  const patientName = patient?.values.name ?? input.patientName ?? `Quick plan ${plan.id}`;
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

      <PatientSection detail={detail} settings={settings} patientName={patientName} />
      <CautionsSection result={result} />
      <PlanSection input={input} result={result} recoveryWindowMin={recoveryWindowMin} />
      <PredictionSection result={result} onDrawn={onDrawn} />
      <SuppliesSection input={input} result={result} />
      <EstimatesSection result={result} />
      <EmergencyCardSection drugs={drugs} bodyMassG={input.bodyMassG} massUnit={settings.massUnit} />
      <MonitoringSection
        input={input}
        result={result}
        settings={settings}
        patientName={patientName}
        recoveryWindowMin={recoveryWindowMin}
      />

      <footer className="ws-footer">
        Tidewing {appVersion} · model {plan.modelVersion} · plan {plan.id} version {plan.stamp.versionId}{' '}
        saved by {plan.stamp.enteredBy} · printed{' '}
        {printedAt.toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' })}
      </footer>
    </article>
  );
}
