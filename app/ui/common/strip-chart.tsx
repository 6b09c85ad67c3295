import { useEffect, useId, useMemo, useRef, useState, type KeyboardEvent, type PointerEvent } from 'react';
import { ScrollRegion } from './scroll-region.js';
import {
  chartTable,
  figureText,
  isCursorKey,
  listedLines,
  minuteText,
  moveCursor,
  nearestIndex,
  readOutAt,
  readOutText,
  stepCorners,
  timeTicks,
  type LineStyle,
  type Strip,
  type StripChartData,
  type StripLine,
  type StripMarker,
} from './strip-chart-model.js';

const margin = { left: 62, right: 122, top: 34, bottom: 36 };
const stripGap = 24;
/** Width the static (printed) chart is laid out at; it scales to the column. */
const printWidth = 720;

type Props = {
  readonly data: StripChartData;
  /** Accessible name, e.g. "Predicted depth over time". */
  readonly label: string;
  /** One or two sentences on what the chart shows, for a screen reader and the printout's alt text. */
  readonly summary: string;
  /** Height of the strips together, px (margins added). */
  readonly height?: number;
  /** false for paper: no cursor, no table toggle, laid out at a fixed width that scales. */
  readonly interactive?: boolean;
  /** Called once the chart is on the page (the printed worksheet waits for it). */
  readonly onDrawn?: () => void;
  /** Extra key lines below the legend (milestone marks, bases). */
  readonly keyNotes?: readonly string[];
};

function dashText(style: LineStyle): string | undefined {
  return style.dash === undefined || style.dash.length === 0 ? undefined : style.dash.join(' ');
}

function strokeStyle(style: LineStyle) {
  return { stroke: style.stroke, strokeWidth: style.width ?? 2, strokeDasharray: dashText(style) };
}

/** A short line in the line's own stroke and dash, for the key. */
export function LineSwatch({ style }: { readonly style: LineStyle }) {
  return (
    <svg
      className="strip-swatch"
      width="34"
      height="10"
      viewBox="0 0 34 10"
      aria-hidden="true"
      focusable="false"
    >
      <line x1="0" y1="5" x2="34" y2="5" style={{ ...strokeStyle(style), fill: 'none' }} />
    </svg>
  );
}

function FillSwatch({ fill, edge }: { readonly fill: string; readonly edge?: LineStyle }) {
  return (
    <svg
      className="strip-swatch"
      width="34"
      height="10"
      viewBox="0 0 34 10"
      aria-hidden="true"
      focusable="false"
    >
      <rect
        x="0.5"
        y="0.5"
        width="33"
        height="9"
        style={{
          fill,
          stroke: edge?.stroke ?? 'var(--chart-grid)',
          strokeWidth: 1,
          strokeDasharray: edge === undefined ? undefined : dashText(edge),
        }}
      />
    </svg>
  );
}

type Layout = {
  readonly width: number;
  readonly height: number;
  readonly plotLeft: number;
  readonly plotRight: number;
  readonly xAt: (minute: number) => number;
  readonly strips: readonly {
    readonly strip: Strip;
    readonly top: number;
    readonly height: number;
    readonly yAt: (value: number) => number;
  }[];
};

function layoutOf(data: StripChartData, width: number, stripsHeight: number): Layout {
  const plotLeft = margin.left;
  // Room at the right for the level names; a narrow window (a zoomed one) keeps less.
  const named = data.strips.some((strip) => (strip.levels ?? []).length > 0);
  const plotRight = Math.max(plotLeft + 50, width - (named ? (width < 560 ? 92 : margin.right) : 16));
  const totalWeight = data.strips.reduce((sum, strip) => sum + strip.weight, 0) || 1;
  const usable = stripsHeight - stripGap * Math.max(0, data.strips.length - 1);
  let top = margin.top;
  const strips = data.strips.map((strip) => {
    const height = Math.max(24, (usable * strip.weight) / totalWeight);
    const stripTop = top;
    top += height + stripGap;
    const span = strip.range.max - strip.range.min || 1;
    const yAt = (value: number) => {
      const clamped = Math.min(strip.range.max, Math.max(strip.range.min, value));
      return stripTop + height - ((clamped - strip.range.min) / span) * height;
    };
    return { strip, top: stripTop, height, yAt };
  });
  const xMax = data.xMax > 0 ? data.xMax : 1;
  return {
    width,
    height: top - stripGap + margin.bottom,
    plotLeft,
    plotRight,
    xAt: (minute) => plotLeft + (Math.min(xMax, Math.max(0, minute)) / xMax) * (plotRight - plotLeft),
    strips,
  };
}

