/**
 * The data behind the stacked strip charts (planning depth, airway gas, the record): plain
 * functions, no DOM, so that what the chart draws, what the cursor reads out and what the table
 * lists come from one place and can be tested alone.
 */

/** How a line is drawn: a colour from the theme (`var(--chart-...)`), a dash pattern, a width. */
export type LineStyle = {
  /** A CSS colour, always a theme variable, e.g. `var(--chart-blue)`. */
  readonly stroke: string;
  /** Dash pattern in pixels; empty or absent for a solid line. Keeps lines apart without colour. */
  readonly dash?: readonly number[];
  readonly width?: number;
};

export type StripLine = LineStyle & {
  readonly id: string;
  readonly label: string;
  readonly unit: string;
  /** One value (or null) per point of the chart's time axis. */
  readonly values: readonly (number | null)[];
  /** Decimals shown in the read-out and the table. */
  readonly digits: number;
  /** Drawn as steps (a setting that holds until the next), not as a sloping line. */
  readonly steps?: boolean;
  /** Dots at each value (logged readings). */
  readonly points?: boolean;
  /** Shown in the read-out and the table; false for a line that only repeats a band's edge. */
  readonly listed?: boolean;
};

/** A shaded horizontal band of the strip's axis (a planned depth, a recovery zone). */
export type StripBand = {
  readonly id: string;
  readonly label: string;
  readonly from: number;
  readonly to: number;
  /** Fill colour variable, e.g. `var(--chart-depth-fill)`. */
  readonly fill: string;
};

/** A level drawn across a strip with its name at the right-hand edge (a milestone threshold). */
export type StripLevel = LineStyle & { readonly id: string; readonly label: string; readonly value: number };

/** A lighter area between two curves (the 5-95 % band of the model runs). */
export type StripArea = {
  readonly label: string;
  readonly low: readonly (number | null)[];
  readonly high: readonly (number | null)[];
  readonly fill: string;
  readonly edge: LineStyle;
};

export type StripRange = { readonly min: number; readonly max: number };

export type Strip = {
  readonly id: string;
  /** Axis title, e.g. "Brain (× MAC)". */
  readonly title: string;
  readonly range: StripRange;
  readonly ticks: readonly number[];
  /** Relative height: the main strip 3, a small strip 1. */
  readonly weight: number;
  readonly lines: readonly StripLine[];
  readonly bands?: readonly StripBand[];
  readonly levels?: readonly StripLevel[];
  readonly area?: StripArea;
};

/** A moment marked across the strips (a phase change, an event) or on one strip (a milestone). */
export type StripMarker = {
  readonly atMin: number;
  /** Short text drawn by the marker, e.g. "2" or a route's name. */
  readonly mark: string;
  /** Drawn instead of `mark` where the mark does not fit before the next marker (e.g. "P2"). */
  readonly shortMark?: string;
  /** Full words for the key and the read-out. */
  readonly label: string;
  readonly kind: 'phase' | 'milestone' | 'event';
  /** For a milestone: the strip and the level at which to draw it. */
  readonly stripId?: string;
  readonly value?: number;
};

/** A stretch of time shaded across every strip (the room-air gap while a bird is moved). */
export type StripSpan = { readonly fromMin: number; readonly toMin: number; readonly label: string };

export type StripChartData = {
  /** Minutes, ascending. */
  readonly x: readonly number[];
  readonly xMax: number;
  readonly xLabel: string;
  readonly strips: readonly Strip[];
  readonly markers: readonly StripMarker[];
  readonly spans: readonly StripSpan[];
  /**
   * The points the keyboard cursor stops at and the table lists (indexes into x, ascending):
   * every logged row, or about one a minute along a computed curve.
   */
  readonly stops: readonly number[];
};

/**
 * Brain level as a multiple of the bird's MAC.
 * @param brainPct brain partial pressure, vol %
 * @param macPct the MAC in use, vol % (> 0)
 */
export function macMultipleSeries(brainPct: readonly number[], macPct: number): number[] {
  if (!(macPct > 0)) return brainPct.map(() => 0);
  return brainPct.map((value) => value / macPct);
}

export type StepPoint = { readonly minute: number; readonly value: number };

/**
 * A setting drawn as steps: each holds until the next one (a vaporiser does not slide between
 * settings). Returns the corner points of the step line.
 * @param points minutes and settings, ascending by minute
 * @param untilMin where the last setting is drawn to
 */
