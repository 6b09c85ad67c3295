import { describe, expect, it } from 'vitest';
import { forecastPlan, readForecast } from '../../../app/core/evidence/forecast.js';
import { recordEvidence } from '../../../app/core/evidence/observed.js';
import { planInputFromLog, type LoggedEntry, type RecordLog } from '../../../app/core/evidence/record-log.js';
import { computePlan } from '../../../app/core/model/compute-plan.js';
import { speciesReference } from '../../../app/core/species-reference.js';
import { planInputSchema } from '../../../app/contract/plan.js';

const t0 = Date.parse('2026-03-02T09:00:00Z');
const at = (minutes: number) => t0 + minutes * 60_000;
const row = (minutes: number, values: Partial<LoggedEntry>): LoggedEntry => ({
  atMs: at(minutes),
  kind: 'vitals',
  vaporPct: null,
  oxygenLpm: null,
  heartRatePerMin: null,
  breathsPerMin: null,
  eventType: null,
  ...values,
});
const event = (minutes: number, eventType: LoggedEntry['eventType']) =>
  row(minutes, { kind: 'event', eventType });

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
