import { useEffect, useId, useState, type FormEvent, type ReactNode } from 'react';
import {
  correctionMetaSchema,
  type ProcedureEntry,
  type ProcedureEntryValues,
} from '../../contract/records.js';
import type { FieldErrors } from '../common/field-errors.js';
import { api } from '../common/bridge.js';
import { clockText } from './clock-time.js';
import {
  checkEntry,
  readingFields,
  readingLabel,
  readingsSummary,
  readingsToDraft,
  toDisplayReading,
  type DisplayUnits,
  type ReadingDraft,
  type ReadingField,
} from './entry-form.js';
import { eventSummary, minutesFromStart } from './monitoring.js';
import { ScrollRegion } from '../common/scroll-region.js';
import { onEscape, useReturnFocus } from '../common/return-focus.js';
import { displayDateTime } from '../common/display.js';

export type TableEntry = ProcedureEntry & { readonly corrected: boolean };

type Props = {
  readonly entries: readonly TableEntry[];
  readonly startedAt: string;
  readonly units: DisplayUnits;
  /** Saves a correction; resolves to null on success or a message to show. */
  readonly onCorrect: (id: number, values: ProcedureEntryValues, reason: string) => Promise<string | null>;
  readonly onVoid: (id: number, reason: string) => Promise<string | null>;
};

/**
 * The open form or history: which row (by the version it was opened on) and that row as it was
 * then, so the form stays open, with what the user typed, when the log reloads underneath it.
 */
type Mode = {
  readonly kind: 'correct' | 'void' | 'history';
  readonly id: number;
  readonly opened: TableEntry;
} | null;

/** Who wrote a version: initials, with the workstation it was written on when known. */
function WrittenBy({ entry }: { readonly entry: ProcedureEntry }) {
  return (
    <>
      {entry.stamp.enteredBy}
      {entry.workstationName !== null && (
        <span className="record-workstation" title="Workstation that wrote this row">
          {' '}
          {entry.workstationName}
        </span>
      )}
    </>
  );
}

function reasonError(reason: string): string | undefined {
  const checked = correctionMetaSchema.shape.reason.safeParse(reason);
  return checked.success ? undefined : checked.error.issues[0]?.message;
}

function ReasonBox({
  value,
  error,
  onChange,
  autoFocus = false,
}: {
  readonly value: string;
  readonly error: string | undefined;
  readonly onChange: (value: string) => void;
  readonly autoFocus?: boolean;
}) {
  const id = useId();
  return (
    <div className="field record-reason">
      <label htmlFor={id}>Reason (kept with the history)</label>
      <input
        id={id}
        value={value}
        autoFocus={autoFocus}
        size={30}
        aria-invalid={error !== undefined}
        onChange={(event) => onChange(event.target.value)}
      />
      {error !== undefined && (
        <p className="field-error" role="alert">
          {error}
        </p>
      )}
    </div>
  );
}

