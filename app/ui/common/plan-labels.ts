import { agentLabels } from '../../core/agents.js';
import { routeLabels } from '../../core/delivery.js';

function isKeyOf<T extends object>(table: T, key: string): key is Extract<keyof T, string> {
  return Object.hasOwn(table, key);
}

/** "Isoflurane, face mask": a saved plan's agent and route in a list line. */
export function agentRouteText(agent: string, route: string): string {
  const agentName = isKeyOf(agentLabels, agent) ? agentLabels[agent] : agent;
  const routeName = isKeyOf(routeLabels, route) ? routeLabels[route].toLowerCase() : route;
  return `${agentName}, ${routeName}`;
}

/**
 * A vaporiser schedule in one line for lists: "4 % → 2 % at 4 min, off at 30 min". Steps at the
 * same setting as the one before are left out.
 */
export function dialStepsText(
  schedule: readonly { readonly atMin: number; readonly vaporPct: number }[],
): string {
  const parts: string[] = [];
  let previous: number | null = null;
  for (const step of schedule) {
    if (step.vaporPct === previous) continue;
    const at = `${String(Number(step.atMin.toFixed(1)))} min`;
    if (previous === null) parts.push(step.vaporPct === 0 ? `off from ${at}` : `${String(step.vaporPct)} %`);
    else parts.push(step.vaporPct === 0 ? `off at ${at}` : `→ ${String(step.vaporPct)} % at ${at}`);
    previous = step.vaporPct;
  }
  return parts.join(', ').replace(/, →/g, ' →');
}

/** ASA grade as the day list prints it: 1-5 with E for emergency, or "not graded". */
export function asaGradeText(asaGrade: number | null, emergency: boolean): string {
  if (asaGrade === null) return emergency ? 'not graded (E)' : 'not graded';
  return `${String(asaGrade)}${emergency ? 'E' : ''}`;
}

/** Number in a list line: at most 2 decimals. */
function short(value: number): string {
  return String(Math.round(value * 100) / 100);
}

/**
 * A saved plan's agent and its phases in a list line, e.g.
 * "Isoflurane, face mask → endotracheal tube at 6 min"; a one-phase plan reads as agent and route.
 */
export function agentPhasesText(plan: {
  readonly agent: string;
  readonly route: string;
  readonly phases: readonly { readonly startMin: number; readonly route: string }[];
}): string {
  const later = plan.phases
    .slice(1)
    .map((phase) => {
      const name = isKeyOf(routeLabels, phase.route) ? routeLabels[phase.route].toLowerCase() : phase.route;
      return ` → ${name} at ${short(phase.startMin)} min`;
    })
    .join('');
  return `${agentRouteText(plan.agent, plan.route)}${later}`;
}
