import { useEffect, useMemo, useRef, useState } from 'react';
import type { PlanInput } from '../../contract/plan.js';
import { computePlan } from '../../core/model/compute-plan.js';
import type { PlanResult } from '../../core/model/plan-types.js';
import type { SpeciesReference } from '../../core/species-reference.js';
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
};

type Answer = { id: number; result?: PlanResult; error?: string };
type FullAnswer = { result: PlanResult | null; key: string; failure: string | null };

let nextId = 1;

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
 * keystroke; the full run with the uncertainty samples runs in a Web Worker once typing pauses,
 * so typing never waits for it.
 */
export function usePlanComputation(
  draft: PlanDraft,
  species: readonly SpeciesReference[],
  enabled = true,
): Computation {
  const worker = useRef<Worker | null>(null);
  const newestFull = useRef(0);
  const requestKeys = useRef(new Map<number, string>());
  const [full, setFull] = useState<FullAnswer>({ result: null, key: '', failure: null });
  const quickInput = useMemo(() => draftToInput(draft, 0), [draft]);
  const fullInput = useMemo(() => draftToInput(draft, fullUncertaintySamples), [draft]);
  const fullKey = useMemo(() => ('input' in fullInput ? JSON.stringify(fullInput.input) : ''), [fullInput]);
  const quick = useMemo(
    () => (enabled && 'input' in quickInput ? quickRun(quickInput.input, species) : null),
    [enabled, quickInput, species],
  );

  useEffect(() => {
    const created = new Worker(new URL('./plan-worker.ts', import.meta.url), { type: 'module' });
    worker.current = created;
    created.onmessage = (event: MessageEvent<Answer>) => {
      const answer = event.data;
      const key = requestKeys.current.get(answer.id);
      requestKeys.current.delete(answer.id);
      if (key === undefined || answer.id !== newestFull.current) return;
      setFull({ result: answer.result ?? null, key, failure: answer.error ?? null });
    };
    return () => {
      created.terminate();
      worker.current = null;
    };
  }, []);

  useEffect(() => {
    const target = worker.current;
    if (!enabled || target === null || !('input' in fullInput)) return undefined;
    const timer = window.setTimeout(() => {
      const id = nextId++;
      newestFull.current = id;
      requestKeys.current.set(id, fullKey);
      target.postMessage({ id, input: fullInput.input, species });
    }, fullRunDelayMs);
    return () => window.clearTimeout(timer);
  }, [fullInput, fullKey, species, enabled]);

  const problems = 'problems' in quickInput ? quickInput.problems : {};
  const input = 'input' in fullInput ? fullInput.input : null;
  const fullIsCurrent = input !== null && full.key === fullKey;
  const quickResult = quick !== null && 'result' in quick ? quick.result : null;
  // While the form has an error, the last full result stays on view, marked as pending.
  const result = fullIsCurrent && full.result !== null ? full.result : (quickResult ?? full.result);
  const failure = quick !== null && 'failure' in quick ? quick.failure : fullIsCurrent ? full.failure : null;
  return { problems, input, result, pending: input === null || !fullIsCurrent, failure };
}
