import { describe, expect, it } from 'vitest';
import type { CalibrationView } from '../../../app/contract/evidence-channels.js';
import {
  calibrationMilestoneHeading,
  calibrationSwitchText,
  evidenceCountsText,
  factorText,
  outcomeMilestoneText,
  tableMinutesText,
} from '../../../app/ui/evidence/evidence-text.js';

describe('the evidence screens’ sentences', () => {
  it('counts what was listed, compared, skipped per milestone, left out and still running', () => {
    expect(
      evidenceCountsText({
        completed: 60,
        compared: 58,
        skipped: 2,
        skippedByMilestone: { lossOfRighting: 0, surgicalDepth: 3, firstMovement: 1, standing: 5 },
        excluded: 4,
        inProgress: 1,
        pending: 0,
      }),
    ).toBe(
      '60 completed records; 58 compared; 2 skipped whole; skipped for a missing or unusable event: induction (loss of righting) 0, intubation (surgical depth) 3, first movement 1, standing / perching 5; 4 left out of the calibration; 1 still running (not shown).',
    );
  });

  it('puts an ended record’s observed minutes beside the prediction with the ratio, or says why not', () => {
    expect(
      outcomeMilestoneText({ id: 'standing', observedMin: 14, predictedMin: 10, ratio: 1.4, skipped: null }),
    ).toBe('observed 14.0 min, predicted 10.0 min (x1.40)');
    expect(
      outcomeMilestoneText({
        id: 'standing',
        observedMin: null,
        predictedMin: null,
        ratio: null,
        skipped: 'no standing / perching event logged',
      }),
    ).toBe('skipped: no standing / perching event logged');
  });

  it('writes factors to two decimals and table minutes to one, a dash for none', () => {
    expect(factorText(1.4)).toBe('x1.40');
    expect(factorText(0.833)).toBe('x0.83');
    expect(tableMinutesText(12.345)).toBe('12.3');
    expect(tableMinutesText(null)).toBe('—');
  });

  it('says whether the calibration is on, who switched it and what plans then show', () => {
    expect(calibrationSwitchText({ on: true, switchedBy: null, switchedAt: null })).toBe(
      'Calibration is on (the default): plans show the calibrated figure beside the population model.',
    );
    expect(
      calibrationSwitchText({ on: false, switchedBy: 'RW', switchedAt: '2026-11-30T16:20:00.000Z' }),
    ).toBe('Calibration is off (switched by RW on 2026-11-30): plans show the population model only.');
  });

  it('heads each milestone with its records and the whole clinic’s factor and band', () => {
    const milestone: CalibrationView['milestones'][number] = {
      id: 'standing',
      label: 'Standing / perching',
      records: 55,
      birdSd: 0.3,
      clinicFactor: 1.12,
      clinicBand90: { low: 0.98, high: 1.28 },
      species: [],
    };
    expect(calibrationMilestoneHeading(milestone)).toBe(
      'Standing / perching: 55 records; whole clinic x1.12 (90 % x0.98 to x1.28)',
    );
  });
});
