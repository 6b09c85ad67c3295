import type { ProcedureEntryValues } from '../../contract/records.js';
import type { EventType } from '../../core/procedure-events.js';
import { toDisplayReading, type DisplayUnits, type ReadingField } from './entry-form.js';
import { minutesFromStart } from './monitoring.js';

export const chartedReadings = [
  'heartRatePerMin',
  'breathsPerMin',
  'temperatureC',
  'etco2Mmhg',
  'vaporPct',
] as const satisfies readonly ReadingField[];
export type ChartedReading = (typeof chartedReadings)[number];

export type RecordSeries = {
  /** Minutes since the start of the procedure, ascending. */
  readonly minutes: number[];
  /** One value (display units) or null per minute point, per charted reading. */
  readonly readings: Readonly<Record<ChartedReading, (number | null)[]>>;
  /**
   * The event track on its own 0-1 scale: each event adds three points at its minute (0, 1, 0),
   * which draw a vertical marker across the chart; null at vitals rows.
   */
  readonly events: (number | null)[];
  readonly eventList: { readonly minutes: number; readonly eventType: EventType }[];
};

/**
 * The logged rows as aligned chart columns over minutes since the start, in display units.
 * Vitals rows give readings; events give markers. Voided rows must already be left out.
 * @param untilMinutes where the time axis should reach (e.g. a minute past now), so that the
 *   latest row or event is not drawn on the chart's edge; ignored when not after the last row
 */
export function recordSeries(
  startedAt: string,
  entries: readonly { readonly values: ProcedureEntryValues }[],
  units: DisplayUnits,
  untilMinutes: number | null = null,
): RecordSeries {
  const sorted = [...entries].sort((a, b) => Date.parse(a.values.at) - Date.parse(b.values.at));
  const minutes: number[] = [];
  const readings: Record<ChartedReading, (number | null)[]> = {
    heartRatePerMin: [],
    breathsPerMin: [],
    temperatureC: [],
    etco2Mmhg: [],
    vaporPct: [],
  };
  const events: (number | null)[] = [];
  const eventList: { minutes: number; eventType: EventType }[] = [];
  for (const { values } of sorted) {
    const at = minutesFromStart(startedAt, values.at);
    if (values.kind === 'event' && values.eventType !== null) {
      eventList.push({ minutes: at, eventType: values.eventType });
      for (const level of [0, 1, 0]) {
        minutes.push(at);
        for (const field of chartedReadings) readings[field].push(null);
        events.push(level);
      }
      continue;
    }
    minutes.push(at);
    for (const field of chartedReadings) {
      const value = values[field];
      readings[field].push(value === null ? null : toDisplayReading(field, value, units));
    }
    events.push(null);
  }
  const last = minutes.at(-1);
  if (untilMinutes !== null && last !== undefined && untilMinutes > last) {
    minutes.push(untilMinutes);
    for (const field of chartedReadings) readings[field].push(null);
    events.push(null);
  }
  return { minutes, readings, events, eventList };
}
