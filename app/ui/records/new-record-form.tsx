import { useId, useState, type FormEvent } from 'react';
import type { PlanSummary } from '../../contract/plan-records.js';
import { planChoiceSuffix } from '../../core/plan-choice.js';
import { displayDate, displayMass } from '../common/display.js';
import { api } from '../common/bridge.js';
import { fieldErrorsFromContract, type FieldErrors } from '../common/field-errors.js';
import { useOperator } from '../common/operator.js';
import { agentPhasesText } from '../common/plan-labels.js';
import { useClinicSettings } from '../common/settings-context.js';
import { useChannel } from '../common/use-channel.js';
import { href } from '../shell/areas.js';
import { toLocalInputValue } from './clock-time.js';
import { useInitialsGate } from '../common/initials-gate.js';
import { RecordDetailsFields } from './record-details-fields.js';
import { checkRecordDraft, emptyRecordDraft, type RecordDraft } from './record-form.js';
import { plannedPhasesNote, recordAgentHint, withLinkedPlan } from './linked-plan.js';

function PatientPicker() {
  const [query, setQuery] = useState('');
  const [results] = useChannel('patients:search', { query, limit: 20 });
  const id = useId();
  return (
    <section className="screen" aria-labelledby="new-record-title">
      <h1 id="new-record-title">New procedure record</h1>
      <p className="lead">Choose the patient first.</p>
      <div className="field">
        <label htmlFor={id}>Find a patient (name, ring, microchip or owner)</label>
        <input id={id} value={query} autoFocus onChange={(event) => setQuery(event.target.value)} />
      </div>
      {results.state === 'failed' && (
        <p className="form-error" role="alert">
          {results.error.message}
        </p>
      )}
      {results.state === 'ready' && results.value.patients.length === 0 && (
        <p>No patient matches. Add the bird under Patients first.</p>
      )}
      {results.state === 'ready' && results.value.patients.length > 0 && (
        <ul className="record-patient-list">
          {results.value.patients.map((patient) => (
            <li key={patient.id}>
              <a href={href('records', 'new', patient.id)}>
                {patient.name} ({patient.speciesName ?? patient.speciesKey})
              </a>
              {patient.ringId !== '' && <span className="hint"> ring {patient.ringId}</span>}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

/** Starts a procedure record for one patient; `patientId` null offers a patient search first. */
export function NewRecordForm({ patientId }: { readonly patientId: number | null }) {
  if (patientId === null) return <PatientPicker />;
  return <NewRecordFormFor patientId={patientId} />;
}

function NewRecordFormFor({ patientId }: { readonly patientId: number }) {
  const { initials } = useOperator();
  const settings = useClinicSettings();
  const [patient] = useChannel('patients:get', { id: patientId });
  const [draft, setDraft] = useState<RecordDraft>(() =>
    emptyRecordDraft(toLocalInputValue(new Date()), initials, settings.defaultAgent),
  );
  const [errors, setErrors] = useState<FieldErrors>({});
  const [failure, setFailure] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [linkedPlan, setLinkedPlan] = useState<PlanSummary | null>(null);
  const { gate, withInitials } = useInitialsGate();

  function update<K extends keyof RecordDraft>(key: K, value: RecordDraft[K]) {
    setDraft((current) => ({ ...current, [key]: value }));
    if (errors[key] !== undefined || (key === 'startedAtLocal' && errors['startedAt'] !== undefined)) {
      setErrors(({ [key]: _removed, startedAt: _start, ...rest }) => rest);
    }
  }

  function submit(event: FormEvent) {
    event.preventDefault();
    setFailure(null);
    const checked = checkRecordDraft(draft);
    if (!checked.ok) {
      setErrors(checked.errors);
      setFailure('Not saved: correct the fields marked below.');
      return;
    }
    withInitials((enteredBy) => {
      setBusy(true);
      void api
        .invoke('procedures:create', { patientId, values: checked.values, meta: { enteredBy, reason: '' } })
        .then((answer) => {
          setBusy(false);
          if (answer.ok) window.location.hash = href('records', answer.value.id);
          else {
            setErrors(
              Object.fromEntries(
                Object.entries(fieldErrorsFromContract(answer.error)).map(([field, message]) => [
                  field.replace(/^values\./, ''),
                  message,
                ]),
              ),
            );
            setFailure(`Not saved: ${answer.error.message}`);
          }
        });
    });
  }

  if (patient.state === 'loading') return <p aria-busy="true">Loading the patient…</p>;
  if (patient.state === 'failed') {
    return (
      <section className="screen">
        <h1>New procedure record</h1>
        <p className="form-error" role="alert">
          {patient.error.message}
        </p>
      </section>
    );
  }
  const detail = patient.value;
  const latest = detail.trend.latest;

  return (
    <section className="screen" aria-labelledby="new-record-title">
      <h1 id="new-record-title">New procedure record</h1>
      <p className="lead">
        {detail.patient.values.name}, {detail.species?.values.commonName ?? detail.patient.values.speciesKey}
        {latest !== null &&
          `, ${displayMass(latest.massG, settings.massUnit)} on ${displayDate(latest.weighedOn)}`}
        {latest === null && ', no weight recorded'}
      </p>
      <form onSubmit={submit} noValidate className="form record-new-form">
        <LinkedPlan
          patientId={patientId}
          planId={draft.planId}
          error={errors['planId']}
          onChoose={(plan, previous) => {
            setErrors(({ planId: _plan, ...rest }) => rest);
            setLinkedPlan(plan);
            // The record follows the linked plan: the airway and breathing system of the phase it
            // starts on replace what an earlier plan put there (change them here after choosing).
            setDraft((current) => ({
              ...withLinkedPlan(current, plan, previous, settings.defaultAgent),
              planId: plan === null ? null : plan.id,
            }));
          }}
        />
        <RecordDetailsFields
          draft={draft}
          errors={errors}
          update={update}
          agentHint={recordAgentHint(draft.agent, linkedPlan, settings.defaultAgent)}
        />
        {gate}
        <div className="form-actions">
          <button type="submit" className="primary" disabled={busy}>
            {busy ? 'Saving…' : 'Start procedure record'}
          </button>
          {failure !== null && (
            <p className="form-error" role="status">
              {failure}
            </p>
          )}
        </div>
      </form>
    </section>
  );
}

/** Choose the saved plan this procedure follows; its predicted curve is then drawn beside the log. */
function LinkedPlan({
  patientId,
  planId,
  error,
  onChoose,
}: {
  readonly patientId: number;
  readonly planId: number | null;
  /** The back end's refusal of the chosen plan (missing, or another bird's). */
  readonly error: string | undefined;
  readonly onChoose: (plan: PlanSummary | null, previous: PlanSummary | null) => void;
}) {
  const [plans] = useChannel('plans:for-patient', { patientId });
  const previous = plans.state === 'ready' ? (plans.value.find((plan) => plan.id === planId) ?? null) : null;
  const id = useId();
  const note = previous === null ? null : plannedPhasesNote(previous);
  const message =
    error === undefined ? null : (
      <p className="field-error" id={`${id}-error`} role="alert">
        {error}
      </p>
    );
  if (plans.state !== 'ready' || plans.value.length === 0)
    return (
      <>
        <p className="hint">No saved plan for this bird; the record can still be kept.</p>
        {message}
      </>
    );
  return (
    <div className="field">
      <label htmlFor={id}>Linked plan</label>
      <select
        id={id}
        name="planId"
        aria-invalid={error !== undefined}
        aria-describedby={
          [error === undefined ? '' : `${id}-error`, note === null ? '' : `${id}-phases`].join(' ').trim() ||
          undefined
        }
        value={planId === null ? '' : String(planId)}
        onChange={(event) =>
          onChoose(plans.value.find((plan) => String(plan.id) === event.target.value) ?? null, previous)
        }
      >
        <option value="">no plan</option>
        {plans.value.map((plan) => (
          <option key={plan.id} value={plan.id}>
            Plan {plan.id}, {displayDate(plan.plannedFor)}: {agentPhasesText(plan)}
            {plan.label === '' ? '' : ` (${plan.label})`}
            {planChoiceSuffix(plan)}
          </option>
        ))}
      </select>
      {note !== null && (
        <p className="hint phase-plan-note" id={`${id}-phases`}>
          {note} The airway below is the plan’s first phase; log the move as an event when it happens.
        </p>
      )}
      {message}
    </div>
  );
}
