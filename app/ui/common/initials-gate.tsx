import { useId, useRef, useState, type ReactNode } from 'react';
import { useOperator } from './operator.js';

type Write = (enteredBy: string) => void;

/**
 * Every record written carries the initials of the person at the keyboard. When they are not
 * set, the write waits while a small form asks for them, then goes ahead.
 * Returns the form to render (null when nothing is waiting) and `withInitials` to wrap a write.
 */
export function useInitialsGate(): {
  readonly gate: ReactNode;
  readonly withInitials: (write: Write, cancelled?: () => void) => void;
} {
  const { initials, setInitials } = useOperator();
  const pending = useRef<{ write: Write; cancelled: (() => void) | undefined } | null>(null);
  const [asking, setAsking] = useState(false);
  const [typed, setTyped] = useState('');
  const [error, setError] = useState<string | null>(null);
  const id = useId();

  function withInitials(write: Write, cancelled?: () => void) {
    if (initials.trim() !== '') {
      write(initials.trim());
      return;
    }
    pending.current?.cancelled?.();
    pending.current = { write, cancelled };
    setAsking(true);
  }

  function submit() {
    const value = typed.trim();
    if (value === '') {
      setError('Enter your initials; every record keeps who wrote it.');
      return;
    }
    setInitials(value);
    setAsking(false);
    setError(null);
    const waiting = pending.current;
    pending.current = null;
    waiting?.write(value);
  }

  const gate = asking ? (
    // A group rather than a form: it may sit inside the form whose write it holds.
    <div className="record-initials" role="alertdialog" aria-labelledby={`${id}-title`}>
      <p id={`${id}-title`} className="record-initials-title">
        Who is entering this? Your initials are saved with every record.
      </p>
      <label htmlFor={id}>Your initials</label>
      <input
        id={id}
        value={typed}
        autoFocus
        maxLength={40}
        size={8}
        aria-invalid={error !== null}
        onChange={(event) => setTyped(event.target.value)}
        onKeyDown={(event) => {
          if (event.key !== 'Enter') return;
          event.preventDefault();
          event.stopPropagation();
          submit();
        }}
      />
      <button type="button" className="primary" onClick={submit}>
        Save with these initials
      </button>
      <button
        type="button"
        onClick={() => {
          pending.current?.cancelled?.();
          pending.current = null;
          setAsking(false);
        }}
      >
        Cancel
      </button>
      {error !== null && (
        <p className="field-error" role="alert">
          {error}
        </p>
      )}
    </div>
  ) : null;

  return { gate, withInitials };
}
