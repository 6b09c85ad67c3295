import { useState, type FormEvent } from 'react';
import {
  emergencyDrugValuesSchema,
  type EmergencyDrug,
  type EmergencyDrugValues,
} from '../../contract/drug-channels.js';
import { describeIssues } from '../../contract/result.js';
import { api } from '../common/bridge.js';
import { fieldErrorsFrom, fieldErrorsFromContract, type FieldErrors } from '../common/field-errors.js';
import { NumberField, numberText, parseNumber, TextField } from '../common/fields.js';
import { useChannel } from '../common/use-channel.js';
import { useInitialsGate } from '../common/initials-gate.js';
import { SaveStatus, type SaveMessage } from '../common/save-status.js';
import { ScrollRegion } from '../common/scroll-region.js';

type Draft = {
  readonly name: string;
  readonly concentrationMgPerMl: string;
  readonly doseLowMgPerKg: string;
  readonly doseHighMgPerKg: string;
  readonly route: string;
  readonly doseSource: string;
  readonly notes: string;
};

const emptyDraft: Draft = {
  name: '',
  concentrationMgPerMl: '',
  doseLowMgPerKg: '',
  doseHighMgPerKg: '',
  route: '',
  doseSource: '',
  notes: '',
};

function draftOf(values: EmergencyDrugValues): Draft {
  return {
    name: values.name,
    concentrationMgPerMl: numberText(values.concentrationMgPerMl),
    doseLowMgPerKg: numberText(values.doseLowMgPerKg),
    doseHighMgPerKg: numberText(values.doseHighMgPerKg),
    route: values.route,
    doseSource: values.doseSource,
    notes: values.notes,
  };
}

function valuesOf(draft: Draft): unknown {
  return {
    name: draft.name,
    concentrationMgPerMl: parseNumber(draft.concentrationMgPerMl),
    doseLowMgPerKg: parseNumber(draft.doseLowMgPerKg),
    doseHighMgPerKg: parseNumber(draft.doseHighMgPerKg),
    route: draft.route,
    doseSource: draft.doseSource,
    notes: draft.notes,
  };
}

function doseText(values: EmergencyDrugValues): string {
  return values.doseHighMgPerKg === null
    ? `${values.doseLowMgPerKg} mg/kg`
    : `${values.doseLowMgPerKg}-${values.doseHighMgPerKg} mg/kg`;
}

/** What the form edits: a new drug, or a correction or removal of an existing one. */
type Editing =
  | { readonly kind: 'add' }
  | { readonly kind: 'correct'; readonly drug: EmergencyDrug }
  | { readonly kind: 'void'; readonly drug: EmergencyDrug };

/**
 * The clinic's emergency drugs for the worksheet's emergency card. Tidewing ships none and
 * suggests no dose: the clinic enters each drug with the source of its dose.
 */
