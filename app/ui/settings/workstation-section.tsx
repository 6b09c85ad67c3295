import { useState, type FormEvent } from 'react';
import { describeIssues } from '../../contract/result.js';
import {
  themeChoices,
  themeLabels,
  workstationChangeSchema,
  type ThemeChoice,
} from '../../contract/workstation.js';
import { applyThemeChoice } from '../common/theme.js';
import { fieldErrorsFrom, fieldErrorsFromContract, type FieldErrors } from '../common/field-errors.js';
import { Choice, TextField } from '../common/fields.js';
import { useOperator } from '../common/operator.js';
import { SaveStatus, type SaveMessage } from '../common/save-status.js';
import { useFocusFirstError } from '../common/screen-focus.js';
import './workstation-section.css';

/**
 * This workstation's own settings, kept in the clinic database under its id: its name (shown
 * beside what it wrote), the initials of whoever is at its keyboard and the screen theme.
 * The theme and the initials are kept at once (the initials as in the top bar); the name with its button.
 */
export function WorkstationSection() {
  const { workstation, initials, setInitials, saveWorkstation } = useOperator();
  const [name, setName] = useState(workstation?.name ?? '');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [message, setMessage] = useState<SaveMessage | null>(null);
  const [themeMessage, setThemeMessage] = useState<SaveMessage | null>(null);
  const [busy, setBusy] = useState(false);
  // Shown at once when chosen; back to the stored one if the save fails.
  const [theme, setTheme] = useState<ThemeChoice>(workstation?.theme ?? 'system');
  const { ref: formRef, focusFirstError } = useFocusFirstError<HTMLFormElement>();
  if (workstation === null) return null;

  async function submit(event: FormEvent) {
    event.preventDefault();
    const local = workstationChangeSchema.safeParse({ name });
    if (!local.success) {
      setErrors(fieldErrorsFrom(describeIssues(local.error.issues)));
      setMessage({ kind: 'failed', text: 'Not saved: correct the fields marked below.' });
      focusFirstError();
      return;
    }
    setBusy(true);
    const answer = await saveWorkstation({ name: local.data.name });
    setBusy(false);
    if (!answer.ok) {
      setErrors(fieldErrorsFromContract(answer.error));
      setMessage({ kind: 'failed', text: `Not saved: ${answer.error.message}` });
      focusFirstError();
      return;
    }
    setErrors({});
    setName(answer.value.name);
    setMessage({ kind: 'saved', text: `Saved for ${answer.value.name}.` });
  }

  return (
    <section className="panel workstation-display" aria-labelledby="workstation-title">
      <h2 id="workstation-title">This workstation</h2>
      <p className="hint">
        Kept in the clinic database for this computer only, so each workstation has its own; they stay after a
        restart. The printed worksheet is always black on white.
      </p>
      <form ref={formRef} className="form" noValidate onSubmit={(event) => void submit(event)}>
        <TextField
          label="Workstation name"
          name="name"
          value={name}
          error={errors['name']}
          hint="E.g. Theatre 1 or Prep room, so the clinic can tell its computers apart."
          onChange={(value) => {
            setName(value);
            setMessage(null);
          }}
        />
        <TextField
          label="Initials at this workstation"
          name="initials"
          value={initials}
          hint="The same as the initials box in the top bar, kept as you type; every record written here carries them."
          onChange={setInitials}
        />
        <div className="form-actions">
          <button type="submit" disabled={busy}>
            {busy ? 'Saving…' : 'Save workstation'}
          </button>
          <SaveStatus message={message} />
        </div>
      </form>
      <Choice
        legend="Theme"
        name="theme"
        options={themeChoices}
        labels={themeLabels}
        value={theme}
        error={undefined}
        onChange={(value) => {
          setThemeMessage(null);
          setTheme(value);
          applyThemeChoice(value);
          void saveWorkstation({ theme: value }).then((answer) => {
            if (answer.ok) {
              setThemeMessage({
                kind: 'saved',
                text: `${themeLabels[answer.value.theme]}: applied and kept.`,
              });
              return;
            }
            setTheme(workstation.theme);
            applyThemeChoice(workstation.theme);
            setThemeMessage({ kind: 'failed', text: `Theme not kept: ${answer.error.message}` });
          });
        }}
      />
      <SaveStatus message={themeMessage} />
    </section>
  );
}
