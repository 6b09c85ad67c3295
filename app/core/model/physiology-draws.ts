/**
 * The uncertainty run's draws of the anaesthetised bird's physiology: the depression rule
 * (depression.ts), body temperature's effect on solubility and MAC (temperature.ts) and the
 * exchanging share of the lung. Kept apart from uncertainty.ts so that every declared range of
 * these parameters is sampled in one place, and listed in one place for the result.
 */
import type { AgentId } from '../agents.js';
import {
  anaestheticIndexSpread,
  cardiacDepressionFloor,
  cardiacDepressionSlope,
  defaultAnaestheticIndex,
  ventilatoryRateShare,
} from './depression.js';
import { exchangingLungShare, type ModelParameter } from './parameters.js';
import type { UncertaintyParameter } from './plan-types.js';
import {
  avianNormalBodyTemperatureC,
  macTemperatureCoefficient,
  macTemperatureFactor,
  solubilityTemperatureCoefficient,
  solubilityTemperatureFactor,
} from './temperature.js';

/** What the draws need to know of the plan. */
export type PhysiologyContext = {
  readonly agent: AgentId;
  /** Whether the anaesthetic index is the species' published value (sampled by its spread). */
  readonly anaestheticIndexPublished: boolean;
  /** Body temperature entered for the plan, C, or null (the normothermic value, sampled). */
  readonly bodyTemperatureC: number | null;
};

/** One sample's physiology, as multipliers of the nominal setup where the setup holds a value. */
export type PhysiologyDraw = {
  /** Multiplier of the nominal ventilation slope (1 / anaesthetic index). */
  readonly ventilationSlopeMultiple: number;
  readonly rateShare: number;
  readonly cardiacSlope: number;
  readonly cardiacFloor: number;
  /** Multiplier of the nominal exchanging lung volume. */
  readonly lungShareMultiple: number;
  /** Multiplier of the blood/gas coefficient for temperature, over the nominal temperature factor. */
  readonly solubilityMultiple: number;
  /** Multiplier of the MAC for temperature, over the nominal temperature factor. */
  readonly macMultiple: number;
};

/**
 * The nominal temperature factor of the blood/gas coefficient (the setup's coefficient is its
 * 37 C value times this).
 * @param context the plan's agent and temperature
 */
export function nominalSolubilityFactor(context: PhysiologyContext): number {
  return solubilityTemperatureFactor(
    context.agent,
    context.bodyTemperatureC ?? avianNormalBodyTemperatureC.value,
  );
}

/**
 * Draws one sample's physiology.
 * @param draw triangular draw over a parameter's declared range, mode at its value
 * @param context the plan's agent, species index and temperature
 */
export function drawPhysiology(
  draw: (parameter: ModelParameter) => number,
  context: PhysiologyContext,
): PhysiologyDraw {
  // The slope is 1 / anaesthetic index: a sampled index of x times the nominal gives 1 / x the slope.
  const ventilationSlopeMultiple = context.anaestheticIndexPublished
    ? 1 / draw(anaestheticIndexSpread)
    : defaultAnaestheticIndex.value / draw(defaultAnaestheticIndex);
  const rateShare = draw(ventilatoryRateShare[context.agent]);
  const cardiacSlope = draw(cardiacDepressionSlope);
  const cardiacFloor = draw(cardiacDepressionFloor);
  const lungShareMultiple = draw(exchangingLungShare) / exchangingLungShare.value;
  const normalC = draw(avianNormalBodyTemperatureC);
  const solubilityCoefficient = draw(solubilityTemperatureCoefficient[context.agent]);
  const macCoefficient = draw(macTemperatureCoefficient);
  const nominalC = context.bodyTemperatureC ?? avianNormalBodyTemperatureC.value;
  const sampledC = context.bodyTemperatureC ?? normalC;
  return {
    ventilationSlopeMultiple,
    rateShare,
    cardiacSlope,
    cardiacFloor,
    lungShareMultiple,
    solubilityMultiple:
      solubilityTemperatureFactor(context.agent, sampledC, solubilityCoefficient) /
      nominalSolubilityFactor(context),
    macMultiple: macTemperatureFactor(sampledC, normalC, macCoefficient) / macTemperatureFactor(nominalC),
  };
}

/**
 * The sampled physiology parameters with their ranges and bases, for the result.
 * @param context the plan's agent, species index and temperature
 */
export function physiologyParameters(context: PhysiologyContext): UncertaintyParameter[] {
  const of = (name: string, parameter: ModelParameter, note = ''): UncertaintyParameter => ({
    name,
    low: parameter.range[0],
    high: parameter.range[1],
    basis: `${parameter.basis}${note}`,
  });
  return [
    context.anaestheticIndexPublished
      ? of('anaestheticIndexMultiple', anaestheticIndexSpread, " (multiplies the species' published index)")
      : of('anaestheticIndex', defaultAnaestheticIndex),
    of('ventilatoryRateShare', ventilatoryRateShare[context.agent]),
    of('cardiacDepressionSlope', cardiacDepressionSlope),
    of('cardiacDepressionFloor', cardiacDepressionFloor),
    of('exchangingLungShare', exchangingLungShare),
    of(
      'normalBodyTemperatureC',
      avianNormalBodyTemperatureC,
      context.bodyTemperatureC === null
        ? ''
        : ' (reference of the MAC; the entered temperature is not sampled)',
    ),
    of('solubilityTemperatureCoefficient', solubilityTemperatureCoefficient[context.agent]),
    of('macTemperatureCoefficient', macTemperatureCoefficient),
  ];
}
