/**
 * A procedure record's log read as the model's input: the dial settings at their logged times,
 * the fresh gas flow, the route change at intubation, IPPV and the measured heart rate become a
 * PlanInput for the bird, so the model answers for what was given rather than for what was planned.
 * Times come in as milliseconds since the epoch (this layer reads no clock).
 */
import type { AgentId } from '../agents.js';
import type { Circuit, Route } from '../delivery.js';
import {
  breathsPerMin as restingBreathsPerMin,
  tidalVolumeMl as restingTidalVolumeMl,
} from '../model/allometry.js';
import { maxLaterIppvPeriods } from '../model/ippv-periods.js';
import type { PlanInput, PlanPhaseChange, PlanScheduleStep } from '../model/plan-types.js';
import type { EventType } from '../procedure-events.js';

/** One current (not voided, newest version) row of a record, as the log holds it. */
export type LoggedEntry = {
  /** Time of the row, ms since the epoch. */
  readonly atMs: number;
  readonly kind: 'vitals' | 'event';
  readonly vaporPct: number | null;
  readonly oxygenLpm: number | null;
  readonly heartRatePerMin: number | null;
  readonly breathsPerMin: number | null;
  readonly eventType: EventType | null;
};

/** What the log does not say but the model needs, with where each value came from. */
export type LogBird = {
  /** Body mass, g: the weight nearest before the procedure, else the linked plan's. */
  readonly bodyMassG: number;
  readonly speciesId?: string | undefined;
  readonly agent: AgentId;
  /** Where the agent came from: logged on the record, else the linked plan or the clinic's default agent. */
  readonly agentBasis: string;
  readonly macPct?: number | undefined;
};

export type RecordLog = {
  readonly startedAtMs: number;
  /** The record's end, ms since the epoch, or null while it runs. */
  readonly endedAtMs: number | null;
  /** The airway of the record (after intubation when there is an intubation event). */
  readonly airway: Route;
  readonly circuit: Circuit;
  readonly bird: LogBird;
  /** Route before intubation, from the linked plan when it induced by mask or chamber. */
  readonly inductionRoute?: Route | undefined;
  readonly chamberVolumeL?: number | undefined;
  /** Fresh gas flow of the linked plan, L/min: used only until the first flow is logged. */
  readonly plannedFreshGasLpm?: number | undefined;
  /** Current rows of the record in any order. */
  readonly entries: readonly LoggedEntry[];
};

/** Default recovery window when a record is read as a plan, min (enough to see standing). */
export const logRecoveryWindowMin = 120;

/** Mask induction before intubation when the record does not say (common practice in birds). */
export const defaultInductionRoute: Route = 'mask';

/** A plan input built from the log, or the reason it cannot be built. */
export type LogPlan =
  | {
      readonly ok: true;
      readonly input: PlanInput;
      /** The minute 0 of the plan: the first logged dial above 0, ms since the epoch. */
      readonly gasOnMs: number;
      /** The vaporiser-off time the plan uses, ms since the epoch, or null when it never goes off. */
      readonly offMs: number | null;
      /** Each assumption made to turn the log into a plan, in words the clinic can check. */
      readonly notes: readonly string[];
    }
  | { readonly ok: false; readonly missing: string };

const minute = 60_000;

function sorted(entries: readonly LoggedEntry[]): LoggedEntry[] {
  return [...entries].sort((a, b) => a.atMs - b.atMs);
}

/** The first event of a kind, ms since the epoch, or null. */
export function firstEventMs(entries: readonly LoggedEntry[], type: EventType): number | null {
  let found: number | null = null;
  for (const entry of entries)
    if (entry.kind === 'event' && entry.eventType === type && (found === null || entry.atMs < found))
      found = entry.atMs;
  return found;
}

function median(values: readonly number[]): number | null {
  if (values.length === 0) return null;
  const ordered = [...values].sort((a, b) => a - b);
  const middle = Math.floor(ordered.length / 2);
  return ordered.length % 2 === 1
    ? (ordered[middle] as number)
    : ((ordered[middle - 1] as number) + (ordered[middle] as number)) / 2;
}

const round2 = (value: number) => Math.round(value * 100) / 100;

