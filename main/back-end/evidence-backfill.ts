import { performance } from 'node:perf_hooks';
import { setImmediate as nextTurn } from 'node:timers/promises';
import type { ChangeNoticeInput } from '../../app/contract/change-notices.js';
import type { EvidenceRows, PendingRow } from './evidence-handlers.js';
import type { HandlerTable } from './handlers.js';

/** How the clinic view's rows of older or stale records are computed: after start-up by itself, or only when asked. */
export type EvidenceBackfillMode = 'automatic' | 'manual';

export type EvidenceBackfill = {
  /**
   * Starts a pass over every completed record whose row is missing or stale (or, when a pass is
   * running, asks for another after it, so records that ended meanwhile are not missed). Does
   * nothing in 'manual' mode unless `force`.
   */
  start(force?: boolean): void;
  /** Runs a pass now (whatever the mode) and settles when no pass is running; answers the rows stored. */
  run(): Promise<number>;
  /** Settles when no pass is running. */
  idle(): Promise<void>;
  /** Ends the back-fill for good (the back end is closing): the slice running finishes, no other starts. */
  stop(): void;
};

/** Time the model may hold the event loop in one slice before the back-fill lets requests in (ms). */
const sliceMs = 12;
/** Computed rows are written together at most this often (each write is one committed transaction). */
const storeEveryMs = 500;
/** Rows written at most together. */
const storeEveryRows = 200;
/** While a pass runs, the open clinic view is told this often that more rows are ready (ms). */
const noticeEveryMs = 2000;
/** Pending records looked up in the stored cache together, before any is computed. */
const adoptTogether = 100;

/**
 * The back-fill of the clinic view's rows: records that ended before rows were kept when they
 * ended, and rows gone stale (a new model version, a species edit, another default agent), are
 * computed in the background, newest first, in slices of about `sliceMs` that yield to the event
 * loop between them, so requests (and every clinical write) are served meanwhile. Rows another
 * back end already stored under the same key are taken up, not computed again. Writes only the
 * evidence cache table. `publish` tells the open screens (kind 'evidence') as rows become ready
 * and when a pass ends; a failure is logged and ends the pass, never a request.
 */
export function createEvidenceBackfill(
  rows: EvidenceRows,
  options: {
    readonly mode: EvidenceBackfillMode;
    readonly publish: (notice: ChangeNoticeInput) => void;
    readonly log?: (message: string) => void;
  },
): EvidenceBackfill {
  let running: Promise<number> | null = null;
  let again = false;
  let stopped = false;

  async function pass(): Promise<number> {
    const state = await rows.clinicState();
    const pending: readonly PendingRow[] = await rows.pendingRows(state);
    let storedRows = 0;
    let unstored: { recordId: number; key: string; rowJson: string }[] = [];
    let lastStore = performance.now();
    let lastNotice = performance.now();
    let readySinceNotice = 0;
    const failed: string[] = [];
    const flush = async () => {
      if (unstored.length > 0) await rows.store(unstored);
      storedRows += unstored.length;
      readySinceNotice += unstored.length;
      unstored = [];
      lastStore = performance.now();
      if (readySinceNotice > 0 && performance.now() - lastNotice >= noticeEveryMs) {
        options.publish({ kind: 'evidence' });
        lastNotice = performance.now();
        readySinceNotice = 0;
      }
    };
    for (let start = 0; start < pending.length && !stopped; start += adoptTogether) {
      const chunk = pending.slice(start, start + adoptTogether);
      await nextTurn();
      const adopted = await rows.adopt(chunk);
      readySinceNotice += adopted.size;
      let sliceStart = performance.now();
      for (const target of chunk) {
        if (stopped) break;
        if (adopted.has(target.recordId)) continue;
        let computed: Awaited<ReturnType<EvidenceRows['compute']>> = null;
        try {
          computed = await rows.compute(target, state);
        } catch (error) {
          // One record that cannot be read now stays pending; the others go on.
          if (stopped) break;
          failed.push(`${target.recordId} (${error instanceof Error ? error.message : String(error)})`);
        }
        if (computed !== null) unstored.push(computed);
        if (unstored.length >= storeEveryRows || performance.now() - lastStore >= storeEveryMs) await flush();
        if (performance.now() - sliceStart >= sliceMs) {
          // Let requests in: a clinical write waits at most one slice for the model.
          await nextTurn();
          sliceStart = performance.now();
        }
      }
    }
    await flush();
    if (readySinceNotice > 0 || storedRows > 0) options.publish({ kind: 'evidence' });
    if (failed.length > 0)
      options.log?.(
        `The clinic view could not compare ${String(failed.length)} ${failed.length === 1 ? 'record' : 'records'} with the model; they stay counted as still being compared: record ${failed.slice(0, 5).join(', ')}${failed.length > 5 ? ', …' : ''}.`,
      );
    return storedRows;
  }

  async function passes(): Promise<number> {
    let total = 0;
    do {
      again = false;
      try {
        total += await pass();
      } catch (error) {
        if (!stopped)
          options.log?.(
            `The clinic view's rows could not all be compared with the model in the background (${error instanceof Error ? error.message : String(error)}); the view lists those ready and tries again when next opened.`,
          );
        break;
      }
    } while (again && !stopped);
    return total;
  }

  function begin(): Promise<number> {
    if (running !== null) {
      again = true;
      return running;
    }
    const started = passes().finally(() => {
      running = null;
    });
    running = started;
    return started;
  }

  return {
    start(force = false) {
      if (stopped || (options.mode === 'manual' && !force)) return;
      void begin();
    },
    async run() {
      if (stopped) return 0;
      return begin();
    },
    async idle() {
      while (running !== null) await running;
    },
    stop() {
      stopped = true;
    },
  };
}

