import type { PlanInput, PlanResult } from '../../contract/plan.js';
import { agents } from '../../core/agents.js';
import { circuitLabels, routeLabels } from '../../core/delivery.js';
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
  return (
    <section className="ws-section" aria-labelledby="ws-plan">
      <h2 id="ws-plan">The plan</h2>
      <table className="ws-facts">
        <tbody>
          <Row label="Agent">
            {agent.displayName}; MAC used {figure(result.mac.valuePct)} %{' '}
            <span className="ws-basis">({plainBasis(result.mac.basis)})</span>
          </Row>
          <Row label="Route and circuit">
            {routeLabels[input.route]}
            {input.circuit === undefined ? '' : `, ${circuitLabels[input.circuit]}`}
            {deliveryDetails(input).length === 0 ? '' : ` (${deliveryDetails(input).join(', ')})`}
          </Row>
          <Row label="Fresh gas flow set">{figure(input.freshGasLpm)} L/min oxygen</Row>
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
