import { describe, expect, it } from 'vitest';
import { maskEntrainedShare } from '../../../app/core/model/simulation.js';
import { runPlan, twoHourBudgerigarPlan } from './plan-fixtures.js';

describe('room air drawn around a face mask', () => {
  it('is the share of a half-sine inspiratory flow above the fresh gas flow', () => {
    // Half-sine inspiration over half the breath: peak = pi x minute ventilation [derived]; the
    // share is checked against a numerical integral of max(0, q(t) - FGF) / VT.
    const minuteVentilation = 100;
    for (const freshGas of [0, 30, 100, 200, 300]) {
      const peak = Math.PI * minuteVentilation;
      const steps = 200000;
      let above = 0;
      let total = 0;
      for (let step = 0; step < steps; step += 1) {
        const flow = peak * Math.sin((Math.PI * (step + 0.5)) / steps);
        above += Math.max(0, flow - freshGas);
        total += flow;
      }
      expect(maskEntrainedShare(freshGas, minuteVentilation)).toBeCloseTo(above / total, 6);
    }
    expect(maskEntrainedShare(0, 100)).toBeCloseTo(1, 12);
    expect(maskEntrainedShare(Math.PI * 100, 100)).toBe(0);
    expect(maskEntrainedShare(10000, 100)).toBe(0);
  });

  it('dilutes the inspired gas of a small bird only when the flow falls below its peak inspiratory flow', () => {
    const ample = runPlan(twoHourBudgerigarPlan);
    const starved = runPlan({ ...twoHourBudgerigarPlan, freshGasLpm: 0.02 });
    // 1 L/min is far above pi x the 30 g bird's minute ventilation: the dial reaches the bird undiluted.
    expect(ample.peakInspiredPct).toBeCloseTo(4, 6);
    expect(starved.peakInspiredPct).toBeLessThan(4 * 0.95);
  });
});
