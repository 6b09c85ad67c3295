import { useEffect, useState, type FormEvent } from 'react';
import { speciesValuesSchema, type Species, type SpeciesValues } from '../../contract/records.js';
import { describeIssues } from '../../contract/result.js';
import { agentIds, agents, type AgentId } from '../../core/agents.js';
import { potencyMeasures } from '../../core/species-reference.js';
import { api } from '../common/bridge.js';
import { displayBasis, displayDateTime } from '../common/display.js';
import { fieldErrorsFrom, fieldErrorsFromContract, type FieldErrors } from '../common/field-errors.js';
import { NumberField, SelectField, TextField } from '../common/fields.js';
import { useInitialsGate } from '../common/initials-gate.js';
import { useFocusFirstError } from '../common/screen-focus.js';
import { href } from '../shell/areas.js';
import {
  draftToCandidate,
  emptySpeciesDraft,
  speciesToDraft,
  type MacDraft,
  type RangeDraft,
  type SpeciesDraft,
} from './species-draft.js';

const basisHint =
  'Give the source; without one, end with (common practice), (unverified value) or (assumption).';

/** Add a species, or edit one (a reason is required; the earlier values stay in the history). */
export function SpeciesFormScreen({ speciesKey }: { readonly speciesKey: string | null }) {
  const [draft, setDraft] = useState<SpeciesDraft>(emptySpeciesDraft);
  const [history, setHistory] = useState<Species[]>([]);
  const [loaded, setLoaded] = useState(speciesKey === null);
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [failure, setFailure] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  // The version this form was opened on (then the one it saved): a correction names it, so one
  // saved meanwhile on another workstation is refused (with who, when and why), never overwritten.
  const [versionId, setVersionId] = useState<number | null>(null);
  const { gate, withInitials } = useInitialsGate();
  const { ref: formRef, focusFirstError } = useFocusFirstError<HTMLFormElement>();

  useEffect(() => {
    if (speciesKey === null) return;
    void api.invoke('species:history', { key: speciesKey }).then((answer) => {
      if (!answer.ok) return setFailure(answer.error.message);
      const current = answer.value[0];
      if (current === undefined) return setFailure(`There is no species "${speciesKey}".`);
      setDraft(speciesToDraft(current.values));
      setVersionId(current.stamp.versionId);
      setHistory(answer.value);
      setLoaded(true);
    });
  }, [speciesKey]);

  const update = (change: (draft: SpeciesDraft) => SpeciesDraft) => {
    setDraft(change);
    setSaved(null);
  };
  const setMac = (agent: AgentId, key: keyof MacDraft) => (value: string) =>
    update((current) => ({
      ...current,
      mac: { ...current.mac, [agent]: { ...current.mac[agent], [key]: value } },
    }));
  const setRange = (group: 'heartRate' | 'breathsPerMin', key: keyof RangeDraft) => (value: string) =>
    update((current) => ({ ...current, [group]: { ...current[group], [key]: value } }));
  const setText =
    (
      key:
        | 'commonName'
        | 'scientificName'
        | 'massMinG'
        | 'massMaxG'
        | 'massBasis'
        | 'apnoeaValue'
        | 'apnoeaBasis',
    ) =>
    (value: string) =>
      update((current) => ({ ...current, [key]: value }));

  async function submit(event: FormEvent) {
    event.preventDefault();
    setFailure(null);
    const parsed = speciesValuesSchema.safeParse(draftToCandidate(draft));
    const found: Record<string, string> = parsed.success
      ? {}
      : { ...fieldErrorsFrom(describeIssues(parsed.error.issues)) };
    if (speciesKey !== null && reason.trim() === '')
      found['reason'] = 'Say why the value changes; the reason is kept with the history.';
    if (!parsed.success || Object.keys(found).length > 0) {
      setErrors(found);
      setFailure('Not saved: correct the fields marked.');
      focusFirstError();
      return;
    }
    setErrors({});
    const values = parsed.data;
    // Without initials, a prompt opens here, focused, and the save goes ahead once they are given.
    withInitials((enteredBy) => void write(values, { enteredBy, reason: reason.trim() }));
  }

  async function write(values: SpeciesValues, meta: { enteredBy: string; reason: string }) {
    const answer =
      speciesKey === null
        ? await api.invoke('species:add', { values, meta })
        : await api.invoke('species:correct', {
            key: speciesKey,
            ...(versionId === null ? {} : { versionId }),
            values,
            meta,
          });
    if (!answer.ok) {
      setErrors(
        Object.fromEntries(
          Object.entries(fieldErrorsFromContract(answer.error)).map(([field, message]) => [
            field.replace(/^values\./, ''),
            message,
          ]),
        ),
      );
      setFailure(answer.error.message);
      focusFirstError();
      // Refused because another correction came first: the history below shows it.
      if (answer.error.code === 'conflict' && speciesKey !== null) {
        const refreshed = await api.invoke('species:history', { key: speciesKey });
        if (refreshed.ok) setHistory(refreshed.value);
      }
      return;
    }
    setErrors({});
    setVersionId(answer.value.stamp.versionId);
    if (speciesKey === null) {
      window.location.hash = href('species', answer.value.key);
      return;
    }
    const refreshed = await api.invoke('species:history', { key: speciesKey });
    if (refreshed.ok) setHistory(refreshed.value);
    setReason('');
    setSaved(`Saved ${displayDateTime(answer.value.stamp.enteredAt)}.`);
  }

  if (!loaded) return <p aria-busy={failure === null}>{failure ?? 'Loading…'}</p>;
  const range = (group: 'heartRate' | 'breathsPerMin', label: string, unit: string) => (
    <fieldset className="group">
      <legend>{label} (optional)</legend>
      <div className="form-grid">
        <NumberField
          label="Lowest"
          unit={unit}
          value={draft[group].min}
          error={errors[`${group}.min`]}
          onChange={setRange(group, 'min')}
        />
        <NumberField
          label="Highest"
          unit={unit}
          value={draft[group].max}
          error={errors[`${group}.max`]}
          onChange={setRange(group, 'max')}
        />
        <TextField
          label="Source"
          value={draft[group].basis}
          error={errors[`${group}.basis`]}
          hint={basisHint}
          onChange={setRange(group, 'basis')}
        />
      </div>
    </fieldset>
  );
  return (
    <section className="screen" aria-labelledby="species-form-title">
      <p>
        {speciesKey === null ? (
          <a href={href('species')}>← All species</a>
        ) : (
          <a href={href('species', speciesKey)}>
            ← Back to {history[0]?.values.commonName ?? speciesKey} (no changes)
          </a>
        )}
      </p>
      <h1 id="species-form-title">
        {speciesKey === null ? 'Add species' : `Edit ${history[0]?.values.commonName ?? speciesKey}`}
      </h1>
      <form ref={formRef} className="form wide-form" noValidate onSubmit={(event) => void submit(event)}>
        <div className="form-grid">
          <TextField
            label="Common name"
            value={draft.commonName}
            error={errors['commonName']}
            autoFocus
            onChange={setText('commonName')}
          />
          <TextField
            label="Scientific name"
            value={draft.scientificName}
            error={errors['scientificName']}
            onChange={setText('scientificName')}
          />
        </div>
        <fieldset className="group">
          <legend>Typical adult mass</legend>
          <div className="form-grid">
            <NumberField
              label="Lowest"
              unit="g"
              value={draft.massMinG}
              error={errors['massMinG']}
              onChange={setText('massMinG')}
            />
            <NumberField
              label="Highest"
              unit="g"
              value={draft.massMaxG}
              error={errors['massMaxG']}
              onChange={setText('massMaxG')}
            />
            <TextField
              label="Source"
              value={draft.massBasis}
              error={errors['massBasis']}
              hint={basisHint}
              onChange={setText('massBasis')}
            />
          </div>
        </fieldset>
        {agentIds.map((agent) => (
          <fieldset className="group" key={agent}>
            <legend>MAC of {agents[agent].displayName} (end-tidal vol %, optional)</legend>
            <div className="form-grid">
              <NumberField
                label="MAC"
                unit="%"
                value={draft.mac[agent].macPct}
                error={errors[`mac.${agent}.macPct`]}
                onChange={setMac(agent, 'macPct')}
              />
              <NumberField
                label="SD"
                unit="%"
                value={draft.mac[agent].sdPct}
                error={errors[`mac.${agent}.sdPct`]}
                onChange={setMac(agent, 'sdPct')}
              />
              <SelectField
                label="What was measured"
                value={draft.mac[agent].measure}
                options={potencyMeasures.map((measure) => ({ value: measure, label: measure }))}
                onChange={setMac(agent, 'measure')}
              />
              <TextField
                label="Source"
                value={draft.mac[agent].basis}
                error={errors[`mac.${agent}.basis`]}
                hint={basisHint}
                onChange={setMac(agent, 'basis')}
              />
              <TextField
                label="Conditions"
                value={draft.mac[agent].note}
                placeholder="e.g. after butorphanol"
                onChange={setMac(agent, 'note')}
              />
            </div>
          </fieldset>
        ))}
        {range('heartRate', 'Resting heart rate', '/min')}
        {range('breathsPerMin', 'Resting breathing rate', '/min')}
        <fieldset className="group">
          <legend>Apnoea reported above (optional)</legend>
          <div className="form-grid">
            <NumberField
              label="MAC multiple"
              unit="× MAC"
              value={draft.apnoeaValue}
              error={errors['apnoeaMacMultiple.value']}
              onChange={setText('apnoeaValue')}
            />
            <TextField
              label="Source"
              value={draft.apnoeaBasis}
              error={errors['apnoeaMacMultiple.basis']}
              hint={basisHint}
              onChange={setText('apnoeaBasis')}
            />
          </div>
        </fieldset>
        <fieldset className="group">
          <legend>Airway and anatomy notes</legend>
          {draft.anatomyNotes.map((note, index) => (
            <div className="form-grid" key={index}>
              <TextField
                label={`Note ${index + 1}`}
                value={note.text}
                error={errors[`anatomyNotes.${index}.text`]}
                onChange={(value) =>
                  update((current) => ({
                    ...current,
                    anatomyNotes: current.anatomyNotes.map((item, at) =>
                      at === index ? { ...item, text: value } : item,
                    ),
                  }))
                }
              />
              <TextField
                label="Source"
                value={note.basis}
                error={errors[`anatomyNotes.${index}.basis`]}
                onChange={(value) =>
                  update((current) => ({
                    ...current,
                    anatomyNotes: current.anatomyNotes.map((item, at) =>
                      at === index ? { ...item, basis: value } : item,
                    ),
                  }))
                }
              />
              <div className="field">
                <span className="muted">&nbsp;</span>
                <button
                  type="button"
                  onClick={() =>
                    update((current) => ({
                      ...current,
                      anatomyNotes: current.anatomyNotes.filter((_item, at) => at !== index),
                    }))
                  }
                >
                  Remove note {index + 1}
                </button>
              </div>
            </div>
          ))}
          <button
            type="button"
            onClick={() =>
              update((current) => ({
                ...current,
                anatomyNotes: [...current.anatomyNotes, { code: '', text: '', basis: '' }],
              }))
            }
          >
            Add a note
          </button>
        </fieldset>
        {speciesKey !== null && (
          <TextField
            label="Reason for the change"
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
          <button type="submit" className="primary">
            {speciesKey === null ? 'Add species' : 'Save changes'}
          </button>
          {saved !== null && (
            <p className="status-saved" role="status">
              {saved}
            </p>
          )}
        </div>
      </form>
      {history.length > 0 && (
        <section className="panel" aria-labelledby="species-history-title">
          <h2 id="species-history-title">History</h2>
          <ol className="history">
            {history.map((version) => (
              <li key={version.stamp.versionId}>
                {displayDateTime(version.stamp.enteredAt)} by {version.stamp.enteredBy}
                {version.stamp.reason !== '' && ` · why: ${version.stamp.reason}`} · mass{' '}
                {version.values.massMinG}-{version.values.massMaxG} g (
                {displayBasis(version.values.massBasis)})
                {agentIds.map((agent) => {
                  const mac = version.values.mac[agent];
                  return mac === null
                    ? null
                    : ` · ${agents[agent].displayName} ${mac.macPct} % (${displayBasis(mac.basis)})`;
                })}
              </li>
            ))}
          </ol>
        </section>
      )}
    </section>
  );
}
