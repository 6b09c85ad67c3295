import { useMemo } from 'react';
import type { ProcedureEntryValues } from '../../contract/records.js';
import { StripChart } from '../common/strip-chart.js';
import type { DisplayUnits } from './entry-form.js';
import { recordStripData } from './record-strip-data.js';

/**
 * The logged record on paper: the same strips as the record screen (recordStripData), drawn at a
 * fixed width in black and greys, every line with its own dash; events numbered and listed.
 */
export function RecordStrips({
  startedAt,
  entries,
  units,
  untilMinutes,
}: {
  readonly startedAt: string;
  readonly entries: readonly { readonly values: ProcedureEntryValues }[];
  readonly units: DisplayUnits;
  /** Right end of the time axis, minutes since the start. */
  readonly untilMinutes: number;
}) {
  const data = useMemo(
    () => recordStripData(startedAt, entries, units, untilMinutes),
    [startedAt, entries, units, untilMinutes],
  );
  const summary = `Logged record over ${Math.round(data.xMax)} minutes: ${data.strips
    .map(
      (strip) =>
        `${strip.title} ${strip.lines[0]?.values.filter((value) => value !== null).length ?? 0} readings`,
    )
    .join(', ')}; ${data.markers.length} events.`;
  return (
    <div className="record-strips">
      <StripChart data={data} label="The log over time" summary={summary} height={330} interactive={false} />
    </div>
  );
}
