import type { PlanInput, PlanResult } from '../../contract/plan.js';
import { agents } from '../../core/agents.js';
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
  return (
    <section className="ws-section" aria-labelledby="ws-supplies">
      <h2 id="ws-supplies">Flows, agent, oxygen and waste gas</h2>
      <table className="ws-facts">
        <tbody>
          <Row label="Fresh gas flow">
            recommended <strong>{figure(result.flows.recommendedLpm, 2)} L/min</strong> (at least{' '}
            {figure(result.flows.minimumLpm, 2)} L/min); set{' '}
            <strong>{figure(input.freshGasLpm, 2)} L/min</strong>
            {input.freshGasLpm < result.flows.minimumLpm ? (
              <strong className="ws-open"> · BELOW THE MINIMUM</strong>
            ) : (
              ''
            )}
            <br />
            <span className="ws-basis">
              {result.flows.rule}. {result.flows.basis}
              {result.flows.rebreathing ? ` Rebreathing: ${result.flows.rebreathingReason}` : ''}
              {result.flows.chamberTimeTo95Min === null
                ? ''
                : ` Chamber reaches 95 % of the dial in ${figure(result.flows.chamberTimeTo95Min, 2)} min.`}
            </span>
          </Row>
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
