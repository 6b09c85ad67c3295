import { planInputSchema, type PlanInput } from '../../contract/plan.js';
import { agentLabels, agents, type AgentId } from '../../core/agents.js';
import { vaporiserDialLimitPct } from '../../core/budget/consumption.js';
import type { PlanIppvPeriod } from '../../core/model/plan-types.js';
import { kgToG, type MassUnit } from '../../core/units.js';
import { laterPhaseDrafts, laterPhasesFromDraft, phaseFieldOfPath, type PhaseDraft } from './phase-draft.js';

/**
 * What the planning form holds. Numbers stay as typed so that a half-typed "0." is never
 * lost; `draftToInput` turns the draft into a plan the model accepts, or says what is wrong.
 */
export type PlanDraft = {
  patientName: string;
  massText: string;
  massUnit: MassUnit;
  speciesId: string;
  agent: AgentId;
  macText: string;
  route: PlanInput['route'];
  circuit: 'nonRebreathing' | 'circle';
  freshGasText: string;
  chamberVolumeText: string;
  maskDeadSpaceText: string;
  maskLeakText: string;
  circuitVolumeText: string;
  inductionPctText: string;
  inductionMinText: string;
  maintenancePctText: string;
  endMinText: string;
  ventilation: 'spontaneous' | 'ippv';
  ippvRateText: string;
  ippvTidalText: string;
  ippvFromText: string;
  /** Minute IPPV stops (spontaneous breathing after); blank: to the end. Old drafts have none. */
  ippvUntilText?: string | undefined;
  /** Later IPPV periods of a saved plan (the form edits the first), kept as they are. */
  ippvLaterPeriods?: readonly PlanIppvPeriod[] | undefined;
  targetMacText: string;
  recoveryFractionText: string;
  /** Expected or measured body temperature, C; blank: a normal bird. */
  bodyTemperatureText: string;
  scavenging: boolean;
  cylinder: 'us-e' | 'metric-2l-200bar' | 'metric-10l-200bar' | 'waterCapacity';
  cylinderWaterText: string;
  cylinderBarText: string;
  roomVolumeText: string;
  roomChangesText: string;
  /** Phases after the first (the route block above is the first, from 0 min); old drafts have none. */
  laterPhases?: readonly PhaseDraft[] | undefined;
};

/**
 * Usual starting dials of each agent, vol % (induction, maintenance): editable starting values,
 * none a recommendation for a bird. Isoflurane and sevoflurane from memory (isoflurane induction
 * 3-5 %, maintenance 1.5-2.5 %; sevoflurane induction 5-8 %, maintenance 2.5-4 %).
 * Desflurane (assumption): isoflurane's values at the same multiple of the fallback MAC, within
 * the desflurane vaporiser's 18 % mark.
 */
export const typicalDialsPct: Readonly<Record<AgentId, { induction: number; maintenance: number }>> = {
  isoflurane: { induction: 4, maintenance: 2 },
  sevoflurane: { induction: 6, maintenance: 3 },
  desflurane: { induction: 18, maintenance: 9 },
};

/** The highest mark on the agent's vaporiser, vol % (app/core/budget/consumption.ts). */
export function dialLimitPct(agent: AgentId): number {
  return vaporiserDialLimitPct[agent].value;
}

/** The hint under a dial box: the agent's vaporiser range. */
export function dialHint(agent: AgentId): string {
  return `The ${agentLabels[agent].toLowerCase()} vaporiser is marked 0-${String(dialLimitPct(agent))} %.`;
}

/** A caution when a typed dial is above the agent's vaporiser mark, or undefined. */
export function dialCaution(text: string, agent: AgentId): string | undefined {
  const value = Number(text.trim().replace(',', '.'));
  if (text.trim() === '' || !Number.isFinite(value) || value <= dialLimitPct(agent)) return undefined;
  return `Above the ${String(dialLimitPct(agent))} % mark of the ${agentLabels[agent].toLowerCase()} vaporiser: it cannot be set there.`;
}

/**
 * A dial converted to another agent at the same multiple of MAC (the agents' fallback MACs),
 * to the nearest 0.5 % and within the new vaporiser's mark; the typical value stays typical.
 */
