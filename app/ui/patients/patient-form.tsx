import { useEffect, useState, type FormEvent } from 'react';
import { hatchDateProblem, localDateOf } from '../../contract/input-rules.js';
import { describeIssues } from '../../contract/result.js';
import { patientValuesSchema, sexes, type PatientValues } from '../../contract/records.js';
import { api } from '../common/bridge.js';
import { fieldErrorsFrom, fieldErrorsFromContract, type FieldErrors } from '../common/field-errors.js';
import { SelectField, TextField } from '../common/fields.js';
import { useChannel } from '../common/use-channel.js';
import { useInitialsGate } from '../common/initials-gate.js';
import { useFocusFirstError } from '../common/screen-focus.js';
import { href } from '../shell/areas.js';

type Draft = {
  name: string;
  speciesKey: string;
  sex: PatientValues['sex'];
  hatchDate: string;
  ageText: string;
  ringId: string;
  microchipId: string;
  ownerReference: string;
  notes: string;
};

const emptyDraft: Draft = {
  name: '',
  speciesKey: '',
  sex: 'unknown',
  hatchDate: '',
  ageText: '',
  ringId: '',
  microchipId: '',
  ownerReference: '',
  notes: '',
};

function toDraft(values: PatientValues): Draft {
  return { ...values, hatchDate: values.hatchDate ?? '' };
}

