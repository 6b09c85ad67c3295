import type { PlanSummary } from '../../contract/plan-records.js';
import { agentIds, agentLabels, type AgentId } from '../../core/agents.js';
import type { Circuit, Route } from '../../core/delivery.js';
import { plannedMovesText } from '../../core/plan-phases.js';
import type { RecordDraft } from './record-form.js';

type LinkablePlan = Pick<
  PlanSummary,
  'agent' | 'route' | 'circuit' | 'phases' | 'label' | 'asaGrade' | 'emergency'
>;

/** A saved plan's agent, or null when the summary holds no agent Tidewing knows. */
function planAgent(plan: Pick<PlanSummary, 'agent'>): AgentId | null {
  return agentIds.find((id) => id === plan.agent) ?? null;
}

/**
 * The airway and breathing system a record starts on when it follows a plan: the plan's first
 * phase (the record starts with the induction). A chamber has no breathing system, so the first
 * later phase that has one is taken (the mask or tube the bird moves to); none: null.
 */
export function planStartAirway(plan: Pick<PlanSummary, 'route' | 'circuit' | 'phases'>): {
  readonly airway: Route;
  readonly circuit: Circuit | null;
} {
  const phases =
    plan.phases.length > 0
      ? plan.phases
      : [{ route: plan.route as Route, circuit: plan.circuit as Circuit | null }];
  const first = phases[0];
  const circuit = phases.find((phase) => phase.circuit !== null)?.circuit ?? null;
  return { airway: first?.route ?? (plan.route as Route), circuit };
}

/** The plan's later phases as the record form shows them, e.g. "Planned: intubate at 6 min"; null for none. */
export function plannedPhasesNote(plan: Pick<PlanSummary, 'phases'>): string | null {
  const moves = plannedMovesText(plan.phases);
  return moves === '' ? null : `Planned: ${moves}.`;
}

/**
 * The new-record form after the linked plan changes: the airway, breathing system and agent follow
 * the newly linked plan (its starting phase); what the previous plan put there is cleared when the
 * link is removed (never a stale airway; the agent goes back to the clinic's default), while a
 * value chosen by hand stays. The procedure name follows the plan's label unless typed; the plan's
 * ASA grade is taken unless one is chosen.
 * @param defaultAgent the clinic's default agent, the agent of a record without a plan
 */
export function withLinkedPlan(
  current: RecordDraft,
  plan: LinkablePlan | null,
  previous: LinkablePlan | null,
  defaultAgent: AgentId,
): RecordDraft {
  const carried = previous === null ? null : planStartAirway(previous);
  const fromPrevious = {
    airway: carried !== null && current.airway === carried.airway,
    circuit: carried !== null && carried.circuit !== null && current.circuit === carried.circuit,
  };
  if (plan === null) {
    return {
      ...current,
      planId: null,
      airway: fromPrevious.airway ? '' : current.airway,
      circuit: fromPrevious.circuit ? '' : current.circuit,
      agent: previous !== null && current.agent === planAgent(previous) ? defaultAgent : current.agent,
      procedureName:
        previous !== null && current.procedureName === previous.label ? '' : current.procedureName,
    };
  }
  const start = planStartAirway(plan);
  return {
    ...current,
    airway: start.airway,
    circuit: start.circuit ?? (fromPrevious.circuit ? '' : current.circuit),
    agent: planAgent(plan) ?? current.agent,
    procedureName:
      current.procedureName === '' || current.procedureName === previous?.label
        ? plan.label
        : current.procedureName,
    // The ASA grade given in the plan's checklist, unless one is chosen here.
    ...(current.asaGrade === 0 && plan.asaGrade !== null
      ? { asaGrade: plan.asaGrade as RecordDraft['asaGrade'], emergency: plan.emergency }
      : {}),
  };
}

/**
 * Where the new record's agent comes from, said beside the agent: the linked plan, the clinic's
 * default, or neither (chosen here, e.g. differing from the plan).
 * @param agent the agent chosen in the form
 * @param plan the linked plan, or null
 * @param defaultAgent the clinic's default agent
 */
export function recordAgentHint(
  agent: AgentId | '',
  plan: Pick<PlanSummary, 'agent'> | null,
  defaultAgent: AgentId,
): string | undefined {
  if (agent === '') return undefined;
  const planned = plan === null ? null : planAgent(plan);
  if (planned !== null)
    return agent === planned
      ? 'The linked plan’s agent.'
      : `Not the linked plan’s agent (${agentLabels[planned]}); the record keeps the one chosen here.`;
  return agent === defaultAgent ? 'The clinic’s default agent (Settings); no plan is linked.' : undefined;
}