export function stepCorners(points: readonly StepPoint[], untilMin: number): StepPoint[] {
  const corners: StepPoint[] = [];
  points.forEach((point, index) => {
    const previous = corners.at(-1);
    if (index > 0 && previous !== undefined) corners.push({ minute: point.minute, value: previous.value });
    corners.push(point);
  });
  const last = corners.at(-1);
  if (last !== undefined && untilMin > last.minute) corners.push({ minute: untilMin, value: last.value });
  return corners;
}

/**
 * The setting in force at each minute of x: the last step at or before it; null before the first.
 * @param steps settings ascending by minute
 */
export function stepValuesAt(steps: readonly StepPoint[], x: readonly number[]): (number | null)[] {
  let at = -1;
  return x.map((minute) => {
    while (at + 1 < steps.length && (steps[at + 1]?.minute ?? Infinity) <= minute + 1e-9) at += 1;
    return at < 0 ? null : (steps[at]?.value ?? null);
  });
}

/**
 * About one stop a minute along a computed curve: the first point at or after each whole minute
 * (or every `everyMin`), and the last point.
 * @param x minutes ascending
 * @param everyMin spacing of the stops, > 0
 */
export function evenStops(x: readonly number[], everyMin = 1): number[] {
  const stops: number[] = [];
  let next = x[0] ?? 0;
  x.forEach((minute, index) => {
    if (minute + 1e-9 >= next) {
      stops.push(index);
      next = Math.floor(minute / everyMin + 1e-9) * everyMin + everyMin;
    }
  });
  if (x.length > 0 && stops.at(-1) !== x.length - 1) stops.push(x.length - 1);
  return stops;
}

/** Keys the chart answers when it has focus. */
export type CursorKey = 'ArrowLeft' | 'ArrowRight' | 'Home' | 'End' | 'PageUp' | 'PageDown';

export function isCursorKey(key: string): key is CursorKey {
  return ['ArrowLeft', 'ArrowRight', 'Home', 'End', 'PageUp', 'PageDown'].includes(key);
}

/**
 * Where the cursor goes on a key: one stop left or right, ten with Page Up/Down, the first or the
 * last with Home/End. With no cursor yet, Right and Home start at the first stop, Left and End at
 * the last. A cursor between stops (left by the pointer) moves to the next stop in that direction.
 * @param current index into x of the cursor, or null
 * @param stops indexes into x, ascending
 * @returns the new index into x, or null when there are no stops
 */
export function moveCursor(
  current: number | null,
  key: CursorKey,
  stops: readonly number[],
  pageSize = 10,
): number | null {
  const first = stops[0];
  const last = stops.at(-1);
  if (first === undefined || last === undefined) return null;
  if (key === 'Home') return first;
  if (key === 'End') return last;
  const forward = key === 'ArrowRight' || key === 'PageDown';
  const count = key === 'PageUp' || key === 'PageDown' ? pageSize : 1;
  if (current === null) return forward ? first : last;
  let position: number;
  if (forward) {
    // The last stop at or before the cursor, then count stops on.
    let before = -1;
    stops.forEach((stop, index) => {
      if (stop <= current) before = index;
    });
    position = before + count;
  } else {
    let after = stops.length;
    for (let index = stops.length - 1; index >= 0; index -= 1)
      if ((stops[index] ?? 0) >= current) after = index;
    position = after - count;
  }
  return stops[Math.max(0, Math.min(stops.length - 1, position))] ?? null;
}

/**
 * The index of x nearest a minute (for the pointer).
 * @param x minutes ascending
 */
export function nearestIndex(x: readonly number[], minute: number): number | null {
  if (x.length === 0) return null;
  let best = 0;
  x.forEach((value, index) => {
    if (Math.abs(value - minute) < Math.abs((x[best] ?? 0) - minute)) best = index;
  });
  return best;
}

/** A number with at most `digits` decimals, trailing zeros dropped. */
export function figureText(value: number, digits: number): string {
  const factor = 10 ** digits;
  return String(Math.round(value * factor) / factor);
}

/** Minutes as the read-out and the table show them. */
export function minuteText(minute: number): string {
  return `${figureText(minute, 1)} min`;
}

