/**
 * Fresh gas flow for the route and circuit, the rebreathing check of a non-rebreathing system,
 * and the induction-chamber wash-in time.
 */
import type { SourceKind } from '../sourced.js';
import { gToKg } from '../units.js';

import type { Circuit, Route } from '../delivery.js';

export type { Circuit, Route } from '../delivery.js';

/** Non-rebreathing flow as multiples of minute ventilation: 2-3 x VE (common practice). */
export const nonRebreathingMinuteVentilationMultiple = {
  minimum: 2,
  recommended: 3,
  basis: 'Non-rebreathing fresh gas flow 2-3 x minute ventilation (common practice)',
  kind: 'common practice',
} as const;

/** Weight-based non-rebreathing flows of general veterinary teaching, mL/kg/min. */
export const nonRebreathingWeightFlows = {
  reasonablySafeMlPerKgMin: [200, 300] as const,
  preventsRebreathingMlPerKgMin: 500,
  basis:
    'Non-rebreathing flow 200-300 mL/kg/min reasonably safe, 500 mL/kg/min prevents rebreathing (Massey University, Mapleson D circuits)',
  kind: 'published',
} as const;

/** Practical floor of fresh gas flow, L/min: vaporiser output is least reliable at very low flows. */
export const practicalFloorFlowLpm = {
  value: 0.5,
  range: [0.5, 1] as const,
  basis: 'Practical floor of about 0.5-1 L/min (common practice)',
  kind: 'common practice',
} as const;

/**
 * Practical minimum fresh gas flow, L/min: no rule gives a lower minimum, however small the bird.
 * Below it a flowmeter float is hard to read and set, and vaporiser output at very low flows has
 * been measured to drift (sevoflurane vaporisers less accurate at 0.02 L/min, Ambrisko & Klide
 * 2006, Am J Vet Res 67:936-940).
 */
export const practicalMinimumFlowLpm = {
  value: 0.2,
  range: [0.1, 0.5] as const,
  basis:
    'Assumption: no flow below 0.2 L/min is offered as a minimum (flowmeters are hard to set lower; vaporiser output drifts at very low flows, Ambrisko & Klide 2006, Am J Vet Res 67:936-940)',
  kind: 'assumption',
} as const;

/** Body mass above which a circle (rebreathing) system is usual instead of a non-rebreathing one, g. */
export const circleAboveMassG = {
  value: 7000,
  range: [7000, 10000] as const,
  basis: 'Non-rebreathing systems below about 7-10 kg (common practice)',
  kind: 'common practice',
} as const;

/** Default time for an induction chamber to reach 95 % of the dial setting, min (assumption). */
export const defaultChamberTargetMin = 5;

/** Longest acceptable time for an induction chamber to reach 95 %, min; sets its minimum flow (assumption). */
export const chamberLongestAcceptableMin = 10;

/** Default time for a circle to follow a dial change to 95 %, min (assumption). */
export const defaultCircleTargetMin = 10;

/** Fraction of a step change reached after n time constants: 1 - e^-n (OpenAnesthesia, "Time constant"). */
function timeConstantsToFraction(fraction: number): number {
  return -Math.log(1 - fraction);
}

export type FreshGasInputs = {
  readonly route: Route;
  /** Breathing system; ignored for the chamber route. */
  readonly circuit: Circuit;
  /** Body mass in g, 5 to 15000. */
  readonly bodyMassG: number;
  /** Minute ventilation in mL/min (estimated or measured), above 0. */
  readonly minuteVentilationMlMin: number;
  /** Chamber volume in L, 0.1 to 100; required for the chamber route. */
  readonly chamberVolumeL?: number;
  /** Time for the chamber to reach 95 % of the dial, min, 0.5 to 30; default 5 (assumption). */
  readonly chamberTargetMin?: number;
  /** Circle system volume (bag, hoses, absorber) in L, 0.1 to 20; used for the circle route time constant. */
  readonly circuitVolumeL?: number;
  /** Time for the circle to follow a dial change to 95 %, min, 1 to 60; default 10 (assumption). */
  readonly circleTargetMin?: number;
  /** Fraction of mask flow lost around the mask, 0 to 0.9; the mask flow is raised to make up for it. */
  readonly maskLeakFraction?: number;
};

