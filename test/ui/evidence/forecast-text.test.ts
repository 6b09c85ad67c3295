import { describe, expect, it } from 'vitest';
import type { LogForecast } from '../../../app/core/evidence/forecast.js';
import { forecastReadout } from '../../../app/ui/evidence/forecast-text.js';

/** 14:05:00 on the computer's own clock (the clinic's clock), whatever its time zone. */
const offAtMs = new Date(2026, 11, 2, 14, 5, 0).getTime();
const minute = 60_000;

/** An invented forecast: off now at 14:05, first movement 6 min later, standing 10.5 min later. */
const forecast: LogForecast = {
  minutesOnGas: 35,
  depthNowMac: 1.234,
  depthBandMac: { low: 1.05, high: 1.414 },
  alreadyOff: false,
  offAtMs,
  firstMovementAtMs: offAtMs + 6 * minute,
  standingAtMs: offAtMs + 10.5 * minute,
  firstMovementBandMin: { low: 4.6, high: 8.4 },
  standingBandMin: { low: 7.2, high: 15.6 },
  notDeepEnough: { firstMovement: null, standing: null },
  macPct: 1.3,
  notes: [],
};

describe('the forecast that follows the log, read out', () => {
  it('gives the depth now with its band, and the clock times if the vaporiser goes off now', () => {
    expect(forecastReadout(forecast)).toEqual({
      depth: '1.23 x MAC (90 % of birds like this: 1.05 to 1.41)',
      offLabel: 'If the vaporiser goes off now',
      off: '14:05:00',
      firstMovement: '14:11:00 (90 % of birds like this: 5 to 8 min after off)',
      standing: '14:15:30 (90 % of birds like this: 7 to 16 min after off)',
      standingMinutesAfterOff: '10.50',
    });
  });

  it('says when the vaporiser went off once it is logged, and leaves the bands out until they are computed', () => {
    const readout = forecastReadout({
      ...forecast,
      alreadyOff: true,
      depthBandMac: null,
      firstMovementBandMin: null,
      standingBandMin: null,
    });
    expect(readout.offLabel).toBe('Vaporiser went off at');
    expect(readout.depth).toBe('1.23 x MAC');
    expect(readout.firstMovement).toBe('14:11:00');
  });

  it('says a milestone is not within the 90-min window rather than give a time', () => {
    const readout = forecastReadout({ ...forecast, standingAtMs: null, standingBandMin: null });
    expect(readout.standing).toBe('not within 90 min');
    expect(readout.standingMinutesAfterOff).toBe('');
  });

  it('says a bird not yet as deep as a waking level has no time for it, rather than "not within 90 min"', () => {
    const readout = forecastReadout({
      ...forecast,
      depthNowMac: 0.1,
      firstMovementAtMs: null,
      standingAtMs: null,
      firstMovementBandMin: null,
      standingBandMin: null,
      notDeepEnough: { firstMovement: 0.4, standing: 0.2 },
    });
    expect(readout.firstMovement).toBe('no time yet: the predicted depth has not reached 0.4 x MAC');
    expect(readout.standing).toBe('no time yet: the predicted depth has not reached 0.2 x MAC');
    expect(readout.standingMinutesAfterOff).toBe('');
  });
});
