import type { ProcedureDetail } from '../../contract/record-channels.js';
import type { ProcedureRecordValues } from '../../contract/records.js';
import { formatMass } from '../../core/units.js';
import { useClinicSettings } from '../common/settings-context.js';
import { clockMinutesText, clockText, formatElapsed } from './clock-time.js';
import { airwayText, asaText, circuitLabels } from './record-form.js';

/**
 * The head of the live record: the bird, the procedure's facts, the elapsed (or total) time, and
 * the actions on the whole record (CSV, correct details, end).
 */
export function RecordHeader({
  detail,
  nowMs,
  editingDetails,
  onToggleDetails,
  onExportCsv,
  onCorrect,
}: {
  readonly detail: ProcedureDetail;
  readonly nowMs: number;
  readonly editingDetails: boolean;
  readonly onToggleDetails: () => void;
  readonly onExportCsv: () => void;
  readonly onCorrect: (next: ProcedureRecordValues, reason: string) => void;
}) {
  const settings = useClinicSettings();
  const { record, patient, species, latestMassG } = detail;
  const values = record.values;
  const startedAtMs = Date.parse(values.startedAt);
  const endedAtMs = values.endedAt === null ? null : Date.parse(values.endedAt);
  return (
    <header className="record-header">
      <div className="record-header-main">
        <h1 id="record-title">
          {patient.values.name}{' '}
          <span className="record-species">{species?.values.commonName ?? patient.values.speciesKey}</span>
        </h1>
        <p className="record-facts">
          <span>{values.procedureName}</span>
          <span>ASA {asaText(values)}</span>
          <span>{airwayText(values)}</span>
          <span>{circuitLabels[values.circuit]}</span>
          <span>
            {latestMassG === null
              ? 'no weight recorded'
              : `latest weight ${formatMass(latestMassG, settings.massUnit).text}`}
          </span>
          <span>staff {values.staffInitials}</span>
        </p>
      </div>
      <div className="record-clock" role="timer" aria-label="Elapsed time since the start">
        <span className="record-clock-label">{endedAtMs === null ? 'Elapsed' : 'Duration'}</span>
        <span className="record-clock-value">{formatElapsed((endedAtMs ?? nowMs) - startedAtMs)}</span>
        <span className="record-clock-label">from {clockMinutesText(new Date(startedAtMs))}</span>
      </div>
      <div className="record-header-actions">
        <button type="button" onClick={onExportCsv}>
          Download CSV
        </button>
        <button type="button" aria-expanded={editingDetails} onClick={onToggleDetails}>
          Correct details
        </button>
        {endedAtMs === null ? (
          <button
            type="button"
            onClick={() => onCorrect({ ...values, endedAt: new Date().toISOString() }, 'Procedure ended')}
          >
            End procedure
          </button>
        ) : (
          <span className="hint">ended {clockText(values.endedAt ?? '')}</span>
        )}
      </div>
    </header>
  );
}
