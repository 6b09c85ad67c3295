/**
 * Cautions a veterinarian should see before and during an anaesthetic. Each caution names its
 * basis in its reason. The program defers to the veterinarian: a caution informs, it never
 * blocks a plan.
 */
import { agents, type AgentId } from './agents.js';
import { saturatedConcentrationPct } from './budget/consumption.js';
import { circleAboveMassG, practicalFloorFlowLpm, type Circuit, type Route } from './budget/flows.js';
import { nioshCeilingPpm } from './budget/waste-gas.js';
import { checkMassAgainstRange, unitSlipRule } from './mass-check.js';
import { basisText, type Sourced } from './sourced.js';
import type { AnatomyNote, MacMultiple } from './species-reference.js';

/** Severities of cautions and weight flags, most urgent first. */
export const cautionSeverities = ['danger', 'warning', 'notice'] as const;
export type CautionSeverity = (typeof cautionSeverities)[number];

export type Caution = {
  /** Stable kebab-case code; screens and tests key on it. */
  readonly code: string;
  readonly severity: CautionSeverity;
  /** What the veterinarian should know, in plain words. */
  readonly message: string;
  /** Why, with its basis. */
  readonly reason: string;
};

/** Everything the cautions look at. Every field is optional: a caution fires only on what is given. */
export type CautionContext = {
  /** Body mass in g. */
  readonly bodyMassG?: number;
  readonly speciesName?: string;
  /** Typical adult mass range of the species, g. */
  readonly speciesMassRangeG?: { readonly minG: number; readonly maxG: number };
  readonly agent?: AgentId;
  /** Highest vaporiser dial setting in the schedule, vol %. */
  readonly highestDialPct?: number;
  /** Saturated concentration of the agent, vol %; computed from the agent (20 C, 760 mmHg unless given) when absent. */
  readonly saturatedPct?: number;
  readonly temperatureC?: number;
  readonly barometricMmHg?: number;
  /** Set fresh gas flow, L/min (the lowest of the plan when it changes). */
  readonly freshGasLpm?: number;
  /** Minimum fresh gas flow of the route and circuit, L/min (from recommendFreshGas). */
  readonly minimumFreshGasLpm?: number;
  readonly route?: Route;
  readonly circuit?: Circuit;
  /** Whether the breathing system's exhaust is actively scavenged. */
  readonly scavenging?: boolean;
  /** Time the bird spends in the induction chamber, min. */
  readonly chamberExposureMin?: number;
  /** A phased plan: the route the bird is moved to from the chamber, and when. */
  readonly chamberMoveTo?: { readonly routeLabel: string; readonly atMin: number };
  /** Predicted peak brain partial pressure as a multiple of the MAC in use. */
  readonly predictedPeakBrainMacMultiple?: number;
  /** The species' published apnoea MAC multiple, when known. */
  readonly apnoeaMacMultiple?: MacMultiple;
  /**
   * Highest level delivered to the bird (inspired, or the tube gas with an air-sac tube) as a
   * multiple of the MAC in use, from the model.
   */
  readonly peakInspiredMacMultiple?: number;
  /** Whether the MAC in use is a published avian value for this agent (false: fallback or assumption). */
  readonly macIsPublishedForBird?: boolean;
  /** Waste gas: peak and highest 1-h mean room concentration, ppm. */
  readonly wasteGasPeakPpm?: number;
  readonly wasteGasHourMeanPpm?: number;
  /** Ventilation mode; IPPV settings when ventilated. */
  readonly ventilationMode?: 'spontaneous' | 'ippv';
  readonly ippvPeakPressureCmH2O?: number;
  /** Endotracheal route: whether the tube has a cuff and whether it is inflated. */
  readonly tubeCuffInflated?: boolean;
  /** Airway anatomy notes of the species. */
  readonly anatomyNotes?: readonly AnatomyNote[];
};

/** Lowest published MAC multiple at which apnoea is reported in birds: duck, above 1.5 MAC. */
export const lowestPublishedApnoeaMacMultiple = {
  value: 1.5,
  basis: 'Duck apnoea common above 1.5 MAC isoflurane (Ludders, Mitchell & Rode 1990, Vet Surg 19)',
  kind: 'published',
} as const satisfies Sourced<number>;

/** Chamber time above which the chamber caution fires, min (assumption). */
export const longChamberExposureMin = {
  value: 10,
  basis: 'Assumption: about 10 min in a chamber, where the bird cannot be watched or supported closely',
  kind: 'assumption',
} as const satisfies Sourced<number>;

/** IPPV peak inspiratory pressure usually kept to about 10-15 cmH2O (from memory). */
export const ippvPeakPressureCmH2O = {
  value: [10, 15],
  basis: 'IPPV peak pressure about 10-15 cmH2O (unverified value)',
  kind: 'from memory',
} as const satisfies Sourced<readonly [number, number]>;

