/**
 * Body uptake: a venous blood pool and three tissue groups (vessel-rich, muscle, fat) perfused in
 * parallel from arterial blood, after the classic compartment uptake models. Partial pressures
 * are gas-phase fractions (vol % / 100). A tissue group holds lambdaBlood * lambdaTissue * V * P
 * mL of agent vapour; the pool holds lambdaBlood * Vblood * Pv.
 *
 * Equations (per group i, Q = sum Qi):
 *   dPi/dt = Qi (Pa - Pi) / (lambdaTissue_i Vi)
 *   dPv/dt = (sum Qi Pi - Q Pv) / Vblood
 */

import {
  crossCurrentArterialFraction,
  crossCurrentEndGasFraction,
  perfusionVentilationK,
} from './exchange.js';

export type TissueGroup = {
  readonly volumeMl: number;
  readonly flowMlMin: number;
  /** Tissue/blood partition coefficient. */
  readonly tissueBloodPartition: number;
};

export type BodyModel = {
  readonly bloodGasPartition: number;
  readonly bloodVolumeMl: number;
  /** Vessel-rich (brain), muscle, fat, in that order. */
  readonly groups: readonly [TissueGroup, TissueGroup, TissueGroup];
};

/** Total blood flow of the groups, mL/min (the cardiac output). */
export function bodyBloodFlowMlMin(body: BodyModel): number {
  return body.groups[0].flowMlMin + body.groups[1].flowMlMin + body.groups[2].flowMlMin;
}

/**
 * Right-hand side of the body-uptake equations for a given arterial partial pressure, written
 * into `derivative` as [dPv, dP_vesselRich, dP_muscle, dP_fat] per minute. Used by the referee
 * tests that integrate the same equations with an outside solver.
 * @param body body model
 * @param arterialFraction arterial partial pressure, fraction of one atmosphere
 * @param state [Pv, P_vesselRich, P_muscle, P_fat]
 * @param derivative output array of length 4
 */
export function bodyUptakeDerivatives(
  body: BodyModel,
  arterialFraction: number,
  state: ArrayLike<number>,
  derivative: { [index: number]: number },
): void {
  const venous = state[0] ?? 0;
  let returning = 0;
  for (let index = 0; index < 3; index += 1) {
    const group = body.groups[index] as TissueGroup;
    const tissue = state[index + 1] ?? 0;
    derivative[index + 1] =
      (group.flowMlMin * (arterialFraction - tissue)) / (group.tissueBloodPartition * group.volumeMl);
    returning += group.flowMlMin * tissue;
  }
  derivative[0] = (returning - bodyBloodFlowMlMin(body) * venous) / body.bloodVolumeMl;
}

/**
 * Agent held by the body, mL of vapour at the gas-phase reference conditions.
 * @param body body model
 * @param state [Pv, P_vesselRich, P_muscle, P_fat]
 */
export function bodyContentMl(body: BodyModel, state: ArrayLike<number>): number {
  let content = body.bloodVolumeMl * (state[0] ?? 0);
  for (let index = 0; index < 3; index += 1) {
    const group = body.groups[index] as TissueGroup;
    content += group.tissueBloodPartition * group.volumeMl * (state[index + 1] ?? 0);
  }
  return body.bloodGasPartition * content;
}

/**
 * Layout of the state array of one lung-and-body step, all partial pressures as fractions of one
 * atmosphere: mixed venous, vessel-rich (brain), muscle, fat, and the arterial value of the last step.
 */
export const bodyState = { venous: 0, vesselRich: 1, muscle: 2, fat: 3, arterial: 4, length: 5 } as const;

/** Layout of the precomputed factors of one lung-and-body step (see bodyExchangeFactors). */
const factor = {
  arterial: 0,
  endGas: 1,
  bloodMl: 2,
  bloodVolumeMl: 3,
  tissueWeight: 4,
  weight0: 5,
  weight1: 6,
  weight2: 7,
  decay0: 8,
  decay1: 9,
  decay2: 10,
  denominator: 11,
  length: 12,
} as const;

/** Length of the factor array bodyExchangeFactors fills. */
export const bodyExchangeFactorLength = factor.length;

