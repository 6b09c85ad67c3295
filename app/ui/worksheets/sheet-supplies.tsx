import type { PlanInput, PlanResult } from '../../contract/plan.js';
import { agents } from '../../core/agents.js';
import { routeLabels } from '../../core/delivery.js';
import { phasesOfPlan } from '../../core/plan-phases.js';
import { figure } from './labels.js';
import { Row } from './sheet-row.js';

/** Fresh gas flow, liquid agent, oxygen and waste gas in the room. */
export function SuppliesSection({
  input,
  result,
}: {
  readonly input: PlanInput;
  readonly result: PlanResult;
}) {
  const agent = agents[input.agent];
  const phases = phasesOfPlan(input, result);
  return (
    <section className="ws-section" aria-labelledby="ws-supplies">
      <h2 id="ws-supplies">Flows, agent, oxygen and waste gas</h2>
      <table className="ws-facts">
        <tbody>
          {phases.map((phase) => (
            <Row
              key={phase.index}
              label={phases.length === 1 ? 'Fresh gas flow' : `Fresh gas, phase ${String(phase.index + 1)}`}
            >
              {phases.length === 1 ? '' : `${routeLabels[phase.route]}: `}
              recommended <strong>{figure(phase.flows.recommendedLpm, 2)} L/min</strong> (at least{' '}
              {figure(phase.flows.minimumLpm, 2)} L/min); set{' '}
              <strong>{figure(phase.freshGasLpm, 2)} L/min</strong>
              {phase.freshGasLpm < phase.flows.minimumLpm ? (
                <strong className="ws-open"> · BELOW THE MINIMUM</strong>
              ) : (
                ''
              )}
              {phases.length === 1
                ? ''
                : `; ${figure(phase.oxygenUsedL, 2)} L oxygen and ${figure(phase.liquidMl, 2)} mL liquid agent in this phase`}
              <br />
              <span className="ws-basis">
                {phase.flows.rule}. {phase.flows.basis}
                {phase.flows.rebreathing ? ` Rebreathing: ${phase.flows.rebreathingReason}` : ''}
                {phase.flows.chamberTimeTo95Min === null
                  ? ''
                  : ` Chamber reaches 95 % of the dial in ${figure(phase.flows.chamberTimeTo95Min, 2)} min.`}
              </span>
            </Row>
          ))}
          <Row label={`Liquid ${agent.displayName.toLowerCase()}`}>
            <strong>{figure(result.consumption.liquidMl, 2)} mL</strong> for the plan;{' '}
            {figure(result.consumption.liquidMlPerHour, 2)} mL/h at{' '}
            {figure(result.consumption.maintenanceVaporPct)} % maintenance
            <br />
            <span className="ws-basis">
              1 mL of liquid gives {figure(result.consumption.vapourMlPerLiquidMl)} mL of vapour.{' '}
              {result.consumption.basis}
            </span>
          </Row>
          <Row label="Oxygen">
            <strong>{figure(result.oxygen.usedL, 2)} L</strong> over {figure(result.oxygen.durationMin)} min
            {result.oxygen.cylinderContentL === null
              ? ''
              : `; cylinder holds ${figure(result.oxygen.cylinderContentL)} L`}
            {result.oxygen.enduranceMin === null
              ? ''
              : `, lasts ${figure(result.oxygen.enduranceMin)} min at this flow`}
            {result.oxygen.suffices === false ? (
              <strong className="ws-open"> · NOT ENOUGH OXYGEN</strong>
            ) : (
              ''
            )}
            <br />
            <span className="ws-basis">{result.oxygen.basis}</span>
          </Row>
          <Row label="Waste gas in the room">
            peak {figure(result.wasteGas.peakPpm, 2)} ppm; highest 1 h mean{' '}
            {figure(result.wasteGas.highestHourMeanPpm, 2)} ppm against the{' '}
            {figure(result.wasteGas.ceilingPpm)} ppm ceiling (NIOSH 1977)
            {result.wasteGas.exceedsCeiling ? <strong className="ws-open"> · ABOVE THE CEILING</strong> : ''}
            <br />
            <span className="ws-basis">
              {figure(result.wasteGas.releasedVapourMl, 2)} mL of vapour released. {result.wasteGas.basis}
            </span>
          </Row>
        </tbody>
      </table>
    </section>
  );
}
