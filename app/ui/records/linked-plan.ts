import type { PlanSummary } from '../../contract/plan-records.js';
import type { Circuit, Route } from '../../core/delivery.js';
import { plannedMovesText } from '../../core/plan-phases.js';
import type { RecordDraft } from './record-form.js';

type LinkablePlan = Pick<PlanSummary, 'route' | 'circuit' | 'phases' | 'label' | 'asaGrade' | 'emergency'>;

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
 * The new-record form after the linked plan changes: the airway and breathing system follow the
 * newly linked plan's starting phase; what the previous plan put there is cleared when the link is
 * removed (never a stale airway), while a value typed by hand stays. The procedure name follows the
 * plan's label unless typed; the plan's ASA grade is taken unless one is chosen.
 */
export function withLinkedPlan(
  current: RecordDraft,
  plan: LinkablePlan | null,
  previous: LinkablePlan | null,
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
      procedureName:
        previous !== null && current.procedureName === previous.label ? '' : current.procedureName,
    };
  }
  const start = planStartAirway(plan);
  return {
    ...current,
    airway: start.airway,
    circuit: start.circuit ?? (fromPrevious.circuit ? '' : current.circuit),
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
