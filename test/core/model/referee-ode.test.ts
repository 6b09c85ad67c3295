import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { estimateRespiratory } from '../../../app/core/model/allometry.js';
import { bodyBloodFlowMlMin, bodyUptakeDerivatives } from '../../../app/core/model/body-uptake.js';
import { buildBodyModel } from '../../../app/core/model/compute-plan.js';
import { crossCurrentArterialFraction } from '../../../app/core/model/exchange.js';
import { simulate, type SimulationSetup } from '../../../app/core/model/simulation.js';

// odex ships its TypeScript source, which does not compile under this project's strict settings;
// load it through require and describe the small part used here.
type OdexSolver = {
  absoluteTolerance: number;
  relativeTolerance: number;
  maxSteps: number;
  solve(
    derivative: (x: number, y: number[]) => number[],
    x0: number,
    y0: number[],
    x1: number,
  ): { y: number[]; outcome: number };
};
const { Solver } = createRequire(import.meta.url)('odex') as {
  Solver: new (dimension: number) => OdexSolver;
};

/**
 * A scenario with an independent solution: an air-sac tube flushes gas spaces far smaller than
 * one phase's tube flow, and the bird barely breathes through its trachea, so the gas reaching
 * the parabronchi is the tube gas itself (a fixed inspired level, stepped off at `offMin`). The
 * body then follows the ordinary differential equations of body-uptake.ts with the arterial
 * value of the cross-current model at k = lambda Q / tube flow: Pa = Pv + (Pin - Pv)(1 - e^-k)/k.
 */
type Scenario = {
  readonly name: string;
  readonly massG: number;
  readonly cardiacOutputMlMin?: number;
  readonly breathsPerMin: number;
  /** Tube flow as a multiple of lambda Q (1: k = 1). */
  readonly flowPerLambdaQ: number;
};

const inletFraction = 0.02;
const offMin = 40;
const endMin = 70;
const checkpoints = [1, 2, 5, 10, 20, 40, 42, 45, 50, 60, 70];

function setupOf(scenario: Scenario): SimulationSetup {
  const estimates = estimateRespiratory(scenario.massG);
  const body = buildBodyModel(
    scenario.massG,
    scenario.cardiacOutputMlMin ?? estimates.cardiacOutputMlMin.value,
    'isoflurane',
  );
  const tubeFlowMlMin = scenario.flowPerLambdaQ * body.bloodGasPartition * bodyBloodFlowMlMin(body);
  return {
    gasPath: {
      trachealVolumeMl: 1e-4,
      lungVolumeMl: 1e-4,
      anteriorSacsMl: 1e-4,
      posteriorSacsMl: 1e-4,
      posteriorShare: 0.55,
    },
    body,
    delivery: {
      source: 'open',
      freshGasMlMin: tubeFlowMlMin,
      mixedVolumeMl: 1,
      rebreathingFlowMultiple: 2,
      interface: 'airSacTube',
      maskDeadSpaceMl: 0,
      maskLeakFraction: 0,
    },
    ventilation: {
      restingTidalVolumeMl: 1e-9,
      restingBreathsPerMin: scenario.breathsPerMin,
      depressionSlope: 0,
      depressionFloor: 1,
      ippv: null,
    },
    schedule: [
      { atMin: 0, vaporPct: inletFraction * 100 },
      { atMin: offMin, vaporPct: 0 },
    ],
    endMin,
    macPct: 1.3,
    inductionBrainPct: 1.2 * 1.3,
    recoveryBrainPct: 0.4 * 1.3,
    offMin,
    sampleIntervalMin: 1,
    initialGasFraction: 0,
  };
}