/** The polyline points of a line: non-null values joined (gaps spanned), or steps for a setting. */
function linePoints(
  line: StripLine,
  x: readonly number[],
  xMax: number,
): { minute: number; value: number }[] {
  const points: { minute: number; value: number }[] = [];
  line.values.forEach((value, index) => {
    const minute = x[index];
    if (value === null || value === undefined || minute === undefined || !Number.isFinite(value)) return;
    if (line.steps === true) {
      // Only where the setting changes; the corners come from stepCorners.
      if (points.at(-1)?.value === value) return;
    }
    points.push({ minute, value });
  });
  if (line.steps !== true) return points;
  let lastMinute = 0;
  line.values.forEach((value, index) => {
    if (value !== null && value !== undefined) lastMinute = x[index] ?? lastMinute;
  });
  return stepCorners(points, Math.min(xMax, lastMinute));
}

function StripDrawing({
  layout,
  entry,
  data,
}: {
  readonly layout: Layout;
  readonly entry: Layout['strips'][number];
  readonly data: StripChartData;
}) {
  const { strip, top, height, yAt } = entry;
  const { plotLeft, plotRight, xAt } = layout;
  const area = strip.area;
  let areaPath: string | null = null;
  if (area !== undefined) {
    const upper: string[] = [];
    const lower: string[] = [];
    data.x.forEach((minute, index) => {
      const low = area.low[index];
      const high = area.high[index];
      if (low === null || low === undefined || high === null || high === undefined) return;
      upper.push(`${xAt(minute).toFixed(1)},${yAt(high).toFixed(1)}`);
      lower.unshift(`${xAt(minute).toFixed(1)},${yAt(low).toFixed(1)}`);
    });
    if (upper.length > 1) areaPath = `M${upper.join('L')}L${lower.join('L')}Z`;
  }
  return (
    <g className="strip" data-strip={strip.id}>
      {(strip.bands ?? []).map((band) => (
        <rect
          key={band.id}
          className="strip-band"
          data-band={band.id}
          x={plotLeft}
          width={plotRight - plotLeft}
          y={yAt(Math.max(band.from, band.to))}
          height={Math.max(0, yAt(Math.min(band.from, band.to)) - yAt(Math.max(band.from, band.to)))}
          style={{ fill: band.fill }}
        />
      ))}
      {strip.ticks.map((tick) => (
        <g key={tick}>
          <line
            x1={plotLeft}
            x2={plotRight}
            y1={yAt(tick)}
            y2={yAt(tick)}
            style={{ stroke: 'var(--chart-grid)', strokeWidth: 1 }}
          />
          <text x={plotLeft - 6} y={yAt(tick) + 4} textAnchor="end" className="strip-axis-text">
            {figureText(tick, 2)}
          </text>
        </g>
      ))}
      {areaPath !== null && area !== undefined && (
        <path className="strip-area" d={areaPath} style={{ fill: area.fill, ...strokeStyle(area.edge) }} />
      )}
      {(strip.levels ?? []).map((level) => (
        <g key={level.id} data-level={level.id}>
          <line
            x1={plotLeft}
            x2={plotRight}
            y1={yAt(level.value)}
            y2={yAt(level.value)}
            style={strokeStyle(level)}
          />
          <text x={plotRight + 6} y={yAt(level.value) + 4} className="strip-level-text">
            {level.label}
          </text>
        </g>
      ))}
      {strip.lines.map((line) => {
        const points = linePoints(line, data.x, data.xMax);
        return (
          <g key={line.id} data-line={line.id}>
            {points.length > 1 && (
              <polyline
                points={points
                  .map((point) => `${xAt(point.minute).toFixed(1)},${yAt(point.value).toFixed(1)}`)
                  .join(' ')}
                style={{ fill: 'none', ...strokeStyle(line), strokeLinejoin: 'round' }}
              />
            )}
            {line.points === true &&
              line.values.map((value, index) =>
                value === null || value === undefined ? null : (
                  <circle
                    key={index}
                    cx={xAt(data.x[index] ?? 0)}
                    cy={yAt(value)}
                    r={2.8}
                    style={{ fill: line.stroke }}
                  />
                ),
              )}
          </g>
        );
      })}
      <rect
        x={plotLeft}
        y={top}
        width={plotRight - plotLeft}
        height={height}
        style={{ fill: 'none', stroke: 'var(--chart-axis)', strokeWidth: 1 }}
      />
      <text x={plotLeft} y={top - 6} className="strip-title">
        {strip.title}
      </text>
    </g>
  );
}

