import { memo } from 'react';
import { agents, type AgentId } from '../../core/agents.js';
import { routeLabels } from '../../core/delivery.js';
import type { PlanPhaseSummary } from '../../core/model/plan-types.js';
import { breathingSystemText, dialStepsText, phaseMoveText } from '../../core/plan-phases.js';
import { figure } from './format.js';

/**
 * What the anaesthetist does, phase by phase: the minutes and the move (with its gap on room
 * air), the route and breathing system, the flow set against the recommended and the minimum,
 * the dial steps, and the oxygen and liquid agent the phase uses. A list, so that it reads in the
 * narrow results column without sideways scrolling.
 */
export const PhaseList = memo(
  function PhaseList({
    phases,
    agent,
  }: {
    readonly phases: readonly PlanPhaseSummary[];
    readonly agent: AgentId;
  }) {
    const agentName = agents[agent].displayName.toLowerCase();
    return (
      <ol className="phase-list" aria-label="Phases of the plan">
        {phases.map((phase) => {
          const low = phase.freshGasLpm < phase.flows.minimumLpm;
          return (
            <li key={phase.index} data-phase={phase.index + 1}>
              <p className="phase-head">
                <strong>
                  Phase {phase.index + 1}, {figure(phase.startMin, 2)}-{figure(phase.endMin, 2)} min:{' '}
                  {routeLabels[phase.route]}
                </strong>
                {phase.index > 0 && (
                  <>
                    {' '}
                    · {phaseMoveText(phase.route)}
                    {phase.gapMin > 0 ? ` after ${figure(phase.gapMin, 2)} min on room air (assumption)` : ''}
                  </>
                )}
              </p>
              <dl className="phase-facts">
                <dt>Breathing system</dt>
                <dd>{breathingSystemText(phase.route, phase.circuit)}</dd>
                <dt>Fresh gas</dt>
                <dd>
                  set{' '}
                  <strong className={low ? 'too-low' : undefined}>{figure(phase.freshGasLpm)} L/min</strong>{' '}
                  (recommended {figure(phase.flows.recommendedLpm)}, at least {figure(phase.flows.minimumLpm)}
                  ){low && <strong className="too-low"> · below the minimum</strong>}
                </dd>
                <dt>Dial</dt>
                <dd>{dialStepsText(phase.dialSteps)}</dd>
                <dt>Uses</dt>
                <dd>
                  {figure(phase.oxygenUsedL)} L oxygen, {figure(phase.liquidMl)} mL liquid {agentName}
                </dd>
              </dl>
            </li>
          );
        })}
      </ol>
    );
  },
  (previous, next) =>
    previous.agent === next.agent && JSON.stringify(previous.phases) === JSON.stringify(next.phases),
);
