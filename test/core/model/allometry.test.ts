import convert from 'convert-units';
import { describe, expect, it } from 'vitest';
import {
  breathsPerMin,
  cardiacOutputMlMin,
  estimateRespiratory,
  fittedMinuteVentilationMlMin,
  heartRatePerMin,
  tidalVolumeMl,
  trachealVolumeMl,
} from '../../../app/core/model/allometry.js';

describe('allometric estimates at 1 kg equal the published coefficients', () => {
  // At M = 1 kg every power law returns its coefficient, so these pin the coefficients themselves.
  it('gives the Grubb 1983 heart rate and cardiac output', () => {
    expect(heartRatePerMin(1000)).toBeCloseTo(178.5, 10); // Grubb B.R. 1983, Am J Physiol 245:H567-572 [published]
    expect(cardiacOutputMlMin(1000)).toBeCloseTo(290.7, 10); // Grubb 1983 [published]
  });
  it('gives the Lasiewski & Calder 1971 tidal volume and rate (from memory) and the Hinds & Calder 1971 trachea (from memory)', () => {
    expect(tidalVolumeMl(1000)).toBeCloseTo(13.2, 10); // Lasiewski & Calder 1971, from memory
    expect(breathsPerMin(1000)).toBeCloseTo(17.2, 10); // Lasiewski & Calder 1971, from memory
    expect(fittedMinuteVentilationMlMin(1000)).toBeCloseTo(284, 10); // Lasiewski & Calder 1971, from memory
    expect(trachealVolumeMl(1000)).toBeCloseTo(3.72, 10); // Hinds & Calder 1971, from memory
  });
});

describe('allometric estimates at several masses follow the named power laws', () => {
  const masses = [10, 32, 95, 400, 2200, 10000];
  it.each(masses)('heart rate and cardiac output at %d g scale with the Grubb 1983 exponents', (massG) => {
    const massKg = convert(massG).from('g').to('kg');
    // Grubb 1983: HR = 178.5 M^-0.282, Q = 290.7 M^0.69 [published]
    expect(heartRatePerMin(massG) / 178.5).toBeCloseTo(massKg ** -0.282, 12);
    expect(cardiacOutputMlMin(massG) / 290.7).toBeCloseTo(massKg ** 0.69, 12);
  });
  it('predicts a 10 kg heart rate and output from the Grubb 1983 equations', () => {
    // Grubb 1983 [published], 10^-0.282 = 0.5224 and 10^0.69 = 4.898 [derived]
    expect(heartRatePerMin(10000)).toBeCloseTo(178.5 * 0.5224, 0);
    expect(cardiacOutputMlMin(10000)).toBeCloseTo(290.7 * 4.898, -1);
  });
  it('shows why the gas path uses VT x f: their product at 1 kg is 227 mL/min against the fitted 284', () => {
    // Reference values note: VT x f at 1 kg (227) differs from VE (284) [memory: Lasiewski & Calder 1971]
    const estimates = estimateRespiratory(1000);
    expect(estimates.minuteVentilationMlMin.value).toBeCloseTo(227, 0);
    expect(estimates.minuteVentilationMlMin.basis).toContain('284');
  });
});

describe('bird trachea against the mammalian trachea', () => {
  it('scales with mass like a mammal trachea, so a single bird-to-mammal volume ratio (about 4.5 x) holds across 10 g to 10 kg', () => {
    // Tenney & Bartlett 1967 (Respir Physiol 3:130, abstract, published): mammalian tracheal length
    // ~ M^0.27 and radius ~ M^0.39, so volume ~ M^(0.27 + 2 x 0.39) = M^1.05 [derived].
    // Ludders 2001 (published): bird trachea 2.7 x longer and 1.29 x wider at equal mass, a
    // volume ratio 2.7 x 1.29^2 = 4.49 [derived]; a constant ratio needs equal exponents.
    const mammalExponent = 0.27 + 2 * 0.39;
    const birdExponent = Math.log(trachealVolumeMl(10_000) / trachealVolumeMl(10)) / Math.log(1000);
    expect(birdExponent).toBeCloseTo(1.09, 6); // Hinds & Calder 1971, from memory
    expect(Math.abs(birdExponent - mammalExponent)).toBeLessThan(0.05);
    // Over the clinic's whole range the ratio drifts by 1000^(1.09 - 1.05) = 1.32 at most.
    const drift =
      trachealVolumeMl(10_000) / 10_000 ** mammalExponent / (trachealVolumeMl(10) / 10 ** mammalExponent);
    expect(drift).toBeGreaterThan(1);
    expect(drift).toBeLessThan(1.35);
    // The level of the ratio (4.49 at equal mass) needs a mammalian tracheal-volume coefficient,
    // which is not in our reference list: see docs/model.md, section 11.
  });
});

