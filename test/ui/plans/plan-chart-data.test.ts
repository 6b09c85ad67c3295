import { describe, expect, it } from 'vitest';
import { computePlan } from '../../../app/core/model/compute-plan.js';
import { routeLabels } from '../../../app/core/delivery.js';
import type { PlanInput } from '../../../app/core/model/plan-types.js';
import { speciesReference } from '../../../app/core/species-reference.js';
import { stepValuesAt } from '../../../app/ui/common/strip-chart-model.js';
import {
  depthChartData,
  gasChartData,
  planDialSteps,
  resample,
} from '../../../app/ui/plans/plan-chart-data.js';

/** The value, or a failed test when it is missing. */
function must<T>(value: T | null | undefined): T {
  if (value === null || value === undefined) throw new Error('expected a value');
  return value;
}

/** A 30 g bird induced by mask, intubated at 6 min after a minute on room air (invented demo plan). */
const phasedPlan: PlanInput = {
  bodyMassG: 30,
  agent: 'isoflurane',
  route: 'mask',
  freshGasLpm: 1,
  schedule: [
    { atMin: 0, vaporPct: 4 },
    { atMin: 10, vaporPct: 2 },
    { atMin: 40, vaporPct: 0 },
  ],
  laterPhases: [{ startMin: 6, gapMin: 1, route: 'endotracheal', freshGasLpm: 0.5 }],
  recoveryWindowMin: 30,
  uncertainty: { samples: 12, seed: 7 },
};

const result = computePlan(phasedPlan, { species: speciesReference });

describe('the depth view of the planning chart', () => {
  const data = depthChartData(result);
  const depth = must(data.strips.find((strip) => strip.id === 'depth'));
  const dial = must(data.strips.find((strip) => strip.id === 'dial'));

  it('draws the brain as a multiple of the bird’s MAC', () => {
    const brain = must(depth.lines.find((line) => line.id === 'brain'));
    expect(brain.unit).toBe('× MAC');
    result.timeline.brainPct.forEach((pct, index) => {
      expect(brain.values[index]).toBeCloseTo(pct / result.mac.valuePct, 12);
    });
    // The peak the model reports, read back from the curve.
    expect(Math.max(...(brain.values as number[]))).toBeCloseTo(result.milestones.peakBrainMacMultiple, 2);
  });

  it('shades the planned depth from the plan’s target up, and the waking zone between the recovery levels', () => {
    const levelOf = (id: string) =>
      must(result.milestones.definitions.find((entry) => entry.id === id)).macMultiple;
    const bands = Object.fromEntries((depth.bands ?? []).map((band) => [band.id, band]));
    expect(bands['planned-depth']).toMatchObject({ from: result.targetMacMultiple, to: depth.range.max });
    expect(bands['waking']).toMatchObject({ from: levelOf('standing'), to: levelOf('firstMovement') });
    // Every milestone's level is drawn and named, at the level the model defines.
    expect((depth.levels ?? []).map((level) => [level.id, level.value])).toEqual(
      result.milestones.definitions.map((definition) => [definition.id, definition.macMultiple]),
    );
    expect(depth.range.max).toBeGreaterThanOrEqual(result.milestones.peakBrainMacMultiple);
  });

  it('draws the model runs’ 5-95 % band as a lighter area in the same units', () => {
    const band = must(result.uncertainty.brainBandPct);
    expect(depth.area?.low[5]).toBeCloseTo(must(band.p5[5]) / result.mac.valuePct, 12);
    expect(depth.area?.high[5]).toBeCloseTo(must(band.p95[5]) / result.mac.valuePct, 12);
    expect(depth.area?.label).toMatch(/12 model runs/);
  });

  it('marks each milestone at its time and level (recovery counted from the vaporiser off)', () => {
    const m = result.milestones;
    const milestones = data.markers.filter((marker) => marker.kind === 'milestone');
    expect(milestones.map((marker) => marker.atMin)).toEqual(
      [
        m.lossOfRightingMin,
        m.surgicalDepthMin,
        must(m.vaporiserOffMin) + must(m.firstMovementMin),
        must(m.vaporiserOffMin) + must(m.standingMin),
      ].filter((value) => value !== null),
    );
    expect(milestones[0]?.label).toMatch(/^Loss of righting: /);
  });

  it('draws the dial as the plan’s steps on its own strip', () => {
    const line = must(dial.lines[0]);
    expect(line.steps).toBe(true);
    // The plan's own settings: 4 % from the start, 2 % from 10 min, off at 40 min.
    const at = (minute: number) => line.values[data.x.findIndex((value) => value >= minute)];
    expect([at(0), at(5), at(10), at(39), at(40), at(60)]).toEqual([4, 4, 2, 2, 0, 0]);
  });

  it('marks the phase changes with their routes and the room-air gap', () => {
    const phases = data.markers.filter((marker) => marker.kind === 'phase');
    expect(phases.map((marker) => [marker.atMin, marker.mark])).toEqual([
      [0, routeLabels.mask],
      [6, routeLabels.endotracheal],
    ]);
    expect(phases[1]?.label).toBe('Phase 2 from 6 min: Endotracheal tube after 1 min on room air');
    expect(data.spans).toEqual([
      { fromMin: 6, toMin: 7, label: 'Room air while the bird is moved to the next route' },
    ]);
  });

  it('stops the cursor about once a minute (the first sample at or after each minute)', () => {
    const minutes = data.stops.map((index) => must(data.x[index]));
    expect(minutes[0]).toBe(0);
    expect(minutes.at(-1)).toBe(data.xMax);
    for (let index = 1; index < minutes.length - 1; index += 1)
      expect(must(minutes[index]) - must(minutes[index - 1])).toBeLessThanOrEqual(
        1 + result.timeline.sampleIntervalMin + 1e-9,
      );
  });

  it('draws a compared plan at its own MAC multiple on the same minutes', () => {
    const other = computePlan(
      {
        ...phasedPlan,
        agent: 'sevoflurane',
        schedule: [
          { atMin: 0, vaporPct: 6 },
          { atMin: 30, vaporPct: 0 },
        ],
      },
      {
        species: speciesReference,
      },
    );
    const compared = must(
      must(depthChartData(result, { compareWith: { label: 'plan B', result: other } }).strips[0]).lines[1],
    );
    expect(compared.label).toBe('Brain, plan B');
    expect(compared.values[0]).toBeCloseTo(must(other.timeline.brainPct[0]) / other.mac.valuePct, 12);
  });
});

