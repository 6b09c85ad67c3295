import type { PlanInput, PlanResult } from '../../contract/plan.js';
import { agents } from '../../core/agents.js';
import { routeLabels } from '../../core/delivery.js';
import {
  breathingSystemText,
  phaseMinutesText,
  phaseMoveText,
  phasesOfPlan,
} from '../../core/plan-phases.js';
import { plainBasis } from '../common/display.js';
import { figure } from './labels.js';
import { Row } from './sheet-row.js';
import { cylinderText, deliveryDetails, scheduleText, ventilationText } from './sheet-text.js';

/** The plan as entered: agent and MAC, route, flows, schedule, ventilation, depth, recovery, room, cylinder. */
export function PlanSection({
  input,
  result,
  recoveryWindowMin,
}: {
  readonly input: PlanInput;
  readonly result: PlanResult;
  readonly recoveryWindowMin: number;
}) {
  const agent = agents[input.agent];
  const depthPct = result.targetMacMultiple * result.mac.valuePct;
  const arousalPct = result.recoveryMacFraction.value * result.mac.valuePct;
  const phases = phasesOfPlan(input, result);
  // The plan's own delivery fields are the first phase's; each later phase carries its own.
  const details = (index: number) => {
    const own = index === 0 ? deliveryDetails(input) : deliveryDetails(input.laterPhases?.[index - 1] ?? {});
    return own.length === 0 ? '' : ` (${own.join(', ')})`;
  };
  return (
    <section className="ws-section" aria-labelledby="ws-plan">
      <h2 id="ws-plan">The plan</h2>
      <table className="ws-facts">
        <tbody>
          <Row label="Agent">
            {agent.displayName}; MAC used {figure(result.mac.valuePct)} %{' '}
            <span className="ws-basis">({plainBasis(result.mac.basis)})</span>
          </Row>
          {phases.length === 1 ? (
            <>
              <Row label="Route and circuit">
                {routeLabels[input.route]}
                {input.route === 'chamber' ? '' : `, ${breathingSystemText(input.route, input.circuit)}`}
                {details(0)}
              </Row>
              <Row label="Fresh gas flow set">{figure(input.freshGasLpm)} L/min oxygen</Row>
            </>
          ) : (
            <Row label="Phases">
              <ol className="ws-phase-list">
                {phases.map((phase) => (
                  <li key={phase.index}>
                    {phaseMinutesText(phase, false)}
                    {phase.index === 0
                      ? ': '
                      : `, ${phaseMoveText(phase.route)}${phase.gapMin > 0 ? ` after ${figure(phase.gapMin)} min on room air (assumption)` : ''}: `}
                    <strong>{routeLabels[phase.route]}</strong>
                    {phase.route === 'chamber' ? '' : `, ${breathingSystemText(phase.route, phase.circuit)}`}
                    {details(phase.index)}; fresh gas <strong>{figure(phase.freshGasLpm)} L/min</strong>{' '}
                    oxygen
                  </li>
                ))}
              </ol>
            </Row>
          )}
          <Row label="Vaporiser schedule">{scheduleText(input)}</Row>
          <Row label="Ventilation">{ventilationText(input)}</Row>
          <Row label="Planned depth">
            {figure(result.targetMacMultiple)} x MAC = {figure(depthPct)} % in the brain
          </Row>
          <Row label="Recovery threshold">
            {figure(result.recoveryMacFraction.value)} x MAC = {figure(arousalPct)} %{' '}
            <span className="ws-basis">({result.recoveryMacFraction.basis})</span>
          </Row>
          <Row label="Recovery window">{figure(recoveryWindowMin)} min after the last vaporiser step</Row>
          <Row label="Scavenging and room">
            {result.wasteGas.scavenging ? 'Scavenged' : 'Not scavenged'}; room{' '}
            {figure(result.wasteGas.roomVolumeM3)} m³, {figure(result.wasteGas.airChangesPerHour)} air
            changes/h
          </Row>
          <Row label="Oxygen cylinder">{cylinderText(input)}</Row>
        </tbody>
      </table>
    </section>
  );
}