export type FreshGasRecommendation = {
  /** Flow to set, L/min. */
  readonly recommendedLpm: number;
  /** Lowest flow at which the rule still holds, L/min (below it a non-rebreathing system rebreathes). */
  readonly minimumLpm: number;
  /** The rule applied, in words. */
  readonly rule: string;
  /** Sources of the rule, in the project's basis words. */
  readonly basis: string;
  readonly kind: SourceKind;
};

function assertRange(value: number, name: string, min: number, max: number): void {
  if (!Number.isFinite(value) || value < min || value > max) {
    throw new RangeError(
      `${name}: must be a number between ${String(min)} and ${String(max)} (got ${String(value)})`,
    );
  }
}

function nonRebreathingFlows(
  bodyMassG: number,
  minuteVentilationMlMin: number,
): { minimumLpm: number; recommendedLpm: number; weightFlowLpm: number } {
  const minuteVentilationLpm = minuteVentilationMlMin / 1000;
  const weightFlowLpm = (nonRebreathingWeightFlows.preventsRebreathingMlPerKgMin * gToKg(bodyMassG)) / 1000;
  return {
    minimumLpm: Math.max(
      nonRebreathingMinuteVentilationMultiple.minimum * minuteVentilationLpm,
      practicalMinimumFlowLpm.value,
    ),
    recommendedLpm: Math.max(
      nonRebreathingMinuteVentilationMultiple.recommended * minuteVentilationLpm,
      weightFlowLpm,
      practicalFloorFlowLpm.value,
    ),
    weightFlowLpm,
  };
}

/**
 * Recommended and minimum fresh gas flow for the route and circuit.
 * - Non-rebreathing (endotracheal, mask, air-sac tube): minimum 2 x VE; recommended the largest
 *   of 3 x VE, 500 mL/kg/min and the practical floor 0.5 L/min (common practice; Massey
 *   University). A mask's leak fraction raises both by 1 / (1 - leak) (assumption). The air-sac
 *   tube uses the same rule because all of its flow leaves through the lung and trachea
 *   (assumption).
 * - Circle: minimum the practical floor 0.5 L/min; recommended the larger of VE and the flow that
 *   brings the circle to 95 % of a dial change in the target time, 3 x circuit volume / time
 *   (tau = V / FGF, OpenAnesthesia), ignoring uptake (assumption).
 * - Chamber: recommended 3 x V / target time (95 % in the target time, default 5 min,
 *   assumption); minimum 3 x V / 10 min (assumption).
 * @throws RangeError when an input is out of range or the chamber route lacks chamberVolumeL
 */
