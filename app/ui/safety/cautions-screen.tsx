import { useId, useState, type FormEvent } from 'react';
import { acknowledgeRequestSchema, type SafetyStatus } from '../../contract/safety.js';
import { describeIssues } from '../../contract/result.js';
import { api } from '../common/bridge.js';
import { fieldErrorsFrom, fieldErrorsFromContract, type FieldErrors } from '../common/field-errors.js';
import { cautionPoints } from './caution-text.js';

type Props = { readonly status: SafetyStatus; readonly onAcknowledged: (status: SafetyStatus) => void };

/** First-run cautions; the app stays closed until a named person acknowledges them. */
export function CautionsScreen({ status, onAcknowledged }: Props) {
  const [acknowledgedBy, setAcknowledgedBy] = useState('');
  const [accepted, setAccepted] = useState(false);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [failure, setFailure] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const nameId = useId();
  const acceptId = useId();

  async function submit(event: FormEvent) {
    event.preventDefault();
    const request = { acknowledgedBy, accepted };
    const local = acknowledgeRequestSchema.safeParse(request);
    if (!local.success) {
      setErrors(fieldErrorsFrom(describeIssues(local.error.issues)));
      return;
    }
    setBusy(true);
    const answer = await api.invoke('safety:acknowledge', local.data);
    setBusy(false);
    if (answer.ok) onAcknowledged(answer.value);
    else {
      setErrors(fieldErrorsFromContract(answer.error));
      setFailure(answer.error.message);
    }
  }

  return (
    <main className="gate" aria-labelledby="cautions-title">
      <h1 id="cautions-title">Before you use Tidewing</h1>
      <p className="lead">
        Read these cautions. Tidewing {status.appVersion} records who acknowledged them and when.
      </p>
      <ol className="caution-list">
        {cautionPoints.map((point) => (
          <li key={point.heading}>
            <strong>{point.heading}.</strong> {point.text}
          </li>
        ))}
      </ol>
      {status.last !== null && status.last.appVersion !== status.appVersion && (
        <p className="notice">
          Last acknowledged for version {status.last.appVersion}; this version asks again.
        </p>
      )}
      <form onSubmit={(event) => void submit(event)} noValidate className="form">
        <div className="field">
          <label htmlFor={nameId}>Your name or initials</label>
          <input
            id={nameId}
            name="acknowledgedBy"
            value={acknowledgedBy}
            autoComplete="name"
            autoFocus
            aria-invalid={errors['acknowledgedBy'] !== undefined}
            aria-describedby={errors['acknowledgedBy'] !== undefined ? `${nameId}-error` : undefined}
            onChange={(event) => setAcknowledgedBy(event.target.value)}
          />
          {errors['acknowledgedBy'] !== undefined && (
            <p className="field-error" id={`${nameId}-error`} role="alert">
              {errors['acknowledgedBy']}
            </p>
          )}
        </div>
        <div className="field checkbox">
          <input
            id={acceptId}
            name="accepted"
            type="checkbox"
            checked={accepted}
            aria-invalid={errors['accepted'] !== undefined}
            onChange={(event) => setAccepted(event.target.checked)}
          />
          <label htmlFor={acceptId}>
            I have read these cautions. I understand that Tidewing gives estimates for planning and that the
            responsible veterinarian decides.
          </label>
          {errors['accepted'] !== undefined && (
            <p className="field-error" role="alert">
              {errors['accepted']}
            </p>
          )}
        </div>
        {failure !== null && (
          <p className="form-error" role="alert">
            {failure}
          </p>
        )}
        <button type="submit" className="primary" disabled={busy}>
          {busy ? 'Saving…' : 'Acknowledge and continue'}
        </button>
      </form>
    </main>
  );
}
