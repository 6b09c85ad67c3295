/**
 * Allometric estimates of a resting bird's ventilation, airway volumes and circulation.
 *
 * Body mass M is in kg inside the equations. Every estimate is returned with its basis: the
 * source and the body mass it was scaled to (the equations are in docs/model.md), 'measured' when
 * the clinic entered the value, or 'assumption'.
 */
import { sourceKindLabels } from '../sourced.js';
import {
  airSacVolumeFraction,
  allometricValue,
  bodyDensityGPerMl,
  breathingFrequencyAllometry,
  cardiacOutputAllometry,
  heartRateAllometry,
  exchangingLungShare,
  lungVolumeFraction,
  minuteVentilationAllometry,
  posteriorSacShare,
  strokeVolumeAllometry,
  tidalVolumeAllometry,
  trachealVolumeAllometry,
  type Allometric,
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
  return allometricValue(tidalVolumeAllometry, bodyMassG);
}

/**
 * Resting breathing frequency, Lasiewski & Calder 1971 (from memory): 17.2 * M^-0.31 per min.
 * @param bodyMassG body mass in g, 5-15000
 */
export function breathsPerMin(bodyMassG: number): number {
  return allometricValue(breathingFrequencyAllometry, bodyMassG);
}

/**
 * Separately fitted resting minute ventilation, Lasiewski & Calder 1971 (from memory):
 * 284 * M^0.77 mL/min. Reported for comparison only; the gas path uses tidal volume x rate.
 * @param bodyMassG body mass in g, 5-15000
 */
export function fittedMinuteVentilationMlMin(bodyMassG: number): number {
  return allometricValue(minuteVentilationAllometry, bodyMassG);
}

/**
 * Tracheal volume, Hinds & Calder 1971 (from memory): 3.72 * M^1.09 mL. Used as the
 * anatomical dead space of the gas path.
 * @param bodyMassG body mass in g, 5-15000
 */
export function trachealVolumeMl(bodyMassG: number): number {
  return allometricValue(trachealVolumeAllometry, bodyMassG);
}

/**
 * Resting heart rate, Grubb 1983 (Am J Physiol 245:H567-572): 178.5 * M^-0.282 per min.
 * @param bodyMassG body mass in g, 5-15000
 */
export function heartRatePerMin(bodyMassG: number): number {
  return allometricValue(heartRateAllometry, bodyMassG);
}

/**
 * Resting cardiac output, Grubb 1983 (Am J Physiol 245:H567-572): 290.7 * M^0.69 mL/min.
 * @param bodyMassG body mass in g, 5-15000
 */
export function cardiacOutputMlMin(bodyMassG: number): number {
  return allometricValue(cardiacOutputAllometry, bodyMassG);
}

/**
 * Stroke volume, Grubb 1983: 1.72 * M^0.97 mL. Used to turn a measured heart rate into a
 * cardiac output when only the rate is measured.
 * @param bodyMassG body mass in g, 5-15000
 */
export function strokeVolumeMl(bodyMassG: number): number {
  return allometricValue(strokeVolumeAllometry, bodyMassG);
}

/**
 * "Source, scaled to 0.095 kg (unverified value)" for an estimate's basis: the clinic reads the
 * citation and the kind; the equation itself is in docs/model.md.
 */
function equationBasis(equation: Allometric, massKgText: string): string {
  const kind = equation.kind === 'published' ? '' : ` (${sourceKindLabels[equation.kind]})`;
  return `${equation.basis}, scaled to ${massKgText}${kind}`;
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
  const massKgText = `${(bodyMassG / 1000).toPrecision(3)} kg`;
  const tidal = measuredOr(overrides.tidalVolumeMl, {
    value: tidalVolumeMl(bodyMassG),
    basis: equationBasis(tidalVolumeAllometry, massKgText),
  });
  const rate = measuredOr(overrides.breathsPerMin, {
    value: breathsPerMin(bodyMassG),
    basis: equationBasis(breathingFrequencyAllometry, massKgText),
  });
  const fitted = fittedMinuteVentilationMlMin(bodyMassG);
  const minuteVentilationBasis =
    tidal.basis === 'measured' || rate.basis === 'measured'
      ? 'tidal volume x breathing rate (from the measured values)'
      : `tidal volume x breathing rate (Lasiewski & Calder 1971, ${sourceKindLabels['from memory']}); their separately fitted minute ventilation gives ${fitted.toPrecision(3)} mL/min: the gas path needs a tidal volume and a rate that agree, so their product is used`;
  const trachea = measuredOr(overrides.trachealVolumeMl, {
    value: trachealVolumeMl(bodyMassG),
    basis: `tracheal volume, ${equationBasis(trachealVolumeAllometry, massKgText)}`,
  });
  const bodyVolumeMl = bodyMassG / bodyDensityGPerMl.value;
  const lung = measuredOr(overrides.lungVolumeMl, {
    value: lungVolumeFraction.value * exchangingLungShare.value * bodyVolumeMl,
    basis: `exchanging share ${(exchangingLungShare.value * 100).toFixed(1)} % (${exchangingLungShare.basis}) of a lung of ${(lungVolumeFraction.value * 100).toFixed(0)} % of body volume (${lungVolumeFraction.basis})`,
  });
  const sacs = measuredOr(overrides.airSacVolumeMl, {
    value: airSacVolumeFraction.value * bodyVolumeMl,
    basis: `${(airSacVolumeFraction.value * 100).toFixed(1)} % of body volume: ${airSacVolumeFraction.basis}`,
  });
  const splitBasis = `${posteriorSacShare.basis} (posterior ${(posteriorSacShare.value * 100).toFixed(0)} %)`;
  const heart = measuredOr(overrides.heartRatePerMin, {
    value: heartRatePerMin(bodyMassG),
    basis: equationBasis(heartRateAllometry, massKgText),
  });
  let output: Estimate;
  if (overrides.cardiacOutputMlMin !== undefined) {
    output = { value: overrides.cardiacOutputMlMin, basis: 'measured' };
  } else if (overrides.heartRatePerMin !== undefined) {
    output = {
      value: overrides.heartRatePerMin * strokeVolumeMl(bodyMassG),
      basis: `measured heart rate x stroke volume, ${equationBasis(strokeVolumeAllometry, massKgText)}`,
    };
  } else {
    output = {
      value: cardiacOutputMlMin(bodyMassG),
      basis: equationBasis(cardiacOutputAllometry, massKgText),
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
