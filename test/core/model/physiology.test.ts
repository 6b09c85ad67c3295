/**
 * Dose-dependent depression of breathing and cardiac output, body temperature's effect on
 * solubility and MAC, and the exchanging share of the lung, through the code the plan runs.
 */
import { describe, expect, it } from 'vitest';
import { computePlan, depressionRuleOf, resolveMac } from '../../../app/core/model/compute-plan.js';
import {
  cardiacOutputFraction,
  splitVentilation,
  ventilationFraction,
  ventilatoryRateShare,
} from '../../../app/core/model/depression.js';
import type { PlanInput } from '../../../app/core/model/plan-types.js';
import { simulate } from '../../../app/core/model/simulation.js';
import { macTemperatureFactor, solubilityTemperatureFactor } from '../../../app/core/model/temperature.js';
import { speciesReference } from '../../../app/core/species-reference.js';
import { setupFor } from './plan-fixtures.js';

const chicken = speciesReference.find((species) => species.id === 'chicken');
const duck = speciesReference.find((species) => species.id === 'pekin-duck');

const chickenPlan: PlanInput = {
  bodyMassG: 1800,
  speciesId: 'chicken',
  agent: 'isoflurane',
  route: 'endotracheal',
  circuit: 'nonRebreathing',
  freshGasLpm: 1,
  schedule: [
    { atMin: 0, vaporPct: 3 },
    { atMin: 5, vaporPct: 2 },
    { atMin: 65, vaporPct: 0 },
  ],
  recoveryWindowMin: 60,
  uncertainty: { samples: 0, seed: 1 },
};

describe('depression of breathing', () => {
  it('reaches apnoea at the published anaesthetic index of the species', () => {
    // chicken: apnoea at 3.31 % isoflurane, MAC 1.18 % (Midon et al. 2021, J Zoo Wildl Med 52:327-331)
    const rule = depressionRuleOf('isoflurane', chicken);
    expect(rule.anaestheticIndex).toBeCloseTo(3.31 / 1.18, 10);
    expect(ventilationFraction({ ...rule, ventilationFloor: 0 }, 3.31 / 1.18)).toBeCloseTo(0, 10);
    expect(ventilationFraction(rule, 1.4)).toBeCloseTo(1 - 1.4 / (3.31 / 1.18), 10);
    // duck: apnoea common above 1.5 MAC (Ludders, Mitchell & Rode 1990, Vet Surg 19)
    expect(depressionRuleOf('isoflurane', duck).anaestheticIndex).toBe(1.5);
    // no published value: the assumption between duck and chicken
    const unknown = depressionRuleOf('isoflurane', undefined).anaestheticIndex;
    expect(unknown).toBeGreaterThan(1.5);
    expect(unknown).toBeLessThan(3.31 / 1.18);
  });

  it('splits the fall between rate and tidal volume without changing minute ventilation', () => {
    for (const share of [0, 0.2, 0.5, 1])
      for (const minute of [1, 0.6, 0.15]) {
        const [rate, tidal] = splitVentilation(minute, share);
        expect(rate * tidal).toBeCloseTo(minute, 12);
        expect(rate).toBeLessThanOrEqual(1);
        expect(tidal).toBeLessThanOrEqual(1);
      }
    // isoflurane: rate falls too (Langlois et al. 2003: 41 to 25 /min in Amazons); sevoflurane:
    // mostly tidal volume (Botman et al. 2016: rate rose in pigeons while CO2 rose)
    expect(ventilatoryRateShare.isoflurane.value).toBeGreaterThan(ventilatoryRateShare.sevoflurane.value);
  });

  it('slows the breathing rate of a spontaneously breathing chicken under isoflurane', () => {
    const setup = setupFor(chickenPlan);
    const rates: number[] = [];
    simulate({
      ...setup,
      onPhase: (snapshot) => {
        if (snapshot.phase === 'expiration' && snapshot.breathIndex > 0) rates.push(snapshot.timeMin);
      },
    });
    // breath lengths at the start (light) and during maintenance (deep): longer when deep
    const first = (rates[1] as number) - (rates[0] as number);
    const middle = rates.findIndex((time) => time > 30);
    const deep = (rates[middle + 1] as number) - (rates[middle] as number);
    expect(deep).toBeGreaterThan(first * 1.05);
  });
});

