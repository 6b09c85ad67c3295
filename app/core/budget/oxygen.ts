/**
 * Oxygen cylinders and the oxygen budget of a plan: litres used, endurance at the set flow and
 * whether the cylinder lasts with a reserve left.
 */
import type { SourceKind } from '../sourced.js';
import { psiToBar } from '../units.js';
import { flowSteps, integrateSteps, type FreshGasInput } from './consumption.js';

export type CylinderPresetId = 'us-e' | 'metric-2l-200bar' | 'metric-10l-200bar';

/** A cylinder size offered as a preset, with the basis of its figures. */
export type CylinderPreset = {
  readonly id: CylinderPresetId;
  readonly label: string;
  /** Gas content when full, litres at 1 atm; the value used for the budget. */
  readonly fullContentL: number;
  /** Published or derived range of the full content, litres. */
  readonly fullContentRangeL: readonly [number, number];
  /** Gauge pressure when full, bar. */
  readonly fullPressureBar: number;
  readonly basis: string;
  readonly kind: SourceKind;
};

/** Typical fill pressure of metric medical oxygen cylinders, bar. */
const metricFillPressureBar = 200;

export const cylinderPresets: Readonly<Record<CylinderPresetId, CylinderPreset>> = {
  'us-e': {
    id: 'us-e',
    label: 'US size E oxygen cylinder',
    fullContentL: 622,
    fullContentRangeL: [622, 680],
    fullPressureBar: psiToBar(2000),
    basis:
      'US E cylinder 622-680 L at 2000-2200 psi full (published, secondary); the lower figure with 2000 psi is used so that endurance is not overstated (assumption)',
    kind: 'published',
  },
  'metric-2l-200bar': {
    id: 'metric-2l-200bar',
    label: 'Metric cylinder, 2 L water capacity, 200 bar',
    fullContentL: 2 * metricFillPressureBar,
    fullContentRangeL: [2 * metricFillPressureBar, 2 * metricFillPressureBar],
    fullPressureBar: metricFillPressureBar,
    basis:
      'Content from water capacity x pressure (derived, ideal gas); 200 bar fill pressure (common practice)',
    kind: 'derived',
  },
  'metric-10l-200bar': {
    id: 'metric-10l-200bar',
    label: 'Metric cylinder, 10 L water capacity, 200 bar',
    fullContentL: 10 * metricFillPressureBar,
    fullContentRangeL: [10 * metricFillPressureBar, 10 * metricFillPressureBar],
    fullPressureBar: metricFillPressureBar,
    basis:
      'Content from water capacity x pressure (derived, ideal gas); 200 bar fill pressure (common practice)',
    kind: 'derived',
  },
};

/**
 * A cylinder described by a preset (optionally with the gauge reading now), by its water
 * capacity and gauge pressure (metric labelling), or by a known content in litres.
 */
export type CylinderSpec =
  | {
      readonly kind: 'preset';
      readonly presetId: CylinderPresetId;
      readonly gaugePressureBar?: number;
      readonly gaugePressurePsi?: number;
    }
  | { readonly kind: 'waterCapacity'; readonly waterCapacityL: number; readonly pressureBar: number }
  | { readonly kind: 'content'; readonly contentL: number };