/** Create a patient, or correct one (a reason is then required and kept with the history). */
export function PatientFormScreen({ patientId }: { readonly patientId: number | null }) {
  const [speciesLoad] = useChannel('species:list', {});
  const [draft, setDraft] = useState<Draft>(emptyDraft);
  const [reason, setReason] = useState('');
  // The version of the details this form was opened on: a correction names it, so one saved
  // meanwhile on another workstation is refused (with who and when) instead of silently followed.
  const [versionId, setVersionId] = useState<number | null>(null);
  const [loaded, setLoaded] = useState(patientId === null);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [failure, setFailure] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const { gate, withInitials } = useInitialsGate();
  const { ref: formRef, focusFirstError } = useFocusFirstError<HTMLFormElement>();

  useEffect(() => {
    if (patientId === null) return;
    void api.invoke('patients:get', { id: patientId }).then((answer) => {
      if (answer.ok) {
        setDraft(toDraft(answer.value.patient.values));
        setVersionId(answer.value.patient.stamp.versionId);
        setLoaded(true);
      } else setFailure(answer.error.message);
    });
  }, [patientId]);

  const set =
    <K extends keyof Draft>(key: K) =>
    (value: Draft[K]) =>
      setDraft((current) => ({ ...current, [key]: value }));

  async function submit(event: FormEvent) {
    event.preventDefault();
    setFailure(null);
    const parsed = patientValuesSchema.safeParse({
      ...draft,
      hatchDate: draft.hatchDate === '' ? null : draft.hatchDate,
    });
    const local: Record<string, string> = parsed.success
      ? {}
      : { ...fieldErrorsFrom(describeIssues(parsed.error.issues)) };
    // The back end checks this against its clock too; checking here shows it before sending.
    const hatch = patientValuesSchema.shape.hatchDate.safeParse(
      draft.hatchDate === '' ? null : draft.hatchDate,
    );
    const hatchProblem = hatch.success ? hatchDateProblem(hatch.data, localDateOf(new Date())) : null;
    if (hatchProblem !== null) local['hatchDate'] = hatchProblem;
    const reasonError: Record<string, string> =
      patientId !== null && reason.trim() === ''
        ? { reason: 'Say why the record is corrected; the reason is kept with the history.' }
        : {};
    if (!parsed.success || Object.keys(local).length > 0 || Object.keys(reasonError).length > 0) {
      setErrors({ ...local, ...reasonError });
      setFailure('Not saved: correct the fields marked above.');
      focusFirstError();
      return;
    }
    setErrors({});
    const values = parsed.data;
    // Without initials, a prompt opens here, focused, and the save goes ahead once they are given.
    withInitials((enteredBy) => void write(values, { enteredBy, reason: reason.trim() }));
  }

  async function write(values: PatientValues, meta: { enteredBy: string; reason: string }) {
    setBusy(true);
    const answer =
      patientId === null
        ? await api.invoke('patients:create', { values, meta })
        : await api.invoke('patients:correct', {
            id: patientId,
            ...(versionId === null ? {} : { versionId }),
            values,
            meta,
          });
    setBusy(false);
    if (answer.ok) {
      window.location.hash = href('patients', answer.value.id);
      return;
    }
    const contractErrors = fieldErrorsFromContract(answer.error);
    setErrors(
      Object.fromEntries(
        Object.entries(contractErrors).map(([field, message]) => [
          field.replace(/^(values|meta)\./, ''),
          message,
        ]),
      ),
    );
    setFailure(answer.error.message);
    focusFirstError();
  }

  const speciesOptions =
    speciesLoad.state === 'ready'
      ? speciesLoad.value.map((species) => ({
          value: species.key,
          label: `${species.values.commonName} (${species.values.massMinG}-${species.values.massMaxG} g)`,
        }))
      : [];
  const title = patientId === null ? 'New patient' : 'Correct patient details';
  if (!loaded) return <p aria-busy="true">{failure ?? 'Loading…'}</p>;
  return (
    <section className="screen" aria-labelledby="patient-form-title">
      <h1 id="patient-form-title">{title}</h1>
      <form ref={formRef} className="form" noValidate onSubmit={(event) => void submit(event)}>
        <div className="form-grid">
          <TextField
            label="Name or clinic ID"
            name="name"
            value={draft.name}
            error={errors['name']}
            autoFocus
            onChange={set('name')}
          />
          <SelectField
            label="Species"
            name="speciesKey"
            value={draft.speciesKey}
            error={errors['speciesKey']}
            options={[{ value: '', label: 'Choose a species…' }, ...speciesOptions]}
            hint={<a href={href('species')}>Species not listed? Add it under Species.</a>}
            onChange={set('speciesKey')}
          />
          <SelectField
            label="Sex"
            name="sex"
            value={draft.sex}
            error={errors['sex']}
            options={sexes.map((sex) => ({ value: sex, label: sex }))}
            onChange={set('sex')}
          />
          <TextField
            label="Hatch date"
            name="hatchDate"
            type="date"
            value={draft.hatchDate}
            error={errors['hatchDate']}
            hint="Leave blank if unknown."
            onChange={set('hatchDate')}
          />
          <TextField
            label="Age (if hatch date unknown)"
            name="ageText"
            value={draft.ageText}
            error={errors['ageText']}
            placeholder="e.g. adult, about 3 years"
            onChange={set('ageText')}
          />
          <TextField
            label="Ring ID"
            name="ringId"
            value={draft.ringId}
            error={errors['ringId']}
            onChange={set('ringId')}
          />
          <TextField
            label="Microchip ID"
            name="microchipId"
            value={draft.microchipId}
            error={errors['microchipId']}
            onChange={set('microchipId')}
          />
          <TextField
            label="Owner reference"
            name="ownerReference"
            value={draft.ownerReference}
            error={errors['ownerReference']}
            hint="Your practice system's owner number or name."
            onChange={set('ownerReference')}
          />
        </div>
        <TextField
          label="Notes"
          name="notes"
          multiline
          value={draft.notes}
          error={errors['notes']}
          onChange={set('notes')}
        />
        {patientId !== null && (
          <TextField
            label="Reason for the correction"
            name="reason"
            value={reason}
            error={errors['reason']}
            onChange={setReason}
          />
        )}
        {failure !== null && (
          <p className="form-error" role="alert">
            {failure}
          </p>
        )}
        {gate}
        <div className="form-actions">
          <button type="submit" className="primary" disabled={busy}>
            {busy ? 'Saving…' : patientId === null ? 'Save patient' : 'Save correction'}
          </button>
          <a href={patientId === null ? href('patients') : href('patients', patientId)}>Cancel</a>
        </div>
      </form>
    </section>
  );
}
