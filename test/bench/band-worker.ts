// A Node worker for the model bench: runs a range of a plan's uncertainty samples, as the planning
// screen's Web Workers do (app/ui/plans/plan-worker.ts).
import { parentPort } from 'node:worker_threads';
import { planUncertaintyInput } from '../../app/core/model/compute-plan.js';
import type { PlanInput } from '../../app/core/model/plan-types.js';
import { runUncertaintySlice } from '../../app/core/model/uncertainty.js';
import { speciesReference } from '../../app/core/species-reference.js';

export type BandJob = { readonly input: PlanInput; readonly from: number; readonly to: number };

parentPort?.on('message', (job: BandJob) => {
  const slice = runUncertaintySlice(
    planUncertaintyInput(job.input, { species: speciesReference }),
    job.from,
    job.to,
  );
  const buffers = [slice.inductionMin, slice.recoveryMin, slice.brainPct, ...slice.milestoneMin].map(
    (array) => array.buffer as ArrayBuffer,
  );
  parentPort?.postMessage(slice, buffers);
});
