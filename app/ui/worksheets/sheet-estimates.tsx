import type { PlanResult } from '../../contract/plan.js';
import { plainBasis } from '../common/display.js';
import { estimateRows, figure } from './labels.js';

/** The allometric estimates for this bird, each with its basis. */
export function EstimatesSection({ result }: { readonly result: PlanResult }) {
  return (
    <section className="ws-section" aria-labelledby="ws-estimates">
      <h2 id="ws-estimates">Estimates for this bird</h2>
      <table className="ws-grid-table ws-estimates">
        <thead>
          <tr>
            <th scope="col">Quantity</th>
            <th scope="col" className="number">
              Value
            </th>
            <th scope="col">Basis</th>
          </tr>
        </thead>
        <tbody>
          {estimateRows.map((row) => {
            const estimate = result.estimates[row.key];
            return (
              <tr key={row.key}>
                <th scope="row">{row.label}</th>
                <td className="number">
                  {figure(estimate.value)} {row.unit}
                </td>
                <td className="ws-basis">{plainBasis(estimate.basis)}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </section>
  );
}