export function EmergencyDrugs() {
  const [load, reload] = useChannel('drugs:list', {});
  const { gate, withInitials } = useInitialsGate();
  const [editing, setEditing] = useState<Editing | null>(null);
  const [draft, setDraft] = useState<Draft>(emptyDraft);
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [message, setMessage] = useState<SaveMessage | null>(null);
  const [busy, setBusy] = useState(false);

  function start(next: Editing) {
    setEditing(next);
    setDraft(next.kind === 'add' ? emptyDraft : draftOf(next.drug.values));
    setReason('');
    setErrors({});
    setMessage(null);
  }

  function update(key: keyof Draft, value: string) {
    setDraft((current) => ({ ...current, [key]: value }));
    if (errors[`values.${key}`] !== undefined) setErrors(({ [`values.${key}`]: _removed, ...rest }) => rest);
  }

  /** Checks the form, then writes once the initials of whoever is at the keyboard are known. */
  function submit(event: FormEvent) {
    event.preventDefault();
    if (editing === null) return;
    if (editing.kind !== 'add' && reason.trim() === '') {
      setErrors({ 'meta.reason': 'Say why; the reason is kept with the history.' });
      setMessage({ kind: 'failed', text: 'Not saved: give a reason.' });
      return;
    }
    let values: EmergencyDrugValues | null = null;
    if (editing.kind !== 'void') {
      const local = emergencyDrugValuesSchema.safeParse(valuesOf(draft));
      if (!local.success) {
        setErrors(
          fieldErrorsFrom(
            describeIssues(local.error.issues).map((issue) => ({ ...issue, field: `values.${issue.field}` })),
          ),
        );
        setMessage({ kind: 'failed', text: 'Not saved: correct the fields marked below.' });
        return;
      }
      values = local.data;
    }
    const target = editing;
    withInitials((enteredBy) => void write(target, values, { enteredBy, reason: reason.trim() }));
  }

  async function write(
    target: Editing,
    values: EmergencyDrugValues | null,
    meta: { enteredBy: string; reason: string },
  ) {
    setBusy(true);
    const answer =
      target.kind === 'void'
        ? await api.invoke('drugs:void', { id: target.drug.id, meta })
        : values === null
          ? null
          : target.kind === 'add'
            ? await api.invoke('drugs:add', { values, meta })
            : await api.invoke('drugs:correct', { id: target.drug.id, values, meta });
    setBusy(false);
    if (answer === null) return;
    if (answer.ok) {
      setMessage({
        kind: 'saved',
        text:
          target.kind === 'void'
            ? `Removed ${answer.value.values.name}.`
            : `Saved ${answer.value.values.name}.`,
      });
      setEditing(null);
      reload();
    } else {
      setErrors(fieldErrorsFromContract(answer.error));
      setMessage({ kind: 'failed', text: `Not saved: ${answer.error.message}` });
    }
  }

  const formTitle =
    editing === null
      ? ''
      : editing.kind === 'add'
        ? 'Add an emergency drug'
        : editing.kind === 'correct'
          ? `Correct ${editing.drug.values.name}`
          : `Remove ${editing.drug.values.name}`;

  return (
    <section className="emergency-drugs" aria-labelledby="emergency-drugs-title">
      <h2 id="emergency-drugs-title">Emergency drugs</h2>
      <p className="hint">
        Your clinic’s own emergency drugs for the worksheet’s emergency card, which turns each dose into mg
        and mL for the bird’s weight. Tidewing ships no drugs and suggests no doses: enter each dose with the
        source you rely on.
      </p>
      {load.state === 'loading' && <p aria-busy="true">Loading…</p>}
      {load.state === 'failed' && (
        <p className="form-error" role="alert">
          {load.error.message}
        </p>
      )}
      {load.state === 'ready' &&
        (load.value.length === 0 ? (
          <p>No emergency drugs entered yet; the emergency card will be blank until you add them.</p>
        ) : (
          <ScrollRegion label="Emergency drugs table">
            <table className="data-table">
              <thead>
                <tr>
                  <th scope="col">Drug</th>
                  <th scope="col">Concentration</th>
                  <th scope="col">Dose</th>
                  <th scope="col">Route</th>
                  <th scope="col">Source of the dose</th>
                  <th scope="col">Notes</th>
                  <th scope="col">Entered</th>
                  <th scope="col">
                    <span className="visually-hidden">Actions</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {load.value.map((drug) => (
                  <tr key={drug.id}>
                    <td>{drug.values.name}</td>
                    <td>{drug.values.concentrationMgPerMl} mg/mL</td>
                    <td>{doseText(drug.values)}</td>
                    <td>{drug.values.route}</td>
                    <td>{drug.values.doseSource}</td>
                    <td>{drug.values.notes}</td>
                    <td>
                      {drug.stamp.enteredBy}
                      {drug.stamp.reason === '' ? '' : ` (${drug.stamp.reason})`}
                    </td>
                    <td className="row-actions">
                      <button type="button" onClick={() => start({ kind: 'correct', drug })}>
                        Correct
                      </button>
                      <button type="button" onClick={() => start({ kind: 'void', drug })}>
                        Remove
                      </button>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
        ))}
      {editing === null ? (
        <div className="form-actions">
          <button type="button" onClick={() => start({ kind: 'add' })}>
            Add emergency drug
          </button>
          <SaveStatus message={message} />
        </div>
      ) : (
        <form onSubmit={submit} noValidate className="form drug-form" aria-label={formTitle}>
          <h3>{formTitle}</h3>
          {editing.kind !== 'void' && (
            <>
              <TextField
                label="Drug name"
                name="drugName"
                value={draft.name}
                error={errors['values.name']}
                autoFocus
                onChange={(value) => update('name', value)}
              />
              <NumberField
                label="Concentration"
                name="concentration"
                unit="mg/mL"
                value={draft.concentrationMgPerMl}
                error={errors['values.concentrationMgPerMl']}
                onChange={(value) => update('concentrationMgPerMl', value)}
              />
              <NumberField
                label="Dose, low"
                name="doseLow"
                unit="mg/kg"
                value={draft.doseLowMgPerKg}
                error={errors['values.doseLowMgPerKg']}
                onChange={(value) => update('doseLowMgPerKg', value)}
              />
              <NumberField
                label="Dose, high"
                name="doseHigh"
                unit="mg/kg"
                hint="Leave blank for a single dose."
                value={draft.doseHighMgPerKg}
                error={errors['values.doseHighMgPerKg']}
                onChange={(value) => update('doseHighMgPerKg', value)}
              />
              <TextField
                label="Route"
                name="route"
                value={draft.route}
                error={errors['values.route']}
                placeholder="e.g. IV, IM, IO"
                onChange={(value) => update('route', value)}
              />
              <TextField
                label="Source of the dose"
                name="doseSource"
                value={draft.doseSource}
                error={errors['values.doseSource']}
                hint="Required: the formulary, paper or clinic protocol you rely on. Printed on the emergency card."
                onChange={(value) => update('doseSource', value)}
              />
              <TextField
                label="Notes"
                name="notes"
                value={draft.notes}
                error={errors['values.notes']}
                onChange={(value) => update('notes', value)}
              />
            </>
          )}
          {editing.kind !== 'add' && (
            <TextField
              label="Reason"
              name="reason"
              value={reason}
              error={errors['meta.reason']}
              autoFocus={editing.kind === 'void'}
              onChange={setReason}
            />
          )}
          {gate}
          <div className="form-actions">
            <button type="submit" className="primary" disabled={busy}>
              {busy
                ? 'Saving…'
                : editing.kind === 'add'
                  ? 'Save drug'
                  : editing.kind === 'correct'
                    ? 'Save correction'
                    : 'Remove from the card'}
            </button>
            <button type="button" onClick={() => setEditing(null)}>
              Cancel
            </button>
            <SaveStatus message={message} />
          </div>
        </form>
      )}
    </section>
  );
}