/** Cylinder content with its basis. */
export type CylinderContent = {
  readonly contentL: number;
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

/**
 * Oxygen content of a cylinder in litres at 1 atm, with its basis.
 * Preset: full content, scaled by gauge pressure / full pressure when a gauge reading is given.
 * Water capacity: content = water capacity (L) x gauge pressure (bar) (derived; ideal gas, so it
 * slightly overstates a full 200 bar cylinder, whose oxygen is less compressible than ideal).
 * @param spec preset id (gauge 0 to 300 bar or 0 to 4400 psi), water capacity 0.1 to 100 L with
 *   pressure 0 to 300 bar, or content 0 to 100000 L
 * @returns content in L
 */
export function cylinderContent(spec: CylinderSpec): CylinderContent {
  switch (spec.kind) {
    case 'preset': {
      const preset = cylinderPresets[spec.presetId];
      const gaugeBar =
        spec.gaugePressureBar ??
        (spec.gaugePressurePsi === undefined ? undefined : psiToBar(spec.gaugePressurePsi));
      if (gaugeBar === undefined)
        return { contentL: preset.fullContentL, basis: preset.basis, kind: preset.kind };
      assertRange(gaugeBar, 'gaugePressureBar', 0, 300);
      return {
        contentL: (preset.fullContentL * gaugeBar) / preset.fullPressureBar,
        basis: `${preset.basis}; scaled by gauge pressure / full pressure (derived, ideal gas)`,
        kind: 'derived',
      };
    }
    case 'waterCapacity':
      assertRange(spec.waterCapacityL, 'waterCapacityL', 0.1, 100);
      assertRange(spec.pressureBar, 'pressureBar', 0, 300);
      return {
        contentL: spec.waterCapacityL * spec.pressureBar,
        basis: 'Content from water capacity x pressure (derived, ideal gas)',
        kind: 'derived',
      };
    case 'content':
      assertRange(spec.contentL, 'contentL', 0, 100000);
      return { contentL: spec.contentL, basis: 'Content entered by the clinic', kind: 'measured' };
  }
}

/**
 * Oxygen content of a cylinder in litres at 1 atm (see `cylinderContent` for the basis).
 * @returns content in L
 */
export function cylinderContentL(spec: CylinderSpec): number {
  return cylinderContent(spec).contentL;
}

/** Reserve kept in the cylinder by default, % of content (assumption: change at about a quarter full). */
export const defaultOxygenReservePct = 25;

export type OxygenBudgetInput = {
  /** Flowmeter flow, constant in L/min (0 to 20) or a step schedule (0 ahead of its first step). */
  readonly freshGasLpm: FreshGasInput;
  /** Duration of the plan in min, 0 to 1440. */
  readonly durationMin: number;
  readonly cylinder: CylinderSpec;
  /** Reserve to leave in the cylinder, % of content, 0 to 90; default 25 (assumption). */
  readonly reservePct?: number;
};

export type OxygenBudget = {
  /** Oxygen used over the plan, L. */
  readonly usedL: number;
  readonly cylinderContentL: number;
  /** Content above the reserve, L. */
  readonly usableL: number;
  readonly reservePct: number;
  /** Highest flow of the plan, L/min: the endurance is computed at this flow. */
  readonly peakFlowLpm: number;
  /** Minutes until the reserve is reached at the peak flow; null when no oxygen flows. */
  readonly enduranceMin: number | null;
  /** Minutes until the cylinder is empty at the peak flow; null when no oxygen flows. */
  readonly enduranceToEmptyMin: number | null;
  /** True when the plan's use fits in the content above the reserve. */
  readonly suffices: boolean;
  readonly basis: string;
};

/**
 * Oxygen budget of a plan: litres used (integral of the flowmeter flow; vapour is not oxygen),
 * endurance at the highest set flow, and whether the cylinder lasts with the reserve left.
 * @returns litres, minutes and a verdict
 */
export function oxygenBudget(input: OxygenBudgetInput): OxygenBudget {
  assertRange(input.durationMin, 'durationMin', 0, 1440);
  const reservePct = input.reservePct ?? defaultOxygenReservePct;
  assertRange(reservePct, 'reservePct', 0, 90);
  const steps = flowSteps(input.freshGasLpm);
  steps.forEach((step, index) => {
    assertRange(step.freshGasLpm, `freshGasLpm[${String(index)}]`, 0, 20);
    assertRange(step.atMin, `freshGasLpm[${String(index)}].atMin`, 0, 1440);
  });
  const usedL = integrateSteps(
    0,
    input.durationMin,
    steps.map((step) => step.atMin),
    (midMin) => {
      let flow = 0;
      for (const step of steps) if (step.atMin <= midMin) flow = step.freshGasLpm;
      return flow;
    },
  );
  const activeSteps = steps.filter((step) => step.atMin < input.durationMin || input.durationMin === 0);
  const peakFlowLpm = activeSteps.reduce((peak, step) => Math.max(peak, step.freshGasLpm), 0);
  const content = cylinderContent(input.cylinder);
  const usableL = content.contentL * (1 - reservePct / 100);
  return {
    usedL,
    cylinderContentL: content.contentL,
    usableL,
    reservePct,
    peakFlowLpm,
    enduranceMin: peakFlowLpm > 0 ? usableL / peakFlowLpm : null,
    enduranceToEmptyMin: peakFlowLpm > 0 ? content.contentL / peakFlowLpm : null,
    suffices: usedL <= usableL,
    basis: `Used: flowmeter flow over the plan; endurance: content above the reserve at the highest flow. Cylinder: ${content.basis}. Reserve ${String(reservePct)} %${input.reservePct === undefined ? ' (assumption)' : ''}.`,
  };
}
