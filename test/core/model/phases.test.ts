import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { planInputSchema, planResultSchema } from '../../../app/contract/plan.js';
import { liquidAgentMlForSchedule } from '../../../app/core/budget/consumption.js';
import { recommendFreshGas } from '../../../app/core/budget/flows.js';
import { routes, type Route } from '../../../app/core/delivery.js';
import { estimateRespiratory } from '../../../app/core/model/allometry.js';
import { computePlan } from '../../../app/core/model/compute-plan.js';
import { defaultMaskLeakFraction } from '../../../app/core/model/parameters.js';
import { phasedWasteGas } from '../../../app/core/model/phase-budgets.js';
import { resolvePlanPhases } from '../../../app/core/model/phases.js';
import type { PlanInput, PlanPhaseChange, PlanResult } from '../../../app/core/model/plan-types.js';
import { speciesReference } from '../../../app/core/species-reference.js';
import { runPlan, setupFor } from './plan-fixtures.js';

const tables = { species: speciesReference };

/** A 430 g bird on a mask, isoflurane 5 % then 2 %, off at 60 min, 30 min of recovery. */
const maskPlan: PlanInput = {
  bodyMassG: 430,
  agent: 'isoflurane',
  route: 'mask',
  circuit: 'nonRebreathing',
  freshGasLpm: 1,
  schedule: [
    { atMin: 0, vaporPct: 5 },
    { atMin: 8, vaporPct: 2 },
    { atMin: 60, vaporPct: 0 },
  ],
  recoveryWindowMin: 30,
  uncertainty: { samples: 0, seed: 1 },
};

function withTube(plan: PlanInput, startMin: number, gapMin: number): PlanInput {
  return {
    ...plan,
    laterPhases: [{ startMin, gapMin, route: 'endotracheal', circuit: 'nonRebreathing', freshGasLpm: 0.6 }],
  };
}

/** The brain level (vol %) at the timeline point nearest `atMin`. */
function brainAt(result: PlanResult | ReturnType<typeof runPlan>, atMin: number): number {
  const { timeMin, brainPct } = result.timeline;
  let best = 0;
  timeMin.forEach((time, index) => {
    if (Math.abs(time - atMin) < Math.abs((timeMin[best] as number) - atMin)) best = index;
  });
  return brainPct[best] as number;
}

