/**
 * Gas exchange efficiencies of the classic lung models (Piiper & Scheid 1972), written for an
 * inert gas or an inhalant agent whose blood capacitance is the blood/gas partition coefficient.
 *
 * k = lambda * Q / V, with lambda the blood/gas partition coefficient, Q blood flow and V the
 * ventilation of the exchanging gas (same volume unit per same time unit). Fractions below are
 * (P - Pv) / (Pi - Pv): partial pressure above mixed venous, relative to the inspired excess.
 */

/**
 * The perfusion-to-ventilation ratio k of the Piiper & Scheid models.
 * @param bloodGasPartition blood/gas partition coefficient, > 0
 * @param bloodFlowMlMin blood flow in mL/min, >= 0
 * @param ventilationMlMin ventilation of the exchanging gas in mL/min, > 0
 */
export function perfusionVentilationK(
  bloodGasPartition: number,
  bloodFlowMlMin: number,
  ventilationMlMin: number,
): number {
  return (bloodGasPartition * bloodFlowMlMin) / ventilationMlMin;
}

/**
 * Cross-current model: end-parabronchial gas fraction e^-k.
 * @param k perfusion-to-ventilation ratio, >= 0
 */
export function crossCurrentEndGasFraction(k: number): number {
  return Math.exp(-k);
}

/**
 * Cross-current model: arterial fraction (1 - e^-k) / k (1 at k = 0).
 * @param k perfusion-to-ventilation ratio, >= 0
 */
export function crossCurrentArterialFraction(k: number): number {
  // Series form near 0 avoids 0/0 and cancellation.
  if (k < 1e-6) return 1 - k / 2;
  return -Math.expm1(-k) / k;
}

/**
 * Ventilated pool (mammalian alveolar) model: arterial equals alveolar fraction 1 / (1 + k).
 * @param k perfusion-to-ventilation ratio, >= 0
 */
export function ventilatedPoolArterialFraction(k: number): number {
  return 1 / (1 + k);
}

/**
 * Counter-current model (fish gill), perfusion-limited like the two above: blood leaving at the
 * gas inlet equilibrates with inspired gas while its capacitance rate is the smaller (k <= 1);
 * otherwise the gas leaves at venous level and the arterial fraction is 1/k. The upper bound of
 * the three arrangements at the same k.
 * @param k perfusion-to-ventilation ratio, >= 0
 */
export function counterCurrentArterialFraction(k: number): number {
  return k <= 1 ? 1 : 1 / k;
}