export function recommendFreshGas(input: FreshGasInputs): FreshGasRecommendation {
  assertRange(input.bodyMassG, 'bodyMassG', 5, 15000);
  assertRange(input.minuteVentilationMlMin, 'minuteVentilationMlMin', 0.1, 100000);
  const threeTau = timeConstantsToFraction(0.95);
  if (input.route === 'chamber') {
    if (input.chamberVolumeL === undefined)
      throw new RangeError('chamberVolumeL: the chamber volume is needed for the chamber route');
    assertRange(input.chamberVolumeL, 'chamberVolumeL', 0.1, 100);
    const targetMin = input.chamberTargetMin ?? defaultChamberTargetMin;
    assertRange(targetMin, 'chamberTargetMin', 0.5, 30);
    return {
      recommendedLpm: (threeTau * input.chamberVolumeL) / targetMin,
      minimumLpm: (threeTau * input.chamberVolumeL) / chamberLongestAcceptableMin,
      rule: `Chamber reaches 95 % of the dial after 3 time constants: three ${String(input.chamberVolumeL)} L chamber volumes in ${String(targetMin)} min; minimum for 95 % within ${String(chamberLongestAcceptableMin)} min`,
      basis: `Time constant of volume and flow, 95 % after 3 time constants (OpenAnesthesia, "Time constant"); target ${String(targetMin)} min${input.chamberTargetMin === undefined ? ' (assumption)' : ''} and ${String(chamberLongestAcceptableMin)} min limit (assumption)`,
      kind: 'derived',
    };
  }
  if (input.circuit === 'circle' && input.route !== 'airSacTube') {
    const targetMin = input.circleTargetMin ?? defaultCircleTargetMin;
    assertRange(targetMin, 'circleTargetMin', 1, 60);
    const circuitFlowLpm =
      input.circuitVolumeL === undefined ? 0 : (threeTau * input.circuitVolumeL) / targetMin;
    if (input.circuitVolumeL !== undefined) assertRange(input.circuitVolumeL, 'circuitVolumeL', 0.1, 20);
    return {
      recommendedLpm: Math.max(
        input.minuteVentilationMlMin / 1000,
        circuitFlowLpm,
        practicalFloorFlowLpm.value,
      ),
      minimumLpm: practicalFloorFlowLpm.value,
      rule:
        'Circle: at least the minute ventilation' +
        (input.circuitVolumeL === undefined
          ? ''
          : ` and 3 x circuit volume / ${String(targetMin)} min so the circle follows a dial change to 95 %`) +
        '; never below the practical floor',
      basis: `Time constant of volume and flow (OpenAnesthesia, "Time constant"), ignoring uptake (assumption); ${practicalFloorFlowLpm.basis}; ${circleAboveMassG.basis}`,
      kind: 'assumption',
    };
  }
  const leak = input.route === 'mask' ? (input.maskLeakFraction ?? 0) : 0;
  assertRange(leak, 'maskLeakFraction', 0, 0.9);
  const flows = nonRebreathingFlows(input.bodyMassG, input.minuteVentilationMlMin);
  const leakFactor = 1 / (1 - leak);
  const routeNote =
    input.route === 'mask' && leak > 0
      ? `; raised for a mask leak of ${String(Math.round(leak * 100))} % (assumption)`
      : input.route === 'airSacTube'
        ? '; air-sac tube: the same rule, since all its flow crosses the lung and leaves by the trachea (assumption)'
        : '';
  return {
    recommendedLpm: flows.recommendedLpm * leakFactor,
    minimumLpm: flows.minimumLpm * leakFactor,
    rule: `Non-rebreathing: minimum 2 x minute ventilation, never below ${String(practicalMinimumFlowLpm.value)} L/min; recommended the largest of 3 x minute ventilation, 500 mL/kg/min and ${String(practicalFloorFlowLpm.value)} L/min${routeNote}`,
    basis: `${nonRebreathingMinuteVentilationMultiple.basis}; ${nonRebreathingWeightFlows.basis}; ${practicalFloorFlowLpm.basis}; ${practicalMinimumFlowLpm.basis}`,
    kind: 'common practice',
  };
}

export type RebreathingCheckInput = {
  readonly circuit: Circuit;
  /** Set fresh gas flow in L/min, 0 to 20. */
  readonly freshGasLpm: number;
  /** Minute ventilation in mL/min, above 0. */
  readonly minuteVentilationMlMin: number;
  /** Body mass in g, 5 to 15000. */
  readonly bodyMassG: number;
  /** Route; the chamber route never rebreathes (no airway connection). Default endotracheal. */
  readonly route?: Route;
  /** Mask leak fraction 0 to 0.9 (mask route only). */
  readonly maskLeakFraction?: number;
};

export type RebreathingCheck = {
  /** True when the set flow is below the non-rebreathing minimum (2 x minute ventilation). */
  readonly rebreathing: boolean;
  /** True when the set flow is below the practical floor of 0.5 L/min. */
  readonly belowPracticalFloor: boolean;
  /** Set flow / minute ventilation. */
  readonly flowToMinuteVentilationRatio: number;
  /** Lowest flow to offer, L/min: the rebreathing limit, never below the practical minimum. */
  readonly minimumLpm: number;
  /** Flow below which the system rebreathes, L/min (2 x minute ventilation, mask leak made up); 0 where it cannot. */
  readonly rebreathingBelowLpm: number;
  readonly reason: string;
};