describe('phased plans in the simulation', () => {
  it('gives the same induction as the single-route plan when the switch comes after it', () => {
    const single = runPlan(maskPlan);
    const phased = runPlan(withTube(maskPlan, 10, 0.5));
    expect(single.inductionMin).not.toBeNull();
    expect(single.inductionMin as number).toBeLessThan(10);
    // The same engine runs the same breaths until the switch, so the figures are the same numbers.
    expect(phased.inductionMin).toBe(single.inductionMin);
    expect(phased.milestoneMin[0]).toBe(single.milestoneMin[0]);
    // Until the switch the curves agree point by point; after it they part.
    const before = single.timeline.timeMin.findIndex((time) => time >= 9.9);
    expect(phased.timeline.brainPct.slice(0, before)).toEqual(single.timeline.brainPct.slice(0, before));
    expect(brainAt(phased, 20)).not.toBe(brainAt(single, 20));
  });

  it('lowers the brain during a room-air gap compared with no gap', () => {
    const noGap = runPlan(withTube(maskPlan, 10, 0));
    const gap = runPlan(withTube(maskPlan, 10, 1));
    // The bird breathes room air: nothing is delivered during the gap.
    const gapPoints = gap.timeline.timeMin
      .map((time, index) => ({ time, inspired: gap.timeline.inspiredPct[index] as number }))
      .filter(({ time }) => time > 10.05 && time < 10.95);
    expect(gapPoints.length).toBeGreaterThan(3);
    for (const point of gapPoints) expect(point.inspired).toBe(0);
    expect(brainAt(gap, 11)).toBeLessThan(0.95 * brainAt(noGap, 11));
    // Before the move the two runs are the same.
    expect(brainAt(gap, 9.5)).toBe(brainAt(noGap, 9.5));
  });

  it('carries the bird across a chamber to mask move: the chamber content leaves as a puff at the move', () => {
    const chamberToMask: PlanInput = {
      bodyMassG: 95,
      agent: 'isoflurane',
      route: 'chamber',
      chamberVolumeL: 3,
      freshGasLpm: 2,
      schedule: [
        { atMin: 0, vaporPct: 5 },
        { atMin: 6, vaporPct: 2.5 },
        { atMin: 30, vaporPct: 0 },
      ],
      laterPhases: [{ startMin: 6, gapMin: 0.5, route: 'mask', freshGasLpm: 1, maskLeakFraction: 0.1 }],
      recoveryWindowMin: 30,
      scavenging: false,
      uncertainty: { samples: 0, seed: 1 },
    };
    expect(planInputSchema.safeParse(chamberToMask).success).toBe(true);
    const outcome = runPlan(chamberToMask);
    const result = computePlan(chamberToMask, tables);
    expect(planResultSchema.safeParse(result).success).toBe(true);
    // The chamber held most of its 5 % dial when the bird was taken out at 6 min (3 L at 2 L/min: tau 1.5 min).
    const atMove = outcome.mixedPctAtDeliveryEnd[0] as number;
    expect(atMove).toBeGreaterThan(4);
    expect(atMove).toBeLessThanOrEqual(5);
    const opened = result.wasteGas.sources.find((source) => source.source === 'chamberOpened');
    expect(opened?.vapourMl).toBeCloseTo(3000 * (atMove / 100), 6);
    // The mask leak counts only the mask phase's vapour: 10 % of what the vaporiser puts out from 6 min.
    const maskPhaseVapourMl =
      result.phases[1] === undefined
        ? Number.NaN
        : (result.phases[1].liquidMl * result.consumption.vapourMlPerLiquidMl) / 1;
    const leak = result.wasteGas.sources.find((source) => source.source === 'maskLeak');
    expect(leak?.vapourMl).toBeCloseTo(0.1 * maskPhaseVapourMl, 6);
    // Per phase: the chamber's wash-in time only for the chamber, the mask's own flow rule.
    expect(result.phases.map((phase) => phase.route)).toEqual(['chamber', 'mask']);
    expect(result.phases[0]?.flows.chamberTimeTo95Min).toBeCloseTo(4.49, 2);
    expect(result.phases[1]?.flows.chamberTimeTo95Min).toBeNull();
    // The brain keeps rising after the move on the mask and the bird recovers after the vaporiser is off.
    expect(outcome.inductionMin).not.toBeNull();
    expect(outcome.recoveryMin).not.toBeNull();
    expect(brainAt(outcome, 6.4)).toBeLessThan(brainAt(outcome, 5.9));
  });

  it('points the long-chamber caution at the phase that takes the bird out', () => {
    const longChamber: PlanInput = {
      bodyMassG: 95,
      agent: 'isoflurane',
      route: 'chamber',
      chamberVolumeL: 3,
      freshGasLpm: 2,
      schedule: [
        { atMin: 0, vaporPct: 4 },
        { atMin: 30, vaporPct: 0 },
      ],
      laterPhases: [{ startMin: 14, route: 'mask', freshGasLpm: 1 }],
      scavenging: true,
      uncertainty: { samples: 0, seed: 1 },
    };
    const result = computePlan(longChamber, tables);
    const chamber = result.cautions.filter((caution) => caution.code === 'long-chamber-exposure');
    expect(chamber).toHaveLength(1);
    // 14 min in the chamber; the plan moves the bird to the mask at 14 min.
    expect(chamber[0]?.message).toBe(
      'Phase 1 (Induction chamber, from 0 min): 14 min in the chamber: the bird cannot be watched or supported closely, and opening the chamber releases its agent to the room; the plan moves it to the face mask at 14 min: move it earlier, once it is recumbent',
    );
    // Moved at 8 min: no chamber caution.
    const early = computePlan(
      { ...longChamber, laterPhases: [{ startMin: 8, route: 'mask', freshGasLpm: 1 }] },
      tables,
    );
    expect(early.cautions.some((caution) => caution.code === 'long-chamber-exposure')).toBe(false);
  });

  it('closes the mass balance across phases', () => {
    const plan: PlanInput = {
      ...maskPlan,
      laterPhases: [
        {
          startMin: 5,
          gapMin: 1,
          route: 'endotracheal',
          circuit: 'circle',
          circuitVolumeL: 2,
          freshGasLpm: 0.5,
        },
        { startMin: 40, gapMin: 0.5, route: 'airSacTube', freshGasLpm: 0.3 },
      ],
    };
    const totals = runPlan(plan).totals;
    const held = totals.gasStoredMl + totals.bodyStoredMl;
    expect(totals.deliveredToBirdMl).toBeGreaterThan(0);
    expect(Math.abs(totals.deliveredToBirdMl - totals.exhaledMl - held)).toBeLessThan(
      1e-9 * totals.deliveredToBirdMl,
    );
    expect(Math.abs(totals.uptakeMl - totals.bodyStoredMl)).toBeLessThan(1e-9 * totals.deliveredToBirdMl);
  });

  it('reads a plan with no later phases exactly as one without the field', () => {
    const without = computePlan(maskPlan, tables);
    const empty = computePlan({ ...maskPlan, laterPhases: [] }, tables);
    expect(empty).toEqual(without);
    expect(without.phases).toHaveLength(1);
    expect(without.phases[0]?.flows).toEqual(without.flows);
    expect(setupFor(maskPlan).laterDeliveries).toBeUndefined();
  });

  it('has the uncertainty band follow the phased curve through a long gap', () => {
    const plan: PlanInput = { ...withTube(maskPlan, 20, 3), uncertainty: { samples: 40, seed: 7 } };
    const result = computePlan(plan, tables);
    const band = result.uncertainty.brainBandPct;
    expect(band).not.toBeNull();
    // The nominal curve dips during the 3-min gap; a band from single-route samples would sit above it.
    expect(brainAt(result, 23)).toBeLessThan(0.8 * brainAt(result, 20));
    result.timeline.timeMin.forEach((time, index) => {
      if (time < 19 || time > 26) return;
      const nominal = result.timeline.brainPct[index] as number;
      expect(band?.p5[index] as number).toBeLessThanOrEqual(nominal * 1.0001 + 1e-9);
      expect(band?.p95[index] as number).toBeGreaterThanOrEqual(nominal * 0.9999 - 1e-9);
    });
  });
});

