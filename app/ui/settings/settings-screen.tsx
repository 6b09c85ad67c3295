import { useState, type FormEvent } from 'react';
import {
  clinicSettingsSchema,
  defaultClinicSettings,
  paperSizes,
  type ClinicSettings,
  type StoredSettings,
} from '../../contract/settings.js';
import type { SafetyStatus } from '../../contract/safety.js';
import type { DemoClinicStatus, DemoClinicWritten } from '../../contract/demo-clinic-channels.js';
import { describeIssues } from '../../contract/result.js';
import { agentIds, agentLabels } from '../../core/agents.js';
import { dateFormatLabels, dateFormats, defaultDateFormat } from '../../core/date-format.js';
import { massUnits, pressureUnits, temperatureUnits } from '../../core/units.js';
import { api } from '../common/bridge.js';
import { fieldErrorsFrom, fieldErrorsFromContract, type FieldErrors } from '../common/field-errors.js';
import { Choice, TextField } from '../common/fields.js';
import { DataSection } from './data-section.js';
import { ClinicDatabaseSection } from './clinic-database-section.js';
import { EmergencyDrugs } from './emergency-drugs.js';
import { SaveStatus, type SaveMessage } from '../common/save-status.js';
import { focusMainHeading, useFocusFirstError } from '../common/screen-focus.js';
import { WorkstationSection } from './workstation-section.js';
import { displayDateTime } from '../common/display.js';
import { DemoStart, StartChoice, type StartKind } from './start-choice.js';

type Props = {
  readonly stored: StoredSettings;
  readonly safety: SafetyStatus;
  readonly onSaved: (stored: StoredSettings) => void;
  /**
   * On the first start of a clinic without patients: the demo clinic, offered beside an empty
   * clinic; null when it is not offered.
   */
  readonly demoOffer?: DemoClinicStatus | null;
  readonly onDemoOpened?: (written: DemoClinicWritten) => void;
};

/** Clinic name, address and preferred units; validated per field, saved to the clinic database. */
export function SettingsScreen({ stored, safety, onSaved, demoOffer = null, onDemoOpened }: Props) {
  const [draft, setDraft] = useState<ClinicSettings>(stored.settings ?? defaultClinicSettings);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [message, setMessage] = useState<SaveMessage | null>(null);
  const [busy, setBusy] = useState(false);
  const firstRun = stored.settings === null;
  const offer = firstRun ? demoOffer : null;
  const [start, setStart] = useState<StartKind>('empty');
  const { ref: formRef, focusFirstError } = useFocusFirstError<HTMLFormElement>();

  function update<K extends keyof ClinicSettings>(key: K, value: ClinicSettings[K]) {
    setDraft((current) => ({ ...current, [key]: value }));
    setMessage(null);
    if (errors[key] !== undefined) setErrors(({ [key]: _removed, ...rest }) => rest);
  }

  async function submit(event: FormEvent) {
    event.preventDefault();
    const local = clinicSettingsSchema.safeParse(draft);
    if (!local.success) {
      setErrors(fieldErrorsFrom(describeIssues(local.error.issues)));
      setMessage({ kind: 'failed', text: 'Not saved: correct the fields marked below.' });
      focusFirstError();
      return;
    }
    setBusy(true);
    const answer = await api.invoke('settings:save', local.data);
    setBusy(false);
    if (answer.ok) {
      setErrors({});
      if (answer.value.settings !== null) setDraft(answer.value.settings);
      setMessage({
        kind: 'saved',
        text: `Saved ${displayDateTime(answer.value.updatedAt ?? new Date().toISOString())}.`,
      });
      onSaved(answer.value);
      // Focus to the heading (after the first save it becomes Settings), so the change is heard.
      focusMainHeading();
    } else {
      setErrors(fieldErrorsFromContract(answer.error));
      setMessage({ kind: 'failed', text: `Not saved: ${answer.error.message}` });
      focusFirstError();
    }
  }

  return (
    <section className="screen" aria-labelledby="settings-title">
      <h1 id="settings-title">{firstRun ? 'Set up your clinic' : 'Settings'}</h1>
      {firstRun && (
        <p className="lead">
          {offer === null
            ? 'Enter the clinic’s name and the units your staff read. You can change them later.'
            : 'Start an empty clinic for your own birds, or look around the invented demo clinic first.'}
        </p>
      )}
      {offer !== null && <StartChoice demo={offer.demo} value={start} onChange={setStart} />}
      {offer !== null && start === 'demo' && (
        <DemoStart status={offer} onOpened={(written) => onDemoOpened?.(written)} />
      )}
      <form
        ref={formRef}
        onSubmit={(event) => void submit(event)}
        noValidate
        className="form settings-form"
        hidden={offer !== null && start === 'demo'}
      >
        <TextField
          label="Clinic name"
          name="clinicName"
          value={draft.clinicName}
          error={errors['clinicName']}
          autoFocus={firstRun && offer === null}
          onChange={(value) => update('clinicName', value)}
        />
        <TextField
          label="Address line"
          name="addressLine"
          value={draft.addressLine}
          error={errors['addressLine']}
          hint="Optional; printed under the clinic name on worksheets."
          onChange={(value) => update('addressLine', value)}
        />
        <Choice
          legend="Body mass"
          name="massUnit"
          options={massUnits}
          labels={{ g: 'grams (g)', kg: 'kilograms (kg)' }}
          value={draft.massUnit}
          error={errors['massUnit']}
          onChange={(value) => update('massUnit', value)}
        />
        <Choice
          legend="Pressure (EtCO2, cylinder)"
          name="pressureUnit"
          options={pressureUnits}
          value={draft.pressureUnit}
          error={errors['pressureUnit']}
          onChange={(value) => update('pressureUnit', value)}
        />
        <Choice
          legend="Temperature"
          name="temperatureUnit"
          options={temperatureUnits}
          labels={{ C: '°C', F: '°F' }}
          value={draft.temperatureUnit}
          error={errors['temperatureUnit']}
          onChange={(value) => update('temperatureUnit', value)}
        />
        <Choice
          legend="Default agent"
          name="defaultAgent"
          options={agentIds}
          labels={agentLabels}
          value={draft.defaultAgent}
          error={errors['defaultAgent']}
          onChange={(value) => update('defaultAgent', value)}
        />
        <Choice
          legend="Worksheet paper"
          name="paperSize"
          options={paperSizes}
          labels={{ A4: 'A4', Letter: 'US Letter' }}
          value={draft.paperSize}
          error={errors['paperSize']}
          onChange={(value) => update('paperSize', value)}
        />
        <Choice
          legend="Date format"
          name="dateFormat"
          options={dateFormats}
          labels={dateFormatLabels}
          value={draft.dateFormat ?? defaultDateFormat}
          error={errors['dateFormat']}
          onChange={(value) => update('dateFormat', value)}
        />
        <div className="form-actions">
          <button type="submit" className="primary" disabled={busy}>
            {busy ? 'Saving…' : 'Save settings'}
          </button>
          <SaveStatus message={message} />
        </div>
      </form>
      {safety.last !== null && (
        <p className="provenance">
          Cautions acknowledged by {safety.last.acknowledgedBy} on{' '}
          {displayDateTime(safety.last.acknowledgedAt)} for version {safety.last.appVersion}.
        </p>
      )}
      <WorkstationSection />
      {!firstRun && <EmergencyDrugs />}
      {!firstRun && <ClinicDatabaseSection />}
      {!firstRun && <DataSection />}
    </section>
  );
}
