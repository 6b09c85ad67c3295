import { useEffect, useRef } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { resolveColour, useThemeGeneration } from './theme.js';

export type ChartSeries = {
  readonly label: string;
  readonly values: readonly (number | null)[];
  /** Stroke colour, any CSS colour, usually a theme variable such as `var(--chart-blue)`; patterns (dash) keep series apart when printed in black and white. */
  readonly stroke: string;
  readonly dash?: readonly number[];
  readonly width?: number;
  /** Axis scale key: series sharing a key share an axis. */
  readonly scale?: string;
  readonly points?: boolean;
  /** Fill between this series and the one with the given index (uncertainty bands). */
  readonly bandTo?: number;
};

export type ChartAxis = { readonly scale: string; readonly label: string; readonly side?: 'left' | 'right' };

type Props = {
  readonly x: readonly number[];
  readonly xLabel: string;
  readonly series: readonly ChartSeries[];
  readonly axes: readonly ChartAxis[];
  readonly height?: number;
  readonly title?: string;
  /** Accessible summary of what the chart shows. */
  readonly summary: string;
};

/**
 * A line chart over time drawn with uPlot (a charting library). Redraws data in place when the
 * inputs change so that typing stays smooth.
 */
export function TimeChart({ x, xLabel, series, axes, height = 260, title, summary }: Props) {
  const host = useRef<HTMLDivElement | null>(null);
  const plot = useRef<uPlot | null>(null);
  const themeGeneration = useThemeGeneration();

  const shape = JSON.stringify({
    labels: series.map((item) => [item.label, item.scale, item.stroke, item.dash, item.bandTo]),
    axes,
    title,
    height,
    themeGeneration,
  });

  useEffect(() => {
    const element = host.current;
    if (element === null) return undefined;
    const parsedAxes = axes;
    // Colours are read from the style sheet each time uPlot draws, so they follow the theme.
    // Cached per build; the chart is rebuilt when the theme changes.
    const resolved = new Map<string, string>();
    const colour = (css: string) => () => {
      let value = resolved.get(css);
      if (value === undefined) {
        value = resolveColour(css, element);
        resolved.set(css, value);
      }
      return value;
    };
    // The legend shows the value under the cursor or nothing: never uPlot's "--" placeholder.
    const legendValue = (_self: uPlot, value: number | null, _series: number, index: number | null) =>
      index === null || value === null || !Number.isFinite(value)
        ? ''
        : String(Math.round(value * 100) / 100);
    const options: uPlot.Options = {
      width: Math.max(320, element.clientWidth),
      height,
      ...(title === undefined ? {} : { title }),
      scales: { x: { time: false } },
      legend: { show: true },
      cursor: { drag: { x: false, y: false } },
      axes: [
        {
          label: xLabel,
          stroke: colour('var(--chart-axis)'),
          grid: { stroke: colour('var(--chart-grid)') },
          ticks: { stroke: colour('var(--chart-grid)') },
        },
        ...parsedAxes.map((axis) => ({
          scale: axis.scale,
          label: axis.label,
          side: axis.side === 'right' ? 1 : 3,
          stroke: colour('var(--chart-axis)'),
          grid: { show: axis.side !== 'right', stroke: colour('var(--chart-grid)') },
          ticks: { stroke: colour('var(--chart-grid)') },
        })),
      ],
      series: [
        { label: xLabel, value: legendValue },
        ...series.map((item) => ({
          label: item.label,
          stroke: colour(item.stroke),
          width: item.width ?? 2,
          scale: item.scale ?? parsedAxes[0]?.scale ?? 'y',
          ...(item.dash === undefined ? {} : { dash: [...item.dash] }),
          points: { show: item.points ?? false },
          spanGaps: true,
          value: legendValue,
        })),
      ],
      // A draw counter on the element lets tests and the benchmark see each redraw.
      hooks: {
        draw: [() => (element.dataset['drawn'] = String(Number(element.dataset['drawn'] ?? '0') + 1))],
      },
      bands: series.flatMap((item, index) =>
        item.bandTo === undefined
          ? []
          : [
              {
                series: [index + 1, item.bandTo + 1] as [number, number],
                fill: colour('var(--chart-band-fill)'),
              },
            ],
      ),
    };
    const instance = new uPlot(options, [[], ...series.map(() => [])] as uPlot.AlignedData, element);
    plot.current = instance;
    const resize = new ResizeObserver(() =>
      instance.setSize({ width: Math.max(320, element.clientWidth), height }),
    );
    resize.observe(element);
    return () => {
      resize.disconnect();
      instance.destroy();
      plot.current = null;
    };
    // The chart is rebuilt only when its shape changes; data updates go through setData below.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [shape]);

  useEffect(() => {
    plot.current?.setData([
      x as number[],
      ...series.map((item) => item.values as (number | null)[]),
    ] as uPlot.AlignedData);
  }, [x, series, shape]);

  return (
    <figure className="chart" aria-label={summary}>
      <div ref={host} />
      <figcaption className="visually-hidden">{summary}</figcaption>
    </figure>
  );
}
