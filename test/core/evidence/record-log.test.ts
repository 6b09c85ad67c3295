import { describe, expect, it } from 'vitest';
import { forecastPlan, readForecast } from '../../../app/core/evidence/forecast.js';
import { recordEvidence } from '../../../app/core/evidence/observed.js';
import { planInputFromLog, type LoggedEntry, type RecordLog } from '../../../app/core/evidence/record-log.js';
import {
  breathsPerMin as restingBreathsPerMin,
  tidalVolumeMl as restingTidalVolumeMl,
} from '../../../app/core/model/allometry.js';
import { computePlan } from '../../../app/core/model/compute-plan.js';
import { defaultRecoveryMacFraction, standingMacFraction } from '../../../app/core/model/parameters.js';
import { speciesReference } from '../../../app/core/species-reference.js';
import { planInputSchema } from '../../../app/contract/plan.js';
import { at, event, row } from '../../support/logged-entries.js';

// An invented cockatiel procedure: mask induction at 4 %, intubated at 4 min, 2 % from 10 min,
// IPPV for a while, vaporiser off at 40 min, moving at 45, standing at 52.
const log: RecordLog = {
  startedAtMs: at(-2),
  endedAtMs: at(60),
  airway: 'endotracheal',
  circuit: 'nonRebreathing',
  bird: { bodyMassG: 95, speciesId: 'cockatiel', agent: 'isoflurane', agentBasis: 'the linked plan' },
  entries: [
    row(0, { vaporPct: 4, oxygenLpm: 1, heartRatePerMin: 300 }),
    event(1.5, 'induction'),
    event(4, 'intubation'),
    row(5, { vaporPct: 3, oxygenLpm: 0.8, heartRatePerMin: 320, breathsPerMin: 20 }),
    event(8, 'ippvOn'),
    row(10, { vaporPct: 2, breathsPerMin: 12, heartRatePerMin: 310 }),
    event(20, 'ippvOff'),
    row(30, { vaporPct: 2, heartRatePerMin: 280 }),
    event(40, 'vaporiserOff'),
    event(45, 'firstMovement'),
    event(48, 'extubation'),
    event(52, 'standing'),
  ],
};

describe('a record log read as a plan', () => {
  it('puts the dial steps at their logged minutes from gas on, and the off at the event', () => {
    const plan = planInputFromLog(log);
    if (!plan.ok) throw new Error(plan.missing);
    expect(plan.input.schedule).toEqual([
      { atMin: 0, vaporPct: 4 },
      { atMin: 5, vaporPct: 3 },
      { atMin: 10, vaporPct: 2 },
      { atMin: 40, vaporPct: 0 },
    ]);
    expect(plan.gasOnMs).toBe(at(0));
    expect(plan.offMs).toBe(at(40));
  });

  it('induces on a mask and moves to the tube at the intubation, with the flow logged then', () => {
    const plan = planInputFromLog(log);
    if (!plan.ok) throw new Error(plan.missing);
    expect(plan.input.route).toBe('mask');
    expect(plan.input.freshGasLpm).toBe(1);
    expect(plan.input.laterPhases).toEqual([
      { startMin: 4, route: 'endotracheal', circuit: 'nonRebreathing', freshGasLpm: 1 },
    ]);
    expect(plan.notes.join(' ')).toContain('mask induction');
  });

  it('takes IPPV from the first IPPV-on and the median heart rate, and is a valid plan', () => {
    const plan = planInputFromLog(log);
    if (!plan.ok) throw new Error(plan.missing);
    expect(plan.input.ventilation).toMatchObject({ mode: 'ippv', fromMin: 8, breathsPerMin: 12 });
    expect(plan.input.overrides).toEqual({ heartRatePerMin: 305 });
    expect(planInputSchema.safeParse(plan.input).success).toBe(true);
  });

  it('refuses a log without a dial above 0 or without any flow, saying which', () => {
    expect(planInputFromLog({ ...log, entries: [event(1, 'induction')] })).toEqual({
      ok: false,
      missing: 'no vaporiser setting above 0 % is logged',
    });
    const noFlow = planInputFromLog({ ...log, entries: [row(0, { vaporPct: 3 })] });
    expect(noFlow.ok).toBe(false);
  });
});

