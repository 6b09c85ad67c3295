import { memo } from 'react';
import type { Species } from '../../contract/records.js';
import { agentIds, agentLabels, agents } from '../../core/agents.js';
import { circuitLabels, circuits, routeLabels, routes } from '../../core/delivery.js';
import { basisText } from '../../core/sourced.js';
import { displayBasis } from '../common/display.js';
import { Choice, NumberField, SelectField, TextField } from '../common/fields.js';
import { dialCaution, dialHint, withAgent, type DraftProblems, type PlanDraft } from './plan-draft.js';
import { PhasesEditor } from './phases-editor.js';
import { avianNormalBodyTemperatureC } from '../../core/model/temperature.js';

type Props = {
  readonly draft: PlanDraft;
  readonly problems: DraftProblems;
  readonly species: readonly Species[];
  readonly onChange: (draft: PlanDraft) => void;
  /** Fixed by the patient record when planning for a patient. */
  readonly speciesLocked: boolean;
};

/** The plan's inputs. Every change is a new draft; the results follow without a button. */
export const PlanForm = memo(function PlanForm({ draft, problems, species, onChange, speciesLocked }: Props) {
  const set =
    <K extends keyof PlanDraft>(key: K) =>
    (value: PlanDraft[K]) =>
      onChange({ ...draft, [key]: value });
  const current = species.find((entry) => entry.key === draft.speciesId);
  const publishedMac = current?.values.mac[draft.agent] ?? null;
  return (
    <form
      className="form plan-form"
      noValidate
      onSubmit={(event) => event.preventDefault()}
      aria-label="Plan inputs"
    >
      <fieldset className="group">
        <legend>Bird</legend>
        <div className="form-grid">
          <NumberField
            label="Body mass"
            name="bodyMass"
            unit={draft.massUnit}
            value={draft.massText}
            error={problems['massText']}
            autoFocus
            onChange={set('massText')}
          />
          <SelectField
            label="Species"
            name="speciesId"
            value={draft.speciesId}
            error={problems['speciesId']}
            options={[
              { value: '', label: 'Not chosen (no species defaults)' },
              ...species.map((entry) => ({ value: entry.key, label: entry.values.commonName })),
            ]}
            hint={
              speciesLocked
                ? 'From the patient record.'
                : current === undefined
                  ? undefined
                  : `Typical ${current.values.massMinG}-${current.values.massMaxG} g`
            }
            onChange={speciesLocked ? () => undefined : set('speciesId')}
          />
        </div>
      </fieldset>

      <fieldset className="group">
        <legend>Agent</legend>
        <Choice
          legend="Inhalant"
          name="agent"
          options={agentIds}
          labels={agentLabels}
          value={draft.agent}
          error={undefined}
          onChange={(agent) => onChange(withAgent(draft, agent))}
        />
        <p className="hint">
          Changing the agent converts the dials to the new agent at the same multiple of MAC (usual dials
          become its usual dials), within its vaporiser’s mark; check them.
        </p>
        <NumberField
          label="MAC for this bird"
          name="macPct"
          unit="%"
          value={draft.macText}
          error={problems['macText']}
          hint={
            publishedMac !== null
              ? `Blank uses ${publishedMac.macPct} % (${displayBasis(publishedMac.basis)}).`
              : `Blank uses ${agents[draft.agent].fallbackMacPct.value} % (${basisText(agents[draft.agent].fallbackMacPct)}).`
          }
          onChange={set('macText')}
        />
      </fieldset>

      <fieldset className="group">
        <legend>
          {(draft.laterPhases ?? []).length === 0
            ? 'Route and circuit'
            : 'Phase 1: route and circuit, from 0 min'}
        </legend>
        <div className="form-grid">
          <SelectField
            label="Route"
            name="route"
            value={draft.route}
            options={routes.map((value) => ({
              value,
              label: routeLabels[value],
            }))}
            onChange={set('route')}
          />
          {draft.route !== 'chamber' && draft.route !== 'airSacTube' && (
            <SelectField
              label="Breathing system"
              name="circuit"
              value={draft.circuit}
              error={problems['circuit']}
              options={circuits.map((value) => ({
                value,
                label: circuitLabels[value],
              }))}
              onChange={set('circuit')}
            />
          )}
          <NumberField
            label="Fresh gas flow"
            name="freshGas"
            unit="L/min"
            value={draft.freshGasText}
            error={problems['freshGasText']}
            onChange={set('freshGasText')}
          />
          {draft.route === 'chamber' && (
            <NumberField
              label="Chamber volume"
              name="chamberVolume"
              unit="L"
              value={draft.chamberVolumeText}
              error={problems['chamberVolumeText']}
              onChange={set('chamberVolumeText')}
            />
          )}
          {draft.route === 'mask' && (
            <>
              <NumberField
                label="Mask dead space"
                name="maskDeadSpace"
                unit="mL"
                value={draft.maskDeadSpaceText}
                error={problems['maskDeadSpaceText']}
                hint="Blank: model default (assumption)."
                onChange={set('maskDeadSpaceText')}
              />
              <NumberField
                label="Mask leak"
                name="maskLeak"
                unit="% of flow"
                value={draft.maskLeakText}
                error={problems['maskLeakText']}
                hint="Blank: model default (assumption)."
                onChange={set('maskLeakText')}
              />
            </>
          )}
          {draft.route !== 'chamber' && draft.route !== 'airSacTube' && draft.circuit === 'circle' && (
            <NumberField
              label="Circle volume"
              name="circuitVolume"
              unit="L"
              value={draft.circuitVolumeText}
              error={problems['circuitVolumeText']}
              onChange={set('circuitVolumeText')}
            />
          )}
        </div>
      </fieldset>

      <PhasesEditor
        phases={draft.laterPhases ?? []}
        first={draft}
        maintenanceFromText={draft.inductionMinText}
        problems={problems}
        onChange={(laterPhases) => onChange({ ...draft, laterPhases })}
      />

      <fieldset className="group">
        <legend>Vaporiser schedule</legend>
        <div className="form-grid">
          <NumberField
            label="Induction dial"
            name="inductionPct"
            unit="%"
            value={draft.inductionPctText}
            error={problems['inductionPctText']}
            hint={dialHint(draft.agent)}
            caution={dialCaution(draft.inductionPctText, draft.agent)}
            onChange={set('inductionPctText')}
          />
          <NumberField
            label="Maintenance from"
            name="inductionMin"
            unit="min"
            value={draft.inductionMinText}
            error={problems['inductionMinText']}
            onChange={set('inductionMinText')}
          />
          <NumberField
            label="Maintenance dial"
            name="maintenancePct"
            unit="%"
            value={draft.maintenancePctText}
            error={problems['maintenancePctText']}
            hint={dialHint(draft.agent)}
            caution={dialCaution(draft.maintenancePctText, draft.agent)}
            onChange={set('maintenancePctText')}
          />
          <NumberField
            label="Vaporiser off at"
            name="endMin"
            unit="min"
            value={draft.endMinText}
            error={problems['endMinText']}
            hint="The planned end of the procedure."
            onChange={set('endMinText')}
          />
        </div>
      </fieldset>

      <fieldset className="group">
        <legend>Ventilation</legend>
        <Choice
          legend="Breathing"
          name="ventilation"
          options={['spontaneous', 'ippv'] as const}
          labels={{ spontaneous: 'spontaneous', ippv: 'IPPV' }}
          value={draft.ventilation}
          error={problems['ventilation']}
          onChange={set('ventilation')}
        />
        {draft.ventilation === 'ippv' && (
          <div className="form-grid">
            <NumberField
              label="Ventilator rate"
              name="ippvRate"
              unit="/min"
              value={draft.ippvRateText}
              error={problems['ippvRateText']}
              onChange={set('ippvRateText')}
            />
            <NumberField
              label="Ventilator tidal volume"
              name="ippvTidal"
              unit="mL"
              value={draft.ippvTidalText}
              error={problems['ippvTidalText']}
              onChange={set('ippvTidalText')}
            />
            <NumberField
              label="IPPV from"
              name="ippvFrom"
              unit="min"
              value={draft.ippvFromText}
              error={problems['ippvFromText']}
              onChange={set('ippvFromText')}
            />
            <NumberField
              label="IPPV until"
              name="ippvUntil"
              unit="min"
              value={draft.ippvUntilText ?? ''}
              error={problems['ippvUntilText']}
              hint="Blank: to the end. The bird breathes on its own after."
              onChange={set('ippvUntilText')}
            />
            {draft.ippvLaterPeriods !== undefined && draft.ippvLaterPeriods.length > 0 && (
              <p className="hint">
                Later IPPV periods, kept as saved:{' '}
                {draft.ippvLaterPeriods
                  .map(
                    (period) =>
                      `${period.untilMin === undefined ? `from ${String(period.fromMin)} min` : `${String(period.fromMin)}-${String(period.untilMin)} min`} at ${String(period.breathsPerMin)}/min × ${String(period.tidalVolumeMl)} mL`,
                  )
                  .join('; ')}
                .
              </p>
            )}
          </div>
        )}
      </fieldset>

      <fieldset className="group">
        <legend>Depth and recovery</legend>
        <div className="form-grid">
          <NumberField
            label="Planned depth"
            name="targetMac"
            unit="× MAC"
            value={draft.targetMacText}
            error={problems['targetMacText']}
            onChange={set('targetMacText')}
          />
          <NumberField
            label="Arousal threshold"
            name="recoveryFraction"
            unit="× MAC"
            value={draft.recoveryFractionText}
            error={problems['recoveryFractionText']}
            hint="Blank: 0.4 × MAC, an assumption (no avian value found)."
            onChange={set('recoveryFractionText')}
          />
          <NumberField
            label="Body temperature"
            name="bodyTemperature"
            unit="°C"
            value={draft.bodyTemperatureText}
            error={problems['bodyTemperatureText']}
            hint={`Expected or measured. Blank: ${String(avianNormalBodyTemperatureC.value)} °C, a bird kept warm (assumption). A cooler bird holds more agent and wakes later.`}
            onChange={set('bodyTemperatureText')}
          />
        </div>
      </fieldset>

      <fieldset className="group">
        <legend>Oxygen and room</legend>
        <div className="form-grid">
          <SelectField
            label="Oxygen cylinder"
            name="cylinder"
            value={draft.cylinder}
            options={[
              { value: 'us-e', label: 'US E cylinder' },
              { value: 'metric-2l-200bar', label: '2 L at 200 bar' },
              { value: 'metric-10l-200bar', label: '10 L at 200 bar' },
              { value: 'waterCapacity', label: 'other: water capacity and pressure' },
            ]}
            onChange={set('cylinder')}
          />
          {draft.cylinder === 'waterCapacity' && (
            <>
              <NumberField
                label="Water capacity"
                name="cylinderWater"
                unit="L"
                value={draft.cylinderWaterText}
                error={problems['cylinderWaterText']}
                onChange={set('cylinderWaterText')}
              />
              <NumberField
                label="Pressure"
                name="cylinderBar"
                unit="bar"
                value={draft.cylinderBarText}
                error={problems['cylinderBarText']}
                onChange={set('cylinderBarText')}
              />
            </>
          )}
          <NumberField
            label="Room volume"
            name="roomVolume"
            unit="m³"
            value={draft.roomVolumeText}
            error={problems['roomVolumeText']}
            onChange={set('roomVolumeText')}
          />
          <NumberField
            label="Room air changes"
            name="roomChanges"
            unit="/h"
            value={draft.roomChangesText}
            error={problems['roomChangesText']}
            onChange={set('roomChangesText')}
          />
        </div>
        <div className="field checkbox">
          <input
            id="plan-scavenging"
            type="checkbox"
            checked={draft.scavenging}
            onChange={(event) => set('scavenging')(event.target.checked)}
          />
          <label htmlFor="plan-scavenging">Scavenging connected</label>
        </div>
      </fieldset>
      {problems['form'] !== undefined && (
        <p className="form-error" role="alert">
          {problems['form']}
        </p>
      )}
      {!speciesLocked && (
        <TextField
          label="Bird's name (quick plan)"
          name="patientName"
          value={draft.patientName}
          error={problems['patientName']}
          onChange={set('patientName')}
        />
      )}
    </form>
  );
});
