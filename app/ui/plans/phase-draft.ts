import type { PlanInput } from '../../contract/plan.js';
import type { Circuit, Route } from '../../core/delivery.js';
import { defaultPhaseGapMin } from '../../core/model/phases.js';

/**
 * A later phase as the planning form holds it: numbers as typed. The plan's own route block is
 * the first phase, from 0 min; each later phase starts at its minute after a gap on room air.
 */
export type PhaseDraft = {
  /** Stable within the draft, for the list's keys and for moving focus to a new phase. */
  readonly key: number;
  readonly startMinText: string;
  readonly gapMinText: string;
  readonly route: Route;
  readonly circuit: Circuit;
  readonly freshGasText: string;
  readonly chamberVolumeText: string;
  readonly maskDeadSpaceText: string;
  readonly maskLeakText: string;
  readonly circuitVolumeText: string;
};

export type PhaseField = Exclude<keyof PhaseDraft, 'key' | 'route'> | 'route';

/** The problems' key for a phase field, e.g. `laterPhases.0.startMinText`. */
export function phaseProblemKey(index: number, field: PhaseField): string {
  return `laterPhases.${String(index)}.${field}`;
}

const phaseFieldOfInputField: Readonly<Record<string, PhaseField>> = {
  startMin: 'startMinText',
  gapMin: 'gapMinText',
  route: 'route',
  circuit: 'circuit',
  freshGasLpm: 'freshGasText',
  chamberVolumeL: 'chamberVolumeText',
  maskDeadSpaceMl: 'maskDeadSpaceText',
  maskLeakFraction: 'maskLeakText',
  circuitVolumeL: 'circuitVolumeText',
};

/**
 * The form field to blame for a contract error path such as `laterPhases.0.startMin`, or null
 * when the path is not a later phase's field.
 */
export function phaseFieldOfPath(path: string): string | null {
  const match = /^laterPhases\.(\d+)\.([A-Za-z]+)$/.exec(path);
  if (match === null) return null;
  const field = phaseFieldOfInputField[match[2] ?? ''];
  return field === undefined ? null : phaseProblemKey(Number(match[1]), field);
}

/** The room-air gap a new phase shows: the model's default, an assumption the form says is one. */
export const defaultGapText = String(defaultPhaseGapMin.value);

/**
 * A new later phase after the ones there: a tube after a mask or chamber (a mask after a tube),
 * starting at the maintenance minute for the first move and 5 min after the previous move for the
 * next ones, with the previous phase's flow and breathing system; every value is shown to edit.
 */
export function newPhaseDraft(
  existing: readonly PhaseDraft[],
  previous: { readonly route: Route; readonly circuit: Circuit; readonly freshGasText: string },
  maintenanceFromText: string,
): PhaseDraft {
  const last = existing.at(-1);
  const lastStart = last === undefined ? null : Number(last.startMinText.replace(',', '.'));
  const maintenanceFrom = Number(maintenanceFromText.replace(',', '.'));
  const startMin =
    lastStart !== null
      ? Number.isFinite(lastStart)
        ? String(lastStart + 5)
        : ''
      : Number.isFinite(maintenanceFrom) && maintenanceFrom > 0
        ? String(maintenanceFrom)
        : '5';
  const key = existing.reduce((highest, phase) => Math.max(highest, phase.key), 0) + 1;
  return {
    key,
    startMinText: startMin,
    gapMinText: defaultGapText,
    route: previous.route === 'mask' || previous.route === 'chamber' ? 'endotracheal' : 'mask',
    circuit: previous.circuit,
    freshGasText: previous.freshGasText,
    chamberVolumeText: '3',
    maskDeadSpaceText: '',
    maskLeakText: '',
    circuitVolumeText: '3',
  };
}

function number(text: string): number | undefined | 'not a number' {
  const trimmed = text.trim().replace(',', '.');
  if (trimmed === '') return undefined;
  const value = Number(trimmed);
  return Number.isFinite(value) ? value : 'not a number';
}

/**
 * The plan input's `laterPhases` for the form's phases (nothing for none), with the fields that
 * are not numbers reported in `problems` under their phase keys.
 */
export function laterPhasesFromDraft(
  phases: readonly PhaseDraft[],
  problems: Record<string, string>,
): { laterPhases?: unknown[] } {
  if (phases.length === 0) return {};
  return {
    laterPhases: phases.map((phase, index) => {
      const read = (field: PhaseField & `${string}Text`, label: string): number | undefined => {
        const value = number(phase[field]);
        if (value === 'not a number') {
          problems[phaseProblemKey(index, field)] = `${label} must be a number.`;
          return undefined;
        }
        return value;
      };
      const route = phase.route;
      const gap = read('gapMinText', 'Gap on room air');
      const deadSpace = route === 'mask' ? read('maskDeadSpaceText', 'Mask dead space') : undefined;
      const leak = route === 'mask' ? read('maskLeakText', 'Mask leak') : undefined;
      const circle = route !== 'chamber' && route !== 'airSacTube' && phase.circuit === 'circle';
      return {
        startMin: read('startMinText', 'Phase start'),
        ...(gap === undefined ? {} : { gapMin: gap }),
        route,
        ...(route === 'chamber'
          ? {}
          : { circuit: route === 'airSacTube' ? 'nonRebreathing' : phase.circuit }),
        freshGasLpm: read('freshGasText', 'Fresh gas flow'),
        ...(route === 'chamber' ? { chamberVolumeL: read('chamberVolumeText', 'Chamber volume') } : {}),
        ...(deadSpace === undefined ? {} : { maskDeadSpaceMl: deadSpace }),
        ...(leak === undefined ? {} : { maskLeakFraction: leak / 100 }),
        ...(circle ? { circuitVolumeL: read('circuitVolumeText', 'Circle volume') } : {}),
      };
    }),
  };
}

/** The form's phases for a saved plan's later phases (the reverse of laterPhasesFromDraft). */
export function laterPhaseDrafts(phases: NonNullable<PlanInput['laterPhases']>): PhaseDraft[] {
  const text = (value: number | undefined) => (value === undefined ? '' : String(value));
  return phases.map((phase, index) => ({
    key: index + 1,
    startMinText: String(phase.startMin),
    gapMinText: phase.gapMin === undefined ? defaultGapText : String(phase.gapMin),
    route: phase.route,
    circuit: phase.circuit ?? 'nonRebreathing',
    freshGasText: String(phase.freshGasLpm),
    chamberVolumeText: text(phase.chamberVolumeL) || '3',
    maskDeadSpaceText: text(phase.maskDeadSpaceMl),
    maskLeakText:
      phase.maskLeakFraction === undefined ? '' : String(Math.round(phase.maskLeakFraction * 1000) / 10),
    circuitVolumeText: text(phase.circuitVolumeL) || '3',
  }));
}
