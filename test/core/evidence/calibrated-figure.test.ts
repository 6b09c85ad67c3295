import { describe, expect, it } from 'vitest';
import {
  calibratedFigures,
  calibratedSummaryText,
  calibratedMinutesText,
  calibrationBasisText,
  calibrationOffText,
  speciesWords,
  type CalibrationSource,
  type SpeciesCalibrationSource,
} from '../../../app/core/evidence/calibrated-figure.js';
import { clinicalMilestoneLines } from '../../../app/core/clinical-milestones.js';
import { evidenceMilestoneIds } from '../../../app/core/evidence/observed.js';
import { computePlan } from '../../../app/core/model/compute-plan.js';
import type { PlanInput } from '../../../app/core/model/plan-types.js';
import { speciesReference } from '../../../app/core/species-reference.js';

/** Invented calibration figures (demo values, not measurements). */
const cockatiel: SpeciesCalibrationSource = {
  speciesKey: 'cockatiel',
  speciesName: 'Cockatiel',
  groupName: 'Parrots',
  factor: 1.4,
  band90: { low: 1.2, high: 1.6 },
  speciesRecords: 14,
  groupRecords: 30,
  clinicRecords: 60,
};

/** An invented 95 g cockatiel in a chamber, 10 min of isoflurane. */
const kiwi: PlanInput = {
  bodyMassG: 95,
  speciesId: 'cockatiel',
  agent: 'isoflurane',
  route: 'chamber',
  freshGasLpm: 2,
  chamberVolumeL: 3,
  schedule: [
    { atMin: 0, vaporPct: 5 },
    { atMin: 10, vaporPct: 0 },
  ],
  uncertainty: { samples: 0, seed: 1 },
};
const result = computePlan(kiwi, { species: speciesReference });

const calibrationOf = (species: SpeciesCalibrationSource[], on = true): CalibrationSource => ({
  on,
  milestones: evidenceMilestoneIds.map((id) => ({ id, species })),
});

describe('a species name inside a sentence', () => {
  it('is lower case and plural as English has it, keeping proper words', () => {
    expect(speciesWords('Cockatiel')).toEqual({ one: 'cockatiel', many: 'cockatiels' });
    expect(speciesWords('Zebra finch')).toEqual({ one: 'zebra finch', many: 'zebra finches' });
    expect(speciesWords('Canary')).toEqual({ one: 'canary', many: 'canaries' });
    expect(speciesWords('African grey parrot')).toEqual({
      one: 'African grey parrot',
      many: 'African grey parrots',
    });
    expect(speciesWords('Blue-fronted Amazon')).toEqual({
      one: 'blue-fronted Amazon',
      many: 'blue-fronted Amazons',
    });
  });
});

describe('what the calibrated figure rests on', () => {
  it('says it in the clinic’s words, as the issue words it', () => {
    // The sentence of issue 13: "calibrated on 14 of your cockatiel records; your cockatiels
    // stand 1.4x later than the population model".
    expect(calibrationBasisText(cockatiel, 'standing')).toBe(
      'calibrated on 14 of your cockatiel records; your cockatiels stand 1.4x later than the population model',
    );
    expect(calibrationBasisText({ ...cockatiel, factor: 0.5 }, 'firstMovement')).toBe(
      'calibrated on 14 of your cockatiel records; your cockatiels first move 2.0x sooner than the population model',
    );
    expect(calibrationBasisText({ ...cockatiel, factor: 1.03 }, 'lossOfRighting')).toBe(
      'calibrated on 14 of your cockatiel records; your cockatiels lose righting about when the population model says',
    );
  });

  it('says what a species without records follows, and when the clinic has none', () => {
    expect(calibrationBasisText({ ...cockatiel, speciesRecords: 0 }, 'standing')).toBe(
      'no cockatiel records yet: follows your 30 records of parrots and 60 of the whole clinic',
    );
    expect(
      calibrationBasisText(
        { ...cockatiel, speciesRecords: 0, groupRecords: 0, clinicRecords: 0 },
        'standing',
      ),
    ).toBe('no records yet: the population model alone');
  });
});