export type ReadOut = {
  readonly minute: number;
  readonly values: readonly { readonly id: string; readonly label: string; readonly text: string }[];
  /** Markers at this point (within half a stop), e.g. an event or a phase change. */
  readonly notes: readonly string[];
};

/** Every line of the chart that the read-out and the table list, in strip order. */
export function listedLines(data: StripChartData): StripLine[] {
  return data.strips.flatMap((strip) => strip.lines.filter((line) => line.listed !== false));
}

/**
 * The values under the cursor: each listed line's value with its unit, or nothing for a line with
 * no value there (never a placeholder such as "--").
 */
export function readOutAt(data: StripChartData, index: number): ReadOut | null {
  const minute = data.x[index];
  if (minute === undefined) return null;
  const values = listedLines(data).flatMap((line) => {
    const value = line.values[index];
    return value === null || value === undefined || !Number.isFinite(value)
      ? []
      : [{ id: line.id, label: line.label, text: `${figureText(value, line.digits)} ${line.unit}`.trim() }];
  });
  const previous = data.x[index - 1] ?? -Infinity;
  const notes = data.markers
    .filter((marker) => marker.atMin <= minute + 1e-9 && marker.atMin > previous + 1e-9)
    .map((marker) => marker.label);
  return { minute, values, notes };
}

/** The read-out as one sentence for the live region, e.g. "12 min: Brain 1.21 × MAC; Dial 2.5 %". */
export function readOutText(readOut: ReadOut): string {
  const parts = readOut.values.map((value) => `${value.label} ${value.text}`);
  const notes = readOut.notes.length === 0 ? '' : `. ${readOut.notes.join('; ')}`;
  return `${minuteText(readOut.minute)}: ${parts.length === 0 ? 'no values' : parts.join('; ')}${notes}`;
}

export type ChartTable = {
  /** Header texts, units in brackets: "Time (min)", "Brain (× MAC)". */
  readonly headers: readonly string[];
  /** One row per stop: minutes, then each listed line's value (empty where it has none). */
  readonly rows: readonly (readonly string[])[];
};

/** The chart's data as a table: the stops of the time axis and the values there, units in the headers. */
export function chartTable(data: StripChartData): ChartTable {
  const lines = listedLines(data);
  return {
    headers: [
      `Time (min)`,
      ...lines.map((line) => (line.unit === '' ? line.label : `${line.label} (${line.unit})`)),
    ],
    rows: data.stops.map((index) => [
      figureText(data.x[index] ?? 0, 1),
      ...lines.map((line) => {
        const value = line.values[index];
        return value === null || value === undefined || !Number.isFinite(value)
          ? ''
          : figureText(value, line.digits);
      }),
    ]),
  };
}

/**
 * Round axis ticks from min to max, about `count` of them.
 * @param range min < max
 */
export function niceTicks(range: StripRange, count = 4): number[] {
  const span = range.max - range.min;
  if (!(span > 0)) return [range.min];
  const raw = span / count;
  const magnitude = 10 ** Math.floor(Math.log10(raw));
  const step = ([1, 2, 2.5, 5, 10].map((factor) => factor * magnitude).find((value) => value >= raw) ??
    10 * magnitude) as number;
  const ticks: number[] = [];
  for (let value = Math.ceil(range.min / step - 1e-9) * step; value <= range.max + 1e-9; value += step)
    ticks.push(Math.round(value / step) * step + 0);
  return ticks;
}

/** Time ticks: whole minutes at a step that gives at most about twelve. */
export function timeTicks(xMax: number): number[] {
  const step = [1, 2, 5, 10, 15, 30, 60, 120].find((value) => xMax / value <= 12) ?? 240;
  const ticks: number[] = [];
  for (let minute = 0; minute <= xMax + 1e-9; minute += step) ticks.push(minute);
  return ticks;
}

/**
 * A range that holds every value of a strip: `base` widened by `step` until nothing falls outside.
 * @param base the strip's usual range
 * @param step > 0
 */
export function widenedRange(
  base: StripRange,
  step: number,
  values: Iterable<number | null | undefined>,
): StripRange {
  let { min, max } = base;
  for (const value of values) {
    if (value === null || value === undefined || !Number.isFinite(value)) continue;
    while (value > max) max += step;
    while (value < min) min -= step;
  }
  return { min, max };
}