function CorrectForm({
  entry,
  units,
  onSave,
  onClose,
  onCancel,
}: {
  readonly entry: TableEntry;
  readonly units: DisplayUnits;
  readonly onSave: Props['onCorrect'];
  readonly onClose: () => void;
  /** Closes without saving (Cancel, Escape) and returns focus to the Correct button. */
  readonly onCancel: () => void;
}) {
  const [timeText, setTimeText] = useState(clockText(entry.values.at));
  const [readings, setReadings] = useState<ReadingDraft>(() => readingsToDraft(entry.values, units));
  const [note, setNote] = useState(entry.values.eventNote);
  const [drugName, setDrugName] = useState(entry.values.drugName);
  const [drugDose, setDrugDose] = useState(entry.values.drugDose);
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [failure, setFailure] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const baseId = useId();

  async function submit(event: FormEvent) {
    event.preventDefault();
    const checked = checkEntry(
      {
        timeText,
        originalAt: entry.values.at,
        readings,
        kind: entry.values.kind,
        eventType: entry.values.eventType,
        eventNote: note,
        drugName,
        drugDose,
      },
      units,
      new Date(),
    );
    const reasonMessage = reasonError(reason);
    const nextErrors: Record<string, string> = checked.ok ? {} : { ...checked.errors };
    if (reasonMessage !== undefined) nextErrors['reason'] = reasonMessage;
    setErrors(nextErrors);
    if (!checked.ok || reasonMessage !== undefined) return;
    setBusy(true);
    const message = await onSave(entry.id, checked.values, reason.trim());
    setBusy(false);
    if (message === null) onClose();
    else setFailure(message);
  }

  const isVitals = entry.values.kind === 'vitals';
  return (
    <form
      className="record-edit"
      onSubmit={(event) => void submit(event)}
      noValidate
      aria-label={`Correct the row at ${clockText(entry.values.at)}`}
      onKeyDown={onEscape(onCancel)}
    >
      <div className="record-edit-fields">
        <div className="field record-cell">
          <label htmlFor={`${baseId}-time`}>Time</label>
          <input
            id={`${baseId}-time`}
            // Opening the form (Enter or a click on Correct) puts the cursor in its first box.
            autoFocus
            value={timeText}
            size={8}
            aria-invalid={errors['at'] !== undefined}
            onChange={(event) => setTimeText(event.target.value)}
          />
          {errors['at'] !== undefined && (
            <p className="field-error" role="alert">
              {errors['at']}
            </p>
          )}
        </div>
        {isVitals &&
          readingFields.map((field: ReadingField) => {
            const { label, unit } = readingLabel(field, units);
            return (
              <div className="field record-cell" key={field}>
                <label htmlFor={`${baseId}-${field}`}>
                  {label} <span className="record-unit">{unit}</span>
                </label>
                <input
                  id={`${baseId}-${field}`}
                  value={readings[field]}
                  inputMode="decimal"
                  size={5}
                  aria-invalid={errors[field] !== undefined}
                  onChange={(event) =>
                    setReadings((current) => ({ ...current, [field]: event.target.value }))
                  }
                />
                {errors[field] !== undefined && (
                  <p className="field-error" role="alert">
                    {errors[field]}
                  </p>
                )}
              </div>
            );
          })}
        {!isVitals && entry.values.eventType === 'drugGiven' && (
          <>
            <div className="field record-cell">
              <label htmlFor={`${baseId}-drug`}>Drug</label>
              <input
                id={`${baseId}-drug`}
                value={drugName}
                size={14}
                aria-invalid={errors['drugName'] !== undefined}
                onChange={(event) => setDrugName(event.target.value)}
              />
              {errors['drugName'] !== undefined && (
                <p className="field-error" role="alert">
                  {errors['drugName']}
                </p>
              )}
            </div>
            <div className="field record-cell">
              <label htmlFor={`${baseId}-dose`}>Dose as given</label>
              <input
                id={`${baseId}-dose`}
                value={drugDose}
                size={14}
                onChange={(event) => setDrugDose(event.target.value)}
              />
            </div>
          </>
        )}
        {!isVitals && (
          <div className="field record-cell">
            <label htmlFor={`${baseId}-note`}>Note</label>
            <input
              id={`${baseId}-note`}
              value={note}
              size={24}
              onChange={(event) => setNote(event.target.value)}
            />
          </div>
        )}
        <ReasonBox value={reason} error={errors['reason']} onChange={setReason} />
      </div>
      <div className="form-actions">
        <button type="submit" className="primary" disabled={busy}>
          Save correction
        </button>
        <button type="button" onClick={onCancel}>
          Cancel
        </button>
        {failure !== null && (
          <p className="form-error" role="alert">
            {failure}
          </p>
        )}
      </div>
    </form>
  );
}

