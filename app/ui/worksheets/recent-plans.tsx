import { displayDate, displayMass } from '../common/display.js';
import { agentPhasesText } from '../common/plan-labels.js';
import { useClinicSettings } from '../common/settings-context.js';
import { useChannel } from '../common/use-channel.js';
import { useChangeNotices } from '../common/use-change-notices.js';
import { href } from '../shell/areas.js';
import { figure } from './labels.js';
import { ScrollRegion } from '../common/scroll-region.js';

/** Saved plans, latest planned date first, each opening its printable worksheet. */
export function RecentPlans() {
  const [load, reload] = useChannel('plans:recent', { limit: 100 });
  // A plan saved, corrected or chosen anywhere, or a patient renamed, changes the list.
  useChangeNotices((notice) => notice.kind === 'plans' || notice.kind === 'patients', reload);
  const settings = useClinicSettings();
  return (
    <section className="screen" aria-labelledby="worksheets-title">
      <h1 id="worksheets-title">Worksheets</h1>
      <p className="lead">
        Open a saved plan to print its pre-procedure worksheet: the plan, the predicted times, an emergency
        card in your clinic’s doses and a monitoring grid.
      </p>
      {load.state === 'loading' && <p aria-busy="true">Loading…</p>}
      {load.state === 'failed' && (
        <p className="form-error" role="alert">
          {load.error.message}
        </p>
      )}
      {load.state === 'ready' &&
        (load.value.length === 0 ? (
          <p>No saved plans yet. Save a plan from Anaesthetic plans first.</p>
        ) : (
          <ScrollRegion label="Saved plans">
            <table className="data-table">
              <thead>
                <tr>
                  <th scope="col">Planned for</th>
                  <th scope="col">Patient</th>
                  <th scope="col">Plan</th>
                  <th scope="col" className="number">
                    Weight
                  </th>
                  <th scope="col" className="number">
                    Predicted induction
                  </th>
                  <th scope="col" className="number">
                    Open checklist items
                  </th>
                </tr>
              </thead>
              <tbody>
                {load.value.map((plan) => (
                  <tr key={plan.id}>
                    <td>{displayDate(plan.plannedFor)}</td>
                    <td>
                      <a href={href('worksheets', plan.id)}>{plan.patientName ?? `Quick plan ${plan.id}`}</a>
                    </td>
                    <td>
                      {plan.label === '' ? '' : `${plan.label}: `}
                      {agentPhasesText(plan)}
                    </td>
                    <td className="number">{displayMass(plan.bodyMassG, settings.massUnit)}</td>
                    <td className="number">
                      {plan.inductionMin === null ? 'not reached' : `${figure(plan.inductionMin, 2)} min`}
                    </td>
                    <td className="number">{plan.openChecklistItems}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
        ))}
    </section>
  );
}