function convertedDial(text: string, from: AgentId, to: AgentId, which: 'induction' | 'maintenance'): string {
  const value = Number(text.trim().replace(',', '.'));
  if (text.trim() === '' || !Number.isFinite(value) || value === typicalDialsPct[from][which])
    return String(typicalDialsPct[to][which]);
  const scaled = (value * agents[to].fallbackMacPct.value) / agents[from].fallbackMacPct.value;
  return String(Math.min(dialLimitPct(to), Math.round(scaled * 2) / 2));
}

/**
 * The draft with another agent: the dial settings follow the agent, so that a switch to
 * sevoflurane never keeps isoflurane dials. Usual dials become the new agent's usual dials; dials
 * the user changed are converted at the same multiple of MAC and kept within the new vaporiser's
 * mark. The MAC typed for the old agent is cleared for the same reason. Everything else stays.
 */
export function withAgent(draft: PlanDraft, agent: AgentId): PlanDraft {
  if (agent === draft.agent) return draft;
  return {
    ...draft,
    agent,
    macText: '',
    inductionPctText: convertedDial(draft.inductionPctText, draft.agent, agent, 'induction'),
    maintenancePctText: convertedDial(draft.maintenancePctText, draft.agent, agent, 'maintenance'),
  };
}

/** Typical starting values; each is shown as editable and none is a recommendation for a bird. */
export function defaultDraft(agent: AgentId, massUnit: MassUnit): PlanDraft {
  return {
    patientName: '',
    massText: '',
    massUnit,
    speciesId: '',
    agent,
    macText: '',
    route: 'mask',
    circuit: 'nonRebreathing',
    freshGasText: '1',
    chamberVolumeText: '3',
    maskDeadSpaceText: '',
    maskLeakText: '',
    circuitVolumeText: '3',
    inductionPctText: String(typicalDialsPct[agent].induction),
    inductionMinText: '5',
    maintenancePctText: String(typicalDialsPct[agent].maintenance),
    endMinText: '30',
    ventilation: 'spontaneous',
    ippvRateText: '',
    ippvTidalText: '',
    ippvFromText: '',
    ippvUntilText: '',
    targetMacText: '1.2',
    recoveryFractionText: '',
    bodyTemperatureText: '',
    scavenging: true,
    cylinder: 'us-e',
    cylinderWaterText: '10',
    cylinderBarText: '200',
    roomVolumeText: '40',
    roomChangesText: '10',
  };
}

export type DraftProblems = Readonly<Record<string, string>>;

const fieldOfPath: Readonly<Record<string, keyof PlanDraft>> = {
  bodyMassG: 'massText',
  speciesId: 'speciesId',
  macPct: 'macText',
  freshGasLpm: 'freshGasText',
  chamberVolumeL: 'chamberVolumeText',
  maskDeadSpaceMl: 'maskDeadSpaceText',
  maskLeakFraction: 'maskLeakText',
  circuitVolumeL: 'circuitVolumeText',
  'schedule.0.vaporPct': 'inductionPctText',
  'schedule.1.atMin': 'inductionMinText',
  'schedule.1.vaporPct': 'maintenancePctText',
  'schedule.2.atMin': 'endMinText',
  'ventilation.breathsPerMin': 'ippvRateText',
  'ventilation.tidalVolumeMl': 'ippvTidalText',
  'ventilation.fromMin': 'ippvFromText',
  'ventilation.untilMin': 'ippvUntilText',
  'ventilation.mode': 'ventilation',
  targetMacMultiple: 'targetMacText',
  recoveryMacFraction: 'recoveryFractionText',
  bodyTemperatureC: 'bodyTemperatureText',
  'room.volumeM3': 'roomVolumeText',
  'room.airChangesPerHour': 'roomChangesText',
  'cylinder.waterCapacityL': 'cylinderWaterText',
  'cylinder.pressureBar': 'cylinderBarText',
  circuit: 'circuit',
  patientName: 'patientName',
};

function number(text: string): number | undefined | 'not a number' {
  const trimmed = text.trim().replace(',', '.');
  if (trimmed === '') return undefined;
  const value = Number(trimmed);
  return Number.isFinite(value) ? value : 'not a number';
}

