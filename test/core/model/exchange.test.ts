import { describe, expect, it } from 'vitest';
import {
  counterCurrentArterialFraction,
  crossCurrentArterialFraction,
  crossCurrentEndGasFraction,
  perfusionVentilationK,
  ventilatedPoolArterialFraction,
} from '../../../app/core/model/exchange.js';
import { simulate, type SimulationSetup } from '../../../app/core/model/simulation.js';

describe('Piiper & Scheid cross-current exchange', () => {
  it('gives the arterial fraction (1 - e^-k)/k and the end-gas fraction e^-k', () => {
    // Piiper & Scheid 1972 cross-current model as written in the design notes [published method]
    for (const k of [0.01, 0.3, 1, 2.5, 8]) {
      expect(crossCurrentArterialFraction(k)).toBeCloseTo((1 - Math.exp(-k)) / k, 12);
      expect(crossCurrentEndGasFraction(k)).toBeCloseTo(Math.exp(-k), 12);
    }
    // At k = 1: 1 - 1/e = 0.6321 [derived]
    expect(crossCurrentArterialFraction(1)).toBeCloseTo(0.6321, 4);
    expect(crossCurrentArterialFraction(0)).toBe(1);
  });
  it('lies between the ventilated-pool value 1/(1+k) and the counter-current value at the same k', () => {
    for (let k = 0.05; k <= 20; k *= 1.5) {
      const cross = crossCurrentArterialFraction(k);
      expect(cross).toBeGreaterThan(ventilatedPoolArterialFraction(k));
      expect(cross).toBeLessThan(counterCurrentArterialFraction(k));
    }
    // At k = 1: pool 0.5 < cross-current 0.632 < counter-current 1 [derived]
    expect(ventilatedPoolArterialFraction(1)).toBe(0.5);
    expect(counterCurrentArterialFraction(1)).toBe(1);
  });
  it('conserves agent: what leaves the gas is what the blood carries', () => {
    const k = perfusionVentilationK(1.45, 30, 20);
    const gasLoss = 20 * (1 - crossCurrentEndGasFraction(k));
    const bloodGain = 1.45 * 30 * crossCurrentArterialFraction(k);
    expect(bloodGain).toBeCloseTo(gasLoss, 12);
  });
});

describe('a well-mixed volume without uptake', () => {
  it('reaches 95 % of a step at three time constants (chamber of 5 L at 2 L/min)', () => {
    // tau = V / FGF; 1 - e^-3 = 0.950 after 3 tau (OpenAnesthesia, "Time constant") [published; derived]
    const chamberMl = 5000;
    const flowMlMin = 2000;
    const tauMin = chamberMl / flowMlMin;
    const samples: { timeMin: number; inspired: number }[] = [];
    const setup: SimulationSetup = {
      gasPath: {
        trachealVolumeMl: 0.03,
        lungVolumeMl: 0.2,
        anteriorSacsMl: 0.5,
        posteriorSacsMl: 0.6,
        posteriorShare: 0.55,
      },
      body: {
        bloodGasPartition: 0,
        bloodVolumeMl: 1,
        groups: [
          { volumeMl: 1, flowMlMin: 5, tissueBloodPartition: 1.6 },
          { volumeMl: 5, flowMlMin: 1, tissueBloodPartition: 2.9 },
          { volumeMl: 1, flowMlMin: 0.3, tissueBloodPartition: 45 },
        ],
      },
      delivery: {
        source: 'mixed',
        freshGasMlMin: flowMlMin,
        mixedVolumeMl: chamberMl,
        rebreathingFlowMultiple: 2,
        interface: 'direct',
        maskDeadSpaceMl: 0,
        maskLeakFraction: 0,
      },
      ventilation: {
        restingTidalVolumeMl: 0.1,
        restingBreathsPerMin: 60,
        depressionSlope: 0,
        depressionFloor: 1,
        ippv: null,
      },
      schedule: [{ atMin: 0, vaporPct: 4 }],
      endMin: 3 * tauMin + 0.1,
      macPct: 1.3,
      inductionBrainPct: 100,
      recoveryBrainPct: 0,
      offMin: null,
      sampleIntervalMin: 1,
      onPhase: (snapshot) => {
        if (snapshot.phase === 'inspiration')
          samples.push({ timeMin: snapshot.timeMin, inspired: snapshot.inspiredFraction });
      },
    };
    simulate(setup);
    // The inspired gas of a breath is the chamber gas at the breath's start (one phase before the snapshot).
    const atThreeTau = samples.find((sample) => sample.timeMin - 0.5 / 60 >= 3 * tauMin - 1e-9);
    expect(atThreeTau).toBeDefined();
    const reached = (atThreeTau?.inspired ?? 0) / 0.04;
    expect(reached).toBeCloseTo(0.95, 2);
  });
});
