import { describe, expect, it } from 'vitest';
import type { ProcedureEntryValues } from '../../../app/contract/records.js';
import {
  apnoeaActionSeconds,
  apnoeaNote,
  defaultPromptIntervalMin,
  eventSummary,
  promptState,
  recoveryMilestones,
  stoppedStopwatch,
  stopwatchLevel,
  stopwatchSeconds,
  toggleStopwatch,
} from '../../../app/ui/records/monitoring.js';

const minute = 60_000;
const start = Date.parse('2026-03-10T09:00:00.000Z');

function event(
  eventType: ProcedureEntryValues['eventType'],
  minutes: number,
): { values: ProcedureEntryValues } {
  return {
    values: {
      at: new Date(start + minutes * minute).toISOString(),
      kind: 'event',
      vaporPct: null,
      oxygenLpm: null,
      heartRatePerMin: null,
      breathsPerMin: null,
      temperatureC: null,
      etco2Mmhg: null,
      spo2Pct: null,
      eventType,
      eventNote: '',
      drugName: '',
      drugDose: '',
    },
  };
}

describe('reminder to log vitals', () => {
  it('defaults to every 5 minutes', () => {
    // Vital signs recorded at least every 5 min: common practice.
    expect(defaultPromptIntervalMin).toBe(5);
  });

  it('is due once no vitals row has been logged for the whole interval since the start', () => {
    expect(promptState(start, [], start + 5 * minute - 1000, 5).due).toBe(false);
    const due = promptState(start, [], start + 5 * minute, 5);
    expect(due.due).toBe(true);
    expect(due.sinceLastMin).toBe(5);
  });

  it('counts from the latest vitals row whatever order the rows come in', () => {
    const rows = [start + 3 * minute, start + 1 * minute];
    expect(promptState(start, rows, start + 7 * minute, 5).due).toBe(false);
    expect(promptState(start, rows, start + 8 * minute, 5)).toEqual({
      due: true,
      sinceLastMin: 5,
      dueAtMs: start + 8 * minute,
    });
  });

  it('follows an edited interval and stays quiet after the procedure has ended', () => {
    expect(promptState(start, [], start + 2 * minute, 2).due).toBe(true);
    expect(promptState(start, [], start + 60 * minute, 5, start + 30 * minute).due).toBe(false);
  });
});

describe('apnoea stopwatch', () => {
  it('starts with one toggle and counts whole seconds', () => {
    const { next, finished } = toggleStopwatch(stoppedStopwatch, 1000);
    expect(finished).toBeNull();
    expect(stopwatchSeconds(next, 1000 + 9999)).toBe(9);
    expect(stopwatchLevel(next, 1000 + 9999)).toBe('running');
  });

  it('turns to danger at 10 s', () => {
    // Apnoea of 10-15 s calls for action: published, clinical education site.
    expect(apnoeaActionSeconds).toBe(10);
    const running = { startedAtMs: 1000 };
    expect(stopwatchLevel(running, 1000 + 10_000)).toBe('danger');
    expect(stopwatchLevel(stoppedStopwatch, 1000 + 10_000)).toBe('stopped');
  });

  it('stops with the second toggle and reports when the apnoea began and how long it lasted', () => {
    const { next, finished } = toggleStopwatch({ startedAtMs: 1000 }, 1000 + 12_500);
    expect(next).toEqual(stoppedStopwatch);
    expect(finished).toEqual({ startedAtMs: 1000, durationS: 12 });
    expect(apnoeaNote(12)).toBe('lasted 12 s (stopwatch)');
  });
});

describe('recovery milestones and event lines', () => {
  it('gives each milestone its first time and minutes after the gas was turned off', () => {
    const entries = [
      event('induction', 0),
      event('extubation', 2),
      event('vaporiserOff', 40),
      event('firstMovement', 43),
      event('extubation', 44.5),
      event('firstMovement', 50),
    ];
    const milestones = recoveryMilestones(entries);
    expect(milestones.map((item) => item.label)).toEqual([
      'Gas off',
      'First movement',
      'Extubation',
      'Standing / perching',
    ]);
    expect(milestones[0]?.minutesAfterGasOff).toBe(0);
    expect(milestones[1]?.minutesAfterGasOff).toBe(3);
    // The extubation at 2 min was before the gas went off: a tube change, not recovery.
    expect(milestones[2]?.minutesAfterGasOff).toBe(4.5);
    expect(milestones[3]).toEqual({
      eventType: 'standing',
      label: 'Standing / perching',
      at: null,
      minutesAfterGasOff: null,
    });
  });

  it('shows milestones before gas off is logged, without minutes after it', () => {
    const milestone = recoveryMilestones([event('firstMovement', 5)])[1];
    expect(milestone?.at).toBe(event('firstMovement', 5).values.at);
    expect(milestone?.minutesAfterGasOff).toBeNull();
  });

  it('shows a drug event with the drug and dose text as the clinic entered them', () => {
    const drug = {
      ...event('drugGiven', 3).values,
      drugName: 'drug A',
      drugDose: 'as written by the clinic',
      eventNote: 'left pectoral',
    };
    expect(eventSummary(drug)).toBe('Drug given: drug A, as written by the clinic: left pectoral');
    expect(eventSummary(event('ippvOn', 1).values)).toBe('IPPV on');
  });
});