const severityOrder: Record<CautionSeverity, number> = { danger: 0, warning: 1, notice: 2 };

function format(value: number, digits = 2): string {
  return String(Number(value.toFixed(digits)));
}

function massCautions(context: CautionContext): Caution[] {
  const { bodyMassG, speciesMassRangeG } = context;
  if (bodyMassG === undefined || speciesMassRangeG === undefined || !(bodyMassG > 0)) return [];
  const { minG, maxG } = speciesMassRangeG;
  const species = context.speciesName ?? 'this species';
  const check = checkMassAgainstRange(bodyMassG, speciesMassRangeG);
  if (check.verdict === 'unit-slip') {
    return [
      {
        code: 'mass-unit-slip',
        severity: check.severity,
        message:
          check.slip === 'kg-as-g'
            ? `Body mass ${format(bodyMassG, 0)} g is about 1000 times the typical ${format(minG, 0)}-${format(maxG, 0)} g of ${species}: was the mass entered in kilograms as grams?`
            : `Body mass ${format(bodyMassG, 3)} g is about 1/1000 of the typical ${format(minG, 0)}-${format(maxG, 0)} g of ${species}: was the mass entered in grams as kilograms?`,
        reason: `${unitSlipRule.toleranceFactor.basis}; every flow, volume and budget scales with mass. ${unitSlipRule.rangeBasis}`,
      },
    ];
  }
  if (check.verdict === 'outside') {
    return [
      {
        code: 'mass-outside-species-range',
        severity: check.severity,
        message: `Body mass ${format(bodyMassG, 1)} g is outside the typical ${format(minG, 0)}-${format(maxG, 0)} g of ${species}: check the weight and the species`,
        reason: `${unitSlipRule.rangeBasis}; estimates scale with mass`,
      },
    ];
  }
  return [];
}

function agentCautions(context: CautionContext): Caution[] {
  const cautions: Caution[] = [];
  const { agent, highestDialPct } = context;
  if (agent !== undefined && highestDialPct !== undefined) {
    const saturated =
      context.saturatedPct ??
      saturatedConcentrationPct(agent, context.temperatureC ?? 20, context.barometricMmHg ?? 760);
    if (highestDialPct > saturated) {
      cautions.push({
        code: 'dial-above-saturated',
        severity: 'danger',
        message: `Dial ${format(highestDialPct)} % is above the saturated concentration of ${agents[agent].displayName.toLowerCase()} (${format(saturated, 1)} %): no vaporiser can deliver it; check the agent and the setting`,
        reason:
          'Saturated concentration = saturated vapour pressure / barometric pressure (product label vapour pressure; derived)',
      });
    }
  }
  if (agent === 'desflurane') {
    cautions.push({
      code: 'desflurane-no-avian-mac',
      severity: 'warning',
      message:
        "No MAC of desflurane in birds was found: the depth targets use a value that is an assumption; enter the clinic's own value if it has one",
      reason:
        'Desflurane in birds: none found in the reference list; the fallback is the human adult value (assumption)',
    });
  } else if (agent !== undefined && context.macIsPublishedForBird === false) {
    cautions.push({
      code: 'mac-not-published-for-species',
      severity: 'notice',
      message: `No published ${agents[agent].displayName.toLowerCase()} MAC for this species: the depth targets use ${agents[agent].fallbackMacPct.value} %`,
      reason: agents[agent].fallbackMacPct.basis,
    });
  }
  return cautions;
}

function flowCautions(context: CautionContext): Caution[] {
  const cautions: Caution[] = [];
  const { freshGasLpm, minimumFreshGasLpm, circuit, route } = context;
  if (freshGasLpm === undefined) return cautions;
  const nonRebreathing = circuit === 'nonRebreathing' || route === 'airSacTube';
  // A circle's minimum is the practical floor, reported below; only a non-rebreathing system rebreathes.
  if (
    nonRebreathing &&
    route !== 'chamber' &&
    minimumFreshGasLpm !== undefined &&
    freshGasLpm < minimumFreshGasLpm
  ) {
    cautions.push({
      code: 'flow-below-rebreathing-minimum',
      severity: 'danger',
      message: `Fresh gas ${format(freshGasLpm)} L/min is below the ${format(minimumFreshGasLpm)} L/min minimum: the non-rebreathing system will rebreathe exhaled gas (carbon dioxide)`,
      reason:
        'Non-rebreathing fresh gas flow 2-3 x minute ventilation (common practice); 500 mL/kg/min prevents rebreathing (Massey University, Mapleson D circuits)',
    });
  }
  if (route === 'chamber' && minimumFreshGasLpm !== undefined && freshGasLpm < minimumFreshGasLpm) {
    cautions.push({
      code: 'chamber-flow-slow',
      severity: 'warning',
      message: `Chamber flow ${format(freshGasLpm)} L/min is below ${format(minimumFreshGasLpm)} L/min: the chamber takes more than 10 min to reach 95 % of the dial`,
      reason:
        'Time constant tau = volume / flow, 95 % after 3 tau (OpenAnesthesia, "Time constant"); 10 min limit (assumption)',
    });
  }
  if (freshGasLpm > 0 && freshGasLpm < practicalFloorFlowLpm.value) {
    cautions.push({
      code: 'flow-below-practical-floor',
      severity: 'notice',
      message: `Fresh gas ${format(freshGasLpm)} L/min is below the practical floor of ${practicalFloorFlowLpm.value} L/min: vaporiser output may not match the dial`,
      reason: practicalFloorFlowLpm.basis,
    });
  }
  return cautions;
}

