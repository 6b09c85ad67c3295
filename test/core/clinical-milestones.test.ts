import { describe, expect, it } from 'vitest';
import { clinicalMilestoneLines, type MilestoneSource } from '../../app/core/clinical-milestones.js';
import { computePlan } from '../../app/core/model/compute-plan.js';
import { speciesReference } from '../../app/core/species-reference.js';
import { planInputSchema } from '../../app/contract/plan.js';

// The lines are what the worksheet, the planning screen and `tidewing plan --summary` print for the
// clinical milestones. The minutes below are invented inputs that only exercise the wording; the
// thresholds are the model's stated ones (app/core/model/parameters.ts).
const source: MilestoneSource = {
  milestones: {
    lossOfRightingMin: 0.42,
    surgicalDepthMin: 1.73,
    firstMovementMin: 3.7,
    standingMin: null,
    vaporiserOffMin: 60,
    definitions: [
      {
        id: 'lossOfRighting',
        label: 'Loss of righting',
        macMultiple: 0.6,
        when: 'rising',
        basis: 'Assumption for birds: ...',
      },
      {
        id: 'surgicalDepth',
        label: 'Planned surgical depth',
        macMultiple: 1.2,
        when: 'rising',
        basis: 'Common practice: ...',
      },
      {
        id: 'firstMovement',
        label: 'First movement or head lift',
        macMultiple: 0.5,
        when: 'falling',
        basis: 'entered for this plan',
      },
      {
        id: 'standing',
        label: 'Standing or perching',
        macMultiple: 0.2,
        when: 'falling',
        basis: 'Assumption: ...',
      },
    ],
  },
  uncertainty: {
    samples: 200,
    milestones: [
      { id: 'lossOfRighting', percentiles: { p5: 0.31, p95: 0.82 }, note: null },
      {
        id: 'surgicalDepth',
        percentiles: { p5: 0.79, p95: 60 },
        note: 'not reached by 31 % of birds like this',
      },
      { id: 'firstMovement', percentiles: { p5: 1.6, p95: 8.4 }, note: null },
      { id: 'standing', percentiles: null, note: 'not reached by 100 % of birds like this' },
    ],
  },
};

describe('clinical milestone lines (worksheet, screen and summary content)', () => {
  it('gives the four milestones in clinical order with minutes, range, note and short definition', () => {
    const lines = clinicalMilestoneLines(source);
    expect(lines.map((line) => line.id)).toEqual([
      'lossOfRighting',
      'surgicalDepth',
      'firstMovement',
      'standing',
    ]);
    expect(lines.map((line) => line.from)).toEqual(['start', 'start', 'vaporiser off', 'vaporiser off']);
    const [righting, depth, movement, standing] = lines;
    expect(righting).toMatchObject({
      minutesText: '0.42 min',
      rangeText: '0.31-0.82 min',
      note: null,
      definition: 'Loss of righting: brain reaches 0.6 x MAC (assumption)',
    });
    expect(depth).toMatchObject({
      minutesText: '1.7 min',
      rangeText: '0.79-60 min',
      note: 'not reached by 31 % of birds like this',
      definition: "Planned surgical depth: brain reaches 1.2 x MAC (the plan's depth)",
    });
    // A threshold the clinician entered says so instead of "assumption".
    expect(movement?.definition).toBe(
      'First movement or head lift: brain below 0.5 x MAC after the vaporiser is off (entered for this plan)',
    );
    expect(standing).toMatchObject({
      minutes: null,
      minutesText: 'not reached in the planned time',
      rangeText: null,
      note: 'not reached by 100 % of birds like this',
      definition: 'Standing or perching: brain below 0.2 x MAC after the vaporiser is off (assumption)',
    });
  });

  it('shows no range before the uncertainty run has samples', () => {
    const lines = clinicalMilestoneLines({ ...source, uncertainty: { ...source.uncertainty, samples: 0 } });
    expect(lines.every((line) => line.rangeText === null)).toBe(true);
  });

  it('says the vaporiser was never turned off rather than "not reached" for the recovery milestones', () => {
    const lines = clinicalMilestoneLines({
      ...source,
      milestones: { ...source.milestones, firstMovementMin: null, standingMin: null, vaporiserOffMin: null },
    });
    expect(lines[2]?.minutesText).toBe('vaporiser never turned off');
    expect(lines[3]?.minutesText).toBe('vaporiser never turned off');
  });

  it('does not call a milestone "not reached" for a plan saved before the model stated it', () => {
    const lines = clinicalMilestoneLines({
      ...source,
      milestones: { ...source.milestones, lossOfRightingMin: null, definitions: [] },
      uncertainty: { ...source.uncertainty, milestones: [] },
    });
    expect(lines).toHaveLength(4);
    for (const line of lines) {
      expect(line.minutes).toBeNull();
      expect(line.minutesText).toBe('not computed by the model this plan was saved with');
      expect(line.definition).toContain('compute the plan again');
    }
  });

  it('reads the definitions the model states for a computed plan', () => {
    const plan = planInputSchema.parse({
      bodyMassG: 35,
      agent: 'isoflurane',
      route: 'mask',
      freshGasLpm: 1,
      schedule: [
        { atMin: 0, vaporPct: 3 },
        { atMin: 5, vaporPct: 2 },
        { atMin: 30, vaporPct: 0 },
      ],
      uncertainty: { samples: 0, seed: 1 },
    });
    const result = computePlan(plan, { species: speciesReference });
    const lines = clinicalMilestoneLines(result);
    // Thresholds as stated in app/core/model/parameters.ts (assumptions), planned depth 1.2 x MAC (common practice).
    expect(lines.map((line) => line.definition)).toEqual([
      'Loss of righting: brain reaches 0.6 x MAC (assumption)',
      "Planned surgical depth: brain reaches 1.2 x MAC (the plan's depth)",
      'First movement or head lift: brain below 0.4 x MAC after the vaporiser is off (assumption)',
      'Standing or perching: brain below 0.2 x MAC after the vaporiser is off (assumption)',
    ]);
    expect(lines[0]?.minutes).toBe(result.milestones.lossOfRightingMin);
    expect(lines[1]?.minutes).toBe(result.milestones.inductionMin);
    expect(lines[2]?.minutes).toBe(result.milestones.recoveryMin);
    expect(lines[3]?.minutes).toBe(result.milestones.standingMin);
  });
});
