import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { planInputSchema, planResultSchema } from '../../../app/contract/plan.js';
import { estimateRespiratory } from '../../../app/core/model/allometry.js';
import { computePlan, planEndMin } from '../../../app/core/model/compute-plan.js';
import { ippvPeriodAt, ippvPeriodsOf, ippvText } from '../../../app/core/model/ippv-periods.js';
import { phaseMinuteVentilationMlMin } from '../../../app/core/model/phase-budgets.js';
import { resolvePlanPhases } from '../../../app/core/model/phases.js';
import type { PlanInput, PlanVentilation } from '../../../app/core/model/plan-types.js';
import { simulate, type SimulationOutcome } from '../../../app/core/model/simulation.js';
import { speciesReference } from '../../../app/core/species-reference.js';
import { setupFor } from './plan-fixtures.js';

// An invented 400 g bird intubated on isoflurane: 4 % for 10 min, 2 % to 60 min, 30 min of
// recovery window. IPPV at 4 breaths/min (well below its spontaneous rate) with 1.5 x the resting
// tidal volume, so that a breath on the ventilator is told from a spontaneous one by its length.
const bird = 400;
const restingTidal = estimateRespiratory(bird).tidalVolumeMl.value;
const base: PlanInput = {
  bodyMassG: bird,
  agent: 'isoflurane',
  route: 'endotracheal',
  circuit: 'nonRebreathing',
  freshGasLpm: 1,
  schedule: [
    { atMin: 0, vaporPct: 4 },
    { atMin: 10, vaporPct: 2 },
    { atMin: 60, vaporPct: 0 },
  ],
  recoveryWindowMin: 30,
  uncertainty: { samples: 0, seed: 1 },
};
const ippvRate = 4;
const ippvTidal = Number((restingTidal * 1.5).toPrecision(3));
const ippv = { mode: 'ippv' as const, breathsPerMin: ippvRate, tidalVolumeMl: ippvTidal };

/** Start and length of every breath of a run (from the observer's expiration snapshots). */
function breathsOf(plan: PlanInput): {
  outcome: SimulationOutcome;
  breaths: { startMin: number; lengthMin: number }[];
} {
  const breaths: { startMin: number; lengthMin: number }[] = [];
  let start = 0;
  const outcome = simulate({
    ...setupFor(plan),
    onPhase: (snapshot) => {
      if (snapshot.phase !== 'expiration') return;
      breaths.push({ startMin: start, lengthMin: snapshot.timeMin - start });
      start = snapshot.timeMin;
    },
  });
  return { outcome, breaths };
}

const withVentilation = (ventilation: PlanVentilation): PlanInput => ({ ...base, ventilation });

