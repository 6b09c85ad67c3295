/**
 * Constants of the respiratory and uptake model that are not agent properties: the allometric
 * coefficients, the gas-path and body fractions, the milestone thresholds and the spreads of the
 * uncertainty run.
 *
 * Each constant is a Sourced value (app/core/sourced.ts) with its basis and the kind of that
 * basis; the model's own constants also carry the range the uncertainty run samples. Where no
 * avian measurement was found the value is a choice of ours and says 'assumption'.
 */
import type { Sourced } from '../sourced.js';

export type ModelParameter = Sourced<number> & {
  /** Inclusive range sampled by the uncertainty run (equal ends: not varied). */
  readonly range: readonly [number, number];
};

/** An allometric equation y = coefficient * M^exponent with M the body mass in kg. */
export type Allometric = Sourced<{ readonly coefficient: number; readonly exponent: number }> & {
  /** Unit of y. */
  readonly unit: string;
};

/** Resting tidal volume, mL. */
export const tidalVolumeAllometry: Allometric = {
  value: { coefficient: 13.2, exponent: 1.08 },
  unit: 'mL',
  basis: 'Lasiewski & Calder 1971, Respir Physiol 11:152-166',
  kind: 'from memory',
};

/** Resting breathing frequency, breaths/min. */
export const breathingFrequencyAllometry: Allometric = {
  value: { coefficient: 17.2, exponent: -0.31 },
  unit: '/min',
  basis: 'Lasiewski & Calder 1971, Respir Physiol 11:152-166',
  kind: 'from memory',
};

/** Separately fitted resting minute ventilation, mL/min (reported for comparison only). */
export const minuteVentilationAllometry: Allometric = {
  value: { coefficient: 284, exponent: 0.77 },
  unit: 'mL/min',
  basis: 'Lasiewski & Calder 1971, Respir Physiol 11:152-166',
  kind: 'from memory',
};

/** Tracheal volume (the anatomical dead space of the gas path), mL. */
export const trachealVolumeAllometry: Allometric = {
  value: { coefficient: 3.72, exponent: 1.09 },
  unit: 'mL',
  basis: 'Hinds & Calder 1971, Evolution 25:429-440',
  kind: 'from memory',
};

/** Resting heart rate, beats/min. */
export const heartRateAllometry: Allometric = {
  value: { coefficient: 178.5, exponent: -0.282 },
  unit: '/min',
  basis: 'Grubb 1983, Am J Physiol 245:H567-572',
  kind: 'published',
};

/** Resting cardiac output, mL/min. */
export const cardiacOutputAllometry: Allometric = {
  value: { coefficient: 290.7, exponent: 0.69 },
  unit: 'mL/min',
  basis: 'Grubb 1983, Am J Physiol 245:H567-572',
  kind: 'published',
};

/** Stroke volume, mL (turns a measured heart rate into a cardiac output). */
export const strokeVolumeAllometry: Allometric = {
  value: { coefficient: 1.72, exponent: 0.97 },
  unit: 'mL',
  basis: 'Grubb 1983, Am J Physiol 245:H567-572',
  kind: 'published',
};

/**
 * Value of an allometric equation.
 * @param equation coefficient and exponent
 * @param bodyMassG body mass in g, 5-15000
 */
export function allometricValue(equation: Allometric, bodyMassG: number): number {
  return equation.value.coefficient * (bodyMassG / 1000) ** equation.value.exponent;
}

/** Lung volume as a fraction of body volume. */
export const lungVolumeFraction: ModelParameter = {
  value: 0.02,
  range: [0.01, 0.03],
  basis:
    'Lung 1-3 % of body volume (unverified value; fixed lungs of 19 species scale with body mass to the power 0.988, Maina, Abdalla & King 1982, Acta Anat 112:264-270, coefficient units not read); only its exchanging share meets the blood (exchangingLungShare)',
  kind: 'from memory',
};

/**
 * Share of the lung volume that exchanges gas: the volume density of the exchange tissue (air and
 * blood capillaries) of the avian lung; the rest is bronchi, large vessels and septa.
 */
export const exchangingLungShare: ModelParameter = {
  value: 0.426,
  range: [0.346, 0.535],
  basis:
    'Volume density of the exchange tissue in the lungs of 19 avian species: 42.6 % in non-passerines, 53.5 % in passerines, 34.6 % in charadriiforms (Maina, Abdalla & King 1982, Acta Anat (Cells Tissues Organs) 112:264-270); taking that share of the lung volume as the gas that meets the blood is an assumption',
  kind: 'published',
};

