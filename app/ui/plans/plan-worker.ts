// Runs the model off the main thread so that typing in the planning form stays smooth.
import { computePlan } from '../../core/model/compute-plan.js';
import type { PlanInput } from '../../core/model/plan-types.js';
import type { SpeciesReference } from '../../core/species-reference.js';

export type PlanRequest = {
  readonly id: number;
  readonly input: PlanInput;
  readonly species: readonly SpeciesReference[];
};

type WorkerScope = {
  onmessage: ((event: MessageEvent<PlanRequest>) => void) | null;
  postMessage(message: unknown): void;
};

const scope = self as unknown as WorkerScope;

scope.onmessage = (event) => {
  const { id, input, species } = event.data;
  const startedAt = performance.now();
  try {
    const result = computePlan(input, { species });
    scope.postMessage({ id, result, computeMs: performance.now() - startedAt });
  } catch (error) {
    scope.postMessage({ id, error: error instanceof Error ? error.message : String(error) });
  }
};
