/**
 * One fresh process timing the breath-resolved 2-h plan (printed as JSON), for the model bench.
 * The JavaScript engine's optimisation of the long simulation loop can differ from process to
 * process, so the bench runs several of these and reports their spread.
 */
import type { PlanInput } from '../../app/core/model/plan-types.js';
import { simulate } from '../../app/core/model/simulation.js';
import { setupFor, twoHourBudgerigarPlan } from '../core/model/plan-fixtures.js';
import { median } from './figures.js';

const plan: PlanInput = { ...twoHourBudgerigarPlan, uncertainty: undefined };
const setup = setupFor(plan);
let breaths = 0;
for (let warm = 0; warm < 30; warm += 1) breaths = simulate(setup).breaths;
const times: number[] = [];
for (let run = 0; run < 200; run += 1) {
  const start = performance.now();
  breaths = simulate(setup).breaths;
  times.push(performance.now() - start);
}
process.stdout.write(`${JSON.stringify({ medianMs: median(times), breaths })}\n`);