/**
 * The plan input for a draft, or the problems keyed by the draft field to blame, in the words
 * of the contract's validation. `uncertaintySamples` 0 gives a fast first answer while typing.
 */
export function draftToInput(
  draft: PlanDraft,
  uncertaintySamples: number,
): { input: PlanInput } | { problems: DraftProblems } {
  const problems: Record<string, string> = {};
  const read = (key: keyof PlanDraft, label: string): number | undefined => {
    const value = number(String(draft[key] ?? ''));
    if (value === 'not a number') {
      problems[key] = `${label} must be a number.`;
      return undefined;
    }
    return value;
  };
  const mass = read('massText', 'Body mass');
  const inductionPct = read('inductionPctText', 'Induction dial');
  const inductionMin = read('inductionMinText', 'Induction time');
  const maintenancePct = read('maintenancePctText', 'Maintenance dial');
  const endMin = read('endMinText', 'Vaporiser off');
  const candidate: Record<string, unknown> = {
    ...(draft.patientName.trim() === '' ? {} : { patientName: draft.patientName.trim() }),
    bodyMassG: mass === undefined ? undefined : draft.massUnit === 'kg' ? kgToG(mass) : mass,
    ...(draft.speciesId === '' ? {} : { speciesId: draft.speciesId }),
    agent: draft.agent,
    ...(read('macText', 'MAC') === undefined ? {} : { macPct: read('macText', 'MAC') }),
    route: draft.route,
    ...(draft.route === 'chamber'
      ? {}
      : { circuit: draft.route === 'airSacTube' ? 'nonRebreathing' : draft.circuit }),
    freshGasLpm: read('freshGasText', 'Fresh gas flow'),
    ...(draft.route === 'chamber' ? { chamberVolumeL: read('chamberVolumeText', 'Chamber volume') } : {}),
    ...(draft.route === 'mask' && read('maskDeadSpaceText', 'Mask dead space') !== undefined
      ? { maskDeadSpaceMl: read('maskDeadSpaceText', 'Mask dead space') }
      : {}),
    ...(draft.route === 'mask' && read('maskLeakText', 'Mask leak') !== undefined
      ? { maskLeakFraction: (read('maskLeakText', 'Mask leak') ?? 0) / 100 }
      : {}),
    ...(draft.route !== 'chamber' && draft.route !== 'airSacTube' && draft.circuit === 'circle'
      ? { circuitVolumeL: read('circuitVolumeText', 'Circle volume') }
      : {}),
    ...laterPhasesFromDraft(draft.laterPhases ?? [], problems),
    schedule: [
      { atMin: 0, vaporPct: inductionPct },
      { atMin: inductionMin, vaporPct: maintenancePct },
      { atMin: endMin, vaporPct: 0 },
    ],
    ventilation:
      draft.ventilation === 'spontaneous'
        ? { mode: 'spontaneous' }
        : {
            mode: 'ippv',
            breathsPerMin: read('ippvRateText', 'Ventilator rate'),
            tidalVolumeMl: read('ippvTidalText', 'Ventilator tidal volume'),
            ...(read('ippvFromText', 'Ventilation start') === undefined
              ? {}
              : { fromMin: read('ippvFromText', 'Ventilation start') }),
            ...(read('ippvUntilText', 'Ventilation end') === undefined
              ? {}
              : { untilMin: read('ippvUntilText', 'Ventilation end') }),
            ...(draft.ippvLaterPeriods === undefined || draft.ippvLaterPeriods.length === 0
              ? {}
              : { laterPeriods: draft.ippvLaterPeriods }),
          },
    ...(read('targetMacText', 'Planned depth') === undefined
      ? {}
      : { targetMacMultiple: read('targetMacText', 'Planned depth') }),
    ...(read('recoveryFractionText', 'Recovery threshold') === undefined
      ? {}
      : { recoveryMacFraction: read('recoveryFractionText', 'Recovery threshold') }),
    ...(read('bodyTemperatureText', 'Body temperature') === undefined
      ? {}
      : { bodyTemperatureC: read('bodyTemperatureText', 'Body temperature') }),
    scavenging: draft.scavenging,
    room: {
      volumeM3: read('roomVolumeText', 'Room volume'),
      airChangesPerHour: read('roomChangesText', 'Room air changes'),
    },
    cylinder:
      draft.cylinder === 'waterCapacity'
        ? {
            kind: 'waterCapacity',
            waterCapacityL: read('cylinderWaterText', 'Cylinder water capacity'),
            pressureBar: read('cylinderBarText', 'Cylinder pressure'),
          }
        : { kind: 'preset', presetId: draft.cylinder },
    uncertainty: { samples: uncertaintySamples, seed: 1 },
  };
  if (Object.keys(problems).length > 0) return { problems };
  const parsed = planInputSchema.safeParse(candidate);
  if (parsed.success) return { input: parsed.data };
  for (const issue of parsed.error.issues) {
    const path = issue.path.map(String).join('.');
    const field = fieldOfPath[path] ?? phaseFieldOfPath(path) ?? 'form';
    if (problems[field] === undefined)
      problems[field] = issue.message.charAt(0).toUpperCase() + issue.message.slice(1) + '.';
  }
  return { problems };
}

