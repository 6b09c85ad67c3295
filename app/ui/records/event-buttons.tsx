import { useId, useRef, useState, type FormEvent, type KeyboardEvent } from 'react';
import { onEscape } from '../common/return-focus.js';
import { eventLabels, type EventType } from '../../core/procedure-events.js';
import { clockMinutesText, resolveClockTime } from './clock-time.js';

/** Events common enough for a button of their own, in the order they usually happen. */
const buttonEvents: readonly EventType[] = [
  'induction',
  'intubation',
  'ippvOn',
  'ippvOff',
  'vaporiserOff',
  'extubation',
  'regurgitation',
  'firstMovement',
  'standing',
];

/**
 * One button per common event, and small forms for a drug given or a note. An event is logged at
 * the time typed in the Time box of the row above (blank for now), which is then cleared. `onLog`
 * answers null when logged or the message to show.
 */
export function EventButtons({
  onLog,
  timeText,
  onTimeUsed,
}: {
  readonly onLog: (
    eventType: EventType,
    extra?: { timeText?: string; eventNote?: string; drugName?: string; drugDose?: string },
  ) => Promise<string | null>;
  /** What is typed in the Time box: blank for now, or HH:MM. */
  readonly timeText: string;
  /** Called once an event has been logged at the typed time, to clear the box. */
  readonly onTimeUsed: () => void;
}) {
  const [open, setOpen] = useState<'drugGiven' | 'note' | null>(null);
  const [note, setNote] = useState('');
  const [drugName, setDrugName] = useState('');
  const [drugDose, setDrugDose] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [logged, setLogged] = useState<string | null>(null);
  const baseId = useId();
  const drugButton = useRef<HTMLButtonElement | null>(null);
  const noteButton = useRef<HTMLButtonElement | null>(null);

  /** Escape closes the open form and puts focus back on the button that opened it. */
  function closeOnEscape(event: KeyboardEvent<HTMLFormElement>) {
    onEscape(() => {
      const opener = open === 'note' ? noteButton.current : drugButton.current;
      setOpen(null);
      setError(null);
      opener?.focus();
    })(event);
  }

  async function log(
    eventType: EventType,
    extra?: { eventNote?: string; drugName?: string; drugDose?: string },
  ) {
    const now = new Date();
    const typed = resolveClockTime(timeText, now);
    const message = await onLog(eventType, { ...extra, timeText });
    setError(message);
    if (message === null) {
      const when = typed.ok ? typed.date : now;
      setLogged(
        `${eventLabels[eventType]} logged at ${clockMinutesText(when)}${timeText.trim() === '' ? '' : ' (the time typed)'}.`,
      );
      if (timeText.trim() !== '') onTimeUsed();
      setOpen(null);
      setNote('');
      setDrugName('');
      setDrugDose('');
    }
  }

  function submitDetail(event: FormEvent) {
    event.preventDefault();
    if (open === 'note') {
      if (note.trim() === '') {
        setError('Type the note first.');
        return;
      }
      void log('note', { eventNote: note.trim() });
    } else if (open === 'drugGiven') {
      if (drugName.trim() === '') {
        setError('Name the drug given.');
        return;
      }
      void log('drugGiven', { drugName: drugName.trim(), drugDose: drugDose.trim(), eventNote: note.trim() });
    }
  }

  return (
    <div className="record-events" role="group" aria-label="Events">
      {buttonEvents.map((eventType) => (
        <button type="button" key={eventType} onClick={() => void log(eventType)}>
          {eventLabels[eventType]}
        </button>
      ))}
      <button
        type="button"
        ref={drugButton}
        aria-expanded={open === 'drugGiven'}
        onClick={() => setOpen(open === 'drugGiven' ? null : 'drugGiven')}
      >
        Drug given…
      </button>
      <button
        type="button"
        ref={noteButton}
        aria-expanded={open === 'note'}
        onClick={() => setOpen(open === 'note' ? null : 'note')}
      >
        Note…
      </button>
      {open !== null && (
        <form className="record-event-detail" onSubmit={submitDetail} onKeyDown={closeOnEscape} noValidate>
          {open === 'drugGiven' && (
            <>
              <label htmlFor={`${baseId}-drug`}>Drug</label>
              <input
                id={`${baseId}-drug`}
                value={drugName}
                size={14}
                autoFocus
                aria-invalid={error === 'Name the drug given.'}
                onChange={(event) => setDrugName(event.target.value)}
              />
              <label htmlFor={`${baseId}-dose`}>Dose and route as given</label>
              <input
                id={`${baseId}-dose`}
                value={drugDose}
                size={16}
                onChange={(event) => setDrugDose(event.target.value)}
              />
            </>
          )}
          <label htmlFor={`${baseId}-note`}>Note</label>
          <input
            id={`${baseId}-note`}
            value={note}
            size={24}
            autoFocus={open === 'note'}
            onChange={(event) => setNote(event.target.value)}
          />
          <button type="submit" className="primary">
            Log {open === 'note' ? 'note' : 'drug'}
          </button>
          {open === 'drugGiven' && (
            <span className="hint">Entered by the clinic; Tidewing suggests no dose.</span>
          )}
        </form>
      )}
      {error !== null && (
        <p className="field-error" role="alert">
          {error}
        </p>
      )}
      {logged !== null && error === null && (
        <p className="status-saved" role="status">
          {logged}
        </p>
      )}
    </div>
  );
}
