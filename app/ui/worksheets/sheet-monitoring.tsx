import type { PlanInput, PlanResult } from '../../contract/plan.js';
import type { ClinicSettings } from '../../contract/settings.js';
import { monitoringColumns, monitoringRows, plannedEndMin } from '../../core/worksheet.js';
import { displayMass } from '../common/display.js';
import { figure } from './labels.js';
import { etco2RangeText, temperatureRangeText } from './sheet-text.js';

/** The blank monitoring grid, a row every 5 min with the planned dial setting, and the targets to watch. */
export function MonitoringSection({
  input,
  result,
  settings,
  patientName,
  recoveryWindowMin,
}: {
  readonly input: PlanInput;
  readonly result: PlanResult;
  readonly settings: ClinicSettings;
  readonly patientName: string;
  readonly recoveryWindowMin: number;
}) {
  const endMin = plannedEndMin(
    result.milestones.vaporiserOffMin,
    recoveryWindowMin,
    result.oxygen.durationMin,
  );
  const rows = monitoringRows(input.schedule, endMin);
  const columns = monitoringColumns(settings.temperatureUnit, settings.pressureUnit);
  return (
    <section className="ws-section ws-monitoring ws-break-before" aria-labelledby="ws-monitoring">
      <h2 id="ws-monitoring">
        Monitoring record · {patientName} · {displayMass(input.bodyMassG, settings.massUnit)}
      </h2>
      <p className="ws-small">
        A row every 5 min from 0 to {figure(endMin)} min. Targets to watch: EtCO2 {etco2RangeText(settings)},
        cloacal temperature {temperatureRangeText(settings)}; apnoea of 10-15 s calls for action. Pulse
        oximetry and indirect blood pressure are unreliable in birds.
      </p>
      <table className="ws-monitoring-grid">
        <thead>
          <tr>
            {columns.map((column) => (
              <th scope="col" key={column}>
                {column}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => (
            <tr key={row.timeMin}>
              <th scope="row">{row.timeMin}</th>
              <td className="ws-planned">{figure(row.plannedVaporPct)}</td>
              {columns.slice(2).map((column) => (
                <td key={column} />
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
