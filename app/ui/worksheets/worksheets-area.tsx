import type { Route } from '../shell/areas.js';
import { RecentPlans } from './recent-plans.js';
import { Worksheet } from './worksheet.js';

/** `#/worksheets` lists saved plans; `#/worksheets/<planId>` is the printable worksheet. */
export function WorksheetsArea({ route }: { readonly route: Route }) {
  const [first] = route.segments;
  const planId = first === undefined ? null : Number(first);
  if (planId === null) return <RecentPlans />;
  if (!Number.isInteger(planId) || planId <= 0) {
    return (
      <section className="screen">
        <h1>Worksheet</h1>
        <p className="form-error" role="alert">
          “{first}” is not a plan number. Choose a plan from the list of worksheets.
        </p>
      </section>
    );
  }
  return <Worksheet planId={planId} />;
}
