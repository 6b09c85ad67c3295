/**
 * Dose-dependent depression of breathing and of cardiac output under isoflurane and sevoflurane.
 *
 * Breathing: spontaneous minute ventilation falls linearly with the brain's MAC multiple m and
 * reaches apnoea at the anaesthetic index AI (apnoea concentration / MAC), the species' published
 * value where one exists:
 *   V(m) = max(floor, 1 - m / AI)
 * The fall is split between breathing rate and tidal volume by the agent's rate share s:
 *   rate = V^s x resting rate,   tidal volume = V^(1 - s) x resting tidal volume
 * so that rate x tidal volume = V x resting minute ventilation for any s.
 *
 * Cardiac output: every tissue group's blood flow is scaled by one factor (the flow fractions
 * stay as they are):
 *   C(m) = max(cardiacFloor, 1 - cardiacSlope x m)
 * No avian cardiac output under isoflurane or sevoflurane was found; the slope is an assumption
 * whose direction the avian studies below support (heart rate, pressure and ejection velocity fall
 * or stay level, never rise with the dose in the isoflurane and sevoflurane studies read).
 */
import type { AgentId } from '../agents.js';
import type { ModelParameter } from './parameters.js';

/**
 * Anaesthetic index (apnoea MAC multiple) for a species without a published value: between the
 * published duck and chicken indices.
 */
export const defaultAnaestheticIndex: ModelParameter = {
  value: 2.2,
  range: [1.65, 2.8],
  basis:
    'Assumption between the published avian anaesthetic indices for isoflurane: Pekin duck 1.65 +/- 0.13 (Ludders, Mitchell & Rode 1990, Vet Surg 19), chicken 2.80 +/- 0.26 (Midon et al. 2021, J Zoo Wildl Med 52:327-331); sandhill cranes: apnoea in 2 of 6 at 2 MAC (Ludders et al. 1989, sandhill cranes, isoflurane)',
  kind: 'assumption',
};

/** Spread of a species' published anaesthetic index, as a multiple of it. */
export const anaestheticIndexSpread: ModelParameter = {
  value: 1,
  range: [0.85, 1.15],
  basis:
    'Published spreads of the avian anaesthetic index: chicken 2.80 +/- 0.26 (9 %, Midon et al. 2021, J Zoo Wildl Med 52:327-331); duck 1.65 +/- 0.13 SEM of 4 (SD about 16 %, Ludders, Mitchell & Rode 1990, Vet Surg 19)',
  kind: 'derived',
};

/**
 * Share of the fall in minute ventilation taken by the breathing rate (in logarithms: rate =
 * V^share), by agent. 0: only tidal volume falls; 1: only the rate.
 */
export const ventilatoryRateShare: Readonly<Record<AgentId, ModelParameter>> = {
  isoflurane: {
    value: 0.5,
    range: [0.2, 0.8],
    basis:
      'Assumption from avian isoflurane studies: Hispaniolan Amazons, rate fell from 41 +/- 17 to 25 +/- 15 /min between 1 and 10 min (Langlois et al. 2003, J Avian Med Surg 17:4); pigeons at 1 MAC, rate unchanged while end-tidal CO2 rose (Vet Anaesth Analg 2016, 43:63-71); red-tailed hawks hypoventilated with both rate and tidal volume measured (Hawkins et al. 2013, Am J Vet Res 74:136-143): rate and tidal volume both fall, about half each',
    kind: 'assumption',
  },
  sevoflurane: {
    value: 0.2,
    range: [0, 0.5],
    basis:
      'Assumption from avian sevoflurane studies: pigeons at 1 MAC, end-tidal CO2 rose although the rate rose (Botman et al. 2016, Vet Rec): tidal volume falls; Hispaniolan Amazons, rate below baseline throughout (Klaphake et al. 2006, J Avian Med Surg 20:2-7): most of the fall in tidal volume, some in rate',
    kind: 'assumption',
  },
  desflurane: {
    value: 0.2,
    range: [0, 0.5],
    basis: 'Assumption: no avian desflurane study read; taken as sevoflurane',
    kind: 'assumption',
  },
};

/** Fall of cardiac output per brain MAC multiple. */
export const cardiacDepressionSlope: ModelParameter = {
  value: 0.15,
  range: [0, 0.3],
  basis:
    'Assumption: no avian cardiac output under isoflurane or sevoflurane was found; cardiac output taken to fall 15 % per MAC multiple (0-30 %). Direction from birds: racing pigeons under isoflurane, heart rate and aortic and pulmonary peak flow velocities fell, ejection times lengthened (Legler et al. 2019, Open Vet J 9:18-26); sandhill cranes, mean arterial pressure fell as isoflurane rose (Ludders et al. 1989); pigeons at 1 MAC sevoflurane, systolic pressure fell, heart rate unchanged (Botman et al. 2016, Vet Rec)',
  kind: 'assumption',
};

/** Lowest fraction of resting cardiac output kept by the depression rule. */
export const cardiacDepressionFloor: ModelParameter = {
  value: 0.5,
  range: [0.4, 0.6],
  basis:
    'Assumption: cardiac output is not taken below half of resting; deeper depression is circulatory failure, which the plan does not simulate',
  kind: 'assumption',
};

/** The depression rule of one plan, as the simulation uses it. */
export type DepressionRule = {
  /** Fall of minute ventilation per brain MAC multiple (1 / anaesthetic index). */
  readonly ventilationSlope: number;
  /** Lowest fraction of resting minute ventilation. */
  readonly ventilationFloor: number;
  /** Share of the fall taken by the rate, 0-1. */
  readonly rateShare: number;
  /** Fall of cardiac output per brain MAC multiple. */
  readonly cardiacSlope: number;
  /** Lowest fraction of resting cardiac output. */
  readonly cardiacFloor: number;
};

/**
 * Fraction of resting minute ventilation at a brain MAC multiple.
 * @param rule the plan's depression rule
 * @param macMultiple brain partial pressure / MAC, >= 0
 */
export function ventilationFraction(rule: DepressionRule, macMultiple: number): number {
  return Math.max(rule.ventilationFloor, 1 - rule.ventilationSlope * macMultiple);
}

/**
 * Breathing rate and tidal volume fractions for a minute-ventilation fraction.
 * @param minuteFraction fraction of resting minute ventilation, 0-1
 * @param rateShare share of the fall taken by the rate, 0-1
 * @returns [rate fraction, tidal volume fraction], their product is minuteFraction
 */
export function splitVentilation(minuteFraction: number, rateShare: number): [number, number] {
  const rate = minuteFraction ** rateShare;
  return [rate, minuteFraction / rate];
}

/**
 * Fraction of resting cardiac output at a brain MAC multiple.
 * @param rule the plan's depression rule
 * @param macMultiple brain partial pressure / MAC, >= 0
 */
export function cardiacOutputFraction(rule: DepressionRule, macMultiple: number): number {
  return Math.max(rule.cardiacFloor, 1 - rule.cardiacSlope * macMultiple);
}
