import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { planInputSchema, planResultSchema } from '../../../app/contract/plan.js';
import { estimateRespiratory } from '../../../app/core/model/allometry.js';
import { computePlan } from '../../../app/core/model/compute-plan.js';
import { speciesReference } from '../../../app/core/species-reference.js';
import type { PlanInput } from '../../../app/core/model/plan-types.js';
import { runPlan } from './plan-fixtures.js';

const planArbitrary: fc.Arbitrary<PlanInput> = fc
  .record({
    bodyMassG: fc
      .double({ min: Math.log(10), max: Math.log(10000), noNaN: true })
      .map((log) => Math.round(Math.exp(log))),
    agent: fc.constantFrom('isoflurane' as const, 'sevoflurane' as const, 'desflurane' as const),
    route: fc.constantFrom(
      'mask' as const,
      'chamber' as const,
      'endotracheal' as const,
      'airSacTube' as const,
    ),
    circle: fc.boolean(),
    freshGasLpm: fc.double({ min: 0.1, max: 5, noNaN: true }),
    induction: fc.double({ min: 0.5, max: 6, noNaN: true }),
    maintenance: fc.double({ min: 0, max: 4, noNaN: true }),
    switchMin: fc.integer({ min: 1, max: 10 }),
    offMin: fc.integer({ min: 12, max: 30 }),
    ippv: fc.boolean(),
  })
  .map((draw): PlanInput => {
    const circuit =
      draw.circle && draw.route !== 'airSacTube' && draw.route !== 'chamber' ? 'circle' : 'nonRebreathing';
    const tidal = estimateRespiratory(draw.bodyMassG).tidalVolumeMl.value;
    const canVentilate = draw.route === 'endotracheal' || draw.route === 'airSacTube';
    return {
      bodyMassG: draw.bodyMassG,
      agent: draw.agent,
      route: draw.route,
      circuit,
      // An air-sac tube carries a small flow (it all passes through the bird).
      freshGasLpm:
        draw.route === 'airSacTube'
          ? Math.min(draw.freshGasLpm, (draw.bodyMassG / 1000) * 0.5 + 0.05)
          : draw.freshGasLpm,
      ...(draw.route === 'chamber' ? { chamberVolumeL: 2 } : {}),
      ...(circuit === 'circle' ? { circuitVolumeL: 3 } : {}),
      schedule: [
        { atMin: 0, vaporPct: draw.induction },
        { atMin: draw.switchMin, vaporPct: draw.maintenance },
        { atMin: draw.offMin, vaporPct: 0 },
      ],
      recoveryWindowMin: 10,
      ...(draw.ippv && canVentilate
        ? { ventilation: { mode: 'ippv' as const, breathsPerMin: 10, tidalVolumeMl: Math.max(0.05, tidal) } }
        : {}),
    };
  });

const channels = [
  'inspiredPct',
  'tracheaPct',
  'posteriorSacsPct',
  'parabronchialPct',
  'anteriorSacsPct',
  'arterialPct',
  'brainPct',
  'musclePct',
  'fatPct',
] as const;

describe('properties over valid plans', () => {
  it('generates only plans the contract accepts', () => {
    fc.assert(
      fc.property(planArbitrary, (plan) => {
        expect(planInputSchema.safeParse(plan).success).toBe(true);
      }),
      { numRuns: 60, seed: 7 },
    );
  });

  it('never gives NaN or negative partial pressures, nor any above the highest gas reaching the bird', () => {
    fc.assert(
      fc.property(planArbitrary, (plan) => {
        const outcome = runPlan(plan);
        const highestDial = Math.max(...plan.schedule.map((step) => step.vaporPct));
        const ceiling = outcome.peakInspiredPct;
        const bad: string[] = [];
        for (const channel of channels) {
          outcome.timeline[channel].forEach((value, index) => {
            if (!Number.isFinite(value) || value < -1e-12 || value > ceiling * (1 + 1e-9) + 1e-12)
              bad.push(`${channel}[${String(index)}] = ${String(value)}`);
          });
        }
        expect(bad).toEqual([]);
        expect(outcome.peakInspiredPct).toBeLessThanOrEqual(highestDial * (1 + 1e-12));
      }),
      { numRuns: 40, seed: 11 },
    );
  });

  it('is monotone in the dial setting: a higher schedule never gives a lower brain partial pressure', () => {
    fc.assert(
      fc.property(planArbitrary, fc.double({ min: 1.05, max: 2, noNaN: true }), (plan, factor) => {
        const higher = {
          ...plan,
          schedule: plan.schedule.map((step) => ({ atMin: step.atMin, vaporPct: step.vaporPct * factor })),
        };
        const low = runPlan(plan).timeline;
        const high = runPlan(higher).timeline;
        // Body groups only: a deeper bird breathes less (depression), so its air sacs may fill more
        // slowly even at a higher dial; the brain and tissues still end up higher.
        const bad: string[] = [];
        for (const channel of ['brainPct', 'musclePct', 'fatPct'] as const) {
          low[channel].forEach((value, index) => {
            const raised = high[channel][index] ?? Number.NaN;
            if (!(raised >= value * (1 - 1e-9) - 1e-12))
              bad.push(`${channel}[${String(index)}]: ${String(raised)} < ${String(value)}`);
          });
        }
        expect(bad).toEqual([]);
      }),
      { numRuns: 40, seed: 3 },
    );
  });
});

