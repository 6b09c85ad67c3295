/**
 * What the predicted-vs-observed chart draws, without React: the points of one milestone, the log
 * axes with their ticks, the identity line and the x1.5 band, and how many records fall within it.
 */
import type { EvidenceRow } from '../../contract/evidence-channels.js';
import type { EvidenceMilestoneId } from '../../core/evidence/observed.js';

/** The band drawn about the identity line: observed within x1.5 of predicted either way (assumption: a reading aid, not a clinical limit). */
export const evidenceBandFactor = 1.5;

/** The chart's size in SVG units and the room left for the axes. */
export const evidenceChartSize = {
  width: 420,
  height: 360,
  margin: { left: 56, right: 16, top: 16, bottom: 48 },
} as const;

/** Tick values on both log axes, in minutes; those within the axes are drawn. */
const tickValues = [0.1, 0.2, 0.5, 1, 2, 5, 10, 20, 50, 100, 200] as const;

export type EvidencePoint = {
  /** Predicted minutes for what was given (> 0). */
  readonly x: number;
  /** Observed minutes (> 0). */
  readonly y: number;
  /** Left out of the calibration. */
  readonly excluded: boolean;
  readonly id: number;
};

export type EvidenceChartData = {
  readonly points: readonly EvidencePoint[];
  /** Points whose observed / predicted is within x1.5 either way (the edges count as within). */
  readonly within: number;
  /** Both axes run from `low` to `high` minutes (the same range: the identity line is the diagonal). */
  readonly low: number;
  readonly high: number;
  readonly ticks: readonly number[];
  /** Predicted minutes to x in SVG units. */
  readonly x: (minutes: number) => number;
  /** Observed minutes to y in SVG units (up is later). */
  readonly y: (minutes: number) => number;
  /** The line observed = predicted x factor across the plot, as an SVG path. */
  readonly line: (factor: number) => string;
  /** The shaded band between x1.5 and /1.5, as a closed SVG path. */
  readonly band: string;
};

/**
 * The chart of one milestone.
 * @param rows the listed records; a record is drawn when it has both minutes of the milestone
 * @param milestone which milestone
 * @returns points, axes 1/1.6 below the smallest and 1.6x above the largest value (0.5 to 60 min
 *   with no points; never below 0.05 min), and the SVG geometry
 */
export function evidenceChartData(
  rows: readonly EvidenceRow[],
  milestone: EvidenceMilestoneId,
): EvidenceChartData {
  const { width, height, margin } = evidenceChartSize;
  const points = rows.flatMap((row): EvidencePoint[] => {
    const entry = row.milestones.find((candidate) => candidate.id === milestone);
    return entry?.observedMin != null && entry.predictedMin != null
      ? [{ x: entry.predictedMin, y: entry.observedMin, excluded: row.exclusion !== null, id: row.recordId }]
      : [];
  });
  const values = points.flatMap((point) => [point.x, point.y]);
  const low = values.length === 0 ? 0.5 : Math.max(0.05, Math.min(...values) / 1.6);
  const high = values.length === 0 ? 60 : Math.max(...values) * 1.6;
  const logLow = Math.log10(low);
  const logHigh = Math.log10(high);
  const plotWidth = width - margin.left - margin.right;
  const plotHeight = height - margin.top - margin.bottom;
  const x = (value: number) => margin.left + ((Math.log10(value) - logLow) / (logHigh - logLow)) * plotWidth;
  const y = (value: number) =>
    margin.top + plotHeight - ((Math.log10(value) - logLow) / (logHigh - logLow)) * plotHeight;
  const line = (factor: number) => `M${x(low)},${y(low * factor)} L${x(high)},${y(high * factor)}`;
  const ratioWithin = (ratio: number) => ratio <= evidenceBandFactor && ratio >= 1 / evidenceBandFactor;
  return {
    points,
    within: points.filter((point) => ratioWithin(point.y / point.x)).length,
    low,
    high,
    ticks: tickValues.filter((tick) => tick >= low && tick <= high),
    x,
    y,
    line,
    band: `${line(evidenceBandFactor)} L${x(high)},${y(high / evidenceBandFactor)} L${x(low)},${y(low / evidenceBandFactor)} Z`,
  };
}
