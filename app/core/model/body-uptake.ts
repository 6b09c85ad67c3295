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
 * Advances the body by one step at a fixed arterial partial pressure: each tissue group by its
 * exact exponential, the venous pool by the exact tissue effluent minus the blood sent to the
 * lung at the start-of-step venous value. The step conserves agent exactly: the body gains
 * lambdaBlood * Q * dt * (Pa - Pv_start), the amount the lung handed over.
 * @param body body model
 * @param arterialFraction arterial partial pressure over the step
 * @param state [Pv, P_vesselRich, P_muscle, P_fat], updated in place
 * @param decay per-group exp(-Qi dt / (lambdaTissue_i Vi)) for this step length
 * @param stepMin step length in minutes, small against Vblood / Q
 */
export function advanceBody(
  body: BodyModel,
  arterialFraction: number,
  state: Float64Array,
  decay: Float64Array,
  stepMin: number,
): void {
  const venousStart = state[0] as number;
  let tissueGain = 0;
  for (let index = 0; index < 3; index += 1) {
    const group = body.groups[index] as TissueGroup;
    const before = state[index + 1] as number;
    const after = arterialFraction + (before - arterialFraction) * (decay[index] as number);
    state[index + 1] = after;
    tissueGain += group.tissueBloodPartition * group.volumeMl * (after - before);
  }
  const flow = bodyBloodFlowMlMin(body);
  state[0] =
    venousStart + (flow * stepMin * (arterialFraction - venousStart) - tissueGain) / body.bloodVolumeMl;
}

/**
 * Per-group decay factors exp(-Qi dt / (lambdaTissue_i Vi)) for a step of `stepMin` minutes.
 * @param body body model
 * @param stepMin step length in minutes, > 0
 * @param decay output array of length 3
 */
export function bodyDecayFactors(body: BodyModel, stepMin: number, decay: Float64Array): void {
  for (let index = 0; index < 3; index += 1) {
    const group = body.groups[index] as TissueGroup;
    decay[index] = Math.exp((-group.flowMlMin * stepMin) / (group.tissueBloodPartition * group.volumeMl));
  }
}
