import { describe, expect, it } from 'vitest';
import { planInputSchema } from '../../../app/contract/plan.js';
import { circuitLabels, routeLabels } from '../../../app/core/delivery.js';
import { agentPhasesText, agentRouteText } from '../../../app/ui/common/plan-labels.js';

describe('plain names of plan choices', () => {
  it('names every route and breathing system the plan contract accepts', () => {
    const shape = planInputSchema.shape;
    const routes = shape.route.options;
    const circuits = shape.circuit.unwrap().options;
    expect(Object.keys(routeLabels).sort()).toEqual([...routes].sort());
    expect(Object.keys(circuitLabels).sort()).toEqual([...circuits].sort());
  });

  it('writes a saved plan as agent and route in words, never as internal keys', () => {
    expect(agentRouteText('isoflurane', 'mask')).toBe('Isoflurane, face mask');
    expect(agentRouteText('sevoflurane', 'airSacTube')).toBe('Sevoflurane, air-sac tube');
    expect(agentRouteText('desflurane', 'endotracheal')).toBe('Desflurane, endotracheal tube');
    // Unknown values (from a newer version) are shown as stored rather than dropped.
    expect(agentRouteText('xenon', 'nasal')).toBe('xenon, nasal');
  });

  it('writes a phased plan as its routes in time order with the minute of each move', () => {
    const mask = { startMin: 0, route: 'mask' };
    expect(agentPhasesText({ agent: 'isoflurane', route: 'mask', phases: [] })).toBe('Isoflurane, face mask');
    expect(agentPhasesText({ agent: 'isoflurane', route: 'mask', phases: [mask] })).toBe(
      'Isoflurane, face mask',
    );
    expect(
      agentPhasesText({
        agent: 'sevoflurane',
        route: 'chamber',
        phases: [
          { startMin: 0, route: 'chamber' },
          { startMin: 4, route: 'mask' },
          { startMin: 9.5, route: 'endotracheal' },
        ],
      }),
    ).toBe('Sevoflurane, induction chamber → face mask at 4 min → endotracheal tube at 9.5 min');
  });
});
