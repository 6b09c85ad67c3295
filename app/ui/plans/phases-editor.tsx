import { useEffect, useRef } from 'react';
import {
  circuitLabels,
  circuits,
  routeLabels,
  routes,
  type Circuit,
  type Route,
} from '../../core/delivery.js';
import { defaultPhaseGapMin } from '../../core/model/phases.js';
import { phaseMoveText } from '../../core/plan-phases.js';
import { NumberField, SelectField } from '../common/fields.js';
import { newPhaseDraft, phaseProblemKey, type PhaseDraft, type PhaseField } from './phase-draft.js';

/** The contract's limit on later phases (app/contract/plan.ts). */
const maxLaterPhases = 5;

type Props = {
  readonly phases: readonly PhaseDraft[];
  /** The first phase (the plan's own route block), for the defaults of a new phase. */
  readonly first: { readonly route: Route; readonly circuit: Circuit; readonly freshGasText: string };
  readonly maintenanceFromText: string;
  readonly problems: Readonly<Record<string, string>>;
  readonly onChange: (phases: PhaseDraft[]) => void;
};

/**
 * The plan's later phases: after a mask or chamber induction, the bird is intubated (or moved to a
 * mask) at a minute, after a short gap on room air, and runs on that route's breathing system and
 * flow. Adding a phase moves focus to its first box; removing one moves it to the add button.
 */
export function PhasesEditor({ phases, first, maintenanceFromText, problems, onChange }: Props) {
  const container = useRef<HTMLDivElement>(null);
  const addButton = useRef<HTMLButtonElement>(null);
  // Where focus goes once the changed list is drawn: a new phase's first box, or the add button.
  const focusTarget = useRef<number | 'add' | null>(null);

  useEffect(() => {
    const target = focusTarget.current;
    if (target === null) return;
    focusTarget.current = null;
    if (target === 'add') addButton.current?.focus();
    else
      container.current
        ?.querySelector<HTMLInputElement>(`[data-phase-key="${String(target)}"] input`)
        ?.focus();
  });

  const update = (index: number, change: Partial<PhaseDraft>) =>
    onChange(phases.map((phase, at) => (at === index ? { ...phase, ...change } : phase)));

  function add() {
    const previous = phases.at(-1) ?? first;
    const phase = newPhaseDraft(phases, previous, maintenanceFromText);
    onChange([...phases, phase]);
    focusTarget.current = phase.key;
  }

  const previousRoute = (phases.at(-1) ?? first).route;
  return (
    <fieldset className="group phases-editor">
      <legend>Later phases</legend>
      <div ref={container}>
        {phases.length === 0 && (
          <p className="hint">
            One route for the whole plan. Add a phase for a mask or chamber induction followed by a tube (or a
            move from the chamber to a mask).
          </p>
        )}
        {phases.map((phase, index) => (
          <PhaseFields
            key={phase.key}
            phase={phase}
            number={index + 2}
            problem={(field) => problems[phaseProblemKey(index, field)]}
            onChange={(change) => update(index, change)}
            onRemove={() => {
              onChange(phases.filter((_, at) => at !== index));
              focusTarget.current = 'add';
            }}
          />
        ))}
      </div>
      <div className="phases-add">
        <button
          ref={addButton}
          type="button"
          disabled={phases.length >= maxLaterPhases}
          aria-describedby="phases-add-hint"
          onClick={add}
        >
          Add a later phase
        </button>
        <span className="hint" id="phases-add-hint">
          {phases.length >= maxLaterPhases
            ? `A plan has at most ${String(maxLaterPhases)} later phases.`
            : `Next: ${phaseMoveText(previousRoute === 'mask' || previousRoute === 'chamber' ? 'endotracheal' : 'mask')}; change the route after adding.`}
        </span>
      </div>
    </fieldset>
  );
}

function PhaseFields({
  phase,
  number,
  problem,
  onChange,
  onRemove,
}: {
  readonly phase: PhaseDraft;
  readonly number: number;
  readonly problem: (field: PhaseField) => string | undefined;
  readonly onChange: (change: Partial<PhaseDraft>) => void;
  readonly onRemove: () => void;
}) {
  const hasCircuit = phase.route !== 'chamber' && phase.route !== 'airSacTube';
  const text = (field: PhaseField & `${string}Text`) => ({
    value: phase[field],
    error: problem(field),
    onChange: (value: string) => onChange({ [field]: value }),
  });
  return (
    <fieldset className="phase" data-phase-key={phase.key}>
      <legend>
        Phase {number}: {routeLabels[phase.route]}
      </legend>
      <div className="form-grid">
        <NumberField label="Starts at" name={`phase${number}Start`} unit="min" {...text('startMinText')} />
        <NumberField
          label="Gap on room air"
          name={`phase${number}Gap`}
          unit="min"
          hint={`${defaultPhaseGapMin.value} min is an assumption: set it for the bird and the hands in the room.`}
          {...text('gapMinText')}
        />
        <SelectField
          label="Route"
          name={`phase${number}Route`}
          value={phase.route}
          error={problem('route')}
          options={routes.map((value) => ({ value, label: routeLabels[value] }))}
          onChange={(route) => onChange({ route })}
        />
        {hasCircuit && (
          <SelectField
            label="Breathing system"
            name={`phase${number}Circuit`}
            value={phase.circuit}
            error={problem('circuit')}
            options={circuits.map((value) => ({ value, label: circuitLabels[value] }))}
            onChange={(circuit) => onChange({ circuit })}
          />
        )}
        <NumberField
          label="Fresh gas flow"
          name={`phase${number}FreshGas`}
          unit="L/min"
          {...text('freshGasText')}
        />
        {phase.route === 'chamber' && (
          <NumberField
            label="Chamber volume"
            name={`phase${number}Chamber`}
            unit="L"
            {...text('chamberVolumeText')}
          />
        )}
        {phase.route === 'mask' && (
          <>
            <NumberField
              label="Mask dead space"
              name={`phase${number}MaskDeadSpace`}
              unit="mL"
              hint="Blank: model default (assumption)."
              {...text('maskDeadSpaceText')}
            />
            <NumberField
              label="Mask leak"
              name={`phase${number}MaskLeak`}
              unit="% of flow"
              hint="Blank: model default (assumption)."
              {...text('maskLeakText')}
            />
          </>
        )}
        {hasCircuit && phase.circuit === 'circle' && (
          <NumberField
            label="Circle volume"
            name={`phase${number}Circle`}
            unit="L"
            {...text('circuitVolumeText')}
          />
        )}
      </div>
      <button type="button" className="secondary" onClick={onRemove}>
        Remove phase {number}
      </button>
    </fieldset>
  );
}
