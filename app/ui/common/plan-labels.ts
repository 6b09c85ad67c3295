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