describe('dead space against the chicken measurement', () => {
  it('estimates the 2.2 kg chicken upper respiratory dead space within 30 % of the measured 7.0 mL', () => {
    // "Upper respiratory dead space in the chicken: its fraction of the tidal volume": 7.0 mL at 2.2 kg [published].
    // The Hinds & Calder 1971 trachea (from memory) gives 8.8 mL: 25 % high, documented as a miss in docs/model.md.
    const estimates = estimateRespiratory(2200);
    expect(estimates.trachealDeadSpaceMl.value).toBeGreaterThan(7.0 * 0.7);
    expect(estimates.trachealDeadSpaceMl.value).toBeLessThan(7.0 * 1.3);
  });
  it('puts the dead space near the 23 % of tidal volume after which fresh gas reaches the chicken lung', () => {
    // 7.0 / 30.9 = 0.23 [derived]; the model's own ratio at 2.2 kg is 0.28
    const estimates = estimateRespiratory(2200);
    const fraction = estimates.trachealDeadSpaceMl.value / estimates.tidalVolumeMl.value;
    expect(fraction).toBeGreaterThan(0.23 * 0.7);
    expect(fraction).toBeLessThan(0.23 * 1.3);
  });
});

describe('measured overrides', () => {
  it('replace the estimate and are marked measured', () => {
    const estimates = estimateRespiratory(400, {
      tidalVolumeMl: 7.5,
      breathsPerMin: 20,
      trachealVolumeMl: 1.1,
    });
    expect(estimates.tidalVolumeMl).toEqual({ value: 7.5, basis: 'measured' });
    expect(estimates.breathsPerMin).toEqual({ value: 20, basis: 'measured' });
    expect(estimates.trachealDeadSpaceMl).toEqual({ value: 1.1, basis: 'measured' });
    expect(estimates.minuteVentilationMlMin.value).toBeCloseTo(150, 10);
  });
  it('turn a measured heart rate into cardiac output with the Grubb 1983 stroke volume', () => {
    // Grubb 1983 stroke volume 1.72 M^0.97 mL [published]; at 1 kg, 200 beats x 1.72 mL = 344 mL/min [derived]
    const estimates = estimateRespiratory(1000, { heartRatePerMin: 200 });
    expect(estimates.cardiacOutputMlMin.value).toBeCloseTo(344, 6);
    expect(estimates.cardiacOutputMlMin.basis).toContain('measured heart rate');
  });
  it('name a basis for every estimate', () => {
    const estimates = estimateRespiratory(95);
    for (const estimate of Object.values(estimates)) {
      expect(estimate.basis.length).toBeGreaterThan(5);
      expect(Number.isFinite(estimate.value)).toBe(true);
    }
  });
});

describe('volumes from body-volume fractions', () => {
  it('puts the air sacs at 10-15 % of body volume and the lung at 1-3 %, of which the exchange tissue share exchanges', () => {
    // Lung 1-3 % and air sacs 10-15 % of body volume (from memory); exchange tissue 42.6 % of the
    // lung in non-passerines (Maina, Abdalla & King 1982, Acta Anat 112:264-270)
    const estimates = estimateRespiratory(1000);
    expect(estimates.airSacVolumeMl.value).toBeGreaterThanOrEqual(100);
    expect(estimates.airSacVolumeMl.value).toBeLessThanOrEqual(150);
    const wholeLungMl = estimates.lungVolumeMl.value / 0.426;
    expect(wholeLungMl).toBeGreaterThanOrEqual(10);
    expect(wholeLungMl).toBeLessThanOrEqual(30);
    expect(estimates.lungVolumeMl.basis).toContain('Maina, Abdalla & King 1982');
    expect(estimates.anteriorSacsMl.value + estimates.posteriorSacsMl.value).toBeCloseTo(
      estimates.airSacVolumeMl.value,
      10,
    );
  });
});