function circuitCautions(context: CautionContext): Caution[] {
  const { bodyMassG, circuit, route } = context;
  if (bodyMassG === undefined || circuit === undefined || route === 'chamber' || route === 'airSacTube')
    return [];
  if (circuit === 'nonRebreathing' && bodyMassG > circleAboveMassG.value) {
    return [
      {
        code: 'non-rebreathing-large-bird',
        severity: 'notice',
        message: `A ${format(bodyMassG / 1000, 1)} kg bird on a non-rebreathing system needs high flows: a circle system is usual above about 7-10 kg`,
        reason: circleAboveMassG.basis,
      },
    ];
  }
  if (circuit === 'circle' && bodyMassG < circleAboveMassG.value) {
    return [
      {
        code: 'circle-small-bird',
        severity: 'warning',
        message: `A ${format(bodyMassG / 1000, 2)} kg bird on a circle system: valves and absorber add resistance and volume; non-rebreathing systems are usual below about 7-10 kg`,
        reason: circleAboveMassG.basis,
      },
    ];
  }
  return [];
}

/**
 * The inspired level against the species' published apnoea level (its anaesthetic index x MAC,
 * an end-tidal value). Breathed for long enough, the bird's level moves towards the inspired
 * one, so an inspired level above the apnoea level can bring apnoea even when the plan's
 * predicted depth stays below it. Only species with a published value: no family or default
 * value is used, since none was found.
 */
function inspiredApnoeaCautions(context: CautionContext): Caution[] {
  const inspired = context.peakInspiredMacMultiple;
  const speciesMultiple = context.apnoeaMacMultiple;
  if (inspired === undefined || speciesMultiple === undefined || inspired < speciesMultiple.value) return [];
  return [
    {
      code: 'inspired-above-apnoea-level',
      severity: 'warning',
      message: `The bird breathes up to ${format(inspired)} x MAC, ${format(inspired / speciesMultiple.value, 1)} times the ${format(speciesMultiple.value)} x MAC at which apnoea is reported in this species: watch breathing closely and lower the dial once the bird is induced`,
      reason: `${speciesMultiple.basis}; held long enough, the bird's level approaches the inspired level`,
    },
  ];
}

function apnoeaCautions(context: CautionContext): Caution[] {
  const inspiredCautions = inspiredApnoeaCautions(context);
  return [...inspiredCautions, ...brainApnoeaCautions(context)];
}

function brainApnoeaCautions(context: CautionContext): Caution[] {
  const peak = context.predictedPeakBrainMacMultiple;
  if (peak === undefined) return [];
  const speciesMultiple = context.apnoeaMacMultiple;
  if (speciesMultiple !== undefined) {
    if (peak < speciesMultiple.value) return [];
    return [
      {
        code: 'apnoea-risk',
        severity: 'danger',
        message: `Predicted peak depth ${format(peak)} x MAC reaches ${format(speciesMultiple.value)} x MAC, where apnoea is reported in this species: be ready to ventilate`,
        reason: speciesMultiple.basis,
      },
    ];
  }
  if (peak < lowestPublishedApnoeaMacMultiple.value) return [];
  return [
    {
      code: 'apnoea-risk',
      severity: 'warning',
      message: `Predicted peak depth ${format(peak)} x MAC is above 1.5 x MAC, where apnoea becomes common in ducks; no value is published for this species: be ready to ventilate`,
      reason: `${lowestPublishedApnoeaMacMultiple.basis}; chicken apnoea at 3.31 % isoflurane = 2.8 MAC (Midon et al. 2021, J Zoo Wildl Med 52:327-331)`,
    },
  ];
}

