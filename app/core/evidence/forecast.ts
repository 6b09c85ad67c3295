/**
 * The forecast that follows the log: during a procedure the model runs on what was logged so far
 * and answers "how deep is the bird now" and "if the vaporiser goes off now, when will it move
 * and stand". An estimate for a typical bird given this log; the bird decides.
 */
import type { PlanCourse } from '../model/compute-plan.js';
import { planInputFromLog, type LogPlan, type RecordLog } from './record-log.js';

/** Minutes simulated after the vaporiser goes off in the forecast (enough for standing in most birds). */
export const forecastRecoveryWindowMin = 90;

export type LogForecast = {
  /** Minutes since the first dial above 0. */
  readonly minutesOnGas: number;
  /** Predicted brain level now as a multiple of the MAC in use. */
  readonly depthNowMac: number;
  /** 5th-95th percentile of the depth now when the run had uncertainty samples, else null. */
  readonly depthBandMac: { readonly low: number; readonly high: number } | null;
  /** True when the log already holds a vaporiser-off event: the times are from that moment. */
  readonly alreadyOff: boolean;
  /** The moment the forecast turns the vaporiser off (now, or the logged off), ms since the epoch. */
  readonly offAtMs: number;
  /** Predicted first movement, ms since the epoch, or null when not within the window. */
  readonly firstMovementAtMs: number | null;
  /** Predicted standing or perching, ms since the epoch, or null when not within the window. */
  readonly standingAtMs: number | null;
  readonly firstMovementBandMin: { readonly low: number; readonly high: number } | null;
  readonly standingBandMin: { readonly low: number; readonly high: number } | null;
  /**
   * A recovery milestone's brain level (x MAC) when the predicted brain never reached it (a bird
   * not yet that deep: nothing to wake from, so no time), else null; a null time with a null here
   * means the level is not crossed within the window.
   */
  readonly notDeepEnough: {
    readonly firstMovement: number | null;
    readonly standing: number | null;
  };
  readonly macPct: number;
  readonly notes: readonly string[];
};

/**
 * The plan to run for the forecast: the log so far with the vaporiser off at `nowMs`, or just
 * after the latest row when that is later (unless the log already turned it off).
 * @param log the record's log
 * @param nowMs the time of the question, ms since the epoch
 * @param samples uncertainty samples (0 for the quick run)
 */
export function forecastPlan(log: RecordLog, nowMs: number, samples = 0): LogPlan {
  // A row saved a few seconds past the minute still counts: the vaporiser goes off after it.
  const offAtMs = log.entries.reduce((latest, entry) => Math.max(latest, entry.atMs + 1000), nowMs);
  const plan = planInputFromLog(log, { offAtMs, recoveryWindowMin: forecastRecoveryWindowMin });
  if (!plan.ok) return plan;
  if (plan.offMs === null)
    return { ok: false, missing: 'the time now is not after the first dial above 0 %' };
  return { ...plan, input: { ...plan.input, uncertainty: { samples, seed: 1 } } };
}

/**
 * Reads the forecast out of the model's answer for forecastPlan(log, nowMs).
 * @param plan the forecast plan
 * @param result computePlanCourse(plan.input) (or the whole computePlan answer: the same values)
 * @param nowMs the time of the question, ms since the epoch
 */
export function readForecast(
  plan: Extract<LogPlan, { ok: true }>,
  result: PlanCourse,
  nowMs: number,
): LogForecast {
  const offAtMs = plan.offMs as number;
  const minutesOnGas = Math.max(0, (nowMs - plan.gasOnMs) / 60_000);
  const times = result.timeline.timeMin;
  let index = 0;
  while (index + 1 < times.length && (times[index + 1] as number) <= minutesOnGas) index += 1;
  const mac = result.mac.valuePct;
  const band = result.uncertainty.brainBandPct;
  const milestoneBand = (id: 'firstMovement' | 'standing') => {
    const percentiles = result.uncertainty.milestones.find((entry) => entry.id === id)?.percentiles ?? null;
    return percentiles === null ? null : { low: percentiles.p5, high: percentiles.p95 };
  };
  const at = (minutes: number | null) => (minutes === null ? null : offAtMs + minutes * 60_000);
  // The model times a recovery milestone only for a brain that was above its level.
  const notReached = (id: 'firstMovement' | 'standing', minutes: number | null) => {
    const level = result.milestones.definitions.find((entry) => entry.id === id)?.macMultiple;
    return minutes === null && level !== undefined && result.milestones.peakBrainMacMultiple < level
      ? level
      : null;
  };
  return {
    minutesOnGas,
    depthNowMac: (result.timeline.brainPct[index] ?? 0) / mac,
    depthBandMac:
      band === null ? null : { low: (band.p5[index] ?? 0) / mac, high: (band.p95[index] ?? 0) / mac },
    alreadyOff: offAtMs < nowMs - 1000,
    offAtMs,
    firstMovementAtMs: at(result.milestones.firstMovementMin),
    standingAtMs: at(result.milestones.standingMin),
    firstMovementBandMin: milestoneBand('firstMovement'),
    standingBandMin: milestoneBand('standing'),
    notDeepEnough: {
      firstMovement: notReached('firstMovement', result.milestones.firstMovementMin),
      standing: notReached('standing', result.milestones.standingMin),
    },
    macPct: mac,
    notes: plan.notes,
  };
}