/** Air-sac (non-exchanging reservoir) volume as a fraction of body volume. */
export const airSacVolumeFraction: ModelParameter = {
  value: 0.125,
  range: [0.1, 0.2],
  basis:
    'Air sacs 10-15 % of body volume (unverified value); duck about 20 % (Vos 1935, cited by Krogh 1941)',
  kind: 'from memory',
};

/** Share of the air-sac volume (and of each breath\'s expansion) held by the posterior (caudal) sacs. */
export const posteriorSacShare: ModelParameter = {
  value: 0.55,
  range: [0.45, 0.65],
  basis:
    'Assumption: caudal thoracic and abdominal sacs hold a little over half the air-sac gas and take the same share of each breath',
  kind: 'assumption',
};

/** Body density used to turn body mass into body volume, g/mL. */
export const bodyDensityGPerMl: ModelParameter = {
  value: 1.0,
  range: [1.0, 1.0],
  basis: 'Assumption: body volume in mL equals body mass in g (air-sac gas is counted separately)',
  kind: 'assumption',
};

/** Blood volume as a fraction of body mass (mL per g). */
export const bloodVolumeFraction: ModelParameter = {
  value: 0.08,
  range: [0.06, 0.1],
  basis: 'Assumption: blood volume about 6-10 % of body mass (unverified value, birds)',
  kind: 'assumption',
};

/** One tissue group of the body-uptake model. */
export type TissueGroupParameters = {
  readonly id: 'vesselRich' | 'muscle' | 'fat';
  readonly volumeFraction: ModelParameter;
  readonly flowFraction: ModelParameter;
};

/**
 * Tissue groups after the classic compartment uptake models (vessel-rich, muscle, fat). The
 * volume and flow fractions are mammalian and are assumptions for birds. Flow fractions sum to 1:
 * the shunt and poorly perfused groups are folded into these three.
 */
export const tissueGroups: readonly TissueGroupParameters[] = [
  {
    id: 'vesselRich',
    volumeFraction: {
      value: 0.09,
      range: [0.07, 0.11],
      basis: 'Assumption: mammalian vessel-rich group about 9 % of body mass (unverified value)',
      kind: 'assumption',
    },
    flowFraction: {
      value: 0.75,
      range: [0.65, 0.8],
      basis: 'Assumption: mammalian vessel-rich group about 75 % of cardiac output (unverified value)',
      kind: 'assumption',
    },
  },
  {
    id: 'muscle',
    volumeFraction: {
      value: 0.5,
      range: [0.4, 0.55],
      basis:
        'Assumption: muscle group about half of body mass (unverified value; flight muscle is large in birds)',
      kind: 'assumption',
    },
    flowFraction: {
      value: 0.2,
      range: [0.15, 0.3],
      basis: 'Assumption: muscle group about 20 % of cardiac output at rest (unverified value)',
      kind: 'assumption',
    },
  },
  {
    id: 'fat',
    volumeFraction: {
      value: 0.08,
      range: [0.03, 0.2],
      basis: 'Assumption: fat about 8 % of body mass in a lean pet bird, wide range for body condition',
      kind: 'assumption',
    },
    flowFraction: {
      value: 0.05,
      range: [0.03, 0.07],
      basis: 'Assumption: fat group about 5 % of cardiac output (unverified value)',
      kind: 'assumption',
    },
  },
];

/** Lowest fraction of resting ventilation kept by the depression rule. */
export const ventilatoryDepressionFloor: ModelParameter = {
  value: 0.15,
  range: [0.1, 0.25],
  basis:
    'Assumption: ventilation is not taken below 15 % of resting; real apnoea is flagged as a caution instead of being simulated',
  kind: 'assumption',
};

/**
 * A non-rebreathing system delivers undiluted fresh gas while the fresh gas flow is at least this
 * multiple of minute ventilation (mean inspiratory flow is about twice minute ventilation at an
 * inspiratory to expiratory ratio of 1:1); below it the shortfall is drawn from exhaled gas.
 */
export const rebreathingFlowMultiple: ModelParameter = {
  value: 2,
  range: [1.5, 3],
  basis:
    'Assumption based on the common-practice rule of 2-3 x minute ventilation for non-rebreathing systems',
  kind: 'assumption',
};

/** Default mask apparatus dead space as a multiple of the bird\'s tidal volume. */
export const defaultMaskDeadSpaceTidalMultiple: ModelParameter = {
  value: 1,
  range: [0.5, 3],
  basis: 'Assumption: a well-fitted mask holds about one tidal volume of gas around the beak',
  kind: 'assumption',
};

