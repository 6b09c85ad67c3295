import type { EventType, ProcedureEntryValues } from '../../contract/records.js';
import { eventNames } from '../../core/procedure-events.js';

/**
 * Timing rules of the live record: the reminder to log vitals and the apnoea stopwatch.
 * Plain functions of times in milliseconds so they can be checked without a clock.
 */

/**
 * Apnoea that lasts this long calls for action: apnoea of 10-15 s calls for action
 * (published, clinical education site). The stopwatch turns to the danger style at this point.
 */
export const apnoeaActionSeconds = 10;

/** Vital signs recorded at least every 5 min (common practice): the default reminder interval. */
export const defaultPromptIntervalMin = 5;

export type PromptState = {
  /** True when no vitals row has been logged for the whole interval. */
  readonly due: boolean;
  /** Minutes since the last vitals row (or since the start when there is none). */
  readonly sinceLastMin: number;
  /** When the reminder is (or was) due, ms since the epoch. */
  readonly dueAtMs: number;
};

/**
 * Whether to remind the person monitoring to log a row of vitals.
 * @param startedAtMs start of the procedure, ms since the epoch
 * @param vitalsAtMs times of the vitals rows logged so far (any order), ms since the epoch
 * @param nowMs the current time, ms since the epoch
 * @param intervalMin the reminder interval in minutes, 1 to 30
 * @param endedAtMs end of the procedure, or null while it runs: no reminder after the end
 */
export function promptState(
  startedAtMs: number,
  vitalsAtMs: readonly number[],
  nowMs: number,
  intervalMin: number,
  endedAtMs: number | null = null,
): PromptState {
  const lastMs = vitalsAtMs.reduce((latest, at) => Math.max(latest, at), startedAtMs);
  const dueAtMs = lastMs + intervalMin * 60_000;
  const sinceLastMin = Math.max(0, (nowMs - lastMs) / 60_000);
  return { due: endedAtMs === null && nowMs >= dueAtMs, sinceLastMin, dueAtMs };
}

export type Stopwatch = { readonly startedAtMs: number | null };

export const stoppedStopwatch: Stopwatch = { startedAtMs: null };

/** Starts the stopwatch, or stops it and reports the apnoea to log. */
export function toggleStopwatch(
  stopwatch: Stopwatch,
  nowMs: number,
): {
  readonly next: Stopwatch;
  readonly finished: { readonly startedAtMs: number; readonly durationS: number } | null;
} {
  if (stopwatch.startedAtMs === null) return { next: { startedAtMs: nowMs }, finished: null };
  return {
    next: stoppedStopwatch,
    finished: { startedAtMs: stopwatch.startedAtMs, durationS: stopwatchSeconds(stopwatch, nowMs) },
  };
}

/** Whole seconds shown on a running stopwatch, 0 when stopped. */
export function stopwatchSeconds(stopwatch: Stopwatch, nowMs: number): number {
  return stopwatch.startedAtMs === null ? 0 : Math.max(0, Math.floor((nowMs - stopwatch.startedAtMs) / 1000));
}

/** 'danger' once the apnoea has lasted the action threshold. */
export function stopwatchLevel(stopwatch: Stopwatch, nowMs: number): 'stopped' | 'running' | 'danger' {
  if (stopwatch.startedAtMs === null) return 'stopped';
  return stopwatchSeconds(stopwatch, nowMs) >= apnoeaActionSeconds ? 'danger' : 'running';
}

/** The note logged with an apnoea event. */
export function apnoeaNote(durationS: number): string {
  return `lasted ${durationS} s (stopwatch)`;
}

export type TimedValues = { readonly values: ProcedureEntryValues };

export const milestoneEvents = [
  { eventType: 'vaporiserOff', label: 'Gas off' },
  { eventType: 'firstMovement', label: 'First movement' },
  { eventType: 'extubation', label: 'Extubation' },
  { eventType: 'standing', label: 'Standing / perching' },
] as const satisfies readonly { eventType: EventType; label: string }[];

export type Milestone = {
  readonly eventType: EventType;
  readonly label: string;
  readonly at: string | null;
  readonly minutesAfterGasOff: number | null;
};

/**
 * Recovery milestones: the first time each was logged (once the gas is off, when gas off is
 * logged), and minutes after the gas was turned off (null while gas off is not logged).
 */
export function recoveryMilestones(entries: readonly TimedValues[]): Milestone[] {
  const sorted = [...entries].sort((a, b) => Date.parse(a.values.at) - Date.parse(b.values.at));
  const gasOff = sorted.find((entry) => entry.values.eventType === 'vaporiserOff')?.values.at ?? null;
  const gasOffMs = gasOff === null ? null : Date.parse(gasOff);
  return milestoneEvents.map(({ eventType, label }) => {
    // Recovery begins when the gas goes off: an extubation before that was a tube change.
    const first =
      sorted.find(
        (entry) =>
          entry.values.eventType === eventType &&
          (eventType === 'vaporiserOff' || gasOffMs === null || Date.parse(entry.values.at) >= gasOffMs),
      ) ?? null;
    const at = first?.values.at ?? null;
    const minutesAfterGasOff =
      at === null || gasOffMs === null ? null : Math.round((Date.parse(at) - gasOffMs) / 6000) / 10;
    return { eventType, label, at, minutesAfterGasOff };
  });
}

/** Event names in the clinic's words (shared with the CSV export and the printed record). */
export const eventLabels: Readonly<Record<EventType, string>> = eventNames;

/** Minutes from the start of the procedure, one decimal. */
export function minutesFromStart(startedAt: string, at: string): number {
  return Math.round((Date.parse(at) - Date.parse(startedAt)) / 6000) / 10;
}

/** One line for an event row: its label, the drug and dose as the clinic entered them, the note. */
export function eventSummary(
  values: Pick<ProcedureEntryValues, 'eventType' | 'eventNote' | 'drugName' | 'drugDose'>,
): string {
  if (values.eventType === null) return values.eventNote;
  const drug =
    values.eventType === 'drugGiven'
      ? [values.drugName, values.drugDose].filter((part) => part !== '').join(', ')
      : '';
  return [eventLabels[values.eventType], drug, values.eventNote].filter((part) => part !== '').join(': ');
}
