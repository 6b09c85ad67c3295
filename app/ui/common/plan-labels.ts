import type { PlanInput } from '../../contract/plan.js';
import { agents } from '../../core/agents.js';

/** Plain names of the delivery routes, as the screens and the worksheet show them. */
export const routeLabels: Readonly<Record<PlanInput['route'], string>> = {
  mask: 'Face mask',
  chamber: 'Induction chamber',
  endotracheal: 'Endotracheal tube',
  airSacTube: 'Air-sac tube',
};

/** Plain names of the breathing systems. */
export const circuitLabels: Readonly<Record<NonNullable<PlanInput['circuit']>, string>> = {
  nonRebreathing: 'Non-rebreathing system',
  circle: 'Circle system (rebreathing)',
};

function isKeyOf<T extends object>(table: T, key: string): key is Extract<keyof T, string> {
  return Object.hasOwn(table, key);
}

/** "Isoflurane, face mask": a saved plan's agent and route in a list line. */
export function agentRouteText(agent: string, route: string): string {
  const agentName = isKeyOf(agents, agent) ? agents[agent].displayName : agent;
  const routeName = isKeyOf(routeLabels, route) ? routeLabels[route].toLowerCase() : route;
  return `${agentName}, ${routeName}`;
}
