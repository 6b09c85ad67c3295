/**
 * Liquid agent use: vapour yielded per millilitre of liquid, saturated concentration, and the
 * liquid used by a vaporiser schedule at a fresh gas flow.
 *
 * Conventions: `freshGasLpm` is the flowmeter (carrier gas) flow; the dial % is the vaporiser's
 * output concentration, so the vapour added per minute is FGF x c / (1 - c) (the carrier plus
 * the vapour leaves at concentration c). The clinical rule of thumb (Dhulkhed et al. 2013) uses
 * FGF x c; the two differ by the factor 1 / (1 - c), 2 % at a 2 % dial.
 */
import { agents, molarVolumeLAt20C, standardAtmosphereMmHg, type AgentId } from '../agents.js';
import type { Sourced } from '../sourced.js';

/** One vaporiser step: from `atMin` on, the dial reads `vaporPct` (until the next step). */
export type VaporiserStep = {
  readonly atMin: number;
  readonly vaporPct: number;
};

/** One flowmeter step: from `atMin` on, the oxygen flowmeter reads `freshGasLpm`. */
export type FlowStep = {
  readonly atMin: number;
  readonly freshGasLpm: number;
};

/** A fresh gas flow held constant (L/min) or a per-step flow schedule. */
export type FreshGasInput = number | readonly FlowStep[];

/**
 * Highest mark on the dial of each agent's own vaporiser, vol %: a plan above it cannot be set on
 * the vaporiser the clinic uses for that agent and is flagged.
 */
export const vaporiserDialLimitPct: Readonly<
  Record<AgentId, { readonly value: number; readonly basis: string; readonly kind: 'common practice' }>
> = {
  isoflurane: {
    value: 5,
    basis: 'Isoflurane vaporisers are marked up to 5 % (common practice)',
    kind: 'common practice',
  },
  sevoflurane: {
    value: 8,
    basis: 'Sevoflurane vaporisers are marked up to 8 % (common practice)',
    kind: 'common practice',
  },
  desflurane: {
    value: 18,
    basis: 'Desflurane vaporisers (heated, pressurised) are marked up to 18 % (common practice)',
    kind: 'common practice',
  },
};

/** Temperature of the reference molar volume (20 C) in kelvin. */
const referenceTemperatureK = 293.15;

/** Lowest and highest temperature (C) the vaporiser figures are offered for. */
export const vaporiserTemperatureRangeC: readonly [number, number] = [10, 35];

/**
 * Isoflurane saturated vapour pressure equation from the product label:
 * log10 P(mmHg) = 8.056 - 1664.58 / T(K). Gives 238.7 mmHg at 20 C.
 */
export const isofluraneVapourPressureEquation = {
  a: 8.056,
  b: 1664.58,
  basis: 'Product label (isoflurane): vapour pressure by temperature',
} as const;

function assertFinite(
  value: number,
  name: string,
  min = Number.NEGATIVE_INFINITY,
  max = Number.POSITIVE_INFINITY,
): void {
  if (!Number.isFinite(value) || value < min || value > max) {
    throw new RangeError(
      `${name}: must be a number between ${String(min)} and ${String(max)} (got ${String(value)})`,
    );
  }
}

/**
 * Millilitres of vapour one millilitre of liquid agent yields at 1 atm:
 * density (g/mL) / MW (g/mol) x molar volume (L/mol) x 1000.
 * The liquid density is the 20 C label value at every temperature (its change of about 0.2 % per
 * degree is neglected: assumption); the molar volume scales with absolute temperature.
 * Isoflurane about 195 mL, sevoflurane 183 mL, desflurane 210 mL at 20 C.
 * @param agent inhalant agent
 * @param temperatureC gas temperature in C, 10 to 35; default 20
 * @returns vapour volume in mL per mL of liquid
 */
export function vapourMlPerLiquidMl(agent: AgentId, temperatureC = 20): number {
  assertFinite(temperatureC, 'temperatureC', vaporiserTemperatureRangeC[0], vaporiserTemperatureRangeC[1]);
  const properties = agents[agent];
  const molarVolumeL = (molarVolumeLAt20C * (temperatureC + 273.15)) / referenceTemperatureK;
  return (
    (properties.liquidDensityGPerMl.value / properties.molecularWeightGPerMol.value) * molarVolumeL * 1000
  );
}

