/**
 * Constants of the respiratory and uptake model that are not agent properties.
 *
 * Each constant carries its value, the range the uncertainty run samples, and its basis. Where
 * no avian measurement was found the value is a choice of ours and says 'assumption'.
 */

export type ModelParameter = {
  readonly value: number;
  /** Inclusive range sampled by the uncertainty run (equal ends: not varied). */
  readonly range: readonly [number, number];
  readonly basis: string;
};

/** Lung volume as a fraction of body volume. */
export const lungVolumeFraction: ModelParameter = {
  value: 0.02,
  range: [0.01, 0.03],
  basis:
    'Lung 1-3 % of body volume (from memory); the whole lung volume is taken as exchanging parabronchial gas (assumption)',
};

/** Air-sac (non-exchanging reservoir) volume as a fraction of body volume. */
export const airSacVolumeFraction: ModelParameter = {
  value: 0.125,
  range: [0.1, 0.2],
  basis: 'Air sacs 10-15 % of body volume (from memory); duck about 20 % (Vos 1935, cited by Krogh 1941)',
};

/** Share of the air-sac volume (and of each breath\'s expansion) held by the posterior (caudal) sacs. */
export const posteriorSacShare: ModelParameter = {
  value: 0.55,
  range: [0.45, 0.65],
  basis:
    'Assumption: caudal thoracic and abdominal sacs hold a little over half the air-sac gas and take the same share of each breath',
};

/** Body density used to turn body mass into body volume, g/mL. */
export const bodyDensityGPerMl: ModelParameter = {
  value: 1.0,
  range: [1.0, 1.0],
  basis: 'Assumption: body volume in mL equals body mass in g (air-sac gas is counted separately)',
};

/** Blood volume as a fraction of body mass (mL per g). */
export const bloodVolumeFraction: ModelParameter = {
  value: 0.08,
  range: [0.06, 0.1],
  basis: 'Assumption: blood volume about 6-10 % of body mass (from memory, birds)',
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
      basis: 'Assumption: mammalian vessel-rich group about 9 % of body mass (from memory)',
    },
    flowFraction: {
      value: 0.75,
      range: [0.65, 0.8],
      basis: 'Assumption: mammalian vessel-rich group about 75 % of cardiac output (from memory)',
    },
  },
  {
    id: 'muscle',
    volumeFraction: {
      value: 0.5,
      range: [0.4, 0.55],
      basis:
        'Assumption: muscle group about half of body mass (from memory; flight muscle is large in birds)',
    },
    flowFraction: {
      value: 0.2,
      range: [0.15, 0.3],
      basis: 'Assumption: muscle group about 20 % of cardiac output at rest (from memory)',
    },
  },
  {
    id: 'fat',
    volumeFraction: {
      value: 0.08,
      range: [0.03, 0.2],
      basis: 'Assumption: fat about 8 % of body mass in a lean pet bird, wide range for body condition',
    },
    flowFraction: {
      value: 0.05,
      range: [0.03, 0.07],
      basis: 'Assumption: fat group about 5 % of cardiac output (from memory)',
    },
  },
];

/** Slope of the fall in spontaneous tidal volume per multiple of MAC in the brain. */
export const ventilatoryDepressionSlope: ModelParameter = {
  value: 0.3,
  range: [0.15, 0.45],
  basis:
    'Assumption: spontaneous minute ventilation falls linearly with the brain MAC multiple (0.3 per MAC), reaching the floor near the published apnoea multiples (duck above 1.5 MAC, Ludders, Mitchell & Rode 1990; chicken 2.8 MAC, Midon et al. 2021)',
};

/** Lowest fraction of resting ventilation kept by the depression rule. */
export const ventilatoryDepressionFloor: ModelParameter = {
  value: 0.15,
  range: [0.1, 0.25],
  basis:
    'Assumption: ventilation is not taken below 15 % of resting; real apnoea is flagged as a caution instead of being simulated',
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
};

/** Default mask apparatus dead space as a multiple of the bird\'s tidal volume. */
export const defaultMaskDeadSpaceTidalMultiple: ModelParameter = {
  value: 1,
  range: [0.5, 3],
  basis: 'Assumption: a well-fitted mask holds about one tidal volume of gas around the beak',
};

/** Default fraction of inspired gas drawn from room air around a mask. */
export const defaultMaskLeakFraction: ModelParameter = {
  value: 0.1,
  range: [0, 0.3],
  basis: 'Assumption: a loose-fitting mask entrains about 10 % room air',
};

/** Default recovery threshold, fraction of MAC in the brain. */
export const defaultRecoveryMacFraction: ModelParameter = {
  value: 0.4,
  range: [0.4, 0.4],
  basis: 'Assumption: no avian MAC-awake was found; human MAC-awake is about 0.38 MAC (from memory)',
};

/** Default planned depth, multiple of MAC. */
export const defaultTargetMacMultiple: ModelParameter = {
  value: 1.2,
  range: [1.2, 1.2],
  basis: 'Common practice: surgical depth about 1.2-1.5 MAC',
};

/** Cardiac output spread sampled by the uncertainty run, as a multiple of the estimate. */
export const cardiacOutputSpread: ModelParameter = {
  value: 1,
  range: [0.7, 1.3],
  basis:
    'Assumption: individual and anaesthetic-depressed cardiac output within +/-30 % of the Grubb 1983 regression',
};

/** Tidal volume and breathing rate spread sampled by the uncertainty run. */
export const ventilationSpread: ModelParameter = {
  value: 1,
  range: [0.75, 1.25],
  basis:
    'Assumption: individual resting ventilation within +/-25 % of the Lasiewski & Calder 1971 regressions',
};

/** MAC spread when the species reference gives no standard deviation. */
export const macRelativeSpread: ModelParameter = {
  value: 0.15,
  range: [0.15, 0.15],
  basis: 'Assumption: MAC varies about +/-15 % (1 SD) between individuals when the source gives no SD',
};

/** Spread of the tissue/blood partition coefficients sampled by the uncertainty run (one multiplier for all groups). */
export const tissueBloodPartitionSpread: ModelParameter = {
  value: 1,
  range: [0.7, 1.4],
  basis:
    'Assumption: the human tissue/blood coefficients used for birds may be off by -30 % to +40 %; no avian measurement was found',
};

/** Spread of the tracheal dead space around the Hinds & Calder 1971 regression. */
export const trachealVolumeSpread: ModelParameter = {
  value: 1,
  range: [0.7, 1.3],
  basis:
    'Assumption: individual tracheal volume within +/-30 % of the regression (the 2.2 kg chicken measured 7.0 mL against about 7.6 mL estimated)',
};
