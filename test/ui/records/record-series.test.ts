import { describe, expect, it } from 'vitest';
import type { ProcedureEntryValues } from '../../../app/contract/records.js';
import { recordSeries } from '../../../app/ui/records/record-series.js';
import { nothingMeasured } from '../../support/clinic-birds.js';

const startedAt = '2026-03-10T09:00:00.000Z';
const blank: ProcedureEntryValues = { at: startedAt, kind: 'vitals', ...nothingMeasured };
const minutes = (value: number) => new Date(Date.parse(startedAt) + value * 60_000).toISOString();

describe('chart columns from logged rows', () => {
  it('aligns readings and event markers on minutes since the start, in time order and display units', () => {
    const series = recordSeries(
      startedAt,
      [
        { values: { ...blank, at: minutes(5), heartRatePerMin: 300, temperatureC: 40, etco2Mmhg: 760 } },
        { values: { ...blank, at: minutes(0), vaporPct: 4, heartRatePerMin: 280 } },
        { values: { ...blank, at: minutes(2.5), kind: 'event', eventType: 'intubation' } },
      ],
      { temperature: 'F', pressure: 'kPa' },
    );
    // The event adds three points at its minute: a vertical marker on the event track.
    expect(series.minutes).toEqual([0, 2.5, 2.5, 2.5, 5]);
    expect(series.readings.heartRatePerMin).toEqual([280, null, null, null, 300]);
    expect(series.readings.vaporPct).toEqual([4, null, null, null, null]);
    // 40 °C = 104 °F (definition of the Fahrenheit scale); 760 mmHg = 101.325 kPa (standard atmosphere).
    expect(series.readings.temperatureC).toEqual([null, null, null, null, 104]);
    expect(series.readings.etco2Mmhg).toEqual([null, null, null, null, 101.33]);
    expect(series.events).toEqual([null, 0, 1, 0, null]);
    expect(series.eventList).toEqual([{ minutes: 2.5, eventType: 'intubation' }]);
  });

  it('extends the time axis past the last row with an empty point, and never backwards', () => {
    const entries = [{ values: { ...blank, at: minutes(5), heartRatePerMin: 300 } }];
    const units = { temperature: 'C', pressure: 'mmHg' } as const;
    const extended = recordSeries(startedAt, entries, units, 8);
    expect(extended.minutes).toEqual([5, 8]);
    expect(extended.readings.heartRatePerMin).toEqual([300, null]);
    expect(extended.events).toEqual([null, null]);
    expect(recordSeries(startedAt, entries, units, 4).minutes).toEqual([5]);
    expect(recordSeries(startedAt, [], units, 4).minutes).toEqual([]);
  });
});
