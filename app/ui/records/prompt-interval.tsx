import { useId, useState, type FormEvent } from 'react';
import type { ProcedureRecordValues } from '../../contract/records.js';
import { parseNumber } from './entry-form.js';

/** Sets how often (1 to 30 min) the screen reminds staff to log vitals; saved as a correction with its reason. */
export function PromptInterval({
  values,
  onSave,
}: {
  readonly values: ProcedureRecordValues;
  readonly onSave: (next: ProcedureRecordValues, reason: string) => Promise<string | null>;
}) {
  const [text, setText] = useState(String(values.promptIntervalMin));
  const [error, setError] = useState<string | null>(null);
  const id = useId();
  async function submit(event: FormEvent) {
    event.preventDefault();
    const parsed = parseNumber(text);
    if (parsed === null || parsed === 'invalid' || parsed < 1 || parsed > 30) {
      setError('Prompt interval is 1 to 30 minutes.');
      return;
    }
    if (parsed === values.promptIntervalMin) return;
    const message = await onSave(
      { ...values, promptIntervalMin: parsed },
      `Prompt interval changed from ${values.promptIntervalMin} to ${parsed} min`,
    );
    setError(message);
  }
  return (
    <form className="record-interval" onSubmit={(event) => void submit(event)} noValidate>
      <label htmlFor={id}>Remind me to log vitals every</label>
      <input
        id={id}
        value={text}
        size={3}
        inputMode="decimal"
        aria-invalid={error !== null}
        onChange={(event) => setText(event.target.value)}
      />
      <span>min</span>
      <button type="submit">Set</button>
      {error !== null && (
        <span className="field-error" role="alert">
          {error}
        </span>
      )}
    </form>
  );
}
