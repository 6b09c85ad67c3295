import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { liquidMlPerHour, vapourMlForSchedule } from '../../../app/core/budget/consumption.js';
import { recommendFreshGas } from '../../../app/core/budget/flows.js';
import { routes, type Route } from '../../../app/core/delivery.js';
import { oxygenBudget } from '../../../app/core/budget/oxygen.js';
import { wasteGasExposure } from '../../../app/core/budget/waste-gas.js';

const agentArbitrary = fc.constantFrom('isoflurane' as const, 'sevoflurane' as const, 'desflurane' as const);

describe('budget properties over valid inputs', () => {
  it('uses more liquid agent at a higher dial or a higher flow', () => {
    fc.assert(
      fc.property(
        agentArbitrary,
        fc.double({ min: 0.1, max: 8, noNaN: true }),
        fc.double({ min: 0.1, max: 8, noNaN: true }),
        fc.double({ min: 0.1, max: 5, noNaN: true }),
        (agent, dialA, dialB, flow) => {
          const low = Math.min(dialA, dialB);
          const high = Math.max(dialA, dialB);
          expect(liquidMlPerHour({ agent, vaporPct: high, freshGasLpm: flow })).toBeGreaterThanOrEqual(
            liquidMlPerHour({ agent, vaporPct: low, freshGasLpm: flow }),
          );
          expect(liquidMlPerHour({ agent, vaporPct: low, freshGasLpm: flow * 2 })).toBeCloseTo(
            2 * liquidMlPerHour({ agent, vaporPct: low, freshGasLpm: flow }),
            9,
          );
        },
      ),
      { numRuns: 100 },
    );
  });

  it('never delivers more vapour than the highest dial at the highest flow for the whole time', () => {
    const stepArbitrary = fc.record({
      atMin: fc.double({ min: 0, max: 120, noNaN: true }),
      vaporPct: fc.double({ min: 0, max: 8, noNaN: true }),
    });
    fc.assert(
      fc.property(
        fc.array(stepArbitrary, { minLength: 1, maxLength: 6 }),
        fc.double({ min: 0.1, max: 5, noNaN: true }),
        fc.double({ min: 1, max: 180, noNaN: true }),
        (steps, flow, endMin) => {
          const schedule = [...steps].sort((a, b) => a.atMin - b.atMin);
          const vapour = vapourMlForSchedule({ agent: 'isoflurane', schedule, freshGasLpm: flow, endMin });
          const highest = Math.max(...schedule.map((step) => step.vaporPct));
          expect(vapour).toBeGreaterThanOrEqual(0);
          expect(vapour).toBeLessThanOrEqual(
            ((flow * 1000 * highest) / (100 - highest)) * endMin * (1 + 1e-12) + 1e-9,
          );
        },
      ),
      { numRuns: 100 },
    );
  });

  it('keeps the room concentration non-negative with the peak above every sample and the 1-h mean', () => {
    fc.assert(
      fc.property(
        agentArbitrary,
        fc.double({ min: 0, max: 20000, noNaN: true }),
        fc.oneof(fc.constant(0), fc.double({ min: 0.01, max: 240, noNaN: true })),
        fc.double({ min: 5, max: 500, noNaN: true }),
        fc.double({ min: 0.5, max: 20, noNaN: true }),
        (agent, releasedVapourMl, releaseDurationMin, roomVolumeM3, airChangesPerHour) => {
          const exposure = wasteGasExposure({
            agent,
            releasedVapourMl,
            releaseDurationMin,
            roomVolumeM3,
            airChangesPerHour,
            sampleMin: 2,
          });
          const samples = exposure.timeline.map((sample) => sample.ppm);
          expect(Math.min(...samples)).toBeGreaterThanOrEqual(0);
          expect(Math.max(...samples)).toBeLessThanOrEqual(exposure.peakPpm * (1 + 1e-9) + 1e-12);
          expect(exposure.highestHourMeanPpm).toBeLessThanOrEqual(exposure.peakPpm * (1 + 1e-9) + 1e-12);
          if (releaseDurationMin > 0)
            expect(exposure.peakPpm).toBeLessThanOrEqual(exposure.steadyStatePpm * (1 + 1e-9));
        },
      ),
      { numRuns: 60 },
    );
  });

  it('never uses more oxygen than the highest flow for the whole time, and judges sufficiency by the reserve', () => {
    const flowArbitrary = fc.array(
      fc.record({
        atMin: fc.double({ min: 0, max: 120, noNaN: true }),
        freshGasLpm: fc.double({ min: 0, max: 10, noNaN: true }),
      }),
      { minLength: 1, maxLength: 5 },
    );
    fc.assert(
      fc.property(
        flowArbitrary,
        fc.double({ min: 1, max: 240, noNaN: true }),
        fc.double({ min: 0, max: 50, noNaN: true }),
        (steps, durationMin, reservePct) => {
          const flows = [...steps].sort((a, b) => a.atMin - b.atMin);
          const budget = oxygenBudget({
            freshGasLpm: flows,
            durationMin,
            cylinder: { kind: 'waterCapacity', waterCapacityL: 2, pressureBar: 150 },
            reservePct,
          });
          expect(budget.usedL).toBeGreaterThanOrEqual(0);
          expect(budget.usedL).toBeLessThanOrEqual(budget.peakFlowLpm * durationMin * (1 + 1e-12) + 1e-9);
          expect(budget.suffices).toBe(budget.usedL <= budget.usableL);
        },
      ),
      { numRuns: 100 },
    );
  });

  it('never recommends less than the minimum, on every route and circuit', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...routes),
        fc.constantFrom('nonRebreathing' as const, 'circle' as const),
        fc.double({ min: 5, max: 15000, noNaN: true }),
        fc.double({ min: 1, max: 5000, noNaN: true }),
        fc.double({ min: 0.5, max: 50, noNaN: true }),
        (route: Route, circuit, bodyMassG, minuteVentilationMlMin, chamberVolumeL) => {
          const flow = recommendFreshGas({
            route,
            circuit,
            bodyMassG,
            minuteVentilationMlMin,
            chamberVolumeL,
          });
          expect(flow.recommendedLpm).toBeGreaterThanOrEqual(flow.minimumLpm);
          expect(flow.rule.length).toBeGreaterThan(10);
          expect(flow.basis.length).toBeGreaterThan(10);
        },
      ),
      { numRuns: 100 },
    );
  });
});
