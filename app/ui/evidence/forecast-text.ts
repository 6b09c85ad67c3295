/** The forecast that follows the log, read out in words, without React. */
import type { LogForecast } from '../../core/evidence/forecast.js';
import { clockText } from '../records/clock-time.js';

/** A clock time on the clinic's clock, or why there is none. */
function clock(ms: number | null): string {
  return ms === null ? 'not within 90 min' : clockText(new Date(ms).toISOString());
}

/** A recovery milestone's time, or why there is none (never that deep yet, or beyond the window). */
function recoveryClock(ms: number | null, notDeepEnough: number | null): string {
  return ms === null && notDeepEnough !== null
    ? `no time yet: the predicted depth has not reached ${String(notDeepEnough)} x MAC`
    : clock(ms);
}

/** " (90 % of birds like this: a to b<unit>)", or nothing without a band. */
function band(range: { readonly low: number; readonly high: number } | null, digits: number, unit: string) {
  return range === null
    ? ''
    : ` (90 % of birds like this: ${range.low.toFixed(digits)} to ${range.high.toFixed(digits)}${unit})`;
}

export type ForecastReadout = {
  /** e.g. "1.23 x MAC (90 % of birds like this: 1.05 to 1.41)". */
  readonly depth: string;
  /** "If the vaporiser goes off now", or "Vaporiser went off at" once it was logged off. */
  readonly offLabel: string;
  /** The clock time the vaporiser goes (or went) off. */
  readonly off: string;
  /** e.g. "14:32:00 (90 % of birds like this: 5 to 9 min after off)". */
  readonly firstMovement: string;
  readonly standing: string;
  /** Minutes from the vaporiser off to standing, 2 decimals, or '' when not within the window. */
  readonly standingMinutesAfterOff: string;
};

/**
 * The forecast panel's lines.
 * @param forecast the forecast read from the model's answer
 */
export function forecastReadout(forecast: LogForecast): ForecastReadout {
  return {
    depth: `${forecast.depthNowMac.toFixed(2)} x MAC${band(forecast.depthBandMac, 2, '')}`,
    offLabel: forecast.alreadyOff ? 'Vaporiser went off at' : 'If the vaporiser goes off now',
    off: clock(forecast.offAtMs),
    firstMovement: `${recoveryClock(forecast.firstMovementAtMs, forecast.notDeepEnough.firstMovement)}${band(forecast.firstMovementBandMin, 0, ' min after off')}`,
    standing: `${recoveryClock(forecast.standingAtMs, forecast.notDeepEnough.standing)}${band(forecast.standingBandMin, 0, ' min after off')}`,
    standingMinutesAfterOff:
      forecast.standingAtMs === null ? '' : ((forecast.standingAtMs - forecast.offAtMs) / 60_000).toFixed(2),
  };
}
