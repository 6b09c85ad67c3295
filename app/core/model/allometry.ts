/**
 * Allometric estimates of a resting bird's ventilation, airway volumes and circulation.
 *
 * Body mass M is in kg inside the equations. Every estimate is returned with its basis: the
 * equation and its source, 'measured' when the clinic entered the value, or 'assumption'.
 */
import {
  airSacVolumeFraction,
  bodyDensityGPerMl,
  lungVolumeFraction,
  posteriorSacShare,
} from './parameters.js';

export type Estimate = {
  readonly value: number;
  readonly basis: string;
};

/** Measured values that replace estimates. Any subset may be given. */
export type MeasuredOverrides = {
  readonly tidalVolumeMl?: number | undefined;
  readonly breathsPerMin?: number | undefined;
  readonly trachealVolumeMl?: number | undefined;
  readonly heartRatePerMin?: number | undefined;
  readonly cardiacOutputMlMin?: number | undefined;
  readonly lungVolumeMl?: number | undefined;
  readonly airSacVolumeMl?: number | undefined;
};

export type RespiratoryEstimates = {
  readonly tidalVolumeMl: Estimate;
  readonly breathsPerMin: Estimate;
  readonly minuteVentilationMlMin: Estimate;
  readonly trachealDeadSpaceMl: Estimate;
  readonly lungVolumeMl: Estimate;
  readonly anteriorSacsMl: Estimate;
  readonly posteriorSacsMl: Estimate;
  readonly airSacVolumeMl: Estimate;
  readonly heartRatePerMin: Estimate;
  readonly cardiacOutputMlMin: Estimate;
};

/**
 * Resting tidal volume, Lasiewski & Calder 1971 (from memory): 13.2 * M^1.08 mL.
 * @param bodyMassG body mass in g, 5-15000
 */
export function tidalVolumeMl(bodyMassG: number): number {
  return 13.2 * (bodyMassG / 1000) ** 1.08;
}

/**
 * Resting breathing frequency, Lasiewski & Calder 1971 (from memory): 17.2 * M^-0.31 per min.
 * @param bodyMassG body mass in g, 5-15000
 */
export function breathsPerMin(bodyMassG: number): number {
  return 17.2 * (bodyMassG / 1000) ** -0.31;
}

/**
 * Separately fitted resting minute ventilation, Lasiewski & Calder 1971 (from memory):
 * 284 * M^0.77 mL/min. Reported for comparison only; the gas path uses tidal volume x rate.
 * @param bodyMassG body mass in g, 5-15000
 */
export function fittedMinuteVentilationMlMin(bodyMassG: number): number {
  return 284 * (bodyMassG / 1000) ** 0.77;
}

/**
 * Tracheal volume, Hinds & Calder 1971 (from memory): 3.72 * M^1.09 mL. Used as the
 * anatomical dead space of the gas path.
 * @param bodyMassG body mass in g, 5-15000
 */
export function trachealVolumeMl(bodyMassG: number): number {
  return 3.72 * (bodyMassG / 1000) ** 1.09;
}

/**
 * Resting heart rate, Grubb 1983 (Am J Physiol 245:H567-572): 178.5 * M^-0.282 per min.
 * @param bodyMassG body mass in g, 5-15000
 */
export function heartRatePerMin(bodyMassG: number): number {
  return 178.5 * (bodyMassG / 1000) ** -0.282;
}

/**
 * Resting cardiac output, Grubb 1983 (Am J Physiol 245:H567-572): 290.7 * M^0.69 mL/min.
 * @param bodyMassG body mass in g, 5-15000
 */
export function cardiacOutputMlMin(bodyMassG: number): number {
  return 290.7 * (bodyMassG / 1000) ** 0.69;
}

/**
 * Stroke volume, Grubb 1983: 1.72 * M^0.97 mL. Used to turn a measured heart rate into a
 * cardiac output when only the rate is measured.
 * @param bodyMassG body mass in g, 5-15000
 */
export function strokeVolumeMl(bodyMassG: number): number {
  return 1.72 * (bodyMassG / 1000) ** 0.97;
}

function measuredOr(measured: number | undefined, estimate: Estimate): Estimate {
  return measured === undefined ? estimate : { value: measured, basis: 'measured' };
}

