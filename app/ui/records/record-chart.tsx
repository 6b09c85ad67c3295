import { useMemo } from 'react';
import type { ProcedureEntryValues } from '../../contract/records.js';
import { eventLabels } from '../../core/procedure-events.js';
import { TimeChart, type ChartSeries } from '../common/time-chart.js';
import { readingLabel, type DisplayUnits } from './entry-form.js';
import { recordSeries } from './record-series.js';

const chartStyle: Readonly<
  Record<
    'heartRatePerMin' | 'breathsPerMin' | 'temperatureC' | 'etco2Mmhg' | 'vaporPct',
    { stroke: string; dash?: number[]; scale: string }
  >
> = {
  heartRatePerMin: { stroke: 'var(--chart-red)', scale: 'rate' },
  breathsPerMin: { stroke: 'var(--chart-blue)', dash: [8, 4], scale: 'rate' },
  temperatureC: { stroke: 'var(--chart-amber)', dash: [2, 3], scale: 'temperature' },
  etco2Mmhg: { stroke: 'var(--chart-green)', dash: [12, 4, 2, 4], scale: 'etco2' },
  vaporPct: { stroke: 'var(--chart-violet)', scale: 'vapor' },
};

type RecordChartProps = {
  readonly startedAt: string;
  readonly entries: readonly { readonly values: ProcedureEntryValues }[];
  readonly units: DisplayUnits;
  /** Right end of the time axis in minutes since the start. */
  readonly untilMinutes: number;
};

/** The logged vitals and event markers over the minutes since the start, with a text summary. */
export function RecordChart({ startedAt, entries, units, untilMinutes }: RecordChartProps) {
  const data = useMemo(
    () => recordSeries(startedAt, entries, units, untilMinutes),
    [startedAt, entries, units, untilMinutes],
  );
  const series: ChartSeries[] = useMemo(() => {
    const list: ChartSeries[] = (Object.keys(chartStyle) as (keyof typeof chartStyle)[]).map((field) => {
      const style = chartStyle[field];
      const { label, unit } = readingLabel(field, units);
      return {
        label: `${label} (${unit})`,
        values: data.readings[field],
        stroke: style.stroke,
        scale: style.scale,
        points: true,
        ...(style.dash === undefined ? {} : { dash: style.dash }),
      };
    });
    list.push({
      label: 'Event markers (listed below)',
      values: data.events,
      stroke: 'var(--chart-grey)',
      scale: 'events',
      points: false,
      width: 1.5,
      dash: [3, 4],
    });
    return list;
  }, [data, units]);
  if (data.minutes.length === 0)
    return <p className="hint record-chart-empty">The chart appears once rows are logged.</p>;
  const temperatureUnit = readingLabel('temperatureC', units).unit;
  const summary = `Logged vitals and events over ${untilMinutes} minutes since the start: ${entries.length - data.eventList.length} rows of vitals, ${data.eventList.length} events.`;
  return (
    <>
      <TimeChart
        x={data.minutes}
        xLabel="minutes since start"
        series={series}
        height={240}
        summary={summary}
        axes={[
          { scale: 'rate', label: 'HR, RR (/min)' },
          { scale: 'temperature', label: `Temp (${temperatureUnit})`, side: 'right' },
          { scale: 'etco2', label: `EtCO2 (${units.pressure})`, side: 'right' },
          { scale: 'vapor', label: 'Vaporiser (%)', side: 'right' },
        ]}
      />
      {data.eventList.length > 0 && (
        <p className="record-event-strip">
          <span className="record-event-strip-title">Event markers:</span>
          {data.eventList.map((event, index) => (
            <span key={index}>
              {event.minutes} min {eventLabels[event.eventType]}
            </span>
          ))}
        </p>
      )}
    </>
  );
}