describe('IPPV on, then off', () => {
  const [onMin, offMin] = [15, 35];
  const spontaneous = simulate(setupFor(base));
  const toTheEnd = simulate(setupFor(withVentilation({ ...ippv, fromMin: onMin })));
  const onOff = breathsOf(withVentilation({ ...ippv, fromMin: onMin, untilMin: offMin }));
  const brain = onOff.outcome.timeline.brainPct;
  const times = onOff.outcome.timeline.timeMin;

  it('is a valid plan', () => {
    expect(
      planInputSchema.safeParse(withVentilation({ ...ippv, fromMin: onMin, untilMin: offMin })).success,
    ).toBe(true);
  });

  it('follows the spontaneous run exactly up to the start of IPPV', () => {
    const upTo = times.filter((time) => time <= onMin).length;
    expect(upTo).toBeGreaterThan(10);
    expect(brain.slice(0, upTo)).toEqual(spontaneous.timeline.brainPct.slice(0, upTo));
    expect(onOff.outcome.timeline.arterialPct.slice(0, upTo)).toEqual(
      spontaneous.timeline.arterialPct.slice(0, upTo),
    );
    // ... and differs from it once the ventilator runs.
    const during = times.findIndex((time) => time >= onMin + 2);
    expect(brain[during]).not.toBe(spontaneous.timeline.brainPct[during]);
  });

  it('follows IPPV to the end exactly up to the end of IPPV, and differs from it after', () => {
    const upTo = times.filter((time) => time <= offMin).length;
    expect(brain.slice(0, upTo)).toEqual(toTheEnd.timeline.brainPct.slice(0, upTo));
    const later = times.map((time, index) => ({ time, index })).filter(({ time }) => time >= offMin + 2);
    expect(later.length).toBeGreaterThan(10);
    for (const { index } of later) expect(brain[index]).not.toBe(toTheEnd.timeline.brainPct[index]);
    expect(onOff.outcome.recoveryMin).not.toBe(toTheEnd.recoveryMin);
  });

  it('breathes on the ventilator within the period and spontaneously (depressed) before and after it', () => {
    const ventilated = onOff.breaths.filter(({ startMin }) => startMin >= onMin && startMin < offMin);
    const free = onOff.breaths.filter(({ startMin }) => startMin < onMin || startMin >= offMin);
    expect(ventilated.length).toBeGreaterThan(50);
    for (const breath of ventilated) expect(breath.lengthMin).toBeCloseTo(1 / ippvRate, 9);
    // The first breath after the end starts at or after it: the period ended at the first breath that did.
    const firstAfter = onOff.breaths.find(({ startMin }) => startMin >= offMin);
    expect(firstAfter).toBeDefined();
    expect((firstAfter?.startMin ?? 0) - offMin).toBeLessThan(1 / ippvRate + 1e-9);
    const afterOff = free.filter(({ startMin }) => startMin >= offMin);
    expect(afterOff.length).toBeGreaterThan(100);
    const resting = estimateRespiratory(bird).breathsPerMin.value;
    for (const breath of free) {
      // Spontaneous breaths: the resting rate or a depressed one, never the ventilator's.
      expect(breath.lengthMin).toBeGreaterThanOrEqual(1 / resting - 1e-9);
      expect(breath.lengthMin).toBeLessThan(1 / ippvRate / 2);
    }
    expect(onOff.outcome.lowestVentilationFraction).toBeLessThan(1);
  });

  it('runs the periods of a plan in turn: on, off, on again at other settings', () => {
    const twice = breathsOf(
      withVentilation({
        ...ippv,
        fromMin: onMin,
        untilMin: offMin,
        laterPeriods: [{ fromMin: 50, untilMin: 70, breathsPerMin: 6, tidalVolumeMl: ippvTidal }],
      }),
    );
    const lengthsIn = (from: number, until: number) =>
      twice.breaths.filter(({ startMin }) => startMin >= from && startMin < until).map((b) => b.lengthMin);
    for (const length of lengthsIn(onMin, offMin)) expect(length).toBeCloseTo(1 / ippvRate, 9);
    for (const length of lengthsIn(50, 70)) expect(length).toBeCloseTo(1 / 6, 9);
    for (const length of [...lengthsIn(offMin, 50), ...lengthsIn(70, 90)])
      expect(length).toBeLessThan(1 / 12);
    const twiceTimes = twice.outcome.timeline.timeMin;
    const upTo = twiceTimes.filter((time) => time <= 50).length;
    expect(twice.outcome.timeline.brainPct.slice(0, upTo)).toEqual(brain.slice(0, upTo));
  });

  it('gives a result the contract accepts, its flow rule following the larger of set and resting', () => {
    const plan = withVentilation({ ...ippv, fromMin: onMin, untilMin: offMin });
    const result = computePlan(plan, { species: speciesReference });
    expect(planResultSchema.safeParse(result).success).toBe(true);
    const estimates = estimateRespiratory(bird);
    const [phase] = resolvePlanPhases(plan, planEndMin(plan));
    if (phase === undefined) throw new Error('no phase');
    expect(phaseMinuteVentilationMlMin(plan, estimates, phase, true)).toBe(
      Math.max(ippvRate * ippvTidal, estimates.minuteVentilationMlMin.value),
    );
    // Touching periods that cover the whole plan follow the largest set ventilation alone.
    const covering = withVentilation({
      ...ippv,
      untilMin: 40,
      laterPeriods: [{ fromMin: 40, breathsPerMin: 5, tidalVolumeMl: ippvTidal }],
    });
    expect(phaseMinuteVentilationMlMin(covering, estimates, phase, true)).toBeCloseTo(5 * ippvTidal, 12);
  });
});

