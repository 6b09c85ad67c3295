import { useEffect, useMemo, useRef, useState } from 'react';
import type { PlanInput } from '../../contract/plan.js';
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
  /** True while the shown result is older than the form or still lacks its uncertainty run. */
  readonly pending: boolean;
  readonly failure: string | null;
  readonly computeMs: number | null;
};

type Answer = { id: number; result?: PlanResult; error?: string; computeMs?: number };
type Shown = { result: PlanResult | null; key: string; full: boolean; failure: string | null; computeMs: number | null };

let nextId = 1;

function planWorker(): Worker {
  return new Worker(new URL('./plan-worker.ts', import.meta.url), { type: 'module' });
}

/**
 * Recomputes the plan whenever the draft changes. A quick run without uncertainty samples redraws
 * the curves at once; the full run with them follows once typing pauses. The two run in separate
 * workers so a keystroke never waits behind a full run. The newest answer wins.
 */
export function usePlanComputation(draft: PlanDraft, species: readonly SpeciesReference[], enabled = true): Computation {
  const workers = useRef<{ quick: Worker; full: Worker } | null>(null);
  const requests = useRef(new Map<number, { key: string; full: boolean }>());
  const newest = useRef({ quick: 0, full: 0 });
  const [shown, setShown] = useState<Shown>({ result: null, key: '', full: false, failure: null, computeMs: null });
  const quick = useMemo(() => draftToInput(draft, 0), [draft]);
  const full = useMemo(() => draftToInput(draft, fullUncertaintySamples), [draft]);
  const fullKey = useMemo(() => ('input' in full ? JSON.stringify(full.input) : ''), [full]);

  useEffect(() => {
    const created = { quick: planWorker(), full: planWorker() };
    workers.current = created;
    const onAnswer = (event: MessageEvent<Answer>) => {
      const answer = event.data;
      const request = requests.current.get(answer.id);
      requests.current.delete(answer.id);
      if (request === undefined) return;
      const { quick: quickId, full: fullId } = newest.current;
      if (answer.id !== quickId && answer.id !== fullId) return;
      setShown((current) => {
        // A quick answer never replaces the full answer for the same inputs.
        if (!request.full && current.full && current.key === request.key) return current;
        return { result: answer.result ?? current.result, key: request.key, full: request.full, failure: answer.error ?? null, computeMs: answer.computeMs ?? null };
      });
    };
    created.quick.onmessage = onAnswer;
    created.full.onmessage = onAnswer;
    return () => {
      created.quick.terminate();
      created.full.terminate();
      workers.current = null;
    };
  }, []);

  useEffect(() => {
    const target = workers.current;
    if (!enabled || target === null || !('input' in quick) || !('input' in full)) return undefined;
    const quickId = nextId++;
    const fullId = nextId++;
    newest.current = { quick: quickId, full: fullId };
    requests.current.set(quickId, { key: fullKey, full: false });
    requests.current.set(fullId, { key: fullKey, full: true });
    target.quick.postMessage({ id: quickId, input: quick.input, species });
    const timer = window.setTimeout(() => target.full.postMessage({ id: fullId, input: full.input, species }), fullRunDelayMs);
    return () => window.clearTimeout(timer);
  }, [quick, full, fullKey, species, enabled]);

  const problems = 'problems' in quick ? quick.problems : {};
  const input = 'input' in full ? full.input : null;
  const pending = input !== null && (shown.key !== fullKey || !shown.full);
  return { problems, input, result: shown.result, pending, failure: shown.failure, computeMs: shown.computeMs };
}
