import { useId, useRef, useState, type FormEvent } from 'react';
import type { ProcedureEntryValues } from '../../contract/records.js';
import type { FieldErrors } from '../common/field-errors.js';
import { clockMinutesText } from './clock-time.js';
import {
  checkEntry,
  emptyReadings,
  readingFields,
  readingLabel,
  toDisplayReading,
  type DisplayUnits,
  type ReadingDraft,
} from './entry-form.js';
import { useNowMs } from './use-now.js';

/**
 * The row of reading boxes for a new vitals row: time (blank for now), each reading with the last
 * row as placeholder; Enter saves. `onSave` answers null when saved or the message to show.
 */
export function EntryRow({
  units,
  lastEntry,
  onSave,
}: {
  readonly units: DisplayUnits;
  readonly lastEntry: ProcedureEntryValues | null;
  readonly onSave: (values: ProcedureEntryValues) => Promise<string | null>;
}) {
  const [timeText, setTimeText] = useState('');
  const [readings, setReadings] = useState<ReadingDraft>(emptyReadings);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);
  const firstReading = useRef<HTMLInputElement | null>(null);
  const baseId = useId();
  const nowMs = useNowMs();

  async function submit(event: FormEvent) {
    event.preventDefault();
    if (busy) return;
    const checked = checkEntry({ timeText, readings, kind: 'vitals' }, units, new Date());
    if (!checked.ok) {
      setErrors(checked.errors);
      return;
    }
    setErrors({});
    setBusy(true);
    const message = await onSave(checked.values);
    setBusy(false);
    if (message === null) {
      setTimeText('');
      setReadings(emptyReadings);
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
              setTimeText(event.target.value);
              setErrors({});
            }}
          />
          <span className="visually-hidden" id={`${baseId}-time-hint`}>
            Blank for now, or HH:MM
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
      <p className="hint">
        Blank boxes are not measured. Time blank means now; type HH:MM for an earlier reading. Placeholders
        show the last row.
      </p>
    </form>
  );
}
