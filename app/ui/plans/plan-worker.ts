// One worker of the band pool (band-pool.ts): runs a range of a plan's uncertainty samples off the
// main thread, so that typing in the planning form stays smooth.
import { planUncertaintyInput } from '../../core/model/compute-plan.js';
import { runUncertaintySlice } from '../../core/model/uncertainty.js';
import type { SliceAnswer, SliceRequest } from './band-pool.js';

type WorkerScope = {
  onmessage: ((event: MessageEvent<SliceRequest>) => void) | null;
  postMessage(message: SliceAnswer, transfer: Transferable[]): void;
};

const scope = self as unknown as WorkerScope;

scope.onmessage = (event) => {
  const { id, input, species, from, to } = event.data;
  try {
    const slice = runUncertaintySlice(planUncertaintyInput(input, { species }), from, to);
    // The arrays move to the page without a copy.
    const buffers = [slice.inductionMin, slice.recoveryMin, slice.brainPct, ...slice.milestoneMin].map(
      (array) => array.buffer,
    );
    scope.postMessage({ id, slice }, buffers);
  } catch (error) {
    scope.postMessage({ id, error: error instanceof Error ? error.message : String(error) }, []);
  }
};