/**
 * Saturated vapour pressure of the agent with its basis. Isoflurane follows the label equation at
 * any temperature in range; sevoflurane and desflurane have only their 20 C label values here, so
 * at other temperatures the 20 C value is returned and the basis says so (assumption).
 * @param agent inhalant agent
 * @param temperatureC liquid temperature in C, 10 to 35; default 20
 * @returns vapour pressure in mmHg with its basis
 */
export function saturatedVapourPressureMmHg(agent: AgentId, temperatureC = 20): Sourced<number> {
  assertFinite(temperatureC, 'temperatureC', vaporiserTemperatureRangeC[0], vaporiserTemperatureRangeC[1]);
  if (agent === 'isoflurane') {
    const kelvin = temperatureC + 273.15;
    const { a, b, basis } = isofluraneVapourPressureEquation;
    return { value: 10 ** (a - b / kelvin), basis, kind: 'published' };
  }
  const label = agents[agent].vapourPressureMmHgAt20C;
  if (temperatureC === 20) return label;
  return {
    value: label.value,
    basis: `${label.basis}; no temperature equation held here, so the 20 C value is used at ${String(temperatureC)} C (assumption)`,
    kind: 'assumption',
  };
}

/**
 * Saturated concentration of the agent (vol %) at a barometric pressure: the highest
 * concentration any vaporiser can deliver. Isoflurane 31.3 % (label 238 mmHg; 31.4 % from the
 * label equation), sevoflurane 20.7 %, desflurane 88 % at 20 C and 760 mmHg. Capped at 100 %
 * where the vapour pressure reaches the barometric pressure (the agent boils).
 * @param agent inhalant agent
 * @param temperatureC liquid temperature in C, 10 to 35; default 20
 * @param barometricMmHg barometric pressure in mmHg, 300 to 800; default 760
 * @returns saturated concentration in vol %
 */
export function saturatedConcentrationPct(
  agent: AgentId,
  temperatureC = 20,
  barometricMmHg = standardAtmosphereMmHg,
): number {
  assertFinite(barometricMmHg, 'barometricMmHg', 300, 800);
  const vapourPressure = saturatedVapourPressureMmHg(agent, temperatureC).value;
  return Math.min(100, (vapourPressure / barometricMmHg) * 100);
}

/**
 * Vapour the vaporiser adds per minute at a dial setting: carrier flow x c / (1 - c).
 * @param freshGasLpm carrier (flowmeter) flow in L/min, 0 to 20
 * @param vaporPct dial concentration in vol %, 0 to below 100
 * @returns vapour flow in mL/min
 */
export function vapourFlowMlPerMin(freshGasLpm: number, vaporPct: number): number {
  assertFinite(freshGasLpm, 'freshGasLpm', 0, 20);
  assertFinite(vaporPct, 'vaporPct', 0, 99);
  const fraction = vaporPct / 100;
  return (freshGasLpm * 1000 * fraction) / (1 - fraction);
}

/** Value of a step schedule at time t (the last step at or before t), or `before` ahead of the first step. */
function stepValueAt<T extends { readonly atMin: number }>(
  steps: readonly T[],
  timeMin: number,
  read: (step: T) => number,
  before: number,
): number {
  let value = before;
  for (const step of steps) {
    if (step.atMin <= timeMin) value = read(step);
    else break;
  }
  return value;
}

function assertSorted(steps: readonly { readonly atMin: number }[], name: string): void {
  let previous = Number.NEGATIVE_INFINITY;
  steps.forEach((step, index) => {
    assertFinite(step.atMin, `${name}[${String(index)}].atMin`, 0);
    if (step.atMin < previous)
      throw new RangeError(`${name}[${String(index)}].atMin: steps must be in time order`);
    previous = step.atMin;
  });
}

/** The fresh gas flow as a step schedule (a constant flow is one step at 0 min). */
export function flowSteps(freshGas: FreshGasInput): readonly FlowStep[] {
  return typeof freshGas === 'number' ? [{ atMin: 0, freshGasLpm: freshGas }] : freshGas;
}

