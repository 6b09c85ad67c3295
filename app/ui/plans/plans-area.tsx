import { useMemo } from 'react';
import type { Route } from '../shell/areas.js';
import { DayList } from './day-list.js';
import { PlanningScreen, type PlanningStart } from './planning-screen.js';

/** Plans: `#/plans` (day list), `#/plans/new`, `#/plans/new/<patientId>`, `#/plans/<planId>`. */
export function PlansArea({ route }: { readonly route: Route }) {
  const [first, second] = route.segments;
  const start = useMemo<PlanningStart | null>(() => {
    if (first === undefined) return null;
    if (first === 'new') {
      const patientId = Number(second);
      return second !== undefined && Number.isInteger(patientId) && patientId > 0
        ? { kind: 'patient', patientId }
        : { kind: 'quick' };
    }
    const planId = Number(first);
    return Number.isInteger(planId) && planId > 0 ? { kind: 'saved', planId } : null;
  }, [first, second]);
  if (start === null) return <DayList />;
  return <PlanningScreen key={`${start.kind}-${first ?? ''}-${second ?? ''}`} start={start} />;
}
