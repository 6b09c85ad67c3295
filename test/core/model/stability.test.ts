import { describe, expect, it } from 'vitest';
import { planResultSchema } from '../../../app/contract/plan.js';
import { computePlan } from '../../../app/core/model/compute-plan.js';
import type { PlanInput } from '../../../app/core/model/plan-types.js';
import { speciesReference } from '../../../app/core/species-reference.js';
import { runPlan } from './plan-fixtures.js';

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

/**
 * The plan of the model issue that blew up: a 2 kg chicken with a measured heart rate of 250/min
 * on IPPV at 1 breath/min, isoflurane 3 % then 2 %. With one breath phase of 0.5 min, Q dt / V_blood
 * is about 2.6, beyond the bound of 2 of the former explicit venous update.
 */
function slowIppvChicken(tidalVolumeMl: number): PlanInput {
  return {
    bodyMassG: 2000,
    agent: 'isoflurane',
    route: 'endotracheal',
    freshGasLpm: 1,
    overrides: { heartRatePerMin: 250 },
    ventilation: { mode: 'ippv', breathsPerMin: 1, tidalVolumeMl },
    schedule: [
      { atMin: 0, vaporPct: 3 },
      { atMin: 10, vaporPct: 2 },
      { atMin: 60, vaporPct: 0 },
    ],
    uncertainty: { samples: 0, seed: 1 },
  };
}

describe('stability at long breath phases and high blood flow', () => {
  // Tidal volumes from the bird's own estimate (27.9 mL) to the largest the plan form accepts (10 x).
  for (const tidalVolumeMl of [27.9, 100, 279]) {
    it(`keeps every level finite, never negative and never above the gas reaching the bird (2 kg chicken, IPPV 1/min, ${String(tidalVolumeMl)} mL)`, () => {
      const outcome = runPlan(slowIppvChicken(tidalVolumeMl));
      const bad: string[] = [];
      for (const channel of channels)
        outcome.timeline[channel].forEach((value, index) => {
          if (!Number.isFinite(value) || value < 0 || value > outcome.peakInspiredPct * (1 + 1e-9))
            bad.push(`${channel}[${String(index)}] = ${String(value)}`);
        });
      expect(bad).toEqual([]);
      const result = computePlan(slowIppvChicken(tidalVolumeMl), { species: speciesReference });
      expect(planResultSchema.safeParse(result).success).toBe(true);
    });
  }

  it('gives finite, positive induction and recovery times when the slow ventilator moves enough gas', () => {
    const outcome = runPlan(slowIppvChicken(279));
    expect(outcome.inductionMin).not.toBeNull();
    expect(outcome.recoveryMin).not.toBeNull();
    expect(outcome.inductionMin ?? 0).toBeGreaterThan(0);
    expect(outcome.recoveryMin ?? 0).toBeGreaterThan(0);
    expect(Number.isFinite(outcome.inductionMin)).toBe(true);
    expect(Number.isFinite(outcome.recoveryMin)).toBe(true);
  });

  it('claims no recovery time (instead of 0.0 min) for a bird the plan never anaesthetises', () => {
    // 27.9 mL once a minute is about 7 % of the resting minute ventilation of a 2 kg bird.
    const result = computePlan(slowIppvChicken(27.9), { species: speciesReference });
    expect(result.milestones.inductionMin).toBeNull();
    expect(result.milestones.recoveryMin).toBeNull();
    expect(result.cautions.map((caution) => caution.code)).toContain('recovery-level-never-reached');
  });
});

describe('the result schema', () => {
  const result = computePlan(slowIppvChicken(279), { species: speciesReference });
  it('refuses a negative partial pressure', () => {
    const brainPct = [...result.timeline.brainPct];
    brainPct[3] = -3.5e19;
    const broken = { ...result, timeline: { ...result.timeline, brainPct } };
    expect(planResultSchema.safeParse(broken).success).toBe(false);
  });
  it('refuses a non-finite partial pressure', () => {
    for (const bad of [Number.NaN, Number.POSITIVE_INFINITY]) {
      const arterialPct = [...result.timeline.arterialPct];
      arterialPct[5] = bad;
      const broken = { ...result, timeline: { ...result.timeline, arterialPct } };
      expect(planResultSchema.safeParse(broken).success).toBe(false);
    }
  });
});
