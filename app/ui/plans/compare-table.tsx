import type { PlanInput } from '../../contract/plan.js';
import type { PlanPhaseSummary, PlanResult } from '../../core/model/plan-types.js';
import { agents } from '../../core/agents.js';
import { ippvText } from '../../core/model/ippv-periods.js';
import { breathingSystemText, phasesOfPlan, phaseSequenceText } from '../../core/plan-phases.js';
import { figure, minutes, range } from './format.js';
import { ScrollRegion } from '../common/scroll-region.js';

type Row = { readonly label: string; readonly a: string; readonly b: string };

/** Each phase's value joined in time order, e.g. "1 L/min → 0.5 L/min"; one phase reads alone. */
function perPhase(input: PlanInput, result: PlanResult, text: (phase: PlanPhaseSummary) => string): string {
  return phasesOfPlan(input, result).map(text).join(' → ');
}

function inputRows(a: PlanInput, b: PlanInput, resultA: PlanResult, resultB: PlanResult): Row[] {
  const schedule = (input: PlanInput) =>
    input.schedule.map((step) => `${step.vaporPct} % from ${step.atMin} min`).join(', ');
  const ventilation = (input: PlanInput) =>
    input.ventilation?.mode === 'ippv' ? ippvText(input.ventilation, String, 'short') : 'Spontaneous';
  const routes = (input: PlanInput, result: PlanResult) => phaseSequenceText(phasesOfPlan(input, result));
  const systems = (input: PlanInput, result: PlanResult) =>
    perPhase(input, result, (phase) => breathingSystemText(phase.route, phase.circuit));
  const flows = (input: PlanInput, result: PlanResult) =>
    perPhase(input, result, (phase) => `${figure(phase.freshGasLpm)} L/min`);
  return [
    { label: 'Agent', a: agents[a.agent].displayName, b: agents[b.agent].displayName },
    { label: 'Route', a: routes(a, resultA), b: routes(b, resultB) },
    { label: 'Breathing system', a: systems(a, resultA), b: systems(b, resultB) },
    { label: 'Fresh gas flow', a: flows(a, resultA), b: flows(b, resultB) },
    { label: 'Vaporiser schedule', a: schedule(a), b: schedule(b) },
    { label: 'Ventilation', a: ventilation(a), b: ventilation(b) },
  ];
}

function resultRows(inputA: PlanInput, inputB: PlanInput, a: PlanResult, b: PlanResult): Row[] {
  const recommended = (input: PlanInput, result: PlanResult) =>
    perPhase(input, result, (phase) => `${figure(phase.flows.recommendedLpm)} L/min`);
  return [
    {
      label: 'Time to planned depth',
      a: minutes(a.milestones.inductionMin),
      b: minutes(b.milestones.inductionMin),
    },
    {
      label: '  range (5th-95th)',
      a: range(a.uncertainty.inductionMin),
      b: range(b.uncertainty.inductionMin),
    },
    {
      label: 'Recovery after vaporiser off',
      a: minutes(a.milestones.recoveryMin),
      b: minutes(b.milestones.recoveryMin),
    },
    { label: '  range (5th-95th)', a: range(a.uncertainty.recoveryMin), b: range(b.uncertainty.recoveryMin) },
    {
      label: 'Deepest brain level',
      a: `${figure(a.milestones.peakBrainMacMultiple, 2)} × MAC`,
      b: `${figure(b.milestones.peakBrainMacMultiple, 2)} × MAC`,
    },
    {
      label: 'Recommended fresh gas',
      a: recommended(inputA, a),
      b: recommended(inputB, b),
    },
    {
      label: 'Liquid agent',
      a: `${figure(a.consumption.liquidMl)} mL`,
      b: `${figure(b.consumption.liquidMl)} mL`,
    },
    { label: 'Oxygen', a: `${figure(a.oxygen.usedL)} L`, b: `${figure(b.oxygen.usedL)} L` },
    {
      label: 'Waste gas peak',
      a: `${figure(a.wasteGas.peakPpm)} ppm`,
      b: `${figure(b.wasteGas.peakPpm)} ppm`,
    },
    { label: 'Cautions', a: String(a.cautions.length), b: String(b.cautions.length) },
  ];
}

/** Two variants side by side; rows that differ are marked (colour and a ◆ for print). */
export function CompareTable(props: {
  readonly inputA: PlanInput;
  readonly inputB: PlanInput;
  readonly resultA: PlanResult;
  readonly resultB: PlanResult;
}) {
  const rows = [
    ...inputRows(props.inputA, props.inputB, props.resultA, props.resultB),
    ...resultRows(props.inputA, props.inputB, props.resultA, props.resultB),
  ];
  return (
    <ScrollRegion label="Plan comparison">
      <table className="data-table compare-table" aria-label="Comparison of plan A and plan B">
        <thead>
          <tr>
            <th scope="col">
              <span className="visually-hidden">Quantity</span>
            </th>
            <th scope="col">Plan A</th>
            <th scope="col">Plan B</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((row, index) => {
            const differs = row.a !== row.b;
            return (
              <tr key={`${row.label}-${index}`} data-differs={differs}>
                <th scope="row">{row.label}</th>
                <td className={differs ? 'differs' : undefined}>{row.a}</td>
                <td className={differs ? 'differs' : undefined}>{row.b}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </ScrollRegion>
  );
}
