import { describe, expect, it } from 'vitest';
import type { PlanInput } from '../../../app/contract/plan.js';
import { planBesideLog, plannedDialAt } from '../../../app/ui/records/plan-beside-log.js';
import { nothingMeasured } from '../../support/clinic-birds.js';

const schedule: PlanInput['schedule'] = [
  { atMin: 0, vaporPct: 4 },
  { atMin: 5, vaporPct: 2 },
  { atMin: 30, vaporPct: 0 },
];

describe('plan beside the log', () => {
  it('holds each dial step until the next one', () => {
    expect([0, 4.99, 5, 29, 30, 45].map((minute) => plannedDialAt(schedule, minute))).toEqual([
      4, 4, 2, 2, 0, 0,
    ]);
  });

  it('places logged dial settings at their minute and gives the predicted brain level as a multiple of MAC', () => {
    const input = { schedule } as PlanInput;
    const series = planBesideLog(
      { input, timeline: { timeMin: [0, 5, 10], brainPct: [0, 1.3, 2.6] }, macPct: 1.3 },
      '2026-12-01T09:00:00.000Z',
      [
        { values: { ...nothingMeasured, at: '2026-12-01T09:07:30.000Z', kind: 'vitals', vaporPct: 2.5 } },
        { values: { ...nothingMeasured, at: '2026-12-01T09:10:00.000Z', kind: 'vitals', vaporPct: 2 } },
        {
          values: {
            ...nothingMeasured,
            at: '2026-12-01T09:08:00.000Z',
            kind: 'vitals',
            heartRatePerMin: 300,
          },
        },
        {
          values: {
            ...nothingMeasured,
            at: '2026-12-01T09:09:00.000Z',
            kind: 'event',
            eventType: 'intubation',
          },
        },
      ],
    );
    expect(series.minutes).toEqual([0, 5, 7.5, 10]);
    expect(series.plannedDialPct).toEqual([4, 2, null, 2]);
    expect(series.predictedBrainMac).toEqual([0, 1, null, 2]);
    expect(series.loggedDialPct).toEqual([null, null, 2.5, 2]);
  });
});
