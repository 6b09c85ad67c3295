import type { PlanDetail } from '../../contract/plan-records.js';
import type { PlanResult } from '../../contract/plan.js';
import type { ClinicSettings } from '../../contract/settings.js';
import { agents } from '../../core/agents.js';
import { calibratedSummaryText, type CalibratedLine } from '../../core/evidence/calibrated-figure.js';
import { asaMortalityText, minutesWithRangeText } from '../../core/worksheet.js';
import { displayDate, displayMass } from '../common/display.js';
import { routeLabels } from '../../core/delivery.js';
import { breathingSystemText, dialStepTexts, phaseMoveText, phasesOfPlan } from '../../core/plan-phases.js';
import { figure } from './labels.js';
import { ventilationText } from './sheet-text.js';

const severityWords = { danger: 'DANGER', warning: 'WARNING', notice: 'NOTICE' } as const;

/**
 * Page 1 of the worksheet, the prep-room summary that stands alone: the bird, how it is to be
 * anaesthetised (one row per phase: route, breathing system, flow, dial steps, oxygen and agent), the
 * predicted times with their ranges (and the clinic's calibrated figures when its calibration is
 * on), what to have ready and the cautions in one line each. The emergency card follows it on the
 * same page.
 */
export function SummarySection({
  detail,
  settings,
  patientName,
  identifier,
  result,
  calibrated,
}: {
  readonly detail: PlanDetail;
  readonly settings: ClinicSettings;
  readonly patientName: string;
  readonly identifier: string;
  readonly result: PlanResult;
  /** The calibrated lines of the plan's milestones (none when the calibration is off or unread). */
  readonly calibrated: readonly CalibratedLine[];
}) {
  const { plan, patient, species, weightTrendText } = detail;
  const input = plan.input;
  const agent = agents[input.agent];
  const depthPct = result.targetMacMultiple * result.mac.valuePct;
  const grade = plan.checklist.asaGrade;
  const phases = phasesOfPlan(input, result);
  const agentName = agent.displayName.toLowerCase();
  // Induction is the planned surgical depth, recovery the first movement (compute-plan.ts); one
  // line, so the emergency card still fits on this page; each basis is with the predicted course.
  const calibratedTimes = calibratedSummaryText([
    { name: 'induction', line: calibrated.find((line) => line.id === 'surgicalDepth') },
    { name: 'recovery', line: calibrated.find((line) => line.id === 'firstMovement') },
  ]);
  return (
    <section className="ws-section ws-summary" aria-labelledby="ws-summary">
      <h2 id="ws-summary" className="ws-visually-hidden">
        Prep-room summary
      </h2>
      <div className="ws-summary-bird">
        <p>
          <strong className="ws-patient-name">{patientName}</strong>
          {identifier === '' ? '' : ` · ${identifier}`}
          {patient !== null ? ` · ${patient.values.sex}` : ''}
          {' · '}
          {species === null
            ? (input.speciesId ?? 'species not given')
            : `${species.values.commonName}${species.values.scientificName === '' ? '' : ` (${species.values.scientificName})`}`}
        </p>
        <p>
          Weight <strong>{displayMass(input.bodyMassG, settings.massUnit)}</strong>
          {weightTrendText === null ? '' : ` (${weightTrendText})`} · procedure{' '}
          <strong>{displayDate(plan.plannedFor)}</strong>
          {plan.label === '' ? '' : ` · ${plan.label}`}
          {plan.checklist.emergency ? ' · EMERGENCY' : ''}
        </p>
        <p>
          {grade === null ? (
            <strong className="ws-open">ASA grade NOT SET</strong>
          ) : (
            <>
              <strong>ASA {grade}</strong>{' '}
              <span className="ws-small">{asaMortalityText(grade).replace(/^ASA \d: /, '')}</span>
            </>
          )}
        </p>
      </div>

      <table className="ws-grid-table ws-steps">
        <caption>
          {agent.displayName}, MAC {figure(result.mac.valuePct)} %; planned depth{' '}
          {figure(result.targetMacMultiple)} x MAC = {figure(depthPct)} % in the brain
        </caption>
        <thead>
          <tr>
            <th scope="col">Phase</th>
            <th scope="col">Route and breathing system</th>
            <th scope="col">Fresh gas (oxygen)</th>
            <th scope="col">Dial steps</th>
            <th scope="col">Uses</th>
            <th scope="col">Breathing</th>
          </tr>
        </thead>
        <tbody>
          {phases.map((phase) => (
            <tr key={phase.index}>
              <th scope="row">
                {phase.index + 1}
                <span className="ws-block ws-small">
                  {figure(phase.startMin)}-{figure(phase.endMin)} min
                </span>
                {phase.index > 0 && (
                  <span className="ws-block ws-small">
                    {phaseMoveText(phase.route)}
                    {phase.gapMin > 0 ? `, ${figure(phase.gapMin)} min on room air` : ''}
                  </span>
                )}
              </th>
              <td>
                <strong>{routeLabels[phase.route]}</strong>
                <span className="ws-block ws-small">{breathingSystemText(phase.route, phase.circuit)}</span>
              </td>
              <td>
                <strong>{figure(phase.freshGasLpm, 2)} L/min</strong>
                <span className="ws-block ws-small">
                  recommended {figure(phase.flows.recommendedLpm, 2)}, at least{' '}
                  {figure(phase.flows.minimumLpm, 2)}
                </span>
                {phase.freshGasLpm < phase.flows.minimumLpm && (
                  <strong className="ws-open ws-block">BELOW THE MINIMUM</strong>
                )}
              </td>
              <td>
                {dialStepTexts(phase.dialSteps).map((step) => (
                  <span key={step} className="ws-block">
                    {step}
                  </span>
                ))}
              </td>
              <td>
                <span className="ws-block">{figure(phase.oxygenUsedL, 2)}&nbsp;L oxygen</span>
                <span className="ws-block">
                  {figure(phase.liquidMl, 2)}&nbsp;mL {agentName}
                </span>
              </td>
              {phase.index === 0 && <td rowSpan={phases.length}>{ventilationText(input)}</td>}
            </tr>
          ))}
        </tbody>
      </table>

      <div className="ws-summary-columns">
        <table className="ws-facts ws-summary-times">
          <tbody>
            <tr>
              <th scope="row">Predicted induction</th>
              <td>
                <strong>
                  {minutesWithRangeText(result.milestones.inductionMin, result.uncertainty.inductionMin)}
                </strong>
              </td>
            </tr>
            <tr>
              <th scope="row">Vaporiser off</th>
              <td>
                {result.milestones.vaporiserOffMin === null
                  ? 'not in the schedule'
                  : `at ${figure(result.milestones.vaporiserOffMin)} min`}
              </td>
            </tr>
            <tr>
              <th scope="row">Predicted recovery</th>
              <td>
                <strong>
                  {minutesWithRangeText(result.milestones.recoveryMin, result.uncertainty.recoveryMin)}
                </strong>{' '}
                after the vaporiser is off
              </td>
            </tr>
          </tbody>
        </table>
        <table className="ws-facts ws-summary-ready">
          <tbody>
            <tr>
              <th scope="row">Liquid {agent.displayName.toLowerCase()}</th>
              <td>
                have <strong>{figure(result.consumption.liquidMl, 2)} mL</strong> ready
              </td>
            </tr>
            <tr>
              <th scope="row">Oxygen</th>
              <td>
                have <strong>{figure(result.oxygen.usedL, 2)} L</strong> oxygen over{' '}
                {figure(result.oxygen.durationMin)} min
                {result.oxygen.enduranceMin === null
                  ? ''
                  : `; the cylinder lasts ${figure(result.oxygen.enduranceMin)} min`}
                {result.oxygen.suffices === false && (
                  <strong className="ws-open"> · NOT ENOUGH OXYGEN</strong>
                )}
              </td>
            </tr>
          </tbody>
        </table>
      </div>
      {calibratedTimes !== null && (
        <p className="ws-small ws-calibrated" data-calibrated="summary">
          Your clinic’s calibration: {calibratedTimes}; what each rests on is with the predicted course.
        </p>
      )}

      <h3>Cautions ({result.cautions.length === 0 ? 'none raised' : String(result.cautions.length)})</h3>
      {result.cautions.length > 0 && (
        <ul className="ws-summary-cautions">
          {result.cautions.map((caution) => (
            <li key={caution.code}>
              <strong>{severityWords[caution.severity]}:</strong> {caution.message}
            </li>
          ))}
        </ul>
      )}
      <p className="ws-small">
        Reasons, the checklist, the chart and every basis follow on the next pages. The responsible
        veterinarian decides; watch the bird, not the plan.
      </p>
    </section>
  );
}
