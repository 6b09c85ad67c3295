import convert from 'convert-units';
import { describe, expect, it } from 'vitest';
import { cardiacOutputMlMin, tidalVolumeMl } from '../../../app/core/model/allometry.js';
import type { PlanInput } from '../../../app/core/model/plan-types.js';
import { computePlan } from '../../../app/core/model/compute-plan.js';
import { setupFor } from './plan-fixtures.js';

// convert-units is the referee for every conversion the model makes between the units of the plan
// (g, L/min, L, m3) and its internal units (kg in the allometric equations, mL, mL/min, min).

const plan: PlanInput = {
  bodyMassG: 2200,
  agent: 'isoflurane',
  route: 'chamber',
  chamberVolumeL: 2.5,
  freshGasLpm: 1.5,
  schedule: [
    { atMin: 0, vaporPct: 3 },
    { atMin: 20, vaporPct: 0 },
  ],
  uncertainty: { samples: 0, seed: 1 },
};

describe('unit conversions of the model against convert-units', () => {
  it('turns grams into kilograms for the allometric equations', () => {
    for (const massG of [10, 32, 2200, 15000]) {
      const massKg = convert(massG).from('g').to('kg');
      expect(tidalVolumeMl(massG)).toBeCloseTo(13.2 * massKg ** 1.08, 10);
      expect(cardiacOutputMlMin(massG)).toBeCloseTo(290.7 * massKg ** 0.69, 10);
    }
  });
  it('turns fresh gas L/min into mL/min and chamber litres into mL', () => {
    const setup = setupFor(plan);
    const mlPerMin = convert(plan.freshGasLpm).from('l/min').to('ml/s') * convert(1).from('min').to('s');
    expect(setup.delivery.freshGasMlMin).toBeCloseTo(mlPerMin, 9);
    expect(setup.delivery.mixedVolumeMl).toBeCloseTo(
      convert(plan.chamberVolumeL ?? 0)
        .from('l')
        .to('ml'),
      9,
    );
  });
  it('reports oxygen litres as litres per minute times minutes', () => {
    const result = computePlan(plan, { species: [] });
    const durationH = convert(result.oxygen.durationMin).from('min').to('h');
    const litres = convert(plan.freshGasLpm).from('l/min').to('l/h') * durationH;
    expect(result.oxygen.usedL).toBeCloseTo(litres, 9);
  });
});