describe('IPPV periods read from the log', () => {
  const tidal = Number(restingTidalVolumeMl(95).toPrecision(3));
  const withEvents = (...extra: LoggedEntry[]): RecordLog => ({
    ...log,
    entries: [
      ...log.entries.filter((entry) => entry.eventType !== 'ippvOn' && entry.eventType !== 'ippvOff'),
      ...extra,
    ],
  });
  const planOf = (record: RecordLog) => {
    const plan = planInputFromLog(record);
    if (!plan.ok) throw new Error(plan.missing);
    expect(planInputSchema.safeParse(plan.input).success).toBe(true);
    return plan;
  };

  it('makes the IPPV on and off of the log one period with an end, named in a plain note', () => {
    const plan = planOf(log);
    expect(plan.input.ventilation).toEqual({
      mode: 'ippv',
      fromMin: 8,
      untilMin: 20,
      breathsPerMin: 12,
      tidalVolumeMl: tidal,
    });
    expect(plan.notes).toContain(
      'IPPV period: 8-20 min at 12 breaths/min (the median of 1 logged); with the resting tidal volume (allometric estimate).',
    );
    expect(plan.notes.join(' ')).not.toContain('not modelled');
  });

  it('makes every on-off pair a period, each at the median rate logged within it, else the resting rate', () => {
    const plan = planOf(
      withEvents(
        event(8, 'ippvOn'),
        row(12, { breathsPerMin: 10 }),
        row(14, { breathsPerMin: 14 }),
        event(18, 'ippvOff'),
        row(22, { breathsPerMin: 30 }),
        event(25, 'ippvOn'),
        event(32, 'ippvOff'),
        event(35, 'ippvOn'),
        row(36, { breathsPerMin: 9 }),
      ),
    );
    const resting = Math.round(restingBreathsPerMin(95) * 100) / 100;
    expect(plan.input.ventilation).toEqual({
      mode: 'ippv',
      fromMin: 8,
      untilMin: 18,
      breathsPerMin: 12,
      tidalVolumeMl: tidal,
      laterPeriods: [
        { fromMin: 25, untilMin: 32, breathsPerMin: resting, tidalVolumeMl: tidal },
        { fromMin: 35, breathsPerMin: 9, tidalVolumeMl: tidal },
      ],
    });
    expect(plan.notes).toContain(
      `IPPV periods: 8-18 min at 12 breaths/min (the median of 3 logged); 25-32 min at ${String(resting)} breaths/min (the allometric resting rate, none logged); from 35 min to the end at 9 breaths/min (the median of 1 logged); with the resting tidal volume (allometric estimate).`,
    );
    // The model follows: the bird off the ventilator from 18 to 25 min is not the bird kept on it.
    const tables = { species: speciesReference };
    const onlyFirstOn = planOf(withEvents(event(8, 'ippvOn'), row(12, { breathsPerMin: 12 })));
    const brainOf = (input: typeof plan.input) => computePlan(input, tables).timeline.brainPct;
    expect(brainOf(plan.input)).not.toEqual(brainOf(onlyFirstOn.input));
  });

  it('notes an IPPV off without an IPPV on, and an IPPV on before the tube, as not modelled', () => {
    const offAlone = planOf(withEvents(event(20, 'ippvOff')));
    expect(offAlone.input.ventilation).toBeUndefined();
    expect(offAlone.notes).toContain('IPPV off at 20 min without an IPPV on before it: not modelled.');
    const beforeTube = planOf(
      withEvents(event(2, 'ippvOn'), event(3, 'ippvOff'), event(10, 'ippvOn'), event(30, 'ippvOff')),
    );
    expect(beforeTube.notes).toContain(
      'IPPV logged before a tube is in place (from 2 to 3 min): not modelled.',
    );
    expect(beforeTube.input.ventilation).toMatchObject({ fromMin: 10, untilMin: 30 });
    expect(beforeTube.input.ventilation).not.toHaveProperty('laterPeriods');
  });

  it('starts IPPV logged in the room-air gap of the tube once the tube delivers', () => {
    const plan = planOf(withEvents(event(4.2, 'ippvOn'), event(15, 'ippvOff')));
    expect(plan.input.ventilation).toMatchObject({ fromMin: 5, untilMin: 15 });
  });
});