/** A draft for a saved plan's inputs (the reverse of draftToInput for what the form shows). */
export function inputToDraft(input: PlanInput, massUnit: MassUnit): PlanDraft {
  const base = defaultDraft(input.agent, massUnit);
  const [first, second, third] = input.schedule;
  const text = (value: number | undefined) => (value === undefined ? '' : String(value));
  const cylinder = input.cylinder;
  return {
    ...base,
    patientName: input.patientName ?? '',
    massText: String(massUnit === 'kg' ? input.bodyMassG / 1000 : input.bodyMassG),
    speciesId: input.speciesId ?? '',
    macText: text(input.macPct),
    route: input.route,
    circuit: input.circuit ?? 'nonRebreathing',
    freshGasText: String(input.freshGasLpm),
    chamberVolumeText: text(input.chamberVolumeL) || base.chamberVolumeText,
    maskDeadSpaceText: text(input.maskDeadSpaceMl),
    maskLeakText:
      input.maskLeakFraction === undefined ? '' : String(Math.round(input.maskLeakFraction * 1000) / 10),
    circuitVolumeText: text(input.circuitVolumeL) || base.circuitVolumeText,
    inductionPctText: text(first?.vaporPct),
    inductionMinText: text(second?.atMin),
    maintenancePctText: text(second?.vaporPct),
    endMinText: text(third?.atMin),
    ventilation: input.ventilation?.mode ?? 'spontaneous',
    ippvRateText: input.ventilation?.mode === 'ippv' ? String(input.ventilation.breathsPerMin) : '',
    ippvTidalText: input.ventilation?.mode === 'ippv' ? String(input.ventilation.tidalVolumeMl) : '',
    ippvFromText: input.ventilation?.mode === 'ippv' ? text(input.ventilation.fromMin) : '',
    ippvUntilText: input.ventilation?.mode === 'ippv' ? text(input.ventilation.untilMin) : '',
    ...(input.ventilation?.mode === 'ippv' && input.ventilation.laterPeriods !== undefined
      ? { ippvLaterPeriods: input.ventilation.laterPeriods }
      : {}),
    targetMacText: text(input.targetMacMultiple) || base.targetMacText,
    recoveryFractionText: text(input.recoveryMacFraction),
    bodyTemperatureText: text(input.bodyTemperatureC),
    scavenging: input.scavenging ?? true,
    cylinder:
      cylinder === undefined
        ? base.cylinder
        : cylinder.kind === 'preset'
          ? cylinder.presetId
          : 'waterCapacity',
    cylinderWaterText:
      cylinder?.kind === 'waterCapacity' ? String(cylinder.waterCapacityL) : base.cylinderWaterText,
    cylinderBarText: cylinder?.kind === 'waterCapacity' ? String(cylinder.pressureBar) : base.cylinderBarText,
    roomVolumeText: input.room === undefined ? base.roomVolumeText : String(input.room.volumeM3),
    roomChangesText: input.room === undefined ? base.roomChangesText : String(input.room.airChangesPerHour),
    laterPhases: laterPhaseDrafts(input.laterPhases ?? []),
  };
}