/** Default share of the mask's fresh gas that escapes to the room (budgets only). */
export const defaultMaskLeakFraction: ModelParameter = {
  value: 0.1,
  range: [0, 0.3],
  basis:
    'Assumption: about 10 % of the fresh gas fed to a loose-fitting mask escapes around it to the room (waste gas and flow budgets; room air drawn into the breath follows from fresh gas flow against peak inspiratory flow)',
  kind: 'assumption',
};

/**
 * Loss of righting, the light-plane milestone of induction: the brain rises through this fraction
 * of MAC. No avian value was found; in dogs the end-tidal level at which consciousness returns
 * (MAC-awake) is 1.0 of a MAC of 1.3 vol % for isoflurane (0.77) and 1.3 of 2.1 for sevoflurane
 * (0.62) (Hofmeister et al. 2008, Am J Vet Res 69:451-456); human MAC-awake is about 0.38 MAC.
 */
export const lossOfRightingMacFraction: ModelParameter = {
  value: 0.6,
  range: [0.4, 0.8],
  basis:
    'Assumption for birds: loss of righting taken at the brain level of MAC-awake, about 0.6 MAC (dogs: MAC-awake about 0.77 of MAC for isoflurane and 0.62 for sevoflurane, Hofmeister et al. 2008, Am J Vet Res 69:451-456; humans about 0.38, unverified value); no avian MAC-awake was found',
  kind: 'assumption',
};

/**
 * First movement or head lift after the vaporiser is off: the brain falls below this fraction of
 * MAC (the recovery threshold of the plan, which the clinician can change).
 */
export const defaultRecoveryMacFraction: ModelParameter = {
  value: 0.4,
  range: [0.3, 0.6],
  basis:
    'Assumption for birds: first movement or head lift when the brain falls below about 0.4 MAC (dogs: isoflurane at extubation 0.45 of a MAC of 1.23-1.27 vol %, about 0.36 MAC, Barletta, Quandt & Hofmeister 2016, Res Vet Sci 106:81-83; human MAC-awake about 0.38, unverified value); no avian MAC-awake was found',
  kind: 'assumption',
};

/**
 * Standing or perching after the vaporiser is off: the brain falls below this fraction of MAC.
 * Standing needs coordination that returns well after the first movement.
 */
export const standingMacFraction: ModelParameter = {
  value: 0.2,
  range: [0.1, 0.3],
  basis:
    'Assumption: standing or perching when the brain falls below about half the first-movement level (0.2 MAC); no published brain or end-tidal level at standing was found for birds or mammals',
  kind: 'assumption',
};

/** Default planned depth (surgical depth), multiple of MAC. */
export const defaultTargetMacMultiple: ModelParameter = {
  value: 1.2,
  range: [1.2, 1.2],
  basis:
    "Common practice: surgical depth about 1.2-1.5 MAC; the planned depth is the plan's own choice, not sampled",
  kind: 'common practice',
};

/** Cardiac output spread sampled by the uncertainty run, as a multiple of the estimate. */
export const cardiacOutputSpread: ModelParameter = {
  value: 1,
  range: [0.7, 1.3],
  basis:
    'Assumption: individual and anaesthetic-depressed cardiac output within +/-30 % of the Grubb 1983 regression',
  kind: 'assumption',
};

/** Tidal volume and breathing rate spread sampled by the uncertainty run. */
export const ventilationSpread: ModelParameter = {
  value: 1,
  range: [0.75, 1.25],
  basis:
    'Assumption: individual resting ventilation within +/-25 % of the Lasiewski & Calder 1971 regressions',
  kind: 'assumption',
};

/** MAC spread when the species reference gives no standard deviation. */
export const macRelativeSpread: ModelParameter = {
  value: 0.15,
  range: [0.15, 0.15],
  basis: 'Assumption: MAC varies about +/-15 % (1 SD) between individuals when the source gives no SD',
  kind: 'assumption',
};

/** Spread of the tissue/blood partition coefficients sampled by the uncertainty run (one multiplier for all groups). */
export const tissueBloodPartitionSpread: ModelParameter = {
  value: 1,
  range: [0.7, 1.4],
  basis:
    'Assumption: the human tissue/blood coefficients used for birds may be off by -30 % to +40 %; no avian measurement was found',
  kind: 'assumption',
};

/** Spread of the tracheal dead space around the Hinds & Calder 1971 regression. */
export const trachealVolumeSpread: ModelParameter = {
  value: 1,
  range: [0.7, 1.3],
  basis:
    'Assumption: individual tracheal volume within +/-30 % of the regression (the 2.2 kg chicken measured 7.0 mL against about 7.6 mL estimated)',
  kind: 'assumption',
};
