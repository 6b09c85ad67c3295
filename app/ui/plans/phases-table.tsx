import { memo } from 'react';
import { agents, type AgentId } from '../../core/agents.js';
import { routeLabels } from '../../core/delivery.js';
import type { PlanPhaseSummary } from '../../core/model/plan-types.js';
import { breathingSystemText, dialStepTexts, phaseMoveText } from '../../core/plan-phases.js';
import { ScrollRegion } from '../common/scroll-region.js';
import { figure } from './format.js';

/**
 * What the anaesthetist does, phase by phase: the minutes, the route and breathing system, the
 * gap on room air when the bird is moved, the flow set against the recommended and minimum, the
 * dial steps, and the oxygen and liquid agent each phase uses.
 */
export const PhasesTable = memo(
  function PhasesTable({
    phases,
    agent,
  }: {
    readonly phases: readonly PlanPhaseSummary[];
    readonly agent: AgentId;
  }) {
    const agentName = agents[agent].displayName.toLowerCase();
    return (
      <ScrollRegion label="Phases of the plan">
        <table className="data-table phases-table" aria-label="Phases of the plan">
          <thead>
            <tr>
              <th scope="col">Phase</th>
              <th scope="col">Route and breathing system</th>
              <th scope="col" className="number">
                Fresh gas
              </th>
              <th scope="col">Dial</th>
              <th scope="col" className="number">
                Oxygen
              </th>
              <th scope="col" className="number">
                Liquid {agentName}
              </th>
            </tr>
          </thead>
          <tbody>
            {phases.map((phase) => {
              const low = phase.freshGasLpm < phase.flows.minimumLpm;
              return (
                <tr key={phase.index} data-phase={phase.index + 1}>
                  <th scope="row">
                    {phase.index + 1}: {figure(phase.startMin, 2)}-{figure(phase.endMin, 2)} min
                    {phase.index > 0 && (
                      <span className="basis">
                        {phaseMoveText(phase.route)}
                        {phase.gapMin > 0 ? `; ${figure(phase.gapMin, 2)} min on room air (assumption)` : ''}
                      </span>
                    )}
                  </th>
                  <td>
                    {routeLabels[phase.route]}
                    <span className="basis">{breathingSystemText(phase.route, phase.circuit)}</span>
                  </td>
                  <td className="number">
                    set{' '}
                    <strong className={low ? 'too-low' : undefined}>{figure(phase.freshGasLpm)} L/min</strong>
                    <span className="basis">
                      recommended {figure(phase.flows.recommendedLpm)}, at least{' '}
                      {figure(phase.flows.minimumLpm)}
                    </span>
                    {low && <span className="basis too-low">below the minimum</span>}
                  </td>
                  <td>
                    {dialStepTexts(phase.dialSteps).map((step) => (
                      <span key={step} className="phase-step">
                        {step}
                      </span>
                    ))}
                  </td>
                  <td className="number">{figure(phase.oxygenUsedL)} L</td>
                  <td className="number">{figure(phase.liquidMl)} mL</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </ScrollRegion>
    );
  },
  (previous, next) =>
    previous.agent === next.agent && JSON.stringify(previous.phases) === JSON.stringify(next.phases),
);
