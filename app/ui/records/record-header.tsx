import type { ProcedureDetail } from '../../contract/record-channels.js';
import type { ProcedureRecordValues } from '../../contract/records.js';
import { circuitLabels } from '../../core/delivery.js';
import { displayMass } from '../common/display.js';
import { useClinicSettings } from '../common/settings-context.js';
import { useId, useState, type FormEvent } from 'react';
import { clockMinutesText, clockText, formatElapsed, resolveClockTime } from './clock-time.js';
import { agentText, airwayText, asaText } from './record-form.js';

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
          <span>{agentText(values.agent)}</span>
          <span>
            {latestMassG === null
              ? 'no weight recorded'
              : `latest weight ${displayMass(latestMassG, settings.massUnit)}`}
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
        <button type="button" onClick={() => window.print()}>
          Print record
        </button>
        <button type="button" aria-expanded={editingDetails} onClick={onToggleDetails}>
          Correct details
        </button>
        {endedAtMs === null ? (
          <EndProcedure
            startedAtMs={startedAtMs}
            nowMs={nowMs}
            onEnd={(endedAt) => onCorrect({ ...values, endedAt }, 'Procedure ended')}
          />
        ) : (
          <span className="hint">ended {clockText(values.endedAt ?? '')}</span>
        )}
      </div>
    </header>
  );
}

/**
 * Ending the procedure asks first: the end time (blank for now, or the HH:MM the bird was
 * handed over), then a confirmation that names the time; Esc or Cancel leaves it running.
 */
function EndProcedure({
  startedAtMs,
  nowMs,
  onEnd,
}: {
  readonly startedAtMs: number;
  readonly nowMs: number;
  readonly onEnd: (endedAt: string) => void;
}) {
  const [open, setOpen] = useState(false);
  const [timeText, setTimeText] = useState('');
  const [error, setError] = useState<string | null>(null);
  const baseId = useId();

  function submit(event: FormEvent) {
    event.preventDefault();
    const resolved = resolveClockTime(timeText, new Date());
    if (!resolved.ok) {
      setError(resolved.message);
      return;
    }
    if (resolved.date.getTime() < startedAtMs) {
      setError(
        `The end cannot be before the start at ${clockMinutesText(new Date(startedAtMs))}; type a later time.`,
      );
      return;
    }
    setOpen(false);
    onEnd(resolved.iso);
  }

  if (!open)
    return (
      <button type="button" onClick={() => setOpen(true)}>
        End procedure…
      </button>
    );
  const shown = timeText.trim() === '' ? clockMinutesText(new Date(nowMs)) : timeText.trim();
  return (
    <form
      className="record-end-form"
      onSubmit={submit}
      noValidate
      aria-label="End the procedure"
      onKeyDown={(event) => {
        if (event.key === 'Escape') {
          event.preventDefault();
          setOpen(false);
          setError(null);
        }
      }}
    >
      <label htmlFor={`${baseId}-end`}>End time</label>
      <input
        id={`${baseId}-end`}
        value={timeText}
        size={6}
        autoFocus
        placeholder={clockMinutesText(new Date(nowMs))}
        aria-invalid={error !== null}
        aria-describedby={`${baseId}-end-hint`}
        onChange={(event) => {
          setTimeText(event.target.value);
          setError(null);
        }}
      />
      <button type="submit" className="primary">
        End procedure at {shown}
      </button>
      <button
        type="button"
        onClick={() => {
          setOpen(false);
          setError(null);
        }}
      >
        Cancel
      </button>
      <span className="hint" id={`${baseId}-end-hint`}>
        Blank for now, or HH:MM. Esc keeps the procedure running.
      </span>
      {error !== null && (
        <p className="field-error" role="alert">
          {error}
        </p>
      )}
    </form>
  );
}