describe('phased plans in the budgets', () => {
  const phased: PlanInput = {
    ...withTube(maskPlan, 6, 0.5),
    ventilation: { mode: 'ippv', breathsPerMin: 8, tidalVolumeMl: 12, fromMin: 6.5 },
    cylinder: { kind: 'preset', presetId: 'us-e' },
  };

  it('sums the phases to the whole-plan oxygen and liquid agent', () => {
    const result = computePlan(phased, tables);
    const oxygen = result.phases.reduce((sum, phase) => sum + phase.oxygenUsedL, 0);
    const liquid = result.phases.reduce((sum, phase) => sum + phase.liquidMl, 0);
    // 1 L/min for 6 min, then 0.6 L/min to the end at 90 min.
    expect(oxygen).toBeCloseTo(1 * 6 + 0.6 * 84, 9);
    expect(result.oxygen.usedL).toBeCloseTo(oxygen, 9);
    expect(result.consumption.liquidMl).toBeCloseTo(liquid, 9);
    // The simulation's own vaporiser output (half-breath by half-breath, each phase's flow) agrees.
    const simulatedLiquid = result.massBalance.vaporiserOutputMl / result.consumption.vapourMlPerLiquidMl;
    expect(Math.abs(simulatedLiquid - liquid)).toBeLessThan(0.01 * liquid);
    // Same flow in every phase: the phases sum to the single-route plan's figure.
    const sameFlow = computePlan(
      { ...phased, laterPhases: [{ startMin: 6, gapMin: 0.5, route: 'endotracheal', freshGasLpm: 1 }] },
      tables,
    );
    const single = liquidAgentMlForSchedule({
      agent: 'isoflurane',
      schedule: phased.schedule,
      freshGasLpm: 1,
      endMin: 90,
      temperatureC: 20,
    });
    expect(sameFlow.phases.reduce((sum, phase) => sum + phase.liquidMl, 0)).toBeCloseTo(single, 9);
  });

  it("recommends each phase's flow for its own route and ventilation", () => {
    const result = computePlan(phased, tables);
    const resting = estimateRespiratory(430).minuteVentilationMlMin.value;
    const mask = recommendFreshGas({
      route: 'mask',
      circuit: 'nonRebreathing',
      bodyMassG: 430,
      minuteVentilationMlMin: resting,
      maskLeakFraction: defaultMaskLeakFraction.value,
    });
    // The mask phase breathes spontaneously: its rule follows the resting ventilation (default leak).
    expect(result.phases[0]?.flows.minimumLpm).toBeCloseTo(mask.minimumLpm, 9);
    // IPPV runs from the tube phase's delivery on: its rule follows the set 8 x 12 mL.
    const tube = recommendFreshGas({
      route: 'endotracheal',
      circuit: 'nonRebreathing',
      bodyMassG: 430,
      minuteVentilationMlMin: 96,
    });
    expect(result.phases[1]?.flows.minimumLpm).toBeCloseTo(tube.minimumLpm, 9);
    expect(result.phases[1]?.flows.recommendedLpm).toBeCloseTo(tube.recommendedLpm, 9);
    // The plan's own flows are the first phase's.
    expect(result.flows).toEqual(result.phases[0]?.flows);
  });

  it('flags rebreathing in the phase whose flow is too low, naming the phase', () => {
    const low: PlanInput = {
      ...maskPlan,
      laterPhases: [{ startMin: 10, route: 'endotracheal', freshGasLpm: 0.1 }],
    };
    const result = computePlan(low, tables);
    expect(result.phases[0]?.flows.rebreathing).toBe(false);
    expect(result.phases[1]?.flows.rebreathing).toBe(true);
    const rebreathing = result.cautions.filter(
      (caution) => caution.code === 'flow-below-rebreathing-minimum',
    );
    expect(rebreathing).toHaveLength(1);
    expect(rebreathing[0]?.message).toMatch(
      /^Phase 2 \(Endotracheal tube, from 10 min\): Fresh gas 0\.1 L\/min/,
    );
    const floor = result.cautions.filter((caution) => caution.code === 'flow-below-practical-minimum');
    expect(floor.map((caution) => caution.message.slice(0, 8))).toEqual(['Phase 2 ']);
  });

  it('times the waste-gas releases: the mask steps while it is on, the chamber puff at the move', () => {
    const plan: PlanInput = {
      bodyMassG: 95,
      agent: 'isoflurane',
      route: 'chamber',
      chamberVolumeL: 3,
      freshGasLpm: 2,
      schedule: [
        { atMin: 0, vaporPct: 5 },
        { atMin: 6, vaporPct: 2.5 },
        { atMin: 30, vaporPct: 0 },
      ],
      laterPhases: [{ startMin: 6, gapMin: 0.5, route: 'mask', freshGasLpm: 1 }],
      recoveryWindowMin: 30,
      uncertainty: { samples: 0, seed: 1 },
    };
    const setup = setupFor(plan);
    const outcome = runPlan(plan);
    const phases = resolvePlanPhases(plan, setup.endMin);
    const deliveries = [setup.delivery, ...(setup.laterDeliveries ?? []).map((later) => later.delivery)];
    const waste = phasedWasteGas(
      plan,
      phases,
      deliveries,
      outcome.mixedPctAtDeliveryEnd,
      outcome.mixedPctAtInduction,
      outcome.inductionMin,
    );
    const puffs = waste.releases.filter((release) => release.durationMin === 0);
    expect(puffs).toHaveLength(1);
    expect(puffs[0]?.startMin).toBe(6);
    expect(puffs[0]?.vapourMl).toBeCloseTo(3000 * ((outcome.mixedPctAtDeliveryEnd[0] as number) / 100), 9);
    // The chamber's steady release runs 0-6 min, the mask phase's from 6 min (its gap included) to the vaporiser off at 30.
    const steady = waste.releases
      .filter((release) => release.durationMin > 0)
      .map((release) => [release.startMin, release.startMin + release.durationMin]);
    expect(steady).toEqual([
      [0, 6],
      [6, 30],
    ]);
    // Everything released is the sum of the sources.
    const released = waste.releases.reduce((sum, release) => sum + release.vapourMl, 0);
    expect(released).toBeCloseTo(waste.releasedVapourMl, 9);
  });

  it('releases a mask leak only while the mask is on', () => {
    const single = computePlan({ ...maskPlan, maskLeakFraction: 0.2 }, tables);
    const phasedLeak = computePlan({ ...withTube(maskPlan, 10, 0.5), maskLeakFraction: 0.2 }, tables);
    const leakOf = (result: PlanResult) =>
      result.wasteGas.sources.find((source) => source.source === 'maskLeak')?.vapourMl ?? 0;
    // 0-10 min on the mask (5 % then 2 %) against 0-60 min.
    expect(leakOf(phasedLeak)).toBeGreaterThan(0);
    expect(leakOf(phasedLeak)).toBeLessThan(0.5 * leakOf(single));
    const maskVapour =
      (phasedLeak.phases[0]?.liquidMl ?? Number.NaN) * phasedLeak.consumption.vapourMlPerLiquidMl;
    expect(leakOf(phasedLeak)).toBeCloseTo(0.2 * maskVapour, 6);
  });
});

