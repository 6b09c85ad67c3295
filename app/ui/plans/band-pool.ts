// A pool of workers that runs a plan's uncertainty samples in slices, so the band arrives in a
// fraction of one thread's time; the point estimate is drawn before, without it.
import type { PlanInput } from '../../core/model/plan-types.js';
import type { UncertaintySlice } from '../../core/model/uncertainty.js';
import type { SpeciesReference } from '../../core/species-reference.js';

/** Largest pool: beyond four workers a clinic PC gains little and the screen loses its own core. */
export const maxPoolSize = 4;

/**
 * Workers in the pool, from the processor count the browser reports: at least 1, at most 4.
 * @param hardwareConcurrency `navigator.hardwareConcurrency` (undefined or 0 when unknown)
 */
export function poolSize(hardwareConcurrency: number | undefined): number {
  const reported = Math.floor(hardwareConcurrency ?? 1);
  return Math.max(1, Math.min(maxPoolSize, Number.isFinite(reported) ? reported : 1));
}

/**
 * Contiguous sample ranges [from, to), one per part, as even as whole samples allow; no empty
 * range (fewer parts than asked when there are fewer samples).
 * @param samples sample count, 0 or more
 * @param parts how many parts at most, 1 or more
 */
export function splitSamples(samples: number, parts: number): [number, number][] {
  const count = Math.max(1, Math.min(parts, samples));
  const ranges: [number, number][] = [];
  for (let part = 0; part < count; part += 1) {
    const from = Math.floor((samples * part) / count);
    const to = Math.floor((samples * (part + 1)) / count);
    if (to > from) ranges.push([from, to]);
  }
  return ranges;
}

/** What the page asks a worker (plan-worker.ts). */
export type SliceRequest = {
  readonly id: number;
  readonly input: PlanInput;
  readonly species: readonly SpeciesReference[];
  readonly from: number;
  readonly to: number;
};

/** What a worker answers. */
export type SliceAnswer =
  { readonly id: number; readonly slice: UncertaintySlice } | { readonly id: number; readonly error: string };

/** The part of a Worker the pool uses (a fake in the tests). */
export type SliceWorker = {
  onmessage: ((event: { data: SliceAnswer }) => void) | null;
  onerror: ((event: { message?: string }) => void) | null;
  postMessage(request: SliceRequest): void;
  terminate(): void;
};

export type BandProgress = { readonly done: number; readonly total: number };

export type BandRunHandlers = {
  /** Each slice that arrives for the current run. */
  readonly onProgress: (progress: BandProgress) => void;
  /** All slices of the current run, in sample order. */
  readonly onDone: (slices: UncertaintySlice[]) => void;
  readonly onFailure: (message: string) => void;
};

type Member = { worker: SliceWorker; busyWith: number | null };

type Run = {
  readonly id: number;
  readonly ranges: readonly [number, number][];
  readonly slices: (UncertaintySlice | null)[];
  readonly handlers: BandRunHandlers;
  done: number;
};

/**
 * Runs the uncertainty samples of one plan at a time over a pool of workers. Starting a run
 * cancels the one before: workers still busy with it are stopped and replaced (a running slice
 * cannot be interrupted otherwise), and its late answers are dropped, so a stale band never shows.
 */
export class BandPool {
  private readonly members: Member[] = [];
  private current: Run | null = null;
  private nextId = 1;

  /**
   * @param size workers in the pool (see `poolSize`)
   * @param createWorker makes one worker running plan-worker.ts
   */
  constructor(
    private readonly size: number,
    private readonly createWorker: () => SliceWorker,
  ) {}

  /** Workers made so far (replaced ones included): for the tests. */
  workersMade = 0;

  /**
   * Starts the uncertainty run of `input` (its sample count and seed), cancelling any run still
   * going. Returns the run's id.
   */
  run(input: PlanInput, species: readonly SpeciesReference[], handlers: BandRunHandlers): number {
    this.cancel();
    const id = this.nextId++;
    const samples = input.uncertainty?.samples ?? 0;
    const ranges = splitSamples(samples, this.size);
    const run: Run = { id, ranges, slices: ranges.map(() => null), handlers, done: 0 };
    this.current = run;
    if (ranges.length === 0) {
      handlers.onDone([]);
      this.current = null;
      return id;
    }
    ranges.forEach(([from, to], part) => {
      const member = this.member(part);
      member.busyWith = id;
      member.worker.postMessage({ id, input, species, from, to });
    });
    return id;
  }

  /** Stops the current run, if any: its busy workers are replaced and its answers ignored. */
  cancel(): void {
    const stale = this.current;
    if (stale === null) return;
    this.current = null;
    this.members.forEach((member, index) => {
      if (member.busyWith !== stale.id) return;
      member.worker.terminate();
      this.members[index] = this.spawn();
    });
  }

  /** Stops every worker (the screen is closing). */
  close(): void {
    this.current = null;
    for (const member of this.members.splice(0)) member.worker.terminate();
  }

  private member(index: number): Member {
    const existing = this.members[index];
    if (existing !== undefined) return existing;
    const made = this.spawn();
    this.members[index] = made;
    return made;
  }

  private spawn(): Member {
    const member: Member = { worker: this.createWorker(), busyWith: null };
    this.workersMade += 1;
    member.worker.onmessage = (event) => this.answer(member, event.data);
    member.worker.onerror = (event) => {
      const run = this.current;
      if (run === null || member.busyWith !== run.id) return;
      member.busyWith = null;
      this.fail(run, event.message ?? 'the band worker stopped');
    };
    return member;
  }

  private answer(member: Member, answer: SliceAnswer): void {
    if (member.busyWith === answer.id) member.busyWith = null;
    const run = this.current;
    if (run === null || answer.id !== run.id) return;
    if ('error' in answer) {
      this.fail(run, answer.error);
      return;
    }
    const part = run.ranges.findIndex(
      ([from, to], index) =>
        run.slices[index] === null && from === answer.slice.from && to === answer.slice.to,
    );
    if (part < 0) return;
    run.slices[part] = answer.slice;
    run.done += 1;
    run.handlers.onProgress({ done: run.done, total: run.slices.length });
    if (run.done === run.slices.length) {
      this.current = null;
      run.handlers.onDone(run.slices as UncertaintySlice[]);
    }
  }

  private fail(run: Run, message: string): void {
    this.cancel();
    run.handlers.onFailure(message);
  }
}
