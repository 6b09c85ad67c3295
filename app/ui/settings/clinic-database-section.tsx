import { useId, useState, type FormEvent } from 'react';
import {
  databaseChoiceLabels,
  databaseEngineLabels,
  databaseTestRequestSchema,
  type DatabaseCurrent,
} from '../../contract/database-channels.js';
import { describeIssues } from '../../contract/result.js';
import { api } from '../common/bridge.js';
import { fieldErrorsFrom, fieldErrorsFromContract, type FieldErrors } from '../common/field-errors.js';
import { TextField } from '../common/fields.js';
import { SaveStatus, type SaveMessage } from '../common/save-status.js';
import { useFocusFirstError } from '../common/screen-focus.js';
import { useChannel } from '../common/use-channel.js';
import './clinic-database-section.css';

const nextStart = 'It takes effect the next time Tidewing starts on this workstation.';

/**
 * Which clinic database this workstation uses (read-only: chosen at start), a test of a
 * PostgreSQL server address, and the address for the next start, kept without a password.
 */
export function ClinicDatabaseSection() {
  const [loaded, reload] = useChannel('database:current', {});
  if (loaded.state === 'loading') return null;
  if (loaded.state === 'failed')
    return (
      <section className="panel clinic-database" aria-labelledby="clinic-database-title">
        <h2 id="clinic-database-title">Clinic database</h2>
        <p className="form-error">Could not read which database is in use: {loaded.error.message}</p>
      </section>
    );
  return <ClinicDatabaseForm current={loaded.value} onSaved={reload} />;
}

function ClinicDatabaseForm({
  current,
  onSaved,
}: {
  readonly current: DatabaseCurrent;
  readonly onSaved: () => void;
}) {
  const [address, setAddress] = useState(current.savedAddress ?? '');
  const [password, setPassword] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [message, setMessage] = useState<SaveMessage | null>(null);
  const [busy, setBusy] = useState<'testing' | 'saving' | null>(null);
  const { ref: formRef, focusFirstError } = useFocusFirstError<HTMLFormElement>();
  const passwordId = useId();

  function request() {
    return {
      address,
      ...(current.canKeepPassword && password !== '' ? { password } : {}),
    };
  }

  function locallyValid(): boolean {
    const local = databaseTestRequestSchema.safeParse(request());
    if (local.success) return true;
    setErrors(fieldErrorsFrom(describeIssues(local.error.issues)));
    setMessage({ kind: 'failed', text: 'Correct the field marked below.' });
    focusFirstError();
    return false;
  }

  async function test() {
    setMessage(null);
    if (!locallyValid()) return;
    setBusy('testing');
    const answer = await api.invoke('database:test-connection', request());
    setBusy(null);
    if (!answer.ok) {
      setErrors(fieldErrorsFromContract(answer.error));
      setMessage({ kind: 'failed', text: `Not tested: ${answer.error.message}` });
      focusFirstError();
      return;
    }
    const result = answer.value;
    if (!result.reachable) {
      setErrors({ address: result.message });
      setMessage({ kind: 'failed', text: 'The connection test failed: see the message under the address.' });
      focusFirstError();
      return;
    }
    setErrors({});
    setMessage({
      kind: 'saved',
      text:
        `Connected to PostgreSQL ${result.serverVersion}. ` +
        (result.schemaVersion === 0
          ? 'The database is empty: Tidewing will create its tables when it first starts on it.'
          : `Clinic schema version ${String(result.schemaVersion)} (this Tidewing brings it to ${String(result.supportedSchemaVersion)}).`),
    });
  }

  async function save(chosen: string | null) {
    setMessage(null);
    if (chosen !== null && !locallyValid()) return;
    setBusy('saving');
    const answer = await api.invoke('database:save-address', {
      address: chosen,
      ...(chosen !== null && current.canKeepPassword && password !== '' ? { password } : {}),
    });
    setBusy(null);
    if (!answer.ok) {
      setErrors(fieldErrorsFromContract(answer.error));
      setMessage({ kind: 'failed', text: `Not saved: ${answer.error.message}` });
      focusFirstError();
      return;
    }
    setErrors({});
    setPassword('');
    setMessage({
      kind: 'saved',
      text:
        chosen === null
          ? `Saved: the file in the data folder. ${nextStart}`
          : `Saved for this workstation. ${nextStart}`,
    });
    if (chosen === null) setAddress('');
    onSaved();
  }

  function submit(event: FormEvent) {
    event.preventDefault();
    void save(address);
  }

  return (
    <section className="panel clinic-database" aria-labelledby="clinic-database-title">
      <h2 id="clinic-database-title">Clinic database</h2>
      <dl className="clinic-database-now">
        <dt>In use now</dt>
        <dd>
          {databaseEngineLabels[current.engine]}: <code>{current.location}</code> (
          {databaseChoiceLabels[current.chosenBy]}).
        </dd>
        <dt>At the next start</dt>
        <dd>
          {current.savedAddress === null ? (
            'The file in the data folder, unless --database or TIDEWING_DATABASE_URL names a server.'
          ) : (
            <>
              <code>{current.savedAddress}</code>
              {current.passwordKept ? ', with its password kept by this computer’s keychain' : ''}, unless
              --database or TIDEWING_DATABASE_URL names another.
            </>
          )}
        </dd>
      </dl>
      <p className="hint">
        Several workstations share one clinic through a PostgreSQL server on the clinic network. Test an
        address, then save it for this workstation. {nextStart}
      </p>
      <form ref={formRef} className="form" noValidate onSubmit={submit}>
        <TextField
          label="Server address"
          name="address"
          value={address}
          error={errors['address']}
          placeholder="postgresql://tidewing@clinic-server:5432/tidewing?sslmode=verify-full"
          hint={
            current.canKeepPassword ? (
              <>
                postgresql://role@server:5432/database, with sslmode=verify-full on a clinic network. No
                password in the address: type it below, or use a password file (~/.pgpass) or PGPASSWORD.
              </>
            ) : (
              <>
                postgresql://role@server:5432/database, with sslmode=verify-full on a clinic network. No
                password in the address: it would be kept as plain text. Put it in a password file (~/.pgpass,
                readable only by you) or in PGPASSWORD; see docs/postgresql.md.
              </>
            )
          }
          onChange={(value) => {
            setAddress(value);
            setErrors({});
            setMessage(null);
          }}
        />
        {current.canKeepPassword && (
          <div className="field">
            <label htmlFor={passwordId}>Password (kept by this computer’s keychain)</label>
            <input
              id={passwordId}
              name="password"
              type="password"
              autoComplete="off"
              value={password}
              aria-invalid={errors['password'] !== undefined}
              aria-describedby={errors['password'] !== undefined ? `${passwordId}-error` : undefined}
              onChange={(event) => {
                setPassword(event.target.value);
                setMessage(null);
              }}
            />
            {errors['password'] !== undefined && (
              <p className="field-error" id={`${passwordId}-error`}>
                {errors['password']}
              </p>
            )}
          </div>
        )}
        <div className="form-actions">
          <button type="button" onClick={() => void test()} disabled={busy !== null}>
            {busy === 'testing' ? 'Testing…' : 'Test connection'}
          </button>
          <button type="submit" disabled={busy !== null}>
            {busy === 'saving' ? 'Saving…' : 'Save for the next start'}
          </button>
          {current.savedAddress !== null && (
            <button type="button" onClick={() => void save(null)} disabled={busy !== null}>
              Use the file in the data folder at the next start
            </button>
          )}
        </div>
        <SaveStatus message={message} />
      </form>
    </section>
  );
}
