import { describe, expect, it } from 'vitest';
import {
  chartTable,
  evenStops,
  macMultipleSeries,
  moveCursor,
  nearestIndex,
  niceTicks,
  readOutAt,
  readOutText,
  stepCorners,
  stepValuesAt,
  widenedRange,
  type StripChartData,
} from '../../../app/ui/common/strip-chart-model.js';

/** The value, or a failed test when it is missing. */
function must<T>(value: T | null | undefined): T {
  if (value === null || value === undefined) throw new Error('expected a value');
  return value;
}

/** A small chart: a curve with a gap and a dial, every value invented for the test. */
const data: StripChartData = {
  x: [0, 0.5, 1, 1.5, 2, 3],
  xMax: 3,
  xLabel: 'Minutes from the start',
  strips: [
    {
      id: 'depth',
      title: 'Brain (× MAC)',
      range: { min: 0, max: 2 },
      ticks: [0, 1, 2],
      weight: 3,
      lines: [
        {
          id: 'brain',
          label: 'Brain',
          unit: '× MAC',
          values: [0, 0.25, null, 0.753, 1.1, 1.3],
          digits: 2,
          stroke: 'var(--chart-blue)',
        },
      ],
    },
    {
      id: 'dial',
      title: 'Dial (%)',
      range: { min: 0, max: 5 },
      ticks: [0, 5],
      weight: 1,
      lines: [
        {
          id: 'dial',
          label: 'Dial',
          unit: '%',
          values: [4, 4, 4, 4, 2, 2],
          digits: 1,
          steps: true,
          stroke: 'var(--chart-amber)',
        },
      ],
    },
  ],
  markers: [{ atMin: 2, mark: '1', label: 'Phase 2 from 2 min: Endotracheal tube', kind: 'phase' }],
  spans: [],
  stops: [0, 2, 4, 5],
};

describe('the brain as a multiple of MAC', () => {
  it('divides the brain partial pressure by the MAC in use', () => {
    // Isoflurane MAC 1.45 % is an example value only; the division is what is checked.
    expect(macMultipleSeries([0, 0.725, 1.45, 2.175], 1.45)).toEqual([0, 0.5, 1, 1.5]);
  });
  it('gives zeros rather than infinities for a MAC of zero', () => {
    expect(macMultipleSeries([1, 2], 0)).toEqual([0, 0]);
  });
});

describe('the dial as steps', () => {
  it('holds each setting until the next one and to the end of the axis', () => {
    expect(
      stepCorners(
        [
          { minute: 0, value: 4 },
          { minute: 10, value: 2 },
          { minute: 90, value: 0 },
        ],
        120,
      ),
    ).toEqual([
      { minute: 0, value: 4 },
      { minute: 10, value: 4 },
      { minute: 10, value: 2 },
      { minute: 90, value: 2 },
      { minute: 90, value: 0 },
      { minute: 120, value: 0 },
    ]);
  });
  it('reads the setting in force at each minute, none before the first', () => {
    const steps = [
      { minute: 1, value: 4 },
      { minute: 10, value: 2 },
    ];
    expect(stepValuesAt(steps, [0, 1, 5, 9.99, 10, 30])).toEqual([null, 4, 4, 4, 2, 2]);
  });
});

describe('the cursor', () => {
  const stops = [0, 2, 4, 5];
  it('starts at the first stop with Right or Home and at the last with Left or End', () => {
    expect(moveCursor(null, 'ArrowRight', stops)).toBe(0);
    expect(moveCursor(null, 'Home', stops)).toBe(0);
    expect(moveCursor(null, 'ArrowLeft', stops)).toBe(5);
    expect(moveCursor(null, 'End', stops)).toBe(5);
  });
  it('moves one stop with the arrows and stays at the ends', () => {
    expect(moveCursor(0, 'ArrowRight', stops)).toBe(2);
    expect(moveCursor(2, 'ArrowRight', stops)).toBe(4);
    expect(moveCursor(5, 'ArrowRight', stops)).toBe(5);
    expect(moveCursor(4, 'ArrowLeft', stops)).toBe(2);
    expect(moveCursor(0, 'ArrowLeft', stops)).toBe(0);
  });
  it('moves ten stops (or to the end) with Page Up and Page Down', () => {
    const many = Array.from({ length: 30 }, (_, index) => index * 2);
    expect(moveCursor(0, 'PageDown', many)).toBe(20);
    expect(moveCursor(20, 'PageUp', many)).toBe(0);
    expect(moveCursor(50, 'PageDown', many)).toBe(58);
    expect(moveCursor(4, 'PageUp', many)).toBe(0);
  });
  it('from a point between stops (left by the pointer) goes to the next stop that way', () => {
    expect(moveCursor(3, 'ArrowRight', stops)).toBe(4);
    expect(moveCursor(3, 'ArrowLeft', stops)).toBe(2);
  });
  it('has nowhere to go without stops', () => {
    expect(moveCursor(null, 'ArrowRight', [])).toBeNull();
  });
  it('follows the pointer to the nearest point', () => {
    expect(nearestIndex(data.x, 1.6)).toBe(3);
    expect(nearestIndex([], 1)).toBeNull();
  });
});

describe('the read-out under the cursor', () => {
  it('lists each value with its unit and the marks at that point', () => {
    const readOut = readOutAt(data, 4);
    expect(readOut).not.toBeNull();
    expect(readOutText(must(readOut))).toBe(
      '2 min: Brain 1.1 × MAC; Dial 2 %. Phase 2 from 2 min: Endotracheal tube',
    );
  });
  it('leaves out a line with no value there, never a placeholder', () => {
    const readOut = must(readOutAt(data, 2));
    expect(readOut.values.map((value) => value.id)).toEqual(['dial']);
    expect(readOutText(readOut)).not.toMatch(/--/);
    expect(readOutText(must(readOutAt(data, 3)))).toBe('1.5 min: Brain 0.75 × MAC; Dial 4 %');
  });
  it('has nothing outside the data', () => {
    expect(readOutAt(data, 9)).toBeNull();
  });
});

describe('the table of the same data', () => {
  it('has one row per stop, the time first, units in the headers, blanks where a value is missing', () => {
    expect(chartTable(data)).toEqual({
      headers: ['Time (min)', 'Brain (× MAC)', 'Dial (%)'],
      rows: [
        ['0', '0', '4'],
        ['1', '', '4'],
        ['2', '1.1', '2'],
        ['3', '1.3', '2'],
      ],
    });
  });
});

describe('stops, ticks and ranges', () => {
  it('puts about one stop a minute along a finely sampled curve, and one at the end', () => {
    const x = Array.from({ length: 41 }, (_, index) => index * 0.25);
    expect(evenStops(x, 1).map((index) => x[index])).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    expect(evenStops([0, 0.4, 0.9, 1.3], 1).map((index) => [0, 0.4, 0.9, 1.3][index])).toEqual([0, 1.3]);
  });
  it('gives round ticks', () => {
    expect(niceTicks({ min: 0, max: 2 })).toEqual([0, 0.5, 1, 1.5, 2]);
    expect(niceTicks({ min: 0, max: 600 })).toEqual([0, 200, 400, 600]);
  });
  it('widens a range by whole steps only for a value outside it', () => {
    expect(widenedRange({ min: 34, max: 44 }, 2, [40.1, 39.1, null])).toEqual({ min: 34, max: 44 });
    expect(widenedRange({ min: 34, max: 44 }, 2, [31.5, 45])).toEqual({ min: 30, max: 46 });
  });
});