/** The channels after whose success a record's row may have to be computed, and which records. */
type Kept =
  { readonly recordIds: readonly number[] } | { readonly patientId: number } | 'every record' | null;

/**
 * The handler table with the clinic view's rows kept up to date by the writes: when a record
 * ends (or an ended record's details or log are corrected) its row is computed and stored before
 * the answer, so the view never computes it when opened; a write that changes a bird's rows
 * (weight, details) or every row (species, default agent) starts the back-fill for them. The
 * clinical write is committed first and its answer never depends on this: a failure is logged.
 */
export function keepingEvidenceRows(
  handlers: HandlerTable,
  rows: EvidenceRows,
  backfill: EvidenceBackfill,
  log: (message: string) => void = () => undefined,
): HandlerTable {
  const after = <C extends keyof HandlerTable>(
    channel: C,
    kept: (answer: Awaited<ReturnType<HandlerTable[C]>>) => Kept,
  ): Pick<HandlerTable, C> => {
    const handler = handlers[channel] as (request: unknown) => unknown;
    const wrapped = async (request: unknown) => {
      const answer = (await handler(request)) as Awaited<ReturnType<HandlerTable[C]>>;
      const which = kept(answer);
      if (which === 'every record' || (which !== null && 'patientId' in which)) backfill.start();
      else if (which !== null)
        await rows.keep({ recordIds: which.recordIds }).catch((error: unknown) => {
          log(
            `The clinic view's row of record ${which.recordIds.join(', ')} was not computed now (${error instanceof Error ? error.message : String(error)}); it is computed in the background.`,
          );
          backfill.start();
        });
      return answer;
    };
    return { [channel]: wrapped } as unknown as Pick<HandlerTable, C>;
  };
  return {
    ...handlers,
    // A record's own writes: computed at once (only when the record has ended; `keep` checks).
    ...after('procedures:create', (record) =>
      record.values.endedAt === null ? null : { recordIds: [record.id] },
    ),
    ...after('procedures:correct', (record) =>
      record.values.endedAt === null ? null : { recordIds: [record.id] },
    ),
    ...after('entries:add', (entry) => ({ recordIds: [entry.recordId] })),
    ...after('entries:correct', (entry) => ({ recordIds: [entry.recordId] })),
    ...after('entries:void', (entry) => ({ recordIds: [entry.recordId] })),
    // A bird's weights and details: its ended records, in the background.
    ...after('weights:add', (weight) => ({ patientId: weight.patientId })),
    ...after('weights:correct', (weight) => ({ patientId: weight.patientId })),
    ...after('weights:void', (weight) => ({ patientId: weight.patientId })),
    ...after('patients:correct', (patient) => ({ patientId: patient.id })),
    // The species table and the default agent: every row.
    ...after('species:add', () => 'every record'),
    ...after('species:correct', () => 'every record'),
    ...after('settings:save', () => 'every record'),
    // The demo clinic's 60 records, written straight into the tables: compared in the background.
    ...after('demo-clinic:create', () => 'every record'),
  };
}