/**
 * Factors of one lung-and-body step of `stepMin` minutes in which `gasMl` mL of gas crosses the
 * parabronchi: the Piiper & Scheid (1972) cross-current fractions at k = lambda Q dt / V_gas,
 * each tissue group's exact exponential exp(-Qi dt / (lambdaTissue_i Vi)), and the weights of the
 * implicit venous update (see bodyExchangeStep). Depends only on the body, the gas volume and the
 * step, so it is computed once per breath pattern.
 * @param body body model (blood/gas partition >= 0; 0 gives an insoluble tracer)
 * @param gasMl gas crossing the exchange surface in the step, mL, >= 0 (0: no gas moves)
 * @param stepMin step length in minutes, > 0 (any length: the step is unconditionally stable)
 * @param out factor array of length bodyExchangeFactorLength, filled in place
 * @param flowScale multiplier of every group's blood flow (depressed cardiac output), > 0; the
 *   flow fractions stay as they are, so the venous pool still receives exactly what leaves it
 */
export function bodyExchangeFactors(
  body: BodyModel,
  gasMl: number,
  stepMin: number,
  out: Float64Array,
  flowScale = 1,
): void {
  const bloodMl = bodyBloodFlowMlMin(body) * flowScale * stepMin;
  const k =
    gasMl > 0 ? perfusionVentilationK(body.bloodGasPartition, bloodMl, gasMl) : Number.POSITIVE_INFINITY;
  const arterial = gasMl > 0 ? crossCurrentArterialFraction(k) : 0;
  out[factor.arterial] = arterial;
  out[factor.endGas] = gasMl > 0 ? crossCurrentEndGasFraction(k) : 1;
  out[factor.bloodMl] = bloodMl;
  out[factor.bloodVolumeMl] = body.bloodVolumeMl;
  let tissueWeight = 0;
  for (let index = 0; index < 3; index += 1) {
    const group = body.groups[index] as TissueGroup;
    const capacity = group.tissueBloodPartition * group.volumeMl;
    const decay = Math.exp((-group.flowMlMin * flowScale * stepMin) / capacity);
    const weight = capacity * (1 - decay);
    out[factor.decay0 + index] = decay;
    out[factor.weight0 + index] = weight;
    tissueWeight += weight;
  }
  out[factor.tissueWeight] = tissueWeight;
  out[factor.denominator] = body.bloodVolumeMl + bloodMl * arterial + (1 - arterial) * tissueWeight;
}

/**
 * One lung-and-body step: gas at the parabronchial inlet meets the mixed venous blood by the
 * cross-current model, arterial blood perfuses the three tissue groups, and the venous pool
 * collects their effluent. The one implementation of exchange and uptake, used by the simulation
 * (and so by the uncertainty run and every test of the model).
 *
 * The venous pool is updated implicitly (its end-of-step value feeds the exchange) and each tissue
 * group by its exact exponential at the end-of-step arterial value; solving the linear balance for
 * the venous value gives a convex combination of the inlet, venous and tissue values, so the step
 * is stable and keeps every partial pressure between the lowest and highest of them at any step
 * length (explicit Euler on the pool diverges once Q dt / V_blood exceeds 2). It conserves agent
 * exactly: the body gains lambda Q dt (Pa - Pv_end), which is what the gas lost. First order in
 * the step; the simulation bounds the step for accuracy (see simulation.ts).
 * @param state [Pv, P_vesselRich, P_muscle, P_fat, Pa], updated in place (see bodyState)
 * @param factors from bodyExchangeFactors for this step
 * @param inletFraction gas fraction at the parabronchial inlet over the step, >= 0
 * @returns end-parabronchial gas fraction of the step
 */
export function bodyExchangeStep(state: Float64Array, factors: Float64Array, inletFraction: number): number {
  const arterialFactor = factors[factor.arterial] as number;
  const weight0 = factors[factor.weight0] as number;
  const weight1 = factors[factor.weight1] as number;
  const weight2 = factors[factor.weight2] as number;
  const tissue0 = state[1] as number;
  const tissue1 = state[2] as number;
  const tissue2 = state[3] as number;
  const venous =
    ((factors[factor.bloodVolumeMl] as number) * (state[0] as number) +
      arterialFactor *
        inletFraction *
        ((factors[factor.bloodMl] as number) - (factors[factor.tissueWeight] as number)) +
      weight0 * tissue0 +
      weight1 * tissue1 +
      weight2 * tissue2) /
    (factors[factor.denominator] as number);
  const arterial = venous + (inletFraction - venous) * arterialFactor;
  state[0] = venous;
  state[1] = arterial + (tissue0 - arterial) * (factors[factor.decay0] as number);
  state[2] = arterial + (tissue1 - arterial) * (factors[factor.decay1] as number);
  state[3] = arterial + (tissue2 - arterial) * (factors[factor.decay2] as number);
  state[4] = arterial;
  return venous + (inletFraction - venous) * (factors[factor.endGas] as number);
}
