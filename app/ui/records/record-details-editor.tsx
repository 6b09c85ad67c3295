import { useState, type FormEvent } from 'react';
import type { ProcedureRecordValues } from '../../contract/records.js';
import { displayDateTime } from '../common/display.js';
import type { FieldErrors } from '../common/field-errors.js';
import { onEscape } from '../common/return-focus.js';
import { useChannel } from '../common/use-channel.js';
import { useChangeNotices } from '../common/use-change-notices.js';
import { TextBox } from './fields.js';
import { RecordDetailsFields } from './record-details-fields.js';
import {
  agentText,
  airwayText,
  asaText,
  checkRecordDraft,
  recordToDraft,
  type RecordDraft,
} from './record-form.js';

function sameDetails<T>(a: T, b: T): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

type Props = {
  readonly recordId: number;
  /** The version of the details now on screen. */
  readonly versionId: number;
  readonly values: ProcedureRecordValues;
  /** Saves a correction of `versionId`; null when saved, else the message to show. */
  readonly onSave: (next: ProcedureRecordValues, reason: string, versionId: number) => Promise<string | null>;
  /** Closes the editor (Close, Escape); the screen returns focus to what opened it. */
  readonly onClose: () => void;
};

/**
 * Corrects a record's details (procedure, ASA grade, airway, ...) as a new version with a
 * reason; the earlier versions stay listed below it. The correction names the version the
 * editor was opened on, so a change saved meanwhile on another workstation is not overwritten:
 * the refusal is shown here with the typed values kept. After a save (saved or refused, the
 * screen reloads) the editor follows the version on screen: the user has seen what it holds.
 */
export function RecordDetailsEditor({ recordId, versionId, values, onSave, onClose }: Props) {
  const [draft, setDraft] = useState<RecordDraft>(() => recordToDraft(values));
  const [openedOn] = useState(versionId);
  const [followScreen, setFollowScreen] = useState(false);
  const basedOn = followScreen ? versionId : openedOn;
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [failure, setFailure] = useState<string | null>(null);
  const [history, reloadHistory] = useChannel('procedures:history', { id: recordId });
  useChangeNotices(
    (notice) =>
      notice.kind === 'procedure-records' && (notice.recordId === undefined || notice.recordId === recordId),
    reloadHistory,
  );
  // The details the draft started from. When the record changes meanwhile (another workstation
  // or tab), an untouched draft follows it; a draft being edited is kept, with an offer to show
  // the new details instead.
  const [base, setBase] = useState(values);
  const changedMeanwhile = !sameDetails(base, values);
  // Untouched, or just saved from here: the new details are what the draft says.
  const followsRecord = sameDetails(recordToDraft(base), draft) || sameDetails(recordToDraft(values), draft);
  if (changedMeanwhile && followsRecord) {
    setBase(values);
    setDraft(recordToDraft(values));
  }

  function update<K extends keyof RecordDraft>(key: K, value: RecordDraft[K]) {
    setDraft((current) => ({ ...current, [key]: value }));
  }

  async function submit(event: FormEvent) {
    event.preventDefault();
    const checked = checkRecordDraft(draft, { agentMayStayUnrecorded: base.agent === null });
    const found: Record<string, string> = checked.ok ? {} : { ...checked.errors };
    if (reason.trim() === '')
      found['reason'] = 'Say why the record is corrected; the reason is kept with the history.';
    if (!checked.ok || Object.keys(found).length > 0) {
      setErrors(found);
      return;
    }
    setErrors({});
    const message = await onSave({ ...checked.values, endedAt: values.endedAt }, reason.trim(), basedOn);
    setFailure(message);
    setFollowScreen(true);
    reloadHistory();
    if (message === null) setReason('');
  }

  return (
    <section
      className="panel record-details-editor"
      aria-labelledby="record-details-title"
      onKeyDown={onEscape(onClose)}
    >
      <h2 id="record-details-title">Correct the record’s details</h2>
      <form className="form record-new-form" noValidate onSubmit={(event) => void submit(event)}>
        {changedMeanwhile && !followsRecord && (
          <p className="notice" role="status">
            These details were changed on another workstation or in another tab while you were correcting
            them.{' '}
            <button
              type="button"
              onClick={() => {
                setBase(values);
                setDraft(recordToDraft(values));
              }}
            >
              Show the new details
            </button>{' '}
            (your changes here are then dropped)
          </p>
        )}
        <RecordDetailsFields
          draft={draft}
          errors={errors}
          update={update}
          agentMayStayUnrecorded={base.agent === null}
          agentHint={
            base.agent === null
              ? 'This record was made before records named their agent; choose it only if you know it.'
              : undefined
          }
        />
        <TextBox
          label="Reason for the correction"
          name="reason"
          value={reason}
          error={errors['reason']}
          onChange={setReason}
        />
        {failure !== null && (
          <p className="form-error" role="alert">
            {failure}
          </p>
        )}
        <div className="form-actions">
          <button type="submit" className="primary">
            Save correction
          </button>
          <button type="button" onClick={onClose}>
            Close
          </button>
        </div>
      </form>
      <h3>History of the details</h3>
      {history.state === 'ready' && (
        <ol className="history" aria-label="History of the record's details">
          {history.value.map((version) => (
            <li key={version.stamp.versionId}>
              {displayDateTime(version.stamp.enteredAt)} by {version.stamp.enteredBy}
              {version.stamp.reason !== '' && ` · why: ${version.stamp.reason}`} ·{' '}
              {version.values.procedureName}, ASA {asaText(version.values)}, {airwayText(version.values)},{' '}
              {agentText(version.values.agent)}, staff {version.values.staffInitials}
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}