describe('one IPPV period without an end', () => {
  // The plans the property draws: 10 g to 5 kg on a tube, any dial, IPPV from any minute of the plan.
  const planArbitrary = fc
    .record({
      bodyMassG: fc.integer({ min: 10, max: 5000 }),
      route: fc.constantFrom('endotracheal' as const, 'airSacTube' as const),
      induction: fc.double({ min: 0.5, max: 5, noNaN: true }),
      maintenance: fc.double({ min: 0, max: 3, noNaN: true }),
      offMin: fc.integer({ min: 6, max: 20 }),
      rate: fc.double({ min: 1, max: 60, noNaN: true }),
      tidalMultiple: fc.double({ min: 0.5, max: 3, noNaN: true }),
      fromShare: fc.double({ min: 0, max: 0.95, noNaN: true }),
      splitShare: fc.double({ min: 0.05, max: 0.95, noNaN: true }),
    })
    .map((draw) => {
      const plan: PlanInput = {
        bodyMassG: draw.bodyMassG,
        agent: 'isoflurane',
        route: draw.route,
        circuit: 'nonRebreathing',
        freshGasLpm: draw.route === 'airSacTube' ? (draw.bodyMassG / 1000) * 0.5 + 0.05 : 1,
        schedule: [
          { atMin: 0, vaporPct: draw.induction },
          { atMin: 3, vaporPct: draw.maintenance },
          { atMin: draw.offMin, vaporPct: 0 },
        ],
        recoveryWindowMin: 5,
        uncertainty: { samples: 0, seed: 1 },
      };
      const endMin = planEndMin(plan);
      const fromMin = Math.round(draw.fromShare * endMin * 100) / 100;
      const tidal = Math.max(
        0.05,
        estimateRespiratory(draw.bodyMassG).tidalVolumeMl.value * draw.tidalMultiple,
      );
      return {
        plan,
        endMin,
        fromMin,
        splitMin: fromMin + Math.max(0.01, Math.round(draw.splitShare * (endMin - fromMin) * 100) / 100),
        ventilation: { mode: 'ippv' as const, breathsPerMin: draw.rate, tidalVolumeMl: tidal, fromMin },
      };
    });

  it('runs exactly as IPPV from fromMin to the end always ran (saved plans keep their meaning)', () => {
    fc.assert(
      fc.property(planArbitrary, ({ plan, endMin, fromMin, splitMin, ventilation }) => {
        const saved: PlanInput = { ...plan, ventilation };
        expect(planInputSchema.safeParse(saved).success).toBe(true);
        const { outcome, breaths } = breathsOf(saved);
        // Before fromMin: the spontaneous run, number for number.
        const spontaneous = simulate(setupFor(plan));
        const upTo = outcome.timeline.timeMin.filter((time) => time <= fromMin).length;
        expect(outcome.timeline.brainPct.slice(0, upTo)).toEqual(
          spontaneous.timeline.brainPct.slice(0, upTo),
        );
        // From the first breath that starts at or after fromMin to the end: the set breath, every breath.
        for (const breath of breaths)
          if (breath.startMin >= fromMin)
            expect(breath.lengthMin).toBeCloseTo(1 / ventilation.breathsPerMin, 9);
        // The same run, number for number, when the period is given an end at the plan's end, or
        // split into two touching periods with the same settings.
        expect(simulate(setupFor({ ...plan, ventilation: { ...ventilation, untilMin: endMin } }))).toEqual(
          outcome,
        );
        const split: PlanInput = {
          ...plan,
          ventilation: {
            ...ventilation,
            untilMin: splitMin,
            laterPeriods: [
              {
                fromMin: splitMin,
                breathsPerMin: ventilation.breathsPerMin,
                tidalVolumeMl: ventilation.tidalVolumeMl,
              },
            ],
          },
        };
        expect(planInputSchema.safeParse(split).success).toBe(true);
        expect(simulate(setupFor(split))).toEqual(outcome);
      }),
      { numRuns: 20, seed: 13 },
    );
  });
});

describe('the periods as read from a plan', () => {
  it('takes the plan’s own fields as the first period, from 0 when no start is given', () => {
    const ventilation: PlanVentilation = {
      ...ippv,
      untilMin: 10,
      laterPeriods: [{ fromMin: 20, breathsPerMin: 8, tidalVolumeMl: 3 }],
    };
    const periods = ippvPeriodsOf(ventilation);
    expect(periods).toEqual([
      { fromMin: 0, untilMin: 10, breathsPerMin: ippvRate, tidalVolumeMl: ippvTidal },
      { fromMin: 20, untilMin: null, breathsPerMin: 8, tidalVolumeMl: 3 },
    ]);
    expect(ippvPeriodAt(periods, 9.99)?.breathsPerMin).toBe(ippvRate);
    expect(ippvPeriodAt(periods, 10)).toBeNull();
    expect(ippvPeriodAt(periods, 25)?.breathsPerMin).toBe(8);
    expect(ippvPeriodsOf({ mode: 'spontaneous' })).toEqual([]);
    expect(ippvText(ventilation, String, 'long')).toBe(
      `IPPV 4 breaths/min, ${String(ippvTidal)} mL tidal volume until 10 min; 8 breaths/min, 3 mL tidal volume from 20 min`,
    );
    expect(ippvText({ ...ippv, fromMin: 5 }, String, 'short')).toBe(
      `IPPV 4/min × ${String(ippvTidal)} mL from 5 min`,
    );
  });
});
