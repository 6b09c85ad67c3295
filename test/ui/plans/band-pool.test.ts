import { describe, expect, it } from 'vitest';
import { computePlan, planUncertaintyInput } from '../../../app/core/model/compute-plan.js';
import type { PlanInput } from '../../../app/core/model/plan-types.js';
import { mergeUncertainty, runUncertaintySlice } from '../../../app/core/model/uncertainty.js';
import { speciesReference } from '../../../app/core/species-reference.js';
import {
  BandPool,
  poolSize,
  splitSamples,
  type BandProgress,
  type SliceAnswer,
  type SliceRequest,
  type SliceWorker,
} from '../../../app/ui/plans/band-pool.js';
import { twoHourBudgerigarPlan } from '../../core/model/plan-fixtures.js';

/** A worker that keeps what it was asked and answers only when the test says so. */
class FakeWorker implements SliceWorker {
  onmessage: ((event: { data: SliceAnswer }) => void) | null = null;
  onerror: ((event: { message?: string }) => void) | null = null;
  readonly requests: SliceRequest[] = [];
  terminated = false;
  postMessage(request: SliceRequest): void {
    this.requests.push(request);
  }
  terminate(): void {
    this.terminated = true;
  }
  /** Runs the last request with the real core, as plan-worker.ts does, and answers it. */
  answer(): void {
    const request = this.requests.at(-1);
    if (request === undefined || this.terminated) throw new Error('nothing to answer');
    const input = planUncertaintyInput(request.input, { species: request.species });
    this.onmessage?.({
      data: { id: request.id, slice: runUncertaintySlice(input, request.from, request.to) },
    });
  }
}

function fakePool(size: number): { pool: BandPool; workers: FakeWorker[] } {
  const workers: FakeWorker[] = [];
  const pool = new BandPool(size, () => {
    const worker = new FakeWorker();
    workers.push(worker);
    return worker;
  });
  return { pool, workers };
}

type Outcome = { progress: BandProgress[]; done: PlanResult | null; failures: string[] };
type PlanResult = ReturnType<typeof computePlan>;

function handlersFor(input: PlanInput, outcome: Outcome) {
  return {
    onProgress: (progress: BandProgress) => outcome.progress.push(progress),
    onDone: (slices: Parameters<typeof mergeUncertainty>[1]) => {
      const sampled = mergeUncertainty(planUncertaintyInput(input, tables), slices);
      outcome.done = computePlan(input, tables, { sampled });
    },
    onFailure: (message: string) => outcome.failures.push(message),
  };
}

const tables = { species: speciesReference };
const planA: PlanInput = {
  ...twoHourBudgerigarPlan,
  speciesId: 'budgerigar',
  uncertainty: { samples: 12, seed: 1 },
};
const planB: PlanInput = { ...planA, bodyMassG: planA.bodyMassG * 1.5 };

describe('pool size and sample ranges', () => {
  it('uses the reported processors, at least 1 and at most 4', () => {
    expect(poolSize(undefined)).toBe(1);
    expect(poolSize(0)).toBe(1);
    expect(poolSize(2)).toBe(2);
    expect(poolSize(16)).toBe(4);
  });
  it('splits the samples into contiguous, even, non-empty ranges covering all of them', () => {
    expect(splitSamples(200, 4)).toEqual([
      [0, 50],
      [50, 100],
      [100, 150],
      [150, 200],
    ]);
    expect(splitSamples(10, 3)).toEqual([
      [0, 3],
      [3, 6],
      [6, 10],
    ]);
    expect(splitSamples(2, 4)).toEqual([
      [0, 1],
      [1, 2],
    ]);
    expect(splitSamples(0, 4)).toEqual([]);
  });
});

