import { stepCorners, widenedRange } from '../common/strip-chart-model.js';
import type { DisplayUnits } from './entry-form.js';
import type { ChartedReading } from './record-series.js';

/** A strip's fixed axis: the range drawn and the step by which it widens for a value outside it. */
export type StripRange = { readonly min: number; readonly max: number; readonly step: number };

/**
 * Fixed axes of the record's strips, in display units, wide enough that an ordinary drift (a
 * degree of temperature, ten beats) reads as small, as on a paper chart (common practice: a fixed
 * scale per vital sign, never auto-scaled to the data). Heart rate 0-600 /min covers small
 * psittacines under anaesthesia; breathing 0-80 /min; cloacal temperature 34-44 °C (93-111 °F);
 * EtCO2 0-80 mmHg (0-11 kPa); the dial 0-5 %.
 */
export function fixedStripRange(field: ChartedReading, units: DisplayUnits): StripRange {
  switch (field) {
    case 'heartRatePerMin':
      return { min: 0, max: 600, step: 100 };
    case 'breathsPerMin':
      return { min: 0, max: 80, step: 20 };
    case 'temperatureC':
      return units.temperature === 'C' ? { min: 34, max: 44, step: 2 } : { min: 93, max: 111, step: 3 };
    case 'etco2Mmhg':
      return units.pressure === 'mmHg' ? { min: 0, max: 80, step: 20 } : { min: 0, max: 11, step: 2 };
    case 'vaporPct':
      return { min: 0, max: 5, step: 1 };
  }
}

/**
 * The fixed range, widened by whole steps only when a logged value falls outside it, so that no
 * value is drawn off the strip and the scale still does not follow every reading.
 * @param values logged values in display units (nulls ignored)
 */
export function stripRange(fixed: StripRange, values: readonly (number | null)[]): StripRange {
  return { ...widenedRange(fixed, fixed.step, values), step: fixed.step };
}

/**
 * A dial drawn as steps: each setting holds until the next one (a vaporiser does not slide
 * between settings). Returns the corner points of the step line (the charts' one implementation,
 * stepCorners).
 * @param points logged minutes and settings, ascending by minute
 * @param untilMin where the last setting is drawn to
 */
export function dialSteps(
  points: readonly { readonly minute: number; readonly value: number }[],
  untilMin: number,
): { readonly minute: number; readonly value: number }[] {
  return stepCorners(points, untilMin);
}
