import { describe, expect, it } from 'vitest';
import {
  calibrationPrior,
  fitMilestone,
  normalNormal,
  speciesCalibration,
  z90,
  type CalibrationObservation,
  type CalibrationPrior,
} from '../../../app/core/evidence/calibration.js';
import type { SpeciesGroupId } from '../../../app/core/evidence/species-groups.js';
import { seededRandom } from '../../../app/core/model/uncertainty.js';

// A prior whose bird-to-bird spread is known exactly (an overwhelming weight on sigma_0), so the
// posterior is the closed-form normal one.
const known: CalibrationPrior = { ...calibrationPrior, birdSdWeight: 1e12 };

/** Box-Muller standard normal from the seeded generator. */
function normal(random: () => number): number {
  const u = Math.max(random(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random());
}

/**
 * Exact Gaussian conditioning, written independently of the fit: the posterior mean and variance
 * of theta_i given every y, from the joint covariance of the three-level model,
 * E[theta | y] = C_theta,y S^-1 y and Var = C_theta,theta - C_theta,y S^-1 C_y,theta
 * (BDA 3rd ed. appendix A, multivariate normal conditioning).
 */
function exactPosterior(
  observations: readonly CalibrationObservation[],
  target: string,
  prior: CalibrationPrior,
  groupOf: (species: string) => string,
): { mean: number; variance: number } {
  const t0 = prior.clinicSd ** 2;
  const tg = prior.groupSd ** 2;
  const ts = prior.speciesSd ** 2;
  const s2 = prior.birdSd ** 2;
  const cov = (a: string, b: string) => t0 + (groupOf(a) === groupOf(b) ? tg : 0) + (a === b ? ts : 0);
  const n = observations.length;
  const matrix = observations.map((a, i) =>
    observations.map((b, j) => cov(a.speciesId, b.speciesId) + (i === j ? s2 : 0)),
  );
  const c = observations.map((o) => cov(target, o.speciesId));
  // Solve S x = [y | c] by Gauss-Jordan elimination (row-major, width n + 2).
  const width = n + 2;
  const a = new Float64Array(n * width);
  observations.forEach((observation, i) => {
    matrix[i]?.forEach((value, j) => (a[i * width + j] = value));
    a[i * width + n] = observation.logRatio;
    a[i * width + n + 1] = c[i] as number;
  });
  const cell = (row: number, col: number) => a[row * width + col] as number;
  for (let col = 0; col < n; col += 1) {
    const pivot = cell(col, col);
    for (let k = 0; k < width; k += 1) a[col * width + k] = cell(col, k) / pivot;
    for (let row = 0; row < n; row += 1) {
      if (row === col) continue;
      const factor = cell(row, col);
      for (let k = 0; k < width; k += 1) a[row * width + k] = cell(row, k) - factor * cell(col, k);
    }
  }
  const solveY = observations.map((_, i) => cell(i, n));
  const solveC = observations.map((_, i) => cell(i, n + 1));
  const mean = c.reduce((sum, value, i) => sum + value * (solveY[i] as number), 0);
  const variance = t0 + tg + ts - c.reduce((sum, value, i) => sum + value * (solveC[i] as number), 0);
  return { mean, variance };
}

describe('normal-normal posterior (worked example)', () => {
  it('matches the closed form of BDA 3rd ed. eq. 2.12', () => {
    // Prior N(0, 0.25), data mean 0.4 with variance 0.0625: precision 4 + 16 = 20,
    // mean (0 * 4 + 0.4 * 16) / 20 = 0.32, variance 1 / 20 = 0.05 (hand-computed).
    const posterior = normalNormal(0, 0.25, 0.4, 0.0625);
    expect(posterior.mean).toBeCloseTo(0.32, 12);
    expect(posterior.variance).toBeCloseTo(0.05, 12);
  });

  it('one species alone: the fit equals the closed form with the summed prior variance', () => {
    // Four cockatiel records, log ratios 0.3, 0.5, 0.2, 0.6: mean 0.4, data variance
    // sigma^2 / n = 0.35^2 / 4 = 0.030625; prior variance 0.40^2 + 0.25^2 + 0.15^2 = 0.245.
    // Posterior mean 0.4 * 0.245 / (0.245 + 0.030625) = 0.355556..., variance
    // 0.245 * 0.030625 / 0.275625 = 0.027222... (hand-computed from BDA eq. 2.12).
    const observations = [0.3, 0.5, 0.2, 0.6].map((logRatio) => ({ speciesId: 'cockatiel', logRatio }));
    const fit = fitMilestone(observations, known);
    const cockatiel = speciesCalibration(fit, 'cockatiel', known);
    expect(cockatiel.mean).toBeCloseTo((0.4 * 0.245) / 0.275625, 10);
    expect(cockatiel.mean).toBeCloseTo(0.355556, 6);
    expect(cockatiel.sd ** 2).toBeCloseTo((0.245 * 0.030625) / 0.275625, 10);
    expect(cockatiel.sd ** 2).toBeCloseTo(0.027222, 6);
    expect(cockatiel.factor).toBeCloseTo(Math.exp(0.355556), 5);
    expect(cockatiel.band90.low).toBeCloseTo(Math.exp(cockatiel.mean - z90 * cockatiel.sd), 12);
    expect(cockatiel.speciesRecords).toBe(4);
  });

  it('several species and groups: the two-pass fit equals exact multivariate normal conditioning', () => {
    const random = seededRandom(7);
    const species = ['cockatiel', 'budgerigar', 'african-grey-parrot', 'domestic-pigeon', 'chicken'];
    const observations: CalibrationObservation[] = [];
    species.forEach((speciesId, index) => {
      for (let j = 0; j < index + 1; j += 1)
        observations.push({ speciesId, logRatio: 0.3 * normal(random) + 0.1 * index });
    });
    const groupOf = (id: string): SpeciesGroupId =>
      id === 'domestic-pigeon' ? 'pigeons' : id === 'chicken' ? 'fowl' : 'parrots';
    const fit = fitMilestone(observations, known, groupOf);
    for (const target of [...species, 'canary']) {
      const exact = exactPosterior(observations, target, known, (id) =>
        id === 'canary' ? 'songbirds' : groupOf(id),
      );
      const ours = speciesCalibration(fit, target, known, (id) =>
        id === 'canary' ? 'songbirds' : groupOf(id),
      );
      expect(ours.mean).toBeCloseTo(exact.mean, 10);
      expect(ours.sd ** 2).toBeCloseTo(exact.variance, 10);
    }
  });

  it('without records, the factor is 1 and the band is the prior (x1.65 either way at one SD)', () => {
    const fit = fitMilestone([]);
    const any = speciesCalibration(fit, 'cockatiel');
    expect(any.factor).toBe(1);
    expect(any.sd).toBeCloseTo(Math.sqrt(0.4 ** 2 + 0.25 ** 2 + 0.15 ** 2), 12);
    expect(any.clinicRecords).toBe(0);
  });
});

describe('partial pooling: 2 records move little, 40 a lot', () => {
  // A clinic of 60 budgerigar and pigeon records at the population model (ratio 1, bird-to-bird
  // log SD 0.35 as the prior says), and cockatiels that stand twice as late (ratio 2, log 0.693).
  function clinicWith(cockatiels: number) {
    const random = seededRandom(11);
    const observations: CalibrationObservation[] = [];
    for (let i = 0; i < 30; i += 1)
      observations.push({ speciesId: 'budgerigar', logRatio: 0.35 * normal(random) });
    for (let i = 0; i < 30; i += 1)
      observations.push({ speciesId: 'domestic-pigeon', logRatio: 0.35 * normal(random) });
    for (let i = 0; i < cockatiels; i += 1)
      observations.push({ speciesId: 'cockatiel', logRatio: Math.log(2) });
    return speciesCalibration(fitMilestone(observations), 'cockatiel');
  }

  it('2 cockatiel records move the cockatiel factor less than half way to x2', () => {
    const two = clinicWith(2);
    expect(two.mean / Math.log(2)).toBeLessThan(0.5);
    expect(two.speciesRecords).toBe(2);
  });

  it('40 cockatiel records move it more than three quarters of the way', () => {
    const forty = clinicWith(40);
    expect(forty.mean / Math.log(2)).toBeGreaterThan(0.75);
    expect(forty.sd).toBeLessThan(clinicWith(2).sd);
  });
});

describe('simulation study: synthetic clinics drawn from known true ratios', () => {
  const species = ['cockatiel', 'budgerigar', 'african-grey-parrot', 'domestic-pigeon', 'chicken'];

  /** One synthetic clinic: true effects drawn from the prior, records around them. */
  function syntheticClinic(seed: number, recordsPerSpecies: number) {
    const random = seededRandom(seed);
    const prior = calibrationPrior;
    const mu = prior.clinicSd * normal(random);
    const groupMeans = new Map<string, number>();
    const truth = new Map<string, number>();
    const observations: CalibrationObservation[] = [];
    for (const id of species) {
      const group = id === 'domestic-pigeon' ? 'pigeons' : id === 'chicken' ? 'fowl' : 'parrots';
      if (!groupMeans.has(group)) groupMeans.set(group, mu + prior.groupSd * normal(random));
      const theta = (groupMeans.get(group) as number) + prior.speciesSd * normal(random);
      truth.set(id, theta);
      for (let j = 0; j < recordsPerSpecies; j += 1)
        observations.push({ speciesId: id, logRatio: theta + prior.birdSd * normal(random) });
    }
    return { truth, fit: fitMilestone(observations) };
  }

  it('the 90 % band covers the true ratio in 85-95 % of 200 clinics', () => {
    let covered = 0;
    let total = 0;
    for (let seed = 1; seed <= 200; seed += 1) {
      const { truth, fit } = syntheticClinic(seed * 7919, 1 + (seed % 12));
      // Every species of every clinic: 1000 bands. (One species per clinic, 200 bands, has a
      // Monte Carlo SD of 2 points: it gave 0.845 here, and 0.8945 over 4000 clinics.)
      for (const id of species) {
        const calibration = speciesCalibration(fit, id);
        const trueRatio = Math.exp(truth.get(id) as number);
        if (trueRatio >= calibration.band90.low && trueRatio <= calibration.band90.high) covered += 1;
        total += 1;
      }
    }
    const share = covered / total;
    expect(share).toBeGreaterThanOrEqual(0.85);
    expect(share).toBeLessThanOrEqual(0.95);
  });

  it('the estimate converges on a fixed true ratio (x1.4) as records grow', () => {
    const trueLog = Math.log(1.4);
    const errors: number[] = [];
    const widths: number[] = [];
    for (const n of [5, 20, 80, 320]) {
      let squared = 0;
      let width = 0;
      for (let seed = 1; seed <= 40; seed += 1) {
        const random = seededRandom(seed * 104729 + n);
        const observations = Array.from({ length: n }, () => ({
          speciesId: 'cockatiel',
          logRatio: trueLog + 0.35 * normal(random),
        }));
        const calibration = speciesCalibration(fitMilestone(observations), 'cockatiel');
        squared += (calibration.mean - trueLog) ** 2;
        width += Math.log(calibration.band90.high / calibration.band90.low);
      }
      errors.push(Math.sqrt(squared / 40));
      widths.push(width / 40);
    }
    for (let i = 1; i < errors.length; i += 1) {
      expect(errors[i]).toBeLessThan(errors[i - 1] as number);
      expect(widths[i]).toBeLessThan(widths[i - 1] as number);
    }
    // With 320 records the typical error is within 5 % of the true ratio.
    expect(errors[errors.length - 1]).toBeLessThan(Math.log(1.05));
  });
});