describe('band pool', () => {
  it('runs a plan over the workers and gives the same plan as computePlan alone, with progress per part', () => {
    const { pool, workers } = fakePool(3);
    const outcome: Outcome = { progress: [], done: null, failures: [] };
    pool.run(planA, speciesReference, handlersFor(planA, outcome));
    expect(workers).toHaveLength(3);
    expect(workers.map((worker) => [worker.requests[0]?.from, worker.requests[0]?.to])).toEqual([
      [0, 4],
      [4, 8],
      [8, 12],
    ]);
    // Answers in any order.
    workers[2]?.answer();
    workers[0]?.answer();
    expect(outcome.done).toBeNull();
    workers[1]?.answer();
    expect(outcome.progress).toEqual([
      { done: 1, total: 3 },
      { done: 2, total: 3 },
      { done: 3, total: 3 },
    ]);
    expect(outcome.done).toEqual(computePlan(planA, tables));
    expect(outcome.failures).toEqual([]);
  });

  it('cancels a stale run when the form changes: its busy workers are replaced and its late answers dropped', () => {
    const { pool, workers } = fakePool(2);
    const stale: Outcome = { progress: [], done: null, failures: [] };
    pool.run(planA, speciesReference, handlersFor(planA, stale));
    const [first, second] = workers;
    first?.answer();
    // The form changes while the second worker is still busy with plan A.
    const current: Outcome = { progress: [], done: null, failures: [] };
    pool.run(planB, speciesReference, handlersFor(planB, current));
    expect(second?.terminated).toBe(true);
    expect(first?.terminated).toBe(false);
    expect(pool.workersMade).toBe(3);
    // The idle worker is reused, the replacement takes the other part.
    expect(first?.requests.at(-1)?.input).toBe(planB);
    const replacement = workers[2];
    expect(replacement?.requests.at(-1)?.input).toBe(planB);
    // A late answer for plan A (sent before the worker stopped) changes nothing.
    const lateInput = planUncertaintyInput(planA, tables);
    const staleRequest = second?.requests[0];
    if (staleRequest === undefined) throw new Error('plan A was sent to the second worker');
    second?.onmessage?.({
      data: {
        id: staleRequest.id,
        slice: runUncertaintySlice(lateInput, staleRequest.from, staleRequest.to),
      },
    });
    expect(stale.done).toBeNull();
    expect(stale.progress).toEqual([{ done: 1, total: 2 }]);
    expect(current.progress).toEqual([]);
    first?.answer();
    replacement?.answer();
    expect(current.done).toEqual(computePlan(planB, tables));
    expect(stale.done).toBeNull();
  });

  it('cancels on request without starting another run, and reports a failing worker once', () => {
    const { pool, workers } = fakePool(2);
    const cancelled: Outcome = { progress: [], done: null, failures: [] };
    pool.run(planA, speciesReference, handlersFor(planA, cancelled));
    pool.cancel();
    expect(workers.slice(0, 2).every((worker) => worker.terminated)).toBe(true);
    expect(cancelled.done).toBeNull();

    const failing: Outcome = { progress: [], done: null, failures: [] };
    pool.run(planA, speciesReference, handlersFor(planA, failing));
    const id = workers[2]?.requests[0]?.id ?? -1;
    workers[2]?.onmessage?.({ data: { id, error: 'out of memory' } });
    workers[3]?.onmessage?.({ data: { id, error: 'out of memory' } });
    expect(failing.failures).toEqual(['out of memory']);
    expect(failing.done).toBeNull();
    pool.close();
    expect(workers.every((worker) => worker.terminated)).toBe(true);
  });

  it('finishes at once when the plan asks for no samples', () => {
    const { pool, workers } = fakePool(4);
    const outcome: Outcome = { progress: [], done: null, failures: [] };
    const none: PlanInput = { ...planA, uncertainty: { samples: 0, seed: 1 } };
    pool.run(none, speciesReference, handlersFor(none, outcome));
    expect(workers).toHaveLength(0);
    expect(outcome.done).toEqual(computePlan(none, tables));
  });
});