/**
 * All respiratory and circulatory estimates for one bird, with measured values in place of
 * estimates where given.
 * @param bodyMassG body mass in g, 5-15000
 * @param overrides measured values (all optional, each > 0)
 */
export function estimateRespiratory(
  bodyMassG: number,
  overrides: MeasuredOverrides = {},
): RespiratoryEstimates {
  const massKgText = `M = ${(bodyMassG / 1000).toPrecision(3)} kg`;
  const tidal = measuredOr(overrides.tidalVolumeMl, {
    value: tidalVolumeMl(bodyMassG),
    basis: `Lasiewski & Calder 1971 (from memory): 13.2 * M^1.08 mL, ${massKgText}`,
  });
  const rate = measuredOr(overrides.breathsPerMin, {
    value: breathsPerMin(bodyMassG),
    basis: `Lasiewski & Calder 1971 (from memory): 17.2 * M^-0.31 /min, ${massKgText}`,
  });
  const fitted = fittedMinuteVentilationMlMin(bodyMassG);
  const minuteVentilationBasis =
    tidal.basis === 'measured' || rate.basis === 'measured'
      ? 'tidal volume x breathing rate (from the measured values)'
      : `tidal volume x breathing rate (Lasiewski & Calder 1971, from memory); the separately fitted 284 * M^0.77 gives ${fitted.toPrecision(3)} mL/min: the gas path needs a tidal volume and a rate that agree, so their product is used`;
  const trachea = measuredOr(overrides.trachealVolumeMl, {
    value: trachealVolumeMl(bodyMassG),
    basis: `Hinds & Calder 1971 (from memory): tracheal volume 3.72 * M^1.09 mL, ${massKgText}`,
  });
  const bodyVolumeMl = bodyMassG / bodyDensityGPerMl.value;
  const lung = measuredOr(overrides.lungVolumeMl, {
    value: lungVolumeFraction.value * bodyVolumeMl,
    basis: `${(lungVolumeFraction.value * 100).toFixed(0)} % of body volume: ${lungVolumeFraction.basis}`,
  });
  const sacs = measuredOr(overrides.airSacVolumeMl, {
    value: airSacVolumeFraction.value * bodyVolumeMl,
    basis: `${(airSacVolumeFraction.value * 100).toFixed(1)} % of body volume: ${airSacVolumeFraction.basis}`,
  });
  const splitBasis = `${posteriorSacShare.basis} (posterior ${(posteriorSacShare.value * 100).toFixed(0)} %)`;
  const heart = measuredOr(overrides.heartRatePerMin, {
    value: heartRatePerMin(bodyMassG),
    basis: `Grubb 1983: 178.5 * M^-0.282 /min, ${massKgText}`,
  });
  let output: Estimate;
  if (overrides.cardiacOutputMlMin !== undefined) {
    output = { value: overrides.cardiacOutputMlMin, basis: 'measured' };
  } else if (overrides.heartRatePerMin !== undefined) {
    output = {
      value: overrides.heartRatePerMin * strokeVolumeMl(bodyMassG),
      basis: `measured heart rate x Grubb 1983 stroke volume 1.72 * M^0.97 mL, ${massKgText}`,
    };
  } else {
    output = {
      value: cardiacOutputMlMin(bodyMassG),
      basis: `Grubb 1983: 290.7 * M^0.69 mL/min, ${massKgText}`,
    };
  }
  return {
    tidalVolumeMl: tidal,
    breathsPerMin: rate,
    minuteVentilationMlMin: { value: tidal.value * rate.value, basis: minuteVentilationBasis },
    trachealDeadSpaceMl: trachea,
    lungVolumeMl: lung,
    anteriorSacsMl: {
      value: sacs.value * (1 - posteriorSacShare.value),
      basis: `air-sac volume split: ${splitBasis}`,
    },
    posteriorSacsMl: {
      value: sacs.value * posteriorSacShare.value,
      basis: `air-sac volume split: ${splitBasis}`,
    },
    airSacVolumeMl: sacs,
    heartRatePerMin: heart,
    cardiacOutputMlMin: output,
  };
}