/**
 * Small stacked strips over one time axis, drawn as SVG: each strip its own axis and range,
 * settings as steps, shaded bands, a lighter uncertainty area, marked moments. Colours come from
 * the theme's variables (system colours in forced-colours mode) and every line has its own dash,
 * so the chart reads without colour and in black and white. On screen, with focus, the arrow keys
 * (Home/End, Page Up/Down) move a cursor along time, the values under it are read out (a polite
 * live region, shown as text too), and "Show as table" lists the same data.
 */
export function StripChart({
  data,
  label,
  summary,
  height = 300,
  interactive = true,
  onDrawn,
  keyNotes = [],
}: Props) {
  const host = useRef<HTMLDivElement | null>(null);
  const [measured, setMeasured] = useState(0);
  const [cursor, setCursor] = useState<number | null>(null);
  const [announced, setAnnounced] = useState('');
  const [showTable, setShowTable] = useState(false);
  const drawCount = useRef(0);
  const ids = useId();

  useEffect(() => {
    const element = host.current;
    if (!interactive || element === null) return undefined;
    setMeasured(element.clientWidth);
    const resize = new ResizeObserver(() => setMeasured(element.clientWidth));
    resize.observe(element);
    return () => resize.disconnect();
  }, [interactive]);

  const width = interactive ? Math.max(240, measured) : printWidth;
  const layout = useMemo(() => layoutOf(data, width, height), [data, width, height]);
  // A cursor past the end of new data (the plan got shorter) is dropped.
  const cursorIndex = cursor !== null && cursor < data.x.length ? cursor : null;
  const readOut = cursorIndex === null ? null : readOutAt(data, cursorIndex);
  const lines = listedLines(data);

  useEffect(() => {
    // A draw counter on the element lets the benchmark and the tests see each redraw.
    drawCount.current += 1;
    host.current?.setAttribute('data-drawn', String(drawCount.current));
    if (onDrawn !== undefined && (measured > 0 || !interactive)) onDrawn();
  }, [layout, onDrawn, measured, interactive]);

  const onKeyDown = (event: KeyboardEvent<HTMLDivElement>) => {
    if (event.key === 'Escape' && cursorIndex !== null) {
      setCursor(null);
      setAnnounced('');
      event.preventDefault();
      return;
    }
    if (!isCursorKey(event.key)) return;
    event.preventDefault();
    const next = moveCursor(cursorIndex, event.key, data.stops);
    setCursor(next);
    const text = next === null ? null : readOutAt(data, next);
    setAnnounced(text === null ? '' : readOutText(text));
  };
  const onPointerMove = (event: PointerEvent<SVGSVGElement>) => {
    const box = event.currentTarget.getBoundingClientRect();
    if (box.width === 0) return;
    const px = ((event.clientX - box.left) / box.width) * layout.width;
    if (px < layout.plotLeft || px > layout.plotRight) return;
    const minute = ((px - layout.plotLeft) / (layout.plotRight - layout.plotLeft)) * data.xMax;
    setCursor(nearestIndex(data.x, minute));
  };

  const bottom = layout.height - margin.bottom;
  const firstTop = layout.strips[0]?.top ?? margin.top;
  const cursorMinute = cursorIndex === null ? null : (data.x[cursorIndex] ?? null);
  const table = showTable ? chartTable(data) : null;
  const bands = data.strips.flatMap((strip) => strip.bands ?? []);
  const areas = data.strips.flatMap((strip) => (strip.area === undefined ? [] : [strip.area]));
  const levels = data.strips.flatMap((strip) => strip.levels ?? []);
  const markerKey = data.markers;
  // A phase's name where it fits before the next phase starts, else its short mark (the key says which).
  const markText = (marker: StripMarker, index: number): string => {
    if (marker.kind !== 'phase' || marker.shortMark === undefined) return marker.mark;
    const next = data.markers.slice(index + 1).find((other) => other.kind === 'phase');
    const room =
      (next === undefined ? layout.plotRight + margin.right : layout.xAt(next.atMin)) -
      layout.xAt(marker.atMin);
    return marker.mark.length * 6.4 + 10 <= room ? marker.mark : marker.shortMark;
  };

  const drawing = (
    <svg
      className="strip-chart-svg"
      viewBox={`0 0 ${layout.width} ${layout.height}`}
      width={interactive ? layout.width : '100%'}
      height={interactive ? layout.height : undefined}
      role="img"
      aria-label={summary}
      onPointerMove={interactive ? onPointerMove : undefined}
      onPointerLeave={interactive ? () => setCursor(null) : undefined}
    >
      {data.spans.map((span, index) => (
        <g key={index} className="strip-span">
          <rect
            x={layout.xAt(span.fromMin)}
            width={Math.max(2, layout.xAt(span.toMin) - layout.xAt(span.fromMin))}
            y={firstTop}
            height={bottom - firstTop}
            style={{ fill: 'var(--chart-gap-fill)' }}
          />
        </g>
      ))}
      {layout.strips.map((entry) => (
        <StripDrawing key={entry.strip.id} layout={layout} entry={entry} data={data} />
      ))}
      {data.markers.map((marker, index) => {
        const x = layout.xAt(marker.atMin);
        if (marker.kind === 'milestone') {
          const entry = layout.strips.find((item) => item.strip.id === marker.stripId) ?? layout.strips[0];
          if (entry === undefined) return null;
          const y = entry.yAt(marker.value ?? entry.strip.range.min);
          return (
            <g key={index} className="strip-milestone" data-marker={marker.label}>
              <line
                x1={x}
                x2={x}
                y1={y}
                y2={entry.top + entry.height}
                style={{ stroke: 'var(--chart-ink)', strokeWidth: 1, strokeDasharray: '1 3' }}
              />
              <circle
                cx={x}
                cy={y}
                r={8}
                style={{ fill: 'var(--chart-marker-fill)', stroke: 'var(--chart-ink)', strokeWidth: 1.2 }}
              />
              <text x={x} y={y + 4} textAnchor="middle" className="strip-marker-text">
                {marker.mark}
              </text>
            </g>
          );
        }
        return (
          <g key={index} className={`strip-${marker.kind}`} data-marker={marker.label}>
            <line
              x1={x}
              x2={x}
              y1={firstTop - 16}
              y2={bottom}
              style={{
                stroke: 'var(--chart-ink)',
                strokeWidth: marker.kind === 'phase' ? 1.5 : 1,
                strokeDasharray: marker.kind === 'phase' ? '6 3' : '3 4',
              }}
            />
            <text
              x={x + (marker.kind === 'phase' ? 4 : 0)}
              y={firstTop - 20}
              textAnchor={marker.kind === 'phase' ? 'start' : 'middle'}
              className="strip-marker-text"
            >
              {markText(marker, index)}
            </text>
          </g>
        );
      })}
      {timeTicks(data.xMax).map((minute) => (
        <text
          key={minute}
          x={layout.xAt(minute)}
          y={bottom + 15}
          textAnchor="middle"
          className="strip-axis-text"
        >
          {minute}
        </text>
      ))}
      <text x={layout.plotRight} y={bottom + 31} textAnchor="end" className="strip-axis-text">
        {data.xLabel}
      </text>
      {cursorMinute !== null && cursorIndex !== null && (
        <g className="strip-cursor">
          <line
            x1={layout.xAt(cursorMinute)}
            x2={layout.xAt(cursorMinute)}
            y1={firstTop}
            y2={bottom}
            style={{ stroke: 'var(--chart-cursor)', strokeWidth: 2 }}
          />
          {layout.strips.flatMap((entry) =>
            entry.strip.lines.map((line) => {
              const value = line.values[cursorIndex];
              return value === null || value === undefined ? null : (
                <circle
                  key={`${entry.strip.id}-${line.id}`}
                  cx={layout.xAt(cursorMinute)}
                  cy={entry.yAt(value)}
                  r={4}
                  style={{
                    fill: 'var(--chart-cursor)',
                    stroke: 'var(--chart-marker-fill)',
                    strokeWidth: 1.5,
                  }}
                />
              );
            }),
          )}
        </g>
      )}
    </svg>
  );

  const valueOf = (id: string) => readOut?.values.find((value) => value.id === id)?.text;
  return (
    <figure className={`chart strip-chart${interactive ? '' : ' strip-chart-static'}`}>
      <ul className="strip-legend" aria-label="Key">
        {lines.map((line) => {
          const value = valueOf(line.id);
          return (
            <li key={line.id} data-line={line.id}>
              <LineSwatch style={line} /> <span className="strip-legend-label">{line.label}</span>
              {value !== undefined && <strong className="strip-legend-value"> {value}</strong>}
            </li>
          );
        })}
        {areas.map((area) => (
          <li key={area.label}>
            <FillSwatch fill={area.fill} edge={area.edge} /> {area.label}
          </li>
        ))}
        {bands.map((band) => (
          <li key={band.id}>
            <FillSwatch fill={band.fill} /> {band.label}
          </li>
        ))}
        {levels.length > 0 && (
          <li>
            <LineSwatch style={levels[0] as LineStyle} /> Milestone levels, named at the right
          </li>
        )}
        {data.spans.length > 0 && (
          <li>
            <FillSwatch fill="var(--chart-gap-fill)" /> {data.spans[0]?.label}
          </li>
        )}
      </ul>
      <div
        ref={host}
        className="strip-chart-plot"
        {...(interactive
          ? {
              tabIndex: 0,
              role: 'group',
              'aria-roledescription': 'chart',
              'aria-label': label,
              'aria-describedby': `${ids}-help`,
              onKeyDown,
            }
          : {})}
      >
        {drawing}
      </div>
      {markerKey.length > 0 && (
        <ul className="strip-marker-key" aria-label="Marked on the chart">
          {markerKey.map((marker, index) => (
            <li key={index}>
              <span className="strip-marker-badge" aria-hidden="true">
                {marker.kind === 'phase' ? (marker.shortMark ?? marker.mark) : marker.mark}
              </span>{' '}
              {marker.label}
            </li>
          ))}
        </ul>
      )}
      {keyNotes.map((note) => (
        <p key={note} className="strip-note">
          {note}
        </p>
      ))}
      {interactive && (
        <>
          <p id={`${ids}-help`} className="strip-help">
            With the chart focused, Left and Right move along time (Page Up and Page Down ten steps, Home and
            End to the ends); the values are read out here.
          </p>
          <p className="strip-readout" aria-live="polite" aria-atomic="true">
            {announced}
          </p>
          <button
            type="button"
            className="link-button strip-table-toggle"
            aria-expanded={showTable}
            aria-controls={`${ids}-table`}
            onClick={() => setShowTable((shown) => !shown)}
          >
            {showTable ? 'Hide the table' : 'Show as table'}
          </button>
          <div id={`${ids}-table`}>
            {table !== null && (
              <ScrollRegion label={`${label}, as a table`}>
                <table className="strip-table">
                  <caption>{label}</caption>
                  <thead>
                    <tr>
                      {table.headers.map((header) => (
                        <th key={header} scope="col">
                          {header}
                        </th>
                      ))}
                    </tr>
                  </thead>
                  <tbody>
                    {table.rows.map((row, index) => (
                      <tr key={index}>
                        {row.map((cell, column) =>
                          column === 0 ? (
                            <th key={column} scope="row">
                              {cell}
                            </th>
                          ) : (
                            <td key={column}>{cell}</td>
                          ),
                        )}
                      </tr>
                    ))}
                  </tbody>
                </table>
              </ScrollRegion>
            )}
          </div>
        </>
      )}
      <figcaption className="visually-hidden">
        {summary}
        {cursorMinute === null ? '' : ` Cursor at ${minuteText(cursorMinute)}.`}
      </figcaption>
    </figure>
  );
}
