import { useEffect, useId, useRef, useState, type FormEvent } from 'react';
import { entryTimeProblem } from '../../contract/input-rules.js';
import type { ProcedureEntryValues, ProcedureRecordValues } from '../../contract/records.js';
import type { FieldErrors } from '../common/field-errors.js';
import { clockMinutesText } from './clock-time.js';
import {
  checkEntry,
  emptyReadings,
  readingFields,
  readingLabel,
  readingsToDraft,
  toDisplayReading,
  type DisplayUnits,
  type ReadingDraft,
} from './entry-form.js';
import { useNowMs } from './use-now.js';

/** Fills the boxes with the last row's readings, for the 5-minute round when nothing changed. */
export const sameAsLastRowKey = 'F4';

/**
 * The row of reading boxes for a new vitals row: time (blank for now; the event buttons use it
 * too, so the Time box belongs to the screen), each reading with the last row as placeholder;
 * Enter saves; "Same as last row" (F4) copies the last row's readings into the boxes to be
 * checked and saved. `onSave` answers null when saved or the message to show.
 */
export function EntryRow({
  units,
  record,
  lastEntry,
  onSave,
  timeText,
  onTimeText,
}: {
  readonly units: DisplayUnits;
  /** The record's start and end: a row's time must lie within them (with the contract's tolerances). */
  readonly record: Pick<ProcedureRecordValues, 'startedAt' | 'endedAt'>;
  readonly lastEntry: ProcedureEntryValues | null;
  readonly onSave: (values: ProcedureEntryValues) => Promise<string | null>;
  readonly timeText: string;
  readonly onTimeText: (text: string) => void;
}) {
  const [readings, setReadings] = useState<ReadingDraft>(emptyReadings);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);
  const firstReading = useRef<HTMLInputElement | null>(null);
  const baseId = useId();
  const nowMs = useNowMs();
  const [copied, setCopied] = useState(false);

  function copyLastRow() {
    if (lastEntry === null) return;
    setReadings(readingsToDraft(lastEntry, units));
    setErrors({});
    setCopied(true);
    firstReading.current?.focus();
  }
  useEffect(() => {
    function onKey(event: KeyboardEvent) {
      if (event.key !== sameAsLastRowKey || event.repeat || lastEntry === null) return;
      event.preventDefault();
      setReadings(readingsToDraft(lastEntry, units));
      setErrors({});
      setCopied(true);
      firstReading.current?.focus();
    }
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [lastEntry, units]);

  async function submit(event: FormEvent) {
    event.preventDefault();
    if (busy) return;
    const now = new Date();
    const checked = checkEntry({ timeText, readings, kind: 'vitals' }, units, now);
    if (!checked.ok) {
      setErrors(checked.errors);
      // Focus the first box in error, so the fix starts where the problem is.
      const key = Object.keys(checked.errors)[0];
      if (key !== undefined) document.getElementById(`${baseId}-${key === 'at' ? 'time' : key}`)?.focus();
      return;
    }
    // The back end refuses a time outside the record too; checking here shows it by the time box.
    const outside = entryTimeProblem(checked.values.at, record, now);
    if (outside !== null) {
      setErrors({ at: outside });
      return;
    }
    setErrors({});
    setBusy(true);
    const message = await onSave(checked.values);
    setBusy(false);
    if (message === null) {
      onTimeText('');
      setReadings(emptyReadings);
      setCopied(false);
    }
    firstReading.current?.focus();
  }

  return (
    <form
      className="record-entry"
      onSubmit={(event) => void submit(event)}
      noValidate
      aria-label="New row of readings"
    >
      <div className="record-entry-fields">
        <div className="field record-cell">
          <label htmlFor={`${baseId}-time`}>Time</label>
          <input
            id={`${baseId}-time`}
            value={timeText}
            size={6}
            placeholder={clockMinutesText(new Date(nowMs))}
            aria-describedby={`${baseId}-time-hint`}
            aria-invalid={errors['at'] !== undefined}
            onChange={(event) => {
              onTimeText(event.target.value);
              setErrors({});
            }}
          />
          <span className="visually-hidden" id={`${baseId}-time-hint`}>
            Blank for now, or HH:MM; the event buttons use this time too
          </span>
        </div>
        {readingFields.map((field, index) => {
          const { label, unit } = readingLabel(field, units);
          const last = lastEntry?.[field] ?? null;
          return (
            <div className="field record-cell" key={field}>
              <label htmlFor={`${baseId}-${field}`}>
                {label} <span className="record-unit">{unit}</span>
              </label>
              <input
                id={`${baseId}-${field}`}
                ref={index === 0 ? firstReading : undefined}
                autoFocus={index === 0}
                value={readings[field]}
                inputMode="decimal"
                size={5}
                placeholder={last === null ? '' : String(toDisplayReading(field, last, units))}
                aria-invalid={errors[field] !== undefined}
                aria-describedby={field === 'spo2Pct' ? `${baseId}-spo2-hint` : undefined}
                onChange={(event) => {
                  const text = event.target.value;
                  setReadings((current) => ({ ...current, [field]: text }));
                  setErrors({});
                }}
              />
              {field === 'spo2Pct' && (
                <span className="record-unit" id={`${baseId}-spo2-hint`}>
                  trend only in birds
                </span>
              )}
            </div>
          );
        })}
        <div className="record-cell record-entry-submit">
          <button type="submit" className="primary" disabled={busy}>
            Save row <kbd className="record-kbd-light">Enter</kbd>
          </button>
          <button type="button" disabled={lastEntry === null} onClick={copyLastRow}>
            Same as last row <kbd>{sameAsLastRowKey}</kbd>
          </button>
        </div>
      </div>
      {Object.keys(errors).length > 0 && (
        // One alert for the list: the problems are announced once, together.
        <div role="alert">
          <ul className="record-entry-errors">
            {Object.entries(errors).map(([field, message]) => (
              <li key={field} className="field-error">
                {message}
              </li>
            ))}
          </ul>
        </div>
      )}
      {copied && (
        <p className="status-saved" role="status">
          The last row’s readings are in the boxes: check them against the bird, change what differs, then
          press Enter.
        </p>
      )}
      <p className="hint">
        Blank boxes are not measured. Time blank means now; type HH:MM for an earlier reading or event.
        Placeholders show the last row.
      </p>
    </form>
  );
}
