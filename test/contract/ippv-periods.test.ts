import { describe, expect, it } from 'vitest';
import { planInputSchema, planIssueMessages } from '../../app/contract/plan.js';

// An invented 400 g bird on a tube: 4 % for 10 min, 2 % to 60 min, 30 min of recovery window (the
// plan ends at 90 min).
const tubePlan = {
  bodyMassG: 400,
  agent: 'isoflurane',
  route: 'endotracheal',
  freshGasLpm: 1,
  schedule: [
    { atMin: 0, vaporPct: 4 },
    { atMin: 10, vaporPct: 2 },
    { atMin: 60, vaporPct: 0 },
  ],
};
const ippv = { mode: 'ippv', breathsPerMin: 10, tidalVolumeMl: 8 };

/** The messages of a refused plan, "path: why". */
function refusals(plan: unknown): string[] {
  const parsed = planInputSchema.safeParse(plan);
  expect(parsed.success).toBe(false);
  return parsed.success ? [] : planIssueMessages(parsed.error);
}

describe('IPPV periods in the plan contract', () => {
  it('accepts one period with an end, and several in time order, the last without an end', () => {
    expect(planInputSchema.safeParse({ ...tubePlan, ventilation: { ...ippv, untilMin: 20 } }).success).toBe(
      true,
    );
    const periods = {
      ...ippv,
      fromMin: 5,
      untilMin: 20,
      laterPeriods: [
        { fromMin: 20, untilMin: 30, breathsPerMin: 12, tidalVolumeMl: 8 },
        { fromMin: 45, breathsPerMin: 8, tidalVolumeMl: 9 },
      ],
    };
    const parsed = planInputSchema.safeParse({ ...tubePlan, ventilation: periods });
    expect(parsed.success, parsed.success ? '' : planIssueMessages(parsed.error).join('\n')).toBe(true);
  });

  it('keeps a saved single-period plan valid, fromMin alone meaning IPPV from then to the end', () => {
    const parsed = planInputSchema.safeParse({ ...tubePlan, ventilation: { ...ippv, fromMin: 5 } });
    expect(parsed.success).toBe(true);
    if (parsed.success) expect(parsed.data.ventilation).toEqual({ ...ippv, fromMin: 5 });
  });

  it('refuses an end that is not after the start', () => {
    expect(refusals({ ...tubePlan, ventilation: { ...ippv, fromMin: 20, untilMin: 20 } })).toContain(
      'ventilation.untilMin: IPPV must end after it starts: the end (20 min) is not after the start (20 min)',
    );
    const later = { ...ippv, untilMin: 10, laterPeriods: [{ ...periodOf(30), untilMin: 25 }] };
    expect(refusals({ ...tubePlan, ventilation: later })).toContain(
      'ventilation.laterPeriods[0].untilMin: IPPV period 2 must end after it starts: the end (25 min) is not after the start (30 min)',
    );
  });

  it('refuses overlapping periods and periods out of time order', () => {
    const overlapping = { ...ippv, untilMin: 20, laterPeriods: [{ ...periodOf(15), untilMin: 40 }] };
    expect(refusals({ ...tubePlan, ventilation: overlapping })).toContain(
      'ventilation.laterPeriods[0].fromMin: IPPV periods must be in time order and must not overlap: IPPV period 2 starts at 15 min, before IPPV ends (20 min)',
    );
    const outOfOrder = {
      ...ippv,
      untilMin: 10,
      laterPeriods: [
        { ...periodOf(40), untilMin: 50 },
        { ...periodOf(20), untilMin: 30 },
      ],
    };
    expect(refusals({ ...tubePlan, ventilation: outOfOrder })).toContain(
      'ventilation.laterPeriods[1].fromMin: IPPV periods must be in time order and must not overlap: IPPV period 3 starts at 20 min, before IPPV period 2 ends (50 min)',
    );
  });

  it('refuses a period without an end that another follows', () => {
    expect(refusals({ ...tubePlan, ventilation: { ...ippv, laterPeriods: [periodOf(30)] } })).toContain(
      'ventilation.untilMin: IPPV has no end, so it runs to the end of the plan: give it an end before IPPV period 2 starts (30 min); only the last period may run to the end',
    );
  });

  it('refuses periods that start or end after the plan', () => {
    expect(refusals({ ...tubePlan, ventilation: { ...ippv, untilMin: 95 } })).toContain(
      'ventilation.untilMin: IPPV must end within the plan (by 90 min, the last step plus the recovery window); leave the end out to ventilate to the end',
    );
    expect(
      refusals({ ...tubePlan, ventilation: { ...ippv, untilMin: 10, laterPeriods: [periodOf(91)] } }),
    ).toContain(
      'ventilation.laterPeriods[0].fromMin: IPPV period 2 must start before the end of the plan (90 min, the last step plus the recovery window)',
    );
  });

  it('refuses a later period on a mask, and a mask phase that starts while IPPV still runs', () => {
    const maskThenTube = {
      ...tubePlan,
      route: 'mask',
      laterPhases: [{ startMin: 5, route: 'endotracheal', freshGasLpm: 0.5 }],
    };
    // IPPV ends before the tube phase's gap: its first period runs on the mask.
    expect(refusals({ ...maskThenTube, ventilation: { ...ippv, fromMin: 2, untilMin: 4 } })).toContain(
      'ventilation.fromMin: IPPV needs an endotracheal tube or an air-sac tube: start it once the tube phase is running (from 5.5 min, after its gap on room air)',
    );
    const backToMask = {
      ...tubePlan,
      laterPhases: [{ startMin: 30, route: 'mask', freshGasLpm: 0.5 }],
    };
    expect(refusals({ ...backToMask, ventilation: { ...ippv, untilMin: 35 } })).toContain(
      'laterPhases[0].route: IPPV runs from 0 to 35 min: a mask phase cannot start before it ends; end IPPV by 30 min or keep the bird on a tube',
    );
    // Ended before the bird leaves the tube: accepted.
    expect(planInputSchema.safeParse({ ...backToMask, ventilation: { ...ippv, untilMin: 30 } }).success).toBe(
      true,
    );
    // A later period on the mask after the move.
    expect(
      refusals({ ...backToMask, ventilation: { ...ippv, untilMin: 30, laterPeriods: [periodOf(40)] } }),
    ).toContain(
      'ventilation.laterPeriods[0].fromMin: IPPV needs an endotracheal tube or an air-sac tube, not a mask or chamber',
    );
  });

  it("refuses a later period's settings out of range or implausible for the bird, and unknown fields", () => {
    const messages = refusals({
      ...tubePlan,
      ventilation: {
        ...ippv,
        untilMin: 10,
        laterPeriods: [
          { fromMin: 20, untilMin: 30, breathsPerMin: 400, tidalVolumeMl: 8 },
          { fromMin: 40, breathsPerMin: 10, tidalVolumeMl: 500, pressure: 12 },
        ],
      },
    });
    expect(messages).toContain(
      'ventilation.laterPeriods[0].breathsPerMin: ventilator rate must be between 1 breaths/min and 150 breaths/min',
    );
    expect(messages).toContain(
      'ventilation.laterPeriods[1]: "pressure" is not part of a later IPPV period (check the spelling)',
    );
    const implausible = refusals({
      ...tubePlan,
      ventilation: { ...ippv, untilMin: 10, laterPeriods: [{ ...periodOf(20), tidalVolumeMl: 500 }] },
    });
    expect(implausible.join('\n')).toContain(
      'ventilation.laterPeriods[0].tidalVolumeMl: a ventilator tidal volume of 500 mL is more than 10 times',
    );
  });
});

function periodOf(fromMin: number) {
  return { fromMin, breathsPerMin: 12, tidalVolumeMl: 8 };
}
