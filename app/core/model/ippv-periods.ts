/**
 * A plan's IPPV periods: the one place that turns the plan's ventilation into the periods the
 * ventilator runs. The plan's own IPPV fields are the first period (from `fromMin`, default 0,
 * until `untilMin`, default the end of the plan); `laterPeriods` follow. Between and around the
 * periods the bird breathes spontaneously, depressed by the agent as the model always does. The
 * simulation, the flow budgets, the contract's checks and the screens read them from here.
 */
import type { PlanIppvPeriod, PlanVentilation } from './plan-types.js';
import type { IppvPeriodSetup } from './simulation.js';

/** Most IPPV periods after the first in one plan (a record log with more keeps the first ones). */
export const maxLaterIppvPeriods = 30;

/** An IPPV period with its start resolved; `untilMin` null: IPPV runs to the end of the plan. */
export type ResolvedIppvPeriod = IppvPeriodSetup;

/**
 * The IPPV periods of a plan's ventilation, in the plan's order (the contract keeps them in time
 * order and not overlapping); none for spontaneous breathing.
 * @param ventilation the plan's ventilation, absent for spontaneous breathing
 */
export function ippvPeriodsOf(ventilation: PlanVentilation | undefined): ResolvedIppvPeriod[] {
  if (ventilation?.mode !== 'ippv') return [];
  const resolve = (period: PlanIppvPeriod): ResolvedIppvPeriod => ({
    fromMin: period.fromMin,
    untilMin: period.untilMin ?? null,
    breathsPerMin: period.breathsPerMin,
    tidalVolumeMl: period.tidalVolumeMl,
  });
  return [
    resolve({ ...ventilation, fromMin: ventilation.fromMin ?? 0 }),
    ...(ventilation.laterPeriods ?? []).map(resolve),
  ];
}

/**
 * The IPPV period running at `timeMin` (from its start, up to but not including its end), or null
 * when the bird breathes spontaneously then.
 */
export function ippvPeriodAt(
  periods: readonly ResolvedIppvPeriod[],
  timeMin: number,
): ResolvedIppvPeriod | null {
  for (const period of periods)
    if (timeMin >= period.fromMin && (period.untilMin === null || timeMin < period.untilMin)) return period;
  return null;
}

/**
 * IPPV in words with `figure` for numbers, e.g. "IPPV 10 breaths/min, 1.2 mL tidal volume from
 * 5 min until 20 min; 12 breaths/min, 1.2 mL tidal volume from 30 min". A first period with no
 * start given reads without one (from the start).
 * @param units 'long' ("10 breaths/min, 1.2 mL tidal volume") or 'short' ("10/min × 1.2 mL")
 */
export function ippvText(
  ventilation: Extract<PlanVentilation, { mode: 'ippv' }>,
  figure: (value: number) => string,
  units: 'long' | 'short',
): string {
  const periods = ippvPeriodsOf(ventilation).map((period, index) => {
    const settings =
      units === 'long'
        ? `${figure(period.breathsPerMin)} breaths/min, ${figure(period.tidalVolumeMl)} mL tidal volume`
        : `${figure(period.breathsPerMin)}/min × ${figure(period.tidalVolumeMl)} mL`;
    const from =
      index === 0 && ventilation.fromMin === undefined ? '' : ` from ${figure(period.fromMin)} min`;
    const until = period.untilMin === null ? '' : ` until ${figure(period.untilMin)} min`;
    return `${settings}${from}${until}`;
  });
  return `IPPV ${periods.join('; ')}`;
}
