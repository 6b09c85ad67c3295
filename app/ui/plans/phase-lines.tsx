import type { PlanSummaryPhase } from '../../contract/plan-records.js';
import { routeLabels } from '../../core/delivery.js';
import { breathingSystemText, dialStepsText } from '../../core/plan-phases.js';
import { figure } from './format.js';

/**
 * A saved plan's phases as short lines for a list: from which minute, route and breathing system,
 * the flow set (and the model's recommendation) and the dial steps, e.g.
 * "from 6 min: Endotracheal tube, Non-rebreathing system · 0.5 L/min (recommended 0.3) · 2 % from 6 min, off at 30 min".
 */
export function PhaseLines({ phases }: { readonly phases: readonly PlanSummaryPhase[] }) {
  return (
    <ol className="phase-lines">
      {phases.map((phase) => (
        <li key={phase.startMin}>
          {phase.startMin === 0 ? '' : `from ${figure(phase.startMin, 2)} min: `}
          <strong>{routeLabels[phase.route]}</strong>
          {phase.route === 'chamber' ? '' : `, ${breathingSystemText(phase.route, phase.circuit)}`} ·{' '}
          <strong className={phase.freshGasLpm < phase.minimumLpm ? 'too-low' : undefined}>
            {figure(phase.freshGasLpm)} L/min
          </strong>{' '}
          (recommended {figure(phase.recommendedLpm, 2)}) · {dialStepsText(phase.dialSteps)}
        </li>
      ))}
    </ol>
  );
}
