import { useMemo } from 'react';
import type { ProcedureEntryValues } from '../../contract/records.js';
import { readingLabel, type DisplayUnits } from './entry-form.js';
import { eventLabels } from '../../core/procedure-events.js';
import { recordSeries, type ChartedReading } from './record-series.js';
import { dialSteps, fixedStripRange, stripRange } from './strip-ranges.js';

const width = 1000;
const left = 112;
const right = 16;
const stripHeight = 64;
const gap = 10;
const top = 22;
const bottom = 30;

/** Strip order: the dial first (what was given), then the vital signs. */
const stripOrder: readonly ChartedReading[] = [
  'vaporPct',
  'heartRatePerMin',
  'breathsPerMin',
  'temperatureC',
  'etco2Mmhg',
];

function tickStep(spanMin: number): number {
  for (const step of [1, 2, 5, 10, 15, 30, 60]) if (spanMin / step <= 12) return step;
  return 120;
}

function figureText(value: number): string {
  return String(Math.round(value * 10) / 10);
}

/**
 * The logged record as small stacked strips over the minutes since the start, drawn as SVG so
 * that it prints sharp in black and white: the dial as steps, each vital sign on its own fixed
 * axis, numbered event markers across all strips (the numbers are listed below the chart).
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
    () => recordSeries(startedAt, entries, units, untilMinutes),
    [startedAt, entries, units, untilMinutes],
  );
  const spanMin = Math.max(5, untilMinutes, data.minutes.at(-1) ?? 0);
  const x = (minute: number) => left + (Math.max(0, minute) / spanMin) * (width - left - right);
  const height = top + stripOrder.length * (stripHeight + gap) - gap + bottom;
  const ticks: number[] = [];
  const step = tickStep(spanMin);
  for (let minute = 0; minute <= spanMin; minute += step) ticks.push(minute);

  const strips = stripOrder.map((field, index) => {
    const values = data.readings[field];
    const range = stripRange(fixedStripRange(field, units), values);
    const y0 = top + index * (stripHeight + gap);
    const y = (value: number) =>
      y0 + stripHeight - ((value - range.min) / (range.max - range.min)) * stripHeight;
    const points = data.minutes
      .map((minute, at) => ({ minute, value: values[at] ?? null }))
      .filter((point): point is { minute: number; value: number } => point.value !== null);
    const line = field === 'vaporPct' ? dialSteps(points, spanMin) : points;
    const { label, unit } = readingLabel(field, units);
    return { field, range, y0, y, points, line, label: field === 'vaporPct' ? 'Dial' : label, unit };
  });

  const summary = `Logged record over ${Math.round(spanMin)} minutes: ${strips
    .map((strip) => `${strip.label} ${strip.points.length} readings`)
    .join(', ')}; ${data.eventList.length} events.`;

  return (
    <figure className="record-strips">
      <svg
        viewBox={`0 0 ${width} ${height}`}
        role="img"
        aria-label={summary}
        preserveAspectRatio="xMidYMid meet"
      >
        {strips.map((strip) => (
          <g key={strip.field}>
            <rect
              x={left}
              y={strip.y0}
              width={width - left - right}
              height={stripHeight}
              fill="none"
              stroke="#000"
              strokeWidth={0.8}
            />
            <line
              x1={left}
              x2={width - right}
              y1={strip.y((strip.range.min + strip.range.max) / 2)}
              y2={strip.y((strip.range.min + strip.range.max) / 2)}
              stroke="#999"
              strokeWidth={0.5}
              strokeDasharray="2 3"
            />
            <text x={4} y={strip.y0 + 14} className="strip-label">
              {strip.label}
            </text>
            <text x={4} y={strip.y0 + 30} className="strip-unit">
              {strip.unit}
            </text>
            {[strip.range.max, (strip.range.min + strip.range.max) / 2, strip.range.min].map((value) => (
              <text key={value} x={left - 4} y={strip.y(value) + 4} textAnchor="end" className="strip-tick">
                {figureText(value)}
              </text>
            ))}
            {strip.line.length > 1 && (
              <polyline
                points={strip.line.map((point) => `${x(point.minute)},${strip.y(point.value)}`).join(' ')}
                fill="none"
                stroke="#000"
                strokeWidth={strip.field === 'vaporPct' ? 2 : 1.4}
              />
            )}
            {strip.points.map((point, at) => (
              <circle key={at} cx={x(point.minute)} cy={strip.y(point.value)} r={2.6} fill="#000" />
            ))}
          </g>
        ))}
        {data.eventList.map((event, index) => (
          <g key={index}>
            <line
              x1={x(event.minutes)}
              x2={x(event.minutes)}
              y1={top - 4}
              y2={height - bottom}
              stroke="#555"
              strokeWidth={0.8}
              strokeDasharray="4 3"
            />
            <text x={x(event.minutes)} y={top - 7} textAnchor="middle" className="strip-event">
              {index + 1}
            </text>
          </g>
        ))}
        {ticks.map((minute) => (
          <text
            key={minute}
            x={x(minute)}
            y={height - bottom + 14}
            textAnchor="middle"
            className="strip-tick"
          >
            {minute}
          </text>
        ))}
        <text x={width - right} y={height - 4} textAnchor="end" className="strip-unit">
          minutes since the start
        </text>
      </svg>
      {data.eventList.length > 0 && (
        <figcaption className="record-strips-events">
          Events:{' '}
          {data.eventList.map((event, index) => (
            <span key={index}>
              {index + 1} {eventLabels[event.eventType]} at {figureText(event.minutes)} min
              {index < data.eventList.length - 1 ? '; ' : ''}
            </span>
          ))}
        </figcaption>
      )}
    </figure>
  );
}