describe('a plan saved before phases were listed', () => {
  it('takes its dial from the plan’s schedule and marks no phases', () => {
    const old = { ...result, phases: [] };
    const data = depthChartData(old, { schedule: phasedPlan.schedule });
    expect(data.markers.filter((marker) => marker.kind === 'phase')).toEqual([]);
    expect(planDialSteps(old, phasedPlan.schedule)).toEqual([
      { minute: 0, value: 4 },
      { minute: 10, value: 2 },
      { minute: 40, value: 0 },
    ]);
  });
  it('joins the phases’ steps into one dial (a phase repeats the step running at its start)', () => {
    expect(planDialSteps(result)).toEqual([
      { minute: 0, value: 4 },
      { minute: 10, value: 2 },
      { minute: 40, value: 0 },
    ]);
    expect(stepValuesAt(planDialSteps(result), [6.5])).toEqual([4]);
  });
});

describe('the gas view', () => {
  it('shows the agent in vol % in the airways, air sacs, blood and brain, with the dial below', () => {
    const data = gasChartData(result);
    expect(data.strips.map((strip) => strip.id)).toEqual(['gas', 'dial']);
    expect(must(data.strips[0]).lines.map((line) => [line.label, line.unit])).toEqual([
      ['Breathed in', '%'],
      ['Posterior air sacs', '%'],
      ['Gas-exchange surface', '%'],
      ['Arterial blood', '%'],
      ['Brain', '%'],
    ]);
    expect(must(must(data.strips[0]).lines[4]).values).toBe(result.timeline.brainPct);
  });
});

describe('resampling onto other minutes', () => {
  it('interpolates linearly and leaves minutes outside the curve empty', () => {
    expect(resample([0, 2, 4], [0, 2, 0], [0, 1, 3, 5])).toEqual([0, 1, 1, null]);
  });
});