/**
 * Whether the set fresh gas flow lets a non-rebreathing system rebreathe: flagged below
 * 2 x minute ventilation (common practice). A circle rebreathes through its absorber by design
 * and is never flagged here; a chamber has no airway connection.
 * @throws RangeError when an input is out of range
 */
export function rebreathingCheck(input: RebreathingCheckInput): RebreathingCheck {
  assertRange(input.freshGasLpm, 'freshGasLpm', 0, 20);
  const route = input.route ?? 'endotracheal';
  const recommendation = recommendFreshGas({
    route: route === 'chamber' ? 'endotracheal' : route,
    circuit: input.circuit,
    bodyMassG: input.bodyMassG,
    minuteVentilationMlMin: input.minuteVentilationMlMin,
    ...(input.maskLeakFraction === undefined ? {} : { maskLeakFraction: input.maskLeakFraction }),
  });
  const ratio = (input.freshGasLpm * 1000) / input.minuteVentilationMlMin;
  const belowPracticalFloor = input.freshGasLpm < practicalFloorFlowLpm.value;
  if (route === 'chamber') {
    return {
      rebreathing: false,
      belowPracticalFloor,
      flowToMinuteVentilationRatio: ratio,
      minimumLpm: 0,
      rebreathingBelowLpm: 0,
      reason: 'Induction chamber: the bird breathes the chamber gas; no breathing system to rebreathe from',
    };
  }
  if (input.circuit === 'circle' && route !== 'airSacTube') {
    return {
      rebreathing: false,
      belowPracticalFloor,
      flowToMinuteVentilationRatio: ratio,
      minimumLpm: recommendation.minimumLpm,
      rebreathingBelowLpm: 0,
      reason: 'Circle: exhaled gas is rebreathed through the carbon dioxide absorber by design',
    };
  }
  const leak = route === 'mask' ? (input.maskLeakFraction ?? 0) : 0;
  const rebreathingBelowLpm =
    (nonRebreathingMinuteVentilationMultiple.minimum * input.minuteVentilationMlMin) / 1000 / (1 - leak);
  const rebreathing = input.freshGasLpm < rebreathingBelowLpm;
  const ratioText = ratio.toFixed(1);
  return {
    rebreathing,
    belowPracticalFloor,
    flowToMinuteVentilationRatio: ratio,
    minimumLpm: recommendation.minimumLpm,
    rebreathingBelowLpm,
    reason: rebreathing
      ? `Set flow is ${ratioText} x the minute ventilation, below the 2 x needed to keep a non-rebreathing system from rebreathing (${nonRebreathingMinuteVentilationMultiple.basis})`
      : `Set flow is ${ratioText} x the minute ventilation, at or above the 2 x minimum (${nonRebreathingMinuteVentilationMultiple.basis})`,
  };
}

/**
 * Time for a well-mixed chamber (no uptake) to reach a fraction of a step change in inflow
 * concentration: t = -tau ln(1 - fraction), tau = V / FGF. 3 tau gives 95 %
 * (OpenAnesthesia, "Time constant").
 * @param chamberVolumeL chamber volume in L, above 0
 * @param freshGasLpm inflow in L/min, above 0
 * @param fraction fraction of the step to reach, 0 to below 1; default 0.95
 * @returns time in min
 */
export function chamberTimeToFractionMin(
  chamberVolumeL: number,
  freshGasLpm: number,
  fraction = 0.95,
): number {
  assertRange(chamberVolumeL, 'chamberVolumeL', Number.MIN_VALUE, 1000);
  assertRange(freshGasLpm, 'freshGasLpm', Number.MIN_VALUE, 100);
  assertRange(fraction, 'fraction', 0, 0.999999);
  return (chamberVolumeL / freshGasLpm) * timeConstantsToFraction(fraction);
}