/** At most 50 steps (the plan's limit): neighbouring steps of equal dial merge first, then the shortest. */
function compactSchedule(steps: PlanScheduleStep[]): PlanScheduleStep[] {
  const merged: PlanScheduleStep[] = [];
  for (const step of steps) {
    const last = merged[merged.length - 1];
    if (last !== undefined && last.vaporPct === step.vaporPct) continue;
    if (last !== undefined && last.atMin === step.atMin) merged[merged.length - 1] = step;
    else merged.push(step);
  }
  while (merged.length > 50) {
    // Drop the step that lasts the shortest time (never the first or the last).
    let shortest = 1;
    let shortestLength = Infinity;
    for (let index = 1; index < merged.length - 1; index += 1) {
      const length = (merged[index + 1]?.atMin ?? 0) - (merged[index]?.atMin ?? 0);
      if (length < shortestLength) {
        shortest = index;
        shortestLength = length;
      }
    }
    merged.splice(shortest, 1);
  }
  return merged;
}

/** One IPPV period read from the log, before the tidal volume is added. */
type LoggedIppvPeriod = { fromMin: number; untilMin?: number; breathsPerMin: number };

/**
 * The IPPV periods of a log: each IPPV on up to the next IPPV off (none: to the end of the plan),
 * at the median breathing rate logged within the period, else the allometric resting rate. An
 * IPPV on before the tube is in place, a second IPPV on while IPPV runs and an IPPV off without
 * an on are not modelled and are named in the notes, as is every period kept.
 */
function ippvPeriodsFromLog(
  entries: readonly LoggedEntry[],
  context: {
    readonly tubeAt: (ms: number) => boolean;
    readonly minutesOf: (ms: number) => number;
    /** Earliest minute IPPV may start in the plan (after the tube phase's gap), min. */
    readonly earliestMin: number;
    readonly planEndMin: number;
    readonly restingRate: number;
  },
): { periods: LoggedIppvPeriod[]; notes: string[] } {
  const { tubeAt, minutesOf, earliestMin, planEndMin, restingRate } = context;
  const notes: string[] = [];
  const spans: { onMs: number; offMs: number | null }[] = [];
  const skipped: string[] = [];
  let onMs: number | null = null;
  for (const entry of entries) {
    if (entry.kind !== 'event') continue;
    const at = `${String(minutesOf(entry.atMs))} min`;
    if (entry.eventType === 'ippvOn') {
      if (onMs !== null) skipped.push(`IPPV on at ${at} while IPPV already runs: read as running on.`);
      else onMs = entry.atMs;
    } else if (entry.eventType === 'ippvOff') {
      if (onMs === null) skipped.push(`IPPV off at ${at} without an IPPV on before it: not modelled.`);
      else {
        spans.push({ onMs, offMs: entry.atMs });
        onMs = null;
      }
    }
  }
  if (onMs !== null) spans.push({ onMs, offMs: null });

  const periods: LoggedIppvPeriod[] = [];
  const described: string[] = [];
  for (const span of spans) {
    const on = minutesOf(span.onMs);
    const off = span.offMs === null ? null : minutesOf(span.offMs);
    const during = off === null ? `from ${String(on)} min` : `from ${String(on)} to ${String(off)} min`;
    if (!tubeAt(span.onMs)) {
      skipped.push(`IPPV logged before a tube is in place (${during}): not modelled.`);
      continue;
    }
    const fromMin = Math.max(0, on, earliestMin);
    // Ends at the plan's end or later: runs to the end.
    const untilMin = off === null || off >= planEndMin ? undefined : off;
    if (fromMin >= planEndMin || (untilMin !== undefined && untilMin <= fromMin)) {
      skipped.push(`IPPV ${during} falls outside the plan or the tube's room-air gap: not modelled.`);
      continue;
    }
    if (periods.length > maxLaterIppvPeriods) {
      skipped.push(`IPPV ${during}: only the first ${String(maxLaterIppvPeriods + 1)} periods are modelled.`);
      continue;
    }
    const rates = entries
      .filter(
        (entry) =>
          entry.atMs >= span.onMs &&
          (span.offMs === null || entry.atMs < span.offMs) &&
          entry.breathsPerMin !== null &&
          entry.breathsPerMin > 0,
      )
      .map((entry) => entry.breathsPerMin as number);
    const logged = median(rates);
    const breathsPerMin = round2(Math.min(150, Math.max(1, logged ?? restingRate)));
    periods.push({ fromMin, ...(untilMin === undefined ? {} : { untilMin }), breathsPerMin });
    const rateBasis =
      logged === null
        ? 'the allometric resting rate, none logged'
        : `the median of ${String(rates.length)} logged`;
    described.push(
      `${untilMin === undefined ? `from ${String(fromMin)} min to the end` : `${String(fromMin)}-${String(untilMin)} min`} at ${String(breathsPerMin)} breaths/min (${rateBasis})`,
    );
  }
  if (described.length > 0)
    notes.push(
      `IPPV ${described.length === 1 ? 'period' : 'periods'}: ${described.join('; ')}; with the resting tidal volume (allometric estimate).`,
    );
  notes.push(...skipped);
  return { periods, notes };
}