function roomCautions(context: CautionContext): Caution[] {
  const cautions: Caution[] = [];
  if (
    context.route === 'chamber' &&
    context.chamberExposureMin !== undefined &&
    context.chamberExposureMin > longChamberExposureMin.value
  ) {
    cautions.push({
      code: 'long-chamber-exposure',
      severity: 'warning',
      message:
        context.chamberMoveTo === undefined
          ? `${format(context.chamberExposureMin, 0)} min in the chamber: the bird cannot be watched or supported closely, and opening the chamber releases its agent to the room; move to a mask or tube once it is recumbent`
          : `${format(context.chamberExposureMin, 0)} min in the chamber: the bird cannot be watched or supported closely, and opening the chamber releases its agent to the room; the plan moves it to the ${context.chamberMoveTo.routeLabel.toLowerCase()} at ${format(context.chamberMoveTo.atMin, 1)} min: move it earlier, once it is recumbent`,
      reason: longChamberExposureMin.basis,
    });
  }
  if (context.scavenging === false) {
    cautions.push({
      code: 'no-scavenging',
      severity: 'warning',
      message: 'No scavenging: the exhaust of the breathing system goes to the room',
      reason:
        'Mask induction without scavenging gave 11.2 ppm isoflurane at the anaesthetist, 2.0 ppm with a scavenging double mask (Friembichler et al. 2011, Acta Vet Scand 53:1); NIOSH 1977 2 ppm ceiling',
    });
  }
  const hourMean = context.wasteGasHourMeanPpm;
  const peak = context.wasteGasPeakPpm;
  if (
    (hourMean !== undefined && hourMean > nioshCeilingPpm.value) ||
    (peak !== undefined && peak > nioshCeilingPpm.value)
  ) {
    const figures = [
      peak === undefined ? null : `peak ${format(peak, 1)} ppm`,
      hourMean === undefined ? null : `highest 1-h mean ${format(hourMean, 1)} ppm`,
    ]
      .filter((text) => text !== null)
      .join(', ');
    cautions.push({
      code: 'waste-gas-above-ceiling',
      severity: 'warning',
      message: `Predicted room concentration (${figures}) is above the 2 ppm ceiling: scavenge, ventilate the room or shorten the mask or chamber time`,
      reason: `${nioshCeilingPpm.basis}; well-mixed room estimate (the breathing zone next to a mask can be higher)`,
    });
  }
  return cautions;
}

function airwayCautions(context: CautionContext): Caution[] {
  const cautions: Caution[] = [];
  if (context.route === 'endotracheal') {
    cautions.push(
      context.tubeCuffInflated === true
        ? {
            code: 'cuff-inflated',
            severity: 'warning',
            message:
              'Tube cuff inflated: birds have complete tracheal rings and an inflated cuff can injure the tracheal mucosa; use an uncuffed tube or leave the cuff down',
            reason:
              'Complete tracheal rings: uncuffed tubes or cuff left down (Elliott 2014, WSAVA proceedings)',
          }
        : {
            code: 'uncuffed-tube',
            severity: 'notice',
            message: 'Use an uncuffed tube or leave the cuff down: birds have complete tracheal rings',
            reason:
              'Complete tracheal rings: uncuffed tubes or cuff left down (Elliott 2014, WSAVA proceedings)',
          },
    );
  }
  if (context.ventilationMode === 'ippv') {
    const pressure = context.ippvPeakPressureCmH2O;
    const [low, high] = ippvPeakPressureCmH2O.value;
    cautions.push(
      pressure !== undefined && pressure > high
        ? {
            code: 'ippv-peak-pressure-high',
            severity: 'warning',
            message: `IPPV peak pressure ${format(pressure, 1)} cmH2O is above the usual ${low}-${high} cmH2O: the air sacs are thin-walled; watch sternal movement`,
            reason: ippvPeakPressureCmH2O.basis,
          }
        : {
            code: 'ippv-peak-pressure',
            severity: 'notice',
            message: `IPPV: keep the peak pressure about ${low}-${high} cmH2O and watch sternal movement`,
            reason: ippvPeakPressureCmH2O.basis,
          },
    );
  }
  for (const note of context.anatomyNotes ?? []) {
    if (note.code === 'complete-tracheal-rings') continue;
    cautions.push({
      code: `anatomy-${note.code}`,
      severity: 'notice',
      message: note.text,
      reason: basisText(note),
    });
  }
  return cautions;
}

/**
 * Every caution that applies to the context, most severe first (danger, warning, notice),
 * in a stable order within a severity. Pure: the same context always gives the same list.
 * @param context plain object; absent fields switch off the cautions that need them
 * @returns cautions, each with its code, severity, message and reason naming its basis
 */
export function collectCautions(context: CautionContext): Caution[] {
  const all = [
    ...massCautions(context),
    ...agentCautions(context),
    ...flowCautions(context),
    ...circuitCautions(context),
    ...apnoeaCautions(context),
    ...roomCautions(context),
    ...airwayCautions(context),
  ];
  return all
    .map((caution, index) => ({ caution, index }))
    .sort(
      (a, b) => severityOrder[a.caution.severity] - severityOrder[b.caution.severity] || a.index - b.index,
    )
    .map(({ caution }) => caution);
}
