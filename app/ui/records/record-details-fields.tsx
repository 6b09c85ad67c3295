import { useId } from 'react';
import { cropStates, tubeTypes } from '../../contract/records.js';
import { agentIds, agentLabels } from '../../core/agents.js';
import { circuitLabels, circuits, routeLabels, routes } from '../../core/delivery.js';
import type { FieldErrors } from '../common/field-errors.js';
import { RadioGroup, SelectBox, TextBox } from './fields.js';
import { airwayHasTube, tubeTypeLabels, type RecordDraft } from './record-form.js';

type Props = {
  readonly draft: RecordDraft;
  readonly errors: FieldErrors;
  readonly update: <K extends keyof RecordDraft>(key: K, value: RecordDraft[K]) => void;
  /**
   * Offer "not recorded" for the agent: only when correcting a record made before records
   * carried an agent, so that it may stay as it was rather than be guessed.
   */
  readonly agentMayStayUnrecorded?: boolean;
  /** Where the agent shown comes from, e.g. "From the linked plan.". */
  readonly agentHint?: string;
};

/** The fields of a procedure record, shared by the new-record form and the correction form. */
export function RecordDetailsFields({
  draft,
  errors,
  update,
  agentMayStayUnrecorded = false,
  agentHint,
}: Props) {
  const emergencyId = useId();
  return (
    <>
      <TextBox
        label="Procedure"
        name="procedureName"
        value={draft.procedureName}
        error={errors['procedureName']}
        autoFocus
        onChange={(value) => update('procedureName', value)}
      />
      <TextBox
        label="Start"
        name="startedAt"
        type="datetime-local"
        value={draft.startedAtLocal}
        error={errors['startedAt']}
        hint="Now unless you change it."
        onChange={(value) => update('startedAtLocal', value)}
      />
      <div className="record-form-pair">
        <RadioGroup
          legend="ASA grade"
          name="asaGrade"
          options={[
            { value: 0, label: 'not graded' },
            ...[1, 2, 3, 4, 5].map((grade) => ({
              value: grade as RecordDraft['asaGrade'],
              label: String(grade),
            })),
          ]}
          value={draft.asaGrade}
          error={errors['asaGrade']}
          onChange={(value) => update('asaGrade', value)}
        />
        <div className="field checkbox">
          <input
            id={emergencyId}
            type="checkbox"
            checked={draft.emergency}
            onChange={(event) => update('emergency', event.target.checked)}
          />
          <label htmlFor={emergencyId}>E: emergency</label>
        </div>
      </div>
      <TextBox
        label="Fasting"
        name="fasting"
        value={draft.fasting}
        error={errors['fasting']}
        hint="e.g. 2 h, food removed 08:00"
        onChange={(value) => update('fasting', value)}
      />
      <RadioGroup
        legend="Crop check"
        name="cropChecked"
        options={cropStates.map((value) => ({ value, label: value }))}
        value={draft.cropChecked}
        error={errors['cropChecked']}
        onChange={(value) => update('cropChecked', value)}
      />
      <SelectBox
        label="Anaesthetic agent"
        name="agent"
        options={[
          ...(agentMayStayUnrecorded || draft.agent === ''
            ? [{ value: '' as const, label: 'not recorded' }]
            : []),
          ...agentIds.map((value) => ({ value, label: agentLabels[value] })),
        ]}
        value={draft.agent}
        error={errors['agent']}
        hint={agentHint}
        onChange={(value) => update('agent', value)}
      />
      <RadioGroup
        legend="Airway"
        name="airway"
        options={routes.map((value) => ({ value, label: routeLabels[value] }))}
        value={draft.airway}
        error={errors['airway']}
        onChange={(value) => update('airway', value)}
      />
      {airwayHasTube(draft.airway) && (
        <div className="record-form-pair">
          <TextBox
            label="Tube size (mm)"
            name="tubeSizeMm"
            inputMode="decimal"
            size={6}
            value={draft.tubeSizeMm}
            error={errors['tubeSizeMm']}
            onChange={(value) => update('tubeSizeMm', value)}
          />
          {draft.airway === 'endotracheal' && (
            <RadioGroup
              legend="Tube"
              name="tubeType"
              options={tubeTypes.map((value) => ({ value, label: tubeTypeLabels[value] }))}
              value={draft.tubeType}
              error={errors['tubeType']}
              onChange={(value) => update('tubeType', value)}
            />
          )}
        </div>
      )}
      <RadioGroup
        legend="Circuit"
        name="circuit"
        options={circuits.map((value) => ({ value, label: circuitLabels[value] }))}
        value={draft.circuit}
        error={errors['circuit']}
        onChange={(value) => update('circuit', value)}
      />
      <div className="record-form-pair">
        <TextBox
          label="Staff initials"
          name="staffInitials"
          size={10}
          value={draft.staffInitials}
          error={errors['staffInitials']}
          hint="Who is monitoring."
          onChange={(value) => update('staffInitials', value)}
        />
        <TextBox
          label="Prompt interval (min)"
          name="promptIntervalMin"
          inputMode="decimal"
          size={4}
          value={draft.promptIntervalMin}
          error={errors['promptIntervalMin']}
          hint="Reminder to log vitals; at least every 5 min is common practice."
          onChange={(value) => update('promptIntervalMin', value)}
        />
      </div>
    </>
  );
}