describe('observed beside predicted', () => {
  const tables = { species: speciesReference };

  it('pairs each event with its milestone and gives the ratio', () => {
    const evidence = recordEvidence(log, tables);
    if (!evidence.ok) throw new Error(evidence.skipped);
    const byId = Object.fromEntries(evidence.milestones.map((m) => [m.id, m]));
    expect(byId.lossOfRighting).toMatchObject({ observedMin: 1.5 });
    expect(byId.surgicalDepth).toMatchObject({ observedMin: 4 });
    expect(byId.firstMovement).toMatchObject({ observedMin: 5 });
    expect(byId.standing).toMatchObject({ observedMin: 12 });
    expect(evidence.extubationMin).toBe(8);
    for (const milestone of evidence.milestones) {
      if (!('ratio' in milestone)) throw new Error(milestone.skipped);
      expect(milestone.ratio).toBeCloseTo(milestone.observedMin / milestone.predictedMin, 1);
    }
  });

  it('skips a milestone whose event is missing, never filling it in', () => {
    const evidence = recordEvidence(
      { ...log, entries: log.entries.filter((entry) => entry.eventType !== 'standing') },
      tables,
    );
    if (!evidence.ok) throw new Error(evidence.skipped);
    expect(evidence.milestones.find((m) => m.id === 'standing')).toEqual({
      id: 'standing',
      skipped: 'no standing / perching event logged',
    });
  });

  it('skips the record when the vaporiser-off is missing', () => {
    const evidence = recordEvidence(
      { ...log, entries: log.entries.filter((entry) => entry.eventType !== 'vaporiserOff') },
      tables,
    );
    expect(evidence).toEqual({ ok: false, skipped: 'no vaporiser-off event logged' });
  });
});

describe('the forecast that follows the log', () => {
  const running: RecordLog = {
    ...log,
    endedAtMs: null,
    entries: log.entries.filter((entry) => entry.atMs < at(20)),
  };

  it('turns the vaporiser off now and gives first movement and standing after now', () => {
    const plan = forecastPlan(running, at(25));
    if (!plan.ok) throw new Error(plan.missing);
    expect(plan.input.schedule.at(-1)).toEqual({ atMin: 25, vaporPct: 0 });
    const forecast = readForecast(plan, computePlan(plan.input, { species: speciesReference }), at(25));
    expect(forecast.alreadyOff).toBe(false);
    expect(forecast.depthNowMac).toBeGreaterThan(0.5);
    expect(forecast.firstMovementAtMs).toBeGreaterThan(at(25));
    expect(forecast.standingAtMs).toBeGreaterThan(forecast.firstMovementAtMs as number);
    expect(forecast.notDeepEnough).toEqual({ firstMovement: null, standing: null });
  });

  it('gives no waking times, and says why, for a bird not yet as deep as the waking levels', () => {
    // Seconds after the first dial: the predicted brain is still far below both waking levels
    // (the model times a recovery milestone only for a brain that was above its level).
    const justStarted: RecordLog = {
      ...log,
      endedAtMs: null,
      entries: [row(0, { vaporPct: 4, oxygenLpm: 1 })],
    };
    const plan = forecastPlan(justStarted, at(0.1));
    if (!plan.ok) throw new Error(plan.missing);
    const forecast = readForecast(plan, computePlan(plan.input, { species: speciesReference }), at(0.1));
    expect(forecast.depthNowMac).toBeLessThan(0.2);
    expect(forecast.firstMovementAtMs).toBeNull();
    expect(forecast.standingAtMs).toBeNull();
    expect(forecast.notDeepEnough).toEqual({
      firstMovement: defaultRecoveryMacFraction.value,
      standing: standingMacFraction.value,
    });
  });

  it('a higher dial logged gives a later predicted standing', () => {
    const standingWith = (dial: number) => {
      const entries = [...running.entries, row(15, { vaporPct: dial })];
      const plan = forecastPlan({ ...running, entries }, at(25));
      if (!plan.ok) throw new Error(plan.missing);
      return readForecast(plan, computePlan(plan.input, { species: speciesReference }), at(25)).standingAtMs;
    };
    expect(standingWith(3.5) as number).toBeGreaterThan(standingWith(1.5) as number);
  });
});
