import type { PlanResult } from '../../contract/plan.js';

/** Printed under the cautions: the sheet is a planning aid and the veterinarian decides. */
export const deferralText =
  'Tidewing is a planning aid. Every figure on this sheet is an estimate from population equations and assumptions, with its basis shown; this bird can differ. ' +
  'The responsible licensed veterinarian decides on the anaesthetic, any drug and dose, and the monitoring, under local regulations. Watch the bird, not the plan.';

/** The model's cautions with their reasons, and who decides. */
export function CautionsSection({ result }: { readonly result: PlanResult }) {
  return (
    <section className="ws-section ws-cautions" aria-labelledby="ws-cautions">
      <h2 id="ws-cautions">Cautions</h2>
      {result.cautions.length === 0 ? (
        <p>The model raised no caution for this plan.</p>
      ) : (
        <ul>
          {result.cautions.map((caution) => (
            <li key={caution.code} className={`ws-caution ws-${caution.severity}`}>
              <strong>
                {caution.severity === 'danger'
                  ? 'DANGER'
                  : caution.severity === 'warning'
                    ? 'WARNING'
                    : 'NOTICE'}
                :
              </strong>{' '}
              {caution.message}
              <br />
              <span className="ws-basis">Why: {caution.reason}</span>
            </li>
          ))}
        </ul>
      )}
      <p className="ws-deferral">{deferralText}</p>
    </section>
  );
}
