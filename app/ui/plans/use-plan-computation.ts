import { useEffect, useMemo, useRef, useState } from 'react';
import type { PlanInput } from '../../contract/plan.js';
import { computePlan, planUncertaintyInput } from '../../core/model/compute-plan.js';
import type { PlanResult } from '../../core/model/plan-types.js';
import { mergeUncertainty, type UncertaintySlice } from '../../core/model/uncertainty.js';
import type { SpeciesReference } from '../../core/species-reference.js';
import { BandPool, poolSize, type BandProgress, type SliceWorker } from './band-pool.js';
import { draftToInput, type DraftProblems, type PlanDraft } from './plan-draft.js';

/** Uncertainty samples for the full answer (the quick answer while typing has none). */
export const fullUncertaintySamples = 200;

/** Quiet time after the last change before the slower full run (with uncertainty) starts, ms. */
export const fullRunDelayMs = 250;

export type Computation = {
  readonly problems: DraftProblems;
  /** The plan input of the full run (with uncertainty), as it would be saved. */
  readonly input: PlanInput | null;
  readonly result: PlanResult | null;
  /** True while the shown result still lacks the uncertainty run for the current inputs. */
  readonly pending: boolean;
  readonly failure: string | null;
  /** Slices of the band's samples done so far while the band for the current inputs is computing. */
  readonly band: BandProgress | null;
};

type FullAnswer = { result: PlanResult | null; key: string; failure: string | null };

/** The whole plan from the pool's slices: the same result as `computePlan` alone (tested in core). */
function planFromSlices(
  input: PlanInput,
  species: readonly SpeciesReference[],
  slices: readonly UncertaintySlice[],
): PlanResult {
  const sampled = mergeUncertainty(planUncertaintyInput(input, { species }), slices);
  return computePlan(input, { species }, { sampled });
}

function newBandWorker(): SliceWorker {
  // Written out here so that Vite finds and bundles the worker.
  return new Worker(new URL('./plan-worker.ts', import.meta.url), {
    type: 'module',
  }) as unknown as SliceWorker;
}

function quickRun(
  input: PlanInput,
  species: readonly SpeciesReference[],
): { result: PlanResult } | { failure: string } {
  try {
    return { result: computePlan(input, { species }) };
  } catch (error) {
    return { failure: error instanceof Error ? error.message : String(error) };
  }
}

/**
 * Recomputes the plan whenever the draft changes. The quick run without uncertainty samples
 * (a few milliseconds, breath-resolved) runs during the render so the curves redraw with the
 * keystroke; once typing pauses, a pool of Web Workers (band-pool.ts) runs the uncertainty
 * samples in slices and the band joins the point estimate when they are all in. A change to the
 * form cancels a run still going.
 */
export function usePlanComputation(
  draft: PlanDraft,
  species: readonly SpeciesReference[],
  enabled = true,
): Computation {
  const pool = useRef<BandPool | null>(null);
  const [full, setFull] = useState<FullAnswer>({ result: null, key: '', failure: null });
  const [progress, setProgress] = useState<{ key: string; band: BandProgress } | null>(null);
  const quickInput = useMemo(() => draftToInput(draft, 0), [draft]);
  const fullInput = useMemo(() => draftToInput(draft, fullUncertaintySamples), [draft]);
  const fullKey = useMemo(() => ('input' in fullInput ? JSON.stringify(fullInput.input) : ''), [fullInput]);
  const quick = useMemo(
    () => (enabled && 'input' in quickInput ? quickRun(quickInput.input, species) : null),
    [enabled, quickInput, species],
  );

  useEffect(
    () => () => {
      pool.current?.close();
      pool.current = null;
    },
    [],
  );

  useEffect(() => {
    if (!enabled || !('input' in fullInput)) return undefined;
    const input = fullInput.input;
    const key = fullKey;
    const timer = window.setTimeout(() => {
      pool.current ??= new BandPool(poolSize(navigator.hardwareConcurrency), newBandWorker);
      setProgress({ key, band: { done: 0, total: 0 } });
      pool.current.run(input, species, {
        onProgress: (band) => setProgress({ key, band }),
        onDone: (slices) => {
          try {
            setFull({ result: planFromSlices(input, species, slices), key, failure: null });
          } catch (error) {
            setFull({ result: null, key, failure: error instanceof Error ? error.message : String(error) });
          }
        },
        onFailure: (message) => setFull({ result: null, key, failure: message }),
      });
    }, fullRunDelayMs);
    return () => {
      window.clearTimeout(timer);
      // The form changed: the run for the old inputs stops here.
      pool.current?.cancel();
    };
  }, [fullInput, fullKey, species, enabled]);

  const problems = 'problems' in quickInput ? quickInput.problems : {};
  const input = 'input' in fullInput ? fullInput.input : null;
  const fullIsCurrent = input !== null && full.key === fullKey;
  const quickResult = quick !== null && 'result' in quick ? quick.result : null;
  // While the form has an error, the last full result stays on view, marked as pending.
  const result = fullIsCurrent && full.result !== null ? full.result : (quickResult ?? full.result);
  const failure = quick !== null && 'failure' in quick ? quick.failure : fullIsCurrent ? full.failure : null;
  const pending = input === null || !fullIsCurrent;
  const band =
    pending && input !== null ? (progress?.key === fullKey ? progress.band : { done: 0, total: 0 }) : null;
  return { problems, input, result, pending, failure, band };
}