describe('the calibrated figures of a plan', () => {
  it('multiplies each population figure by the species’ factor and its band, with the basis', () => {
    const figures = calibratedFigures(result, 'cockatiel', calibrationOf([cockatiel]));
    if (figures.state !== 'on') throw new Error(`expected figures, got ${figures.state}`);
    const population = clinicalMilestoneLines(result);
    expect(figures.lines.map((line) => line.id)).toEqual(population.map((line) => line.id));
    for (const line of figures.lines) {
      const minutes = population.find((entry) => entry.id === line.id)?.minutes ?? null;
      if (minutes === null) {
        expect(line.calibrated).toBeNull();
        expect(line.calibratedText).toBe('—');
        continue;
      }
      // calibrated = population x factor, band = population x the factor's band (docs/evidence.md §3)
      expect(line.calibrated?.minutes).toBeCloseTo(minutes * 1.4, 10);
      expect(line.calibrated?.low).toBeCloseTo(minutes * 1.2, 10);
      expect(line.calibrated?.high).toBeCloseTo(minutes * 1.6, 10);
      expect(line.calibratedText).toBe(calibratedMinutesText(minutes, 1.4, { low: 1.2, high: 1.6 }));
      expect(line.basis).toBe(calibrationBasisText(cockatiel, line.id));
    }
  });

  it('writes the figure and its 90 % band to two significant figures, as the population figures', () => {
    // 10 min x 1.4 = 14 min; band 10 x 1.2 = 12 to 10 x 1.6 = 16 min
    expect(calibratedMinutesText(10, 1.4, { low: 1.2, high: 1.6 })).toBe('14 min (90 % band 12-16 min)');
    // 2.5 x 1.37 = 3.425 -> 3.4; 2.5 x 1.11 = 2.775 -> 2.8; 2.5 x 1.69 = 4.225 -> 4.2
    expect(calibratedMinutesText(2.5, 1.37, { low: 1.11, high: 1.69 })).toBe(
      '3.4 min (90 % band 2.8-4.2 min)',
    );
  });

  it('says calibration is off, or that the clinic has no records yet, instead of a figure', () => {
    expect(calibratedFigures(result, 'cockatiel', calibrationOf([cockatiel], false))).toEqual({
      state: 'off',
      text: calibrationOffText,
    });
    const none = calibratedFigures(
      result,
      'cockatiel',
      calibrationOf([{ ...cockatiel, speciesRecords: 0, groupRecords: 0, clinicRecords: 0 }]),
    );
    expect(none.state).toBe('no-records');
    expect(none.state === 'no-records' && none.text).toMatch(/no completed records it can use yet/);
  });

  it('gives no figure for a plan without a species or a species the clinic does not list', () => {
    for (const [key, basis] of [
      [undefined, 'no species given: the population model alone'],
      ['kakapo', 'this species is not in your clinic’s species list: the population model alone'],
    ] as const) {
      const figures = calibratedFigures(result, key, calibrationOf([cockatiel]));
      if (figures.state !== 'on') throw new Error('expected lines');
      expect(figures.lines.every((line) => line.calibrated === null && line.basis === basis)).toBe(true);
    }
  });

  it('puts a few calibrated figures in one line under their own names, leaving out those without one', () => {
    const figures = calibratedFigures(result, 'cockatiel', calibrationOf([cockatiel]));
    if (figures.state !== 'on') throw new Error('expected lines');
    const [lossOfRighting, surgicalDepth] = figures.lines;
    expect(
      calibratedSummaryText([
        { name: 'induction', line: surgicalDepth },
        { name: 'recovery', line: undefined },
        { name: 'righting', line: lossOfRighting && { ...lossOfRighting, calibrated: null } },
      ]),
    ).toBe(`induction ${String(surgicalDepth?.calibratedText)}`);
    expect(calibratedSummaryText([{ name: 'recovery', line: undefined }])).toBeNull();
  });
});