function VoidForm({
  entry,
  onVoid,
  onClose,
  onCancel,
}: {
  readonly entry: TableEntry;
  readonly onVoid: Props['onVoid'];
  readonly onClose: () => void;
  /** Closes without voiding (Cancel, Escape) and returns focus to the Void button. */
  readonly onCancel: () => void;
}) {
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | undefined>(undefined);
  const [failure, setFailure] = useState<string | null>(null);
  async function submit(event: FormEvent) {
    event.preventDefault();
    const message = reasonError(reason);
    setError(message);
    if (message !== undefined) return;
    const answer = await onVoid(entry.id, reason.trim());
    if (answer === null) onClose();
    else setFailure(answer);
  }
  return (
    <form
      className="record-edit"
      onSubmit={(event) => void submit(event)}
      noValidate
      aria-label={`Void the row at ${clockText(entry.values.at)}`}
      onKeyDown={onEscape(onCancel)}
    >
      <p className="hint">
        The row stays in the history, marked as entered in error; it leaves the chart, the table and the
        export.
      </p>
      <div className="record-edit-fields">
        <ReasonBox value={reason} error={error} onChange={setReason} autoFocus />
      </div>
      <div className="form-actions">
        <button type="submit" className="primary">
          Void row
        </button>
        <button type="button" onClick={onCancel}>
          Cancel
        </button>
        {failure !== null && (
          <p className="form-error" role="alert">
            {failure}
          </p>
        )}
      </div>
    </form>
  );
}

