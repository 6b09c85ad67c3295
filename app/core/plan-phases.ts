/**
 * A plan's phases as the clinic reads them: the lines the planning screen, the comparison, the day
 * list, the worksheet and the records show ("Face mask → Endotracheal tube at 6 min"). The phases
 * themselves come from the model (`PlanResult.phases`, resolved by app/core/model/phases.ts); a
 * result saved before phases existed has none and reads as one phase made of the plan's own fields.
 */
import { circuitLabels, routeLabels, type Circuit, type Route } from './delivery.js';
import type { PlanInput, PlanPhaseSummary, PlanResult, PlanScheduleStep } from './model/plan-types.js';

/**
 * The phases of a computed plan, the first included; a result without phases (saved before they
 * existed) gives one phase from the plan's own route, breathing system, flow and schedule.
 */
export function phasesOfPlan(
  input: Pick<PlanInput, 'route' | 'circuit' | 'freshGasLpm' | 'schedule'>,
  result: Pick<PlanResult, 'phases' | 'flows' | 'oxygen' | 'consumption'>,
): readonly PlanPhaseSummary[] {
  if (result.phases.length > 0) return result.phases;
  return [
    {
      index: 0,
      startMin: 0,
      gapMin: 0,
      deliveryFromMin: 0,
      endMin: result.oxygen.durationMin,
      route: input.route,
      circuit: input.circuit ?? 'nonRebreathing',
      freshGasLpm: input.freshGasLpm,
      dialSteps: input.schedule,
      flows: result.flows,
      oxygenUsedL: result.oxygen.usedL,
      liquidMl: result.consumption.liquidMl,
    },
  ];
}

/** A number in words for a line: at most 2 decimals, no trailing zeros. */
function short(value: number): string {
  return String(Math.round(value * 100) / 100);
}

/** The breathing system of a phase in words; a chamber has none. */
export function breathingSystemText(route: Route, circuit: Circuit | null | undefined): string {
  if (route === 'chamber') return 'none (chamber)';
  return circuitLabels[route === 'airSacTube' ? 'nonRebreathing' : (circuit ?? 'nonRebreathing')];
}

/** What the anaesthetist does at the start of a later phase, e.g. "intubate", "move to a face mask". */
export function phaseMoveText(route: Route): string {
  switch (route) {
    case 'endotracheal':
      return 'intubate';
    case 'airSacTube':
      return 'place the air-sac tube';
    case 'mask':
      return 'move to a face mask';
    case 'chamber':
      return 'move to the induction chamber';
  }
}

type PhaseStart = { readonly startMin: number; readonly route: Route };

/**
 * The routes in order with the minute each later one starts, e.g.
 * "Face mask → Endotracheal tube at 6 min"; one phase reads as its route alone.
 */
export function phaseSequenceText(phases: readonly PhaseStart[]): string {
  return phases
    .map((phase, index) =>
      index === 0 ? routeLabels[phase.route] : `${routeLabels[phase.route]} at ${short(phase.startMin)} min`,
    )
    .join(' → ');
}

/** The later phases as planned moves, e.g. "intubate at 6 min"; empty for a one-phase plan. */
export function plannedMovesText(phases: readonly PhaseStart[]): string {
  return phases
    .slice(1)
    .map((phase) => `${phaseMoveText(phase.route)} at ${short(phase.startMin)} min`)
    .join(', then ');
}

/**
 * A vaporiser schedule as the clinic reads it, one part per change of setting:
 * ["4 % from 0 min", "2 % from 4 min", "off at 30 min"]. A step at the same setting as the one
 * before is left out; a schedule that starts with the vaporiser off reads "off from 6 min". The
 * one wording of dial steps: the worksheet prints the parts one a line, lists and the command line
 * join them (`dialStepsText`).
 */
export function dialStepTexts(steps: readonly PlanScheduleStep[]): string[] {
  const parts: string[] = [];
  let previous: number | null = null;
  for (const step of steps) {
    if (step.vaporPct === previous) continue;
    const at = `${short(step.atMin)} min`;
    if (step.vaporPct !== 0) parts.push(`${short(step.vaporPct)} % from ${at}`);
    else parts.push(previous === null ? `off from ${at}` : `off at ${at}`);
    previous = step.vaporPct;
  }
  return parts;
}

/** A vaporiser schedule in one line: "4 % from 0 min, 2 % from 4 min, off at 30 min" (`dialStepTexts`). */
export function dialStepsText(steps: readonly PlanScheduleStep[]): string {
  return dialStepTexts(steps).join(', ');
}

/** The minutes a phase covers, e.g. "0-6 min" or "6-45 min (0.5 min on room air first)". */
export function phaseMinutesText(
  phase: Pick<PlanPhaseSummary, 'startMin' | 'endMin' | 'gapMin'>,
  withGap = true,
): string {
  const span = `${short(phase.startMin)}-${short(phase.endMin)} min`;
  return withGap && phase.gapMin > 0 ? `${span} (${short(phase.gapMin)} min on room air first)` : span;
}