describe('depression of cardiac output', () => {
  it('falls with depth down to its floor', () => {
    const rule = depressionRuleOf('sevoflurane', undefined);
    expect(cardiacOutputFraction(rule, 0)).toBe(1);
    expect(cardiacOutputFraction(rule, 1)).toBeLessThan(1);
    expect(cardiacOutputFraction(rule, 100)).toBe(rule.cardiacFloor);
  });

  it('keeps the agent balance exact when the flows fall: what the gas lost, the body holds', () => {
    const outcome = simulate(setupFor({ ...chickenPlan, schedule: [{ atMin: 0, vaporPct: 3 }] }));
    const totals = outcome.totals;
    expect(totals.uptakeMl).toBeCloseTo(totals.bodyStoredMl, 6);
    const inBird = totals.deliveredToBirdMl - totals.exhaledMl;
    expect(inBird).toBeCloseTo(totals.uptakeMl + totals.gasStoredMl, 6);
  });

  it('takes up less agent over maintenance than the same plan at resting output', () => {
    const setup = setupFor({ ...chickenPlan, schedule: chickenPlan.schedule.slice(0, 2) });
    const depressed = simulate(setup);
    const resting = simulate({ ...setup, ventilation: { ...setup.ventilation, cardiacSlope: 0 } });
    expect(depressed.totals.uptakeMl).toBeLessThan(resting.totals.uptakeMl * 0.98);
  });
});

describe('body temperature', () => {
  it('raises blood solubility as the bird cools, by the published human-blood coefficients', () => {
    // ln(blood/gas) slope -0.0382 per C isoflurane, -0.0295 sevoflurane (Zhou, Liu & Liu, PubMed 12150733)
    expect(solubilityTemperatureFactor('isoflurane', 37)).toBe(1);
    expect(solubilityTemperatureFactor('isoflurane', 36)).toBeCloseTo(Math.exp(0.0382), 12);
    expect(solubilityTemperatureFactor('sevoflurane', 31)).toBeCloseTo(Math.exp(0.0295 * 6), 12);
    expect(solubilityTemperatureFactor('isoflurane', 41)).toBeLessThan(1);
  });

  it('lowers MAC below the normothermic value and leaves it above', () => {
    // isoflurane MAC 1.69, 1.47, 1.22 % at 37, 34, 31 C in children (Anesthesiology 2001, 94:429-432)
    expect(macTemperatureFactor(41)).toBe(1);
    expect(macTemperatureFactor(42)).toBe(1);
    expect(macTemperatureFactor(35)).toBeCloseTo(1 - 0.051 * 6, 12);
    const plan = { ...chickenPlan, bodyTemperatureC: 37 };
    expect(resolveMac(plan, chicken).valuePct).toBeCloseTo(1.18 * (1 - 0.051 * 4), 12);
    expect(resolveMac(plan, chicken).basis).toContain('body temperature of 37 C');
  });

  it('slows recovery of a cold bird: more agent held, and a lower MAC to fall below', () => {
    const warm = computePlan(chickenPlan, { species: speciesReference });
    const cold = computePlan({ ...chickenPlan, bodyTemperatureC: 36 }, { species: speciesReference });
    expect(cold.milestones.standingMin).not.toBeNull();
    expect(cold.milestones.standingMin as number).toBeGreaterThan(warm.milestones.standingMin as number);
    expect(cold.mac.valuePct).toBeLessThan(warm.mac.valuePct);
  });
});

describe('apnoea caution from the inspired level', () => {
  it('warns when a chicken breathes 5 % isoflurane, above its published apnoea level of 3.31 %', () => {
    // Midon et al. 2021 (J Zoo Wildl Med 52:327-331): apnoea at 3.31 % end-tidal, MAC 1.18 %
    const result = computePlan(
      { ...chickenPlan, route: 'mask', schedule: [{ atMin: 0, vaporPct: 5 }], recoveryWindowMin: 5 },
      { species: speciesReference },
    );
    expect(result.cautions.map((caution) => caution.code)).toContain('inspired-above-apnoea-level');
    const low = computePlan(
      { ...chickenPlan, schedule: [{ atMin: 0, vaporPct: 2 }], recoveryWindowMin: 5 },
      { species: speciesReference },
    );
    expect(low.cautions.map((caution) => caution.code)).not.toContain('inspired-above-apnoea-level');
  });
});
