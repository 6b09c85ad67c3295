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