function History({ entry, units }: { readonly entry: TableEntry; readonly units: DisplayUnits }) {
  const [versions, setVersions] = useState<ProcedureEntry[] | null>(null);
  const [failure, setFailure] = useState<string | null>(null);
  useEffect(() => {
    let live = true;
    void api.invoke('entries:history', { id: entry.id }).then((answer) => {
      if (!live) return;
      if (answer.ok) setVersions(answer.value);
      else setFailure(answer.error.message);
    });
    return () => {
      live = false;
    };
  }, [entry.id]);
  if (failure !== null)
    return (
      <p className="form-error" role="alert">
        History could not be loaded: {failure}
      </p>
    );
  if (versions === null) return <p aria-busy="true">Loading history…</p>;
  return (
    <table className="record-history" aria-label={`History of the row at ${clockText(entry.values.at)}`}>
      <caption>History of this row, newest first</caption>
      <thead>
        <tr>
          <th scope="col">Version</th>
          <th scope="col">Time</th>
          <th scope="col">Values</th>
          <th scope="col">Who</th>
          <th scope="col">When</th>
          <th scope="col">Why</th>
        </tr>
      </thead>
      <tbody>
        {versions.map((version, index) => (
          <tr key={version.id} className={index === 0 ? 'record-history-current' : undefined}>
            <td>
              {index === 0 ? 'current' : index === versions.length - 1 ? 'original' : 'earlier'}
              {version.voided ? ' (voided)' : ''}
            </td>
            <td>{clockText(version.values.at)}</td>
            <td>
              {version.values.kind === 'vitals'
                ? readingsSummary(version.values, units)
                : eventSummary(version.values)}
            </td>
            <td>
              <WrittenBy entry={version} />
            </td>
            <td>{displayDateTime(version.stamp.enteredAt)}</td>
            <td>{version.stamp.reason === '' ? '—' : version.stamp.reason}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function readingCell(values: ProcedureEntryValues, field: ReadingField, units: DisplayUnits): string {
  const value = values[field];
  return value === null ? '' : String(toDisplayReading(field, value, units));
}

/** The logged rows, newest first, with Correct, Void and History. */
export function EntryTable({ entries, startedAt, units, onCorrect, onVoid }: Props) {
  const [mode, setMode] = useState<Mode>(null);
  const { remember, returnFocus } = useReturnFocus();
  const toggle = (next: NonNullable<Mode>, opener: HTMLElement) => {
    if (mode !== null && mode.id === next.id && mode.kind === next.kind) setMode(null);
    else {
      remember(opener);
      setMode(next);
    }
  };
  const cancel = () => {
    setMode(null);
    returnFocus();
  };
  const newestFirst = [...entries].sort(
    (a, b) => Date.parse(b.values.at) - Date.parse(a.values.at) || b.id - a.id,
  );
  /**
   * The row the open form belongs to: the version it was opened on, or the correction another
   * workstation saved of it (after a refused save the log reloads with that one).
   */
  const isOpenRow = (entry: TableEntry) =>
    mode !== null && (entry.id === mode.id || entry.stamp.correctsId === mode.id);
  const columns = 2 + readingFields.length + 3;
  const close = () => setMode(null);
  /**
   * The row holding the open form or history for `entry` (the row now in the log, or as it was
   * opened when it has left the log: voided elsewhere).
   */
  const detailRow = (open: NonNullable<Mode>, entry: TableEntry, gone: boolean) => (
    <tr key={`detail-${open.id}`} className="record-detail-row">
      <td colSpan={columns}>
        {gone && (
          <p className="hint">
            The row at {clockText(entry.values.at)} is no longer in the log as you opened it.
          </p>
        )}
        {open.kind === 'correct' && (
          <CorrectForm entry={entry} units={units} onSave={onCorrect} onClose={close} onCancel={cancel} />
        )}
        {open.kind === 'void' && <VoidForm entry={entry} onVoid={onVoid} onClose={close} onCancel={cancel} />}
        {open.kind === 'history' && <History entry={entry} units={units} />}
      </td>
    </tr>
  );
  if (entries.length === 0 && mode === null) return <p className="hint">No rows logged yet.</p>;
  return (
    <ScrollRegion label="Procedure log">
      <table className="record-table record-entries">
        <caption className="visually-hidden">Logged rows, newest first</caption>
        <thead>
          <tr>
            <th scope="col">Time</th>
            <th scope="col" className="record-number">
              min
            </th>
            {readingFields.map((field) => {
              const { label, unit } = readingLabel(field, units);
              return (
                <th scope="col" key={field} className="record-number">
                  {label} <span className="record-unit">{unit}</span>
                </th>
              );
            })}
            <th scope="col">Event / note</th>
            <th scope="col">By</th>
            <th scope="col">
              <span className="visually-hidden">Actions</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {/* One flat list, the open form's row keyed by the version it was opened on: it keeps
              what was typed when the log reloads and its row is replaced or leaves the log. */}
          {[
            mode !== null && !newestFirst.some(isOpenRow) && detailRow(mode, mode.opened, true),
            ...newestFirst.flatMap((entry, index) => {
              // Rows logged in the same second share a time: the row number keeps each button's name unique.
              const rowName = `the row at ${clockText(entry.values.at)} (row ${newestFirst.length - index})`;
              const open = mode !== null && isOpenRow(entry) ? mode.kind : null;
              const rows: ReactNode[] = [
                <tr
                  key={`entry-${entry.id}`}
                  className={entry.values.kind === 'event' ? 'record-event-row' : undefined}
                >
                  <td>
                    {clockText(entry.values.at)}
                    {entry.corrected && (
                      <span className="record-corrected" title="Corrected: see its history">
                        {' '}
                        corrected
                      </span>
                    )}
                  </td>
                  <td className="record-number">{minutesFromStart(startedAt, entry.values.at)}</td>
                  {readingFields.map((field) => (
                    <td key={field} className="record-number">
                      {readingCell(entry.values, field, units)}
                    </td>
                  ))}
                  <td>{entry.values.kind === 'event' ? eventSummary(entry.values) : ''}</td>
                  <td>
                    <WrittenBy entry={entry} />
                  </td>
                  <td>
                    <div className="record-actions">
                      <button
                        type="button"
                        aria-label={`Correct ${rowName}`}
                        aria-expanded={open === 'correct'}
                        onClick={(event) =>
                          toggle({ kind: 'correct', id: entry.id, opened: entry }, event.currentTarget)
                        }
                      >
                        Correct
                      </button>
                      <button
                        type="button"
                        aria-label={`Void ${rowName}`}
                        aria-expanded={open === 'void'}
                        onClick={(event) =>
                          toggle({ kind: 'void', id: entry.id, opened: entry }, event.currentTarget)
                        }
                      >
                        Void
                      </button>
                      {entry.corrected && (
                        <button
                          type="button"
                          aria-label={`History of ${rowName}`}
                          aria-expanded={open === 'history'}
                          onClick={() =>
                            setMode(
                              open === 'history' ? null : { kind: 'history', id: entry.id, opened: entry },
                            )
                          }
                        >
                          History
                        </button>
                      )}
                    </div>
                  </td>
                </tr>,
              ];
              if (mode !== null && open !== null) rows.push(detailRow(mode, entry, false));
              return rows;
            }),
          ]}
        </tbody>
      </table>
    </ScrollRegion>
  );
}
