/**
 * The logged record as stacked strips, for the record screen and the printed record alike (one
 * builder, one set of ranges: strip-ranges.ts): the dial first, as steps, then each vital sign on
 * its own fixed axis; events numbered across every strip.
 */
import type { ProcedureEntryValues } from '../../contract/records.js';
import { eventLabels } from '../../core/procedure-events.js';
import {
  figureText,
  stepValuesAt,
  type Strip,
  type StripChartData,
  type StripLine,
  type LineStyle,
} from '../common/strip-chart-model.js';
import { readingLabel, type DisplayUnits } from './entry-form.js';
import { recordSeries, type ChartedReading } from './record-series.js';
import { fixedStripRange, stripRange } from './strip-ranges.js';

/** Strip order: the dial first (what was given), then the vital signs. */
export const recordStripOrder: readonly ChartedReading[] = [
  'vaporPct',
  'heartRatePerMin',
  'breathsPerMin',
  'temperatureC',
  'etco2Mmhg',
];

/** Each reading's line: a theme colour and its own dash, so the strips read without colour too. */
const styles: Readonly<Record<ChartedReading, LineStyle>> = {
  vaporPct: { stroke: 'var(--chart-amber)', width: 2.5 },
  heartRatePerMin: { stroke: 'var(--chart-red)', width: 1.6 },
  breathsPerMin: { stroke: 'var(--chart-blue)', dash: [8, 4], width: 1.6 },
  temperatureC: { stroke: 'var(--chart-green)', dash: [2, 3], width: 1.6 },
  etco2Mmhg: { stroke: 'var(--chart-violet)', dash: [12, 4, 2, 4], width: 1.6 },
};

const digits: Readonly<Record<ChartedReading, number>> = {
  vaporPct: 1,
  heartRatePerMin: 0,
  breathsPerMin: 0,
  temperatureC: 1,
  etco2Mmhg: 1,
};

/**
 * The strips of a record.
 * @param untilMinutes right end of the time axis, minutes since the start
 */
export function recordStripData(
  startedAt: string,
  entries: readonly { readonly values: ProcedureEntryValues }[],
  units: DisplayUnits,
  untilMinutes: number,
): StripChartData {
  const series = recordSeries(startedAt, entries, units, untilMinutes);
  // Vitals rows only: the event points of the series are markers here.
  const rows = series.events.flatMap((event, index) => (event === null ? [index] : []));
  const x = rows.map((index) => series.minutes[index] ?? 0);
  const xMax = Math.max(5, untilMinutes, x.at(-1) ?? 0, ...series.eventList.map((event) => event.minutes));
  const strips: Strip[] = recordStripOrder.map((field) => {
    const logged = rows.map((index) => series.readings[field][index] ?? null);
    const range = stripRange(fixedStripRange(field, units), logged);
    const { label, unit } = readingLabel(field, units);
    const isDial = field === 'vaporPct';
    const values = isDial
      ? stepValuesAt(
          logged.flatMap((value, at) => (value === null ? [] : [{ minute: x[at] ?? 0, value }])),
          x,
        )
      : logged;
    const line: StripLine = {
      id: field,
      label: isDial ? 'Dial' : label,
      unit,
      values,
      digits: digits[field],
      steps: isDial,
      // Dots where a reading was logged; the dial's steps already show each setting.
      points: !isDial,
      ...styles[field],
    };
    return {
      id: field,
      title: `${isDial ? 'Dial' : label} (${unit})`,
      range: { min: range.min, max: range.max },
      ticks: [range.min, (range.min + range.max) / 2, range.max],
      weight: 1,
      lines: [line],
    };
  });
  return {
    x,
    xMax,
    xLabel: 'Minutes since the start',
    strips,
    markers: series.eventList.map((event, index) => ({
      atMin: event.minutes,
      mark: String(index + 1),
      label: `${eventLabels[event.eventType]} at ${figureText(event.minutes, 1)} min`,
      kind: 'event' as const,
    })),
    spans: [],
    // The cursor and the table stop at the logged rows, not at the axis end added for "now".
    stops: rows.flatMap((index, at) =>
      recordStripOrder.some((field) => series.readings[field][index] !== null) ? [at] : [],
    ),
  };
}
