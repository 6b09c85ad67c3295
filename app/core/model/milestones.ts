/**
 * Wash-in and washout of the bird's gas spaces, measured on an insoluble tracer so that the
 * times describe the air sacs themselves (the two-cycle gas path), not agent uptake or release.
 */
import type { BodyModel } from './body-uptake.js';
import { simulate, type GasPath } from './simulation.js';

export type GasSpaceWashInput = {
  readonly gasPath: GasPath;
  /** Template body: only its flows and volumes are used; the tracer does not dissolve. */
  readonly body: BodyModel;
  readonly tidalVolumeMl: number;
  readonly breathsPerMin: number;
  /** 'in': clean sacs, tracer at the airway opening; 'out': sacs full, clean gas inspired. */
  readonly direction: 'in' | 'out';
  /** Air-sac tube flow into the posterior sacs, mL/min (0 when breathing through the trachea). */
  readonly airSacTubeMlMin: number;
  /** Give up after this many breaths. */
  readonly maxBreaths?: number;
};

export type GasSpaceWash = {
  /** Breaths until both sac groups pass 95 % of the step, or null if not within maxBreaths. */
  readonly breaths: number | null;
  readonly minutes: number | null;
};

/**
 * Breaths and minutes for both air-sac groups to reach 95 % of a step change in inspired
 * tracer (wash-in) or to fall below 5 % of their starting tracer (washout).
 * @param input gas path, ventilation (tidal volume mL > 0, rate per min > 0) and direction
 */
export function gasSpaceWash(input: GasSpaceWashInput): GasSpaceWash {
  const maxBreaths = input.maxBreaths ?? 3000;
  const tube = input.airSacTubeMlMin > 0;
  let reachedBreaths: number | null = null;
  let reachedMin: number | null = null;
  const washIn = input.direction === 'in';
  simulate({
    gasPath: input.gasPath,
    body: { ...input.body, bloodGasPartition: 0 },
    delivery: {
      source: 'open',
      freshGasMlMin: tube ? input.airSacTubeMlMin : Number.MAX_SAFE_INTEGER,
      mixedVolumeMl: 1,
      rebreathingFlowMultiple: 1,
      interface: tube ? 'airSacTube' : 'direct',
      maskDeadSpaceMl: 0,
      maskLeakFraction: 0,
    },
    ventilation: {
      restingTidalVolumeMl: input.tidalVolumeMl,
      restingBreathsPerMin: input.breathsPerMin,
      depressionSlope: 0,
      depressionFloor: 1,
      ippv: null,
    },
    schedule: [{ atMin: 0, vaporPct: washIn ? 100 : 0 }],
    endMin: maxBreaths / input.breathsPerMin,
    macPct: 1,
    inductionBrainPct: 0,
    recoveryBrainPct: 0,
    offMin: null,
    sampleIntervalMin: maxBreaths / input.breathsPerMin,
    initialGasFraction: washIn ? 0 : 1,
    onPhase: (snapshot) => {
      if (snapshot.phase !== 'expiration') return false;
      const done = washIn
        ? snapshot.posterior >= 0.95 && snapshot.anterior >= 0.95
        : snapshot.posterior <= 0.05 && snapshot.anterior <= 0.05;
      if (done) {
        reachedBreaths = snapshot.breathIndex + 1;
        reachedMin = snapshot.timeMin;
      }
      return done;
    },
  });
  return { breaths: reachedBreaths, minutes: reachedMin };
}