function refereeAt(setup: SimulationSetup): number[][] {
  const body = setup.body;
  const k = (body.bloodGasPartition * bodyBloodFlowMlMin(body)) / setup.delivery.freshGasMlMin;
  const arterialShare = crossCurrentArterialFraction(k);
  const solver = new Solver(4);
  solver.absoluteTolerance = 1e-13;
  solver.relativeTolerance = 1e-11;
  solver.maxSteps = 100000;
  const derivative = new Array<number>(4).fill(0);
  let state = [0, 0, 0, 0];
  let time = 0;
  const results: number[][] = [];
  for (const checkpoint of checkpoints) {
    // Integrate piecewise so the inlet step at offMin is a segment boundary.
    const boundaries = [time, ...(time < offMin && checkpoint > offMin ? [offMin] : []), checkpoint];
    for (let index = 1; index < boundaries.length; index += 1) {
      const from = boundaries[index - 1] as number;
      const to = boundaries[index] as number;
      const inlet = (from + to) / 2 < offMin ? inletFraction : 0;
      state = solver.solve(
        (_x, y) => {
          const venous = y[0] ?? 0;
          bodyUptakeDerivatives(body, venous + (inlet - venous) * arterialShare, y, derivative);
          return [...derivative];
        },
        from,
        state,
        to,
      ).y;
    }
    time = checkpoint;
    results.push([...state]);
  }
  return results;
}

const scenarios: Scenario[] = [
  { name: '95 g cockatiel, 600 phases a minute, k = 1', massG: 95, breathsPerMin: 300, flowPerLambdaQ: 1 },
  { name: '95 g cockatiel, one breath a minute, k = 0.5', massG: 95, breathsPerMin: 1, flowPerLambdaQ: 2 },
  {
    name: '2 kg chicken, cardiac output of a heart rate of 250/min, one breath a minute, k = 1',
    massG: 2000,
    cardiacOutputMlMin: 250 * 1.72 * 2 ** 0.97,
    breathsPerMin: 1,
    flowPerLambdaQ: 1,
  },
  { name: '10 kg bird, 8 breaths a minute, k = 3', massG: 10000, breathsPerMin: 8, flowPerLambdaQ: 1 / 3 },
];

describe('simulate against an independent ODE solver (odex, Gragg-Bulirsch-Stoer)', () => {
  for (const scenario of scenarios) {
    it(`agrees within 0.5 % for the vessel-rich group, muscle, fat and arterial blood (${scenario.name})`, () => {
      const setup = setupOf(scenario);
      const outcome = simulate(setup);
      const referee = refereeAt(setup);
      const body = setup.body;
      const k = (body.bloodGasPartition * bodyBloodFlowMlMin(body)) / setup.delivery.freshGasMlMin;
      const arterialShare = crossCurrentArterialFraction(k);
      const worst: string[] = [];
      referee.forEach((row, rowIndex) => {
        const atMin = checkpoints[rowIndex] as number;
        const sample = outcome.timeline.timeMin.findIndex((time) => Math.abs(time - atMin) < 1e-9);
        const venous = row[0] ?? 0;
        const expected = {
          brain: row[1] ?? 0,
          muscle: row[2] ?? 0,
          fat: row[3] ?? 0,
          arterial: venous + ((atMin <= offMin ? inletFraction : 0) - venous) * arterialShare,
        };
        const actual = {
          brain: (outcome.timeline.brainPct[sample] ?? Number.NaN) / 100,
          muscle: (outcome.timeline.musclePct[sample] ?? Number.NaN) / 100,
          fat: (outcome.timeline.fatPct[sample] ?? Number.NaN) / 100,
          arterial: (outcome.timeline.arterialPct[sample] ?? Number.NaN) / 100,
        };
        for (const key of ['brain', 'muscle', 'fat', 'arterial'] as const) {
          // Requirement of the model issue: agree within 0.5 % (relative to the value, floor of 1e-7 absolute)
          if (!(Math.abs(actual[key] - expected[key]) <= 0.005 * Math.abs(expected[key]) + 1e-7))
            worst.push(
              `${key} at ${String(atMin)} min: simulate ${String(actual[key])} vs odex ${String(expected[key])}`,
            );
        }
      });
      expect(worst).toEqual([]);
      // The checkpoints cover loading and washout with non-trivial values.
      expect(referee[5]?.[1] ?? 0).toBeGreaterThan(0.005);
      expect(referee[10]?.[3] ?? 0).toBeGreaterThan(0);
    });
  }
});