/** Random phase lists: any route after any route, any gap, any flow, with the contract's checks. */
const phasedPlanArbitrary: fc.Arbitrary<PlanInput> = fc
  .record({
    bodyMassG: fc.integer({ min: 20, max: 5000 }),
    first: fc.constantFrom<Route>(...routes),
    later: fc.array(
      fc.record({
        route: fc.constantFrom<Route>(...routes),
        circle: fc.boolean(),
        startStep: fc.double({ min: 0.5, max: 12, noNaN: true }),
        gapMin: fc.double({ min: 0, max: 3, noNaN: true }),
        freshGasLpm: fc.double({ min: 0.1, max: 3, noNaN: true }),
      }),
      { minLength: 1, maxLength: 3 },
    ),
    induction: fc.double({ min: 1, max: 5, noNaN: true }),
    maintenance: fc.double({ min: 0.5, max: 3, noNaN: true }),
  })
  .map((draw): PlanInput => {
    let start = 0;
    const laterPhases = draw.later.map((phase): PlanPhaseChange => {
      start += phase.startStep;
      const circuit = phase.circle && phase.route === 'endotracheal' ? 'circle' : 'nonRebreathing';
      return {
        startMin: Math.round(start * 10) / 10 + 0.1,
        gapMin: phase.gapMin,
        route: phase.route,
        circuit,
        freshGasLpm:
          phase.route === 'airSacTube'
            ? Math.min(phase.freshGasLpm, (draw.bodyMassG / 1000) * 0.5 + 0.05)
            : phase.freshGasLpm,
        ...(phase.route === 'chamber' ? { chamberVolumeL: 2 } : {}),
        ...(circuit === 'circle' ? { circuitVolumeL: 2 } : {}),
      };
    });
    return {
      bodyMassG: draw.bodyMassG,
      agent: 'isoflurane',
      route: draw.first,
      freshGasLpm: draw.first === 'airSacTube' ? Math.min(0.5, (draw.bodyMassG / 1000) * 0.5 + 0.05) : 1,
      ...(draw.first === 'chamber' ? { chamberVolumeL: 2 } : {}),
      schedule: [
        { atMin: 0, vaporPct: draw.induction },
        { atMin: 5, vaporPct: draw.maintenance },
        { atMin: 35, vaporPct: 0 },
      ],
      laterPhases,
      recoveryWindowMin: 10,
      uncertainty: { samples: 0, seed: 1 },
    };
  });

describe('phased plans, properties', () => {
  it('never gives a negative or non-finite level, and the result passes its schema', () => {
    fc.assert(
      fc.property(phasedPlanArbitrary, (plan) => {
        const parsed = planInputSchema.safeParse(plan);
        if (!parsed.success) return true;
        const result = computePlan(parsed.data, tables);
        for (const channel of [
          result.timeline.inspiredPct,
          result.timeline.posteriorSacsPct,
          result.timeline.parabronchialPct,
          result.timeline.anteriorSacsPct,
          result.timeline.arterialPct,
          result.timeline.brainPct,
          result.timeline.musclePct,
          result.timeline.fatPct,
        ])
          for (const value of channel) {
            expect(Number.isFinite(value)).toBe(true);
            expect(value).toBeGreaterThanOrEqual(0);
          }
        expect(planResultSchema.safeParse(result).success).toBe(true);
        const phaseOxygen = result.phases.reduce((sum, phase) => sum + phase.oxygenUsedL, 0);
        expect(phaseOxygen).toBeCloseTo(result.oxygen.usedL, 6);
        return true;
      }),
      { numRuns: 25, seed: 11 },
    );
  });
});
