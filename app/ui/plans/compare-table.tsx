import type { PlanInput } from '../../contract/plan.js';
import type { PlanResult } from '../../core/model/plan-types.js';
import { agents } from '../../core/agents.js';
import { circuitLabels, routeLabels } from '../../core/delivery.js';
import { figure, minutes, range } from './format.js';
import { ScrollRegion } from '../common/scroll-region.js';

type Row = { readonly label: string; readonly a: string; readonly b: string };

/** A chamber has no breathing system; an air-sac tube always runs on a non-rebreathing system. */
function breathingSystem(input: PlanInput): string {
  return input.route === 'chamber' ? '—' : circuitLabels[input.circuit ?? 'nonRebreathing'];
}

function inputRows(a: PlanInput, b: PlanInput): Row[] {
  const schedule = (input: PlanInput) =>
    input.schedule.map((step) => `${step.vaporPct} % from ${step.atMin} min`).join(', ');
  const ventilation = (input: PlanInput) =>
    input.ventilation?.mode === 'ippv'
      ? `IPPV ${input.ventilation.breathsPerMin}/min × ${input.ventilation.tidalVolumeMl} mL`
      : 'Spontaneous';
  return [
    { label: 'Agent', a: agents[a.agent].displayName, b: agents[b.agent].displayName },
    { label: 'Route', a: routeLabels[a.route], b: routeLabels[b.route] },
    { label: 'Breathing system', a: breathingSystem(a), b: breathingSystem(b) },
    { label: 'Fresh gas flow', a: `${figure(a.freshGasLpm)} L/min`, b: `${figure(b.freshGasLpm)} L/min` },
    { label: 'Vaporiser schedule', a: schedule(a), b: schedule(b) },
    { label: 'Ventilation', a: ventilation(a), b: ventilation(b) },
  ];
}

function resultRows(a: PlanResult, b: PlanResult): Row[] {
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
      a: `${figure(a.flows.recommendedLpm)} L/min`,
      b: `${figure(b.flows.recommendedLpm)} L/min`,
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
  const rows = [...inputRows(props.inputA, props.inputB), ...resultRows(props.resultA, props.resultB)];
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