/**
 * Integral over [startMin, endMin] of a product of piecewise-constant step functions of time:
 * the intervals are cut at every step boundary of every schedule.
 * Ahead of its first step a vaporiser schedule reads 0 and a flow schedule reads 0.
 * @param startMin start in min, 0 or more
 * @param endMin end in min, at or after startMin
 * @param breakpoints every atMin of the schedules involved
 * @param integrand value of the product on an interval, given its midpoint
 */
export function integrateSteps(
  startMin: number,
  endMin: number,
  breakpoints: readonly number[],
  integrand: (midMin: number) => number,
): number {
  const cuts = [startMin, ...breakpoints.filter((t) => t > startMin && t < endMin), endMin].sort(
    (a, b) => a - b,
  );
  let total = 0;
  for (let index = 0; index + 1 < cuts.length; index += 1) {
    const from = cuts[index] ?? startMin;
    const to = cuts[index + 1] ?? endMin;
    if (to > from) total += integrand((from + to) / 2) * (to - from);
  }
  return total;
}

/** Inputs for the liquid agent used by a whole vaporiser schedule. */
export type ScheduleConsumptionInput = {
  readonly agent: AgentId;
  /** Vaporiser steps in time order; the dial reads 0 ahead of the first step. */
  readonly schedule: readonly VaporiserStep[];
  /** Carrier flow, constant in L/min (0 to 20) or a step schedule. */
  readonly freshGasLpm: FreshGasInput;
  /** End of the plan in min, 0 to 1440. */
  readonly endMin: number;
  /** Gas temperature for the vapour volume in C, 10 to 35; default 20. */
  readonly temperatureC?: number;
};

/**
 * Vapour (mL at 1 atm) the vaporiser adds over the schedule: the integral of
 * carrier flow x c / (1 - c) from 0 to endMin.
 * @returns vapour volume in mL
 */
export function vapourMlForSchedule(input: ScheduleConsumptionInput): number {
  assertFinite(input.endMin, 'endMin', 0, 1440);
  assertSorted(input.schedule, 'schedule');
  const flows = flowSteps(input.freshGasLpm);
  assertSorted(flows, 'freshGasLpm');
  const breakpoints = [...input.schedule.map((step) => step.atMin), ...flows.map((step) => step.atMin)];
  return integrateSteps(0, input.endMin, breakpoints, (midMin) =>
    vapourFlowMlPerMin(
      stepValueAt(flows, midMin, (step) => step.freshGasLpm, 0),
      stepValueAt(input.schedule, midMin, (step) => step.vaporPct, 0),
    ),
  );
}

/**
 * Liquid agent (mL) used by a vaporiser schedule at a fresh gas flow: vapour delivered over the
 * schedule divided by the vapour per mL of liquid. Agent taken up by the bird comes out of the
 * same vapour, so it is not added again.
 * @returns liquid agent in mL
 */
export function liquidAgentMlForSchedule(input: ScheduleConsumptionInput): number {
  return vapourMlForSchedule(input) / vapourMlPerLiquidMl(input.agent, input.temperatureC ?? 20);
}

/** Inputs for the hourly liquid use at one steady setting. */
export type HourlyConsumptionInput = {
  readonly agent: AgentId;
  /** Dial concentration in vol %, 0 to the saturated concentration. */
  readonly vaporPct: number;
  /** Carrier flow in L/min, 0 to 20. */
  readonly freshGasLpm: number;
  /** Gas temperature in C, 10 to 35; default 20. */
  readonly temperatureC?: number;
};

/**
 * Liquid agent used per hour at a steady dial setting and flow. Isoflurane 2 % at 1 L/min about
 * 6.3 mL/h (rule of thumb 3 x FGF x % = 6 mL/h, Dhulkhed et al. 2013).
 * @returns liquid agent in mL/h
 */
export function liquidMlPerHour(input: HourlyConsumptionInput): number {
  return (
    (vapourFlowMlPerMin(input.freshGasLpm, input.vaporPct) * 60) /
    vapourMlPerLiquidMl(input.agent, input.temperatureC ?? 20)
  );
}