/**
 * The record's log as a PlanInput.
 * - Minute 0 is the first logged dial above 0 (gas on); the dial steps sit at their logged
 *   minutes from then; the vaporiser goes off at the vaporiser-off event, or at `offAtMs` (the
 *   "if the vaporiser goes off now" question), or at the last logged dial of 0.
 * - An intubation event after gas on starts a second phase on the record's airway; before it the
 *   bird is on the linked plan's induction route (mask or chamber), else a mask (common practice).
 * - Fresh gas flow: the flow logged last before each phase starts, else the first one logged in
 *   it, else the linked plan's flow; none at all: the log cannot be read.
 * - Every IPPV on up to the next IPPV off (none: to the end) is an IPPV period, at the median
 *   breathing rate logged within it (else the allometric resting rate) and the bird's allometric
 *   resting tidal volume; the bird breathes spontaneously between periods. An IPPV on before the
 *   tube is in place and an IPPV off without an on are named in the notes, not modelled.
 * - The median measured heart rate replaces the allometric one (it scales cardiac output).
 * @param log the record's log and the bird
 * @param options offAtMs: turn the vaporiser off at this time when the log has not; recoveryWindowMin 5-240
 */
export function planInputFromLog(
  log: RecordLog,
  options: { readonly offAtMs?: number; readonly recoveryWindowMin?: number } = {},
): LogPlan {
  const entries = sorted(log.entries);
  const notes: string[] = [`Agent: ${log.bird.agentBasis}.`];
  const dials = entries.filter((entry) => entry.kind === 'vitals' && entry.vaporPct !== null);
  const gasOn = dials.find((entry) => (entry.vaporPct ?? 0) > 0);
  if (gasOn === undefined) return { ok: false, missing: 'no vaporiser setting above 0 % is logged' };
  const gasOnMs = gasOn.atMs;
  const eventOffMs = firstEventMs(entries, 'vaporiserOff');
  const offMs =
    eventOffMs !== null && eventOffMs > gasOnMs
      ? eventOffMs
      : options.offAtMs !== undefined && options.offAtMs > gasOnMs
        ? options.offAtMs
        : null;
  const minutesOf = (ms: number) => round2((ms - gasOnMs) / minute);

  const steps: PlanScheduleStep[] = [{ atMin: 0, vaporPct: gasOn.vaporPct as number }];
  for (const entry of dials) {
    if (entry.atMs <= gasOnMs || (offMs !== null && entry.atMs >= offMs)) continue;
    steps.push({ atMin: minutesOf(entry.atMs), vaporPct: entry.vaporPct as number });
  }
  if (offMs !== null) steps.push({ atMin: Math.max(minutesOf(offMs), 0.01), vaporPct: 0 });
  const schedule = compactSchedule(steps);
  if (offMs === null && schedule[schedule.length - 1]?.vaporPct !== 0) {
    // Still running: the plan ends at the last logged step plus the window.
    notes.push('The vaporiser is still on in the log: no recovery is predicted.');
  }

  const flows = entries.filter(
    (entry) => entry.kind === 'vitals' && entry.oxygenLpm !== null && entry.oxygenLpm > 0,
  );
  const flowAt = (ms: number): number | null => {
    let flow: number | null = null;
    for (const entry of flows) if (entry.atMs <= ms) flow = entry.oxygenLpm;
    return flow ?? flows.find((entry) => entry.atMs > ms)?.oxygenLpm ?? null;
  };
  const intubationMs = firstEventMs(entries, 'intubation');
  const tubeRoute = log.airway === 'endotracheal' || log.airway === 'airSacTube';
  const intubatedLater = tubeRoute && intubationMs !== null && intubationMs > gasOnMs;
  const firstRoute: Route = intubatedLater
    ? log.inductionRoute === 'mask' || log.inductionRoute === 'chamber'
      ? log.inductionRoute
      : defaultInductionRoute
    : log.airway;
  if (intubatedLater && log.inductionRoute !== 'mask' && log.inductionRoute !== 'chamber')
    notes.push(
      'Induction before intubation read as a mask induction (common practice; no plan says otherwise).',
    );

  const firstFlow = flowAt(gasOnMs) ?? (log.plannedFreshGasLpm !== undefined ? log.plannedFreshGasLpm : null);
  if (firstFlow === null)
    return { ok: false, missing: 'no oxygen (fresh gas) flow is logged and no plan is linked' };
  if (flows.length === 0)
    notes.push(`Fresh gas flow ${String(firstFlow)} L/min from the linked plan (none logged).`);
  const clampFlow = (lpm: number) => Math.min(20, Math.max(0.05, lpm));
  const chamberVolumeL = firstRoute === 'chamber' ? (log.chamberVolumeL ?? 2) : undefined;
  if (firstRoute === 'chamber' && log.chamberVolumeL === undefined)
    notes.push('Chamber volume 2 L (assumption; no plan gives it).');

  const window = options.recoveryWindowMin ?? logRecoveryWindowMin;
  const lastStep = schedule[schedule.length - 1] as PlanScheduleStep;
  const planEnd = lastStep.atMin + window;
  const laterPhases: PlanPhaseChange[] = [];
  if (intubatedLater && intubationMs !== null && minutesOf(intubationMs) < planEnd) {
    laterPhases.push({
      startMin: Math.max(0.01, minutesOf(intubationMs)),
      route: log.airway,
      circuit: log.circuit,
      freshGasLpm: clampFlow(flowAt(intubationMs) ?? firstFlow),
    });
  }

  const tubeAt = (ms: number) => (intubatedLater ? intubationMs !== null && ms >= intubationMs : tubeRoute);
  // IPPV must start after the room-air gap of the tube phase.
  const tubeStart = laterPhases[0]?.startMin;
  const ippv = ippvPeriodsFromLog(entries, {
    tubeAt,
    minutesOf,
    earliestMin: tubeStart === undefined ? 0 : tubeStart + 1,
    planEndMin: planEnd,
    restingRate: restingBreathsPerMin(log.bird.bodyMassG),
  });
  notes.push(...ippv.notes);
  const tidalVolumeMl = Number(restingTidalVolumeMl(log.bird.bodyMassG).toPrecision(3));
  const [firstPeriod, ...laterPeriods] = ippv.periods;
  const ventilation: PlanInput['ventilation'] =
    firstPeriod === undefined
      ? undefined
      : {
          mode: 'ippv',
          ...firstPeriod,
          tidalVolumeMl,
          ...(laterPeriods.length === 0
            ? {}
            : { laterPeriods: laterPeriods.map((period) => ({ ...period, tidalVolumeMl })) }),
        };

  const heartRates = entries
    .filter(
      (entry) =>
        entry.heartRatePerMin !== null && entry.heartRatePerMin >= 20 && entry.heartRatePerMin <= 1500,
    )
    .map((entry) => entry.heartRatePerMin as number);
  const heartRate = median(heartRates);
  if (heartRate !== null)
    notes.push(`Heart rate ${String(heartRate)}/min: the median of ${String(heartRates.length)} logged.`);

  const input: PlanInput = {
    bodyMassG: log.bird.bodyMassG,
    ...(log.bird.speciesId === undefined ? {} : { speciesId: log.bird.speciesId }),
    ...(heartRate === null ? {} : { overrides: { heartRatePerMin: heartRate } }),
    agent: log.bird.agent,
    ...(log.bird.macPct === undefined ? {} : { macPct: log.bird.macPct }),
    route: firstRoute,
    ...(firstRoute === 'chamber' ? {} : { circuit: log.circuit }),
    freshGasLpm: clampFlow(firstFlow),
    ...(chamberVolumeL === undefined ? {} : { chamberVolumeL }),
    schedule,
    ...(laterPhases.length === 0 ? {} : { laterPhases }),
    ...(ventilation === undefined ? {} : { ventilation }),
    recoveryWindowMin: window,
    uncertainty: { samples: 0, seed: 1 },
  };
  return { ok: true, input, gasOnMs, offMs, notes };
}