const anyPlanArbitrary = fc
  .record(
    {
      bodyMassG: fc.double({ min: 5, max: 15000, noNaN: true }),
      speciesId: fc.constantFrom('budgerigar', 'pekin-duck', 'chicken', 'zebra-finch', 'no-such-bird'),
      overrides: fc.record(
        {
          tidalVolumeMl: fc.double({ min: 0.01, max: 1000, noNaN: true }),
          breathsPerMin: fc.double({ min: 1, max: 200, noNaN: true }),
          trachealVolumeMl: fc.double({ min: 0.01, max: 200, noNaN: true }),
          heartRatePerMin: fc.double({ min: 20, max: 1500, noNaN: true }),
          lungVolumeMl: fc.double({ min: 0.05, max: 2000, noNaN: true }),
          airSacVolumeMl: fc.double({ min: 0.5, max: 5000, noNaN: true }),
        },
        { requiredKeys: [] },
      ),
      agent: fc.constantFrom('isoflurane' as const, 'sevoflurane' as const, 'desflurane' as const),
      macPct: fc.double({ min: 0.1, max: 15, noNaN: true }),
      route: fc.constantFrom(
        'mask' as const,
        'chamber' as const,
        'endotracheal' as const,
        'airSacTube' as const,
      ),
      circuit: fc.constantFrom('nonRebreathing' as const, 'circle' as const),
      freshGasLpm: fc.double({ min: 0.05, max: 20, noNaN: true }),
      chamberVolumeL: fc.double({ min: 0.1, max: 100, noNaN: true }),
      circuitVolumeL: fc.double({ min: 0.1, max: 20, noNaN: true }),
      dial: fc.double({ min: 0, max: 20, noNaN: true }),
      offMin: fc.double({ min: 0.5, max: 200, noNaN: true }),
      recoveryWindowMin: fc.double({ min: 5, max: 60, noNaN: true }),
      targetMacMultiple: fc.double({ min: 0.5, max: 3, noNaN: true }),
      vaporiserTemperatureC: fc.double({ min: 10, max: 35, noNaN: true }),
      scavenging: fc.boolean(),
      maskDeadSpaceMl: fc.double({ min: 0, max: 500, noNaN: true }),
      maskLeakFraction: fc.double({ min: 0, max: 0.9, noNaN: true }),
      ventilation: fc.record({
        mode: fc.constant('ippv' as const),
        breathsPerMin: fc.double({ min: 1, max: 150, noNaN: true }),
        tidalVolumeMl: fc.double({ min: 0.05, max: 1000, noNaN: true }),
        fromMin: fc.double({ min: 0, max: 100, noNaN: true }),
      }),
      cylinder: fc.constantFrom(
        { kind: 'preset' as const, presetId: 'us-e' as const, gaugePressurePsi: 500 },
        { kind: 'waterCapacity' as const, waterCapacityL: 2, pressureBar: 0 },
        { kind: 'content' as const, contentL: 10 },
      ),
    },
    { requiredKeys: ['bodyMassG', 'agent', 'route', 'freshGasLpm', 'dial', 'offMin'] },
  )
  .map(({ dial, offMin, ...rest }) => ({
    ...rest,
    schedule: [
      { atMin: 0, vaporPct: dial },
      { atMin: offMin, vaporPct: 0 },
    ],
    uncertainty: { samples: 5, seed: 1 },
  }))
  .filter((plan) => planInputSchema.safeParse(plan).success);

describe('any plan the contract accepts', () => {
  it('is computed without throwing into a result the contract accepts', () => {
    fc.assert(
      fc.property(anyPlanArbitrary, (plan) => {
        const input = planInputSchema.parse(plan);
        const result = computePlan(input, { species: speciesReference });
        expect(planResultSchema.safeParse(result).success).toBe(true);
      }),
      { numRuns: 30, seed: 21 },
    );
  });
});
