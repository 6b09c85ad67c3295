import type { PlanInput } from '../../contract/plan.js';
import type { ProcedureEntryValues } from '../../contract/records.js';
import { minutesFromStart } from './monitoring.js';

export type PlanBesideLog = {
  readonly minutes: number[];
  readonly plannedDialPct: (number | null)[];
  readonly predictedBrainMac: (number | null)[];
  readonly loggedDialPct: (number | null)[];
};

/** The dial setting a schedule asks for at a minute (steps hold until the next one). */
export function plannedDialAt(schedule: PlanInput['schedule'], minute: number): number {
  let dial = 0;
  for (const step of schedule) if (step.atMin <= minute) dial = step.vaporPct;
  return dial;
}

/**
 * The linked plan's schedule and predicted brain level (as a multiple of MAC) on the plan's own
 * time grid, with each logged dial setting placed at its minute since the start of the record.
 */
export function planBesideLog(
  plan: {
    readonly input: PlanInput;
    readonly timeline: { readonly timeMin: readonly number[]; readonly brainPct: readonly number[] };
    readonly macPct: number;
  },
  startedAt: string,
  entries: readonly { readonly values: ProcedureEntryValues }[],
): PlanBesideLog {
  const logged = entries
    .filter((entry) => entry.values.kind === 'vitals' && entry.values.vaporPct !== null)
    .map((entry) => ({
      minute: minutesFromStart(startedAt, entry.values.at),
      dial: entry.values.vaporPct as number,
    }))
    .sort((a, b) => a.minute - b.minute);
  const points = new Map<number, { planned: number | null; brain: number | null; logged: number | null }>();
  plan.timeline.timeMin.forEach((minute, index) => {
    points.set(minute, {
      planned: plannedDialAt(plan.input.schedule, minute),
      brain: (plan.timeline.brainPct[index] ?? 0) / plan.macPct,
      logged: null,
    });
  });
  for (const entry of logged) {
    const minute = Math.round(entry.minute * 100) / 100;
    const existing = points.get(minute);
    points.set(minute, {
      planned: existing?.planned ?? null,
      brain: existing?.brain ?? null,
      logged: entry.dial,
    });
  }
  const minutes = [...points.keys()].sort((a, b) => a - b);
  return {
    minutes,
    plannedDialPct: minutes.map((minute) => points.get(minute)?.planned ?? null),
    predictedBrainMac: minutes.map((minute) => points.get(minute)?.brain ?? null),
    loggedDialPct: minutes.map((minute) => points.get(minute)?.logged ?? null),
  };
}
