import { useState } from 'react';
import { agents, type AgentId } from '../../core/agents.js';
import { planChoiceParts } from '../../core/plan-choice.js';
import { displayDate, displayMass, todayIso } from '../common/display.js';
import { TextField } from '../common/fields.js';
import { asaGradeText } from '../common/plan-labels.js';
import { useClinicSettings } from '../common/settings-context.js';
import { useChannel } from '../common/use-channel.js';
import { useChangeNotices } from '../common/use-change-notices.js';
import { href } from '../shell/areas.js';
import { figure, minutes } from './format.js';
import { PhaseLines } from './phase-lines.js';
import { ScrollRegion } from '../common/scroll-region.js';

/**
 * The plans for one day as the prep room reads them: bird, ASA, agent and route, dials, flow,
 * predicted times, and the liquid agent and oxygen to have ready. Prints on one landscape page.
 */
export function DayList() {
  const settings = useClinicSettings();
  const [date, setDate] = useState(todayIso());
  const [load, reload] = useChannel('plans:day', { date });
  // Any plan may have moved to or from this day (a correction names only its new day).
  useChangeNotices((notice) => notice.kind === 'plans' || notice.kind === 'patients', reload);
  return (
    <section className="screen day-list" aria-labelledby="day-title">
      <h1 id="day-title">Anaesthetic plans</h1>
      <div className="toolbar">
        <TextField
          label="Day"
          name="day"
          type="date"
          value={date}
          onChange={(value) => value !== '' && setDate(value)}
        />
        <a className="button-link" href={href('plans', 'new')}>
          Quick plan
        </a>
        <button type="button" onClick={() => window.print()}>
          Print the day list
        </button>
        <p className="hint">To plan for a patient, open the patient and choose New plan.</p>
      </div>
      <p className="day-print-title">
        {settings.clinicName === '' ? '' : `${settings.clinicName} · `}Anaesthetic plans for{' '}
        {displayDate(date)}
      </p>
      {load.state === 'loading' && <p aria-busy="true">Loading…</p>}
      {load.state === 'failed' && (
        <p className="form-error" role="alert">
          {load.error.message}
        </p>
      )}
      {load.state === 'ready' &&
        (load.value.plans.length === 0 ? (
          <p className="muted">No plans for {displayDate(date)}.</p>
        ) : (
          <>
            <ScrollRegion label="Plans for the day">
              <table className="data-table">
                <thead>
                  <tr>
                    <th>Plan</th>
                    <th>Bird</th>
                    <th className="number">Mass</th>
                    <th>ASA</th>
                    <th>Agent, phases, flows and dials</th>
                    <th className="number">To planned depth</th>
                    <th className="number">First movement after off</th>
                    <th className="number">Liquid agent</th>
                    <th className="number">Oxygen</th>
                    <th>Checklist</th>
                  </tr>
                </thead>
                <tbody>
                  {load.value.plans.map((plan) => (
                    <tr key={plan.id}>
                      <td>
                        <a href={href('plans', plan.id)}>
                          {plan.id}
                          {plan.label === '' ? '' : ` · ${plan.label}`}
                        </a>
                        {planChoiceParts(plan).map((part) =>
                          part === 'chosen' ? (
                            <strong key={part} className="plan-choice">
                              {' '}
                              · {part}
                            </strong>
                          ) : (
                            <span key={part} className="plan-choice">
                              {' '}
                              · {part}
                            </span>
                          ),
                        )}
                        <span className="screen-only">
                          {' '}
                          · <a href={href('worksheets', plan.id)}>worksheet</a>
                        </span>
                      </td>
                      <td>{plan.patientName ?? 'quick plan'}</td>
                      <td className="number">{displayMass(plan.bodyMassG, settings.massUnit)}</td>
                      <td>{asaGradeText(plan.asaGrade, plan.emergency)}</td>
                      <td>
                        {agents[plan.agent as AgentId].displayName}
                        <PhaseLines phases={plan.phases} />
                      </td>
                      <td className="number">{minutes(plan.inductionMin)}</td>
                      <td className="number">{minutes(plan.recoveryMin)}</td>
                      <td className="number">{figure(plan.liquidMl)} mL</td>
                      <td className="number">{figure(plan.oxygenL)} L</td>
                      <td>
                        {plan.openChecklistItems === 0 ? 'complete' : `${plan.openChecklistItems} open`}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </ScrollRegion>
            <p className="day-totals" role="status">
              Day total:{' '}
              {Object.entries(load.value.totals.liquidMlByAgent)
                .map(
                  ([agent, ml]) =>
                    `${figure(ml)} mL liquid ${agents[agent as AgentId].displayName.toLowerCase()}`,
                )
                .join(', ')}{' '}
              and {figure(load.value.totals.oxygenL)} L oxygen, before priming, leaks and spillage.
              {load.value.plans.some((plan) => plan.chosen === false) &&
                ' Compared plans not chosen are left out.'}
            </p>
          </>
        ))}
    </section>
  );
}
