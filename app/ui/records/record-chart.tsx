import { useMemo } from 'react';
import type { ProcedureEntryValues } from '../../contract/records.js';
import { StripChart } from '../common/strip-chart.js';
import type { DisplayUnits } from './entry-form.js';
import { recordStripData } from './record-strip-data.js';

type RecordChartProps = {
  readonly startedAt: string;
  readonly entries: readonly { readonly values: ProcedureEntryValues }[];
  readonly units: DisplayUnits;
  /** Right end of the time axis in minutes since the start. */
  readonly untilMinutes: number;
};

/**
 * The logged record on screen as small stacked strips (the dial as steps, each vital sign on its
 * own fixed axis, events numbered across them), the same strips as the printed record.
 */
export function RecordChart({ startedAt, entries, units, untilMinutes }: RecordChartProps) {
  const data = useMemo(
    () => recordStripData(startedAt, entries, units, untilMinutes),
    [startedAt, entries, units, untilMinutes],
  );
  if (data.stops.length === 0 && data.markers.length === 0)
    return <p className="hint record-chart-empty">The chart appears once rows are logged.</p>;
  const summary = `Logged record over ${Math.round(data.xMax)} minutes since the start: ${data.stops.length} rows of readings, ${data.markers.length} events; the dial as steps, then heart rate, breathing, temperature and end-tidal CO2, each on its own fixed axis.`;
  return <StripChart data={data} label="The log over time" summary={summary} height={330} />;
}
