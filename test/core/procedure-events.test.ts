import { describe, expect, it } from 'vitest';
import { procedureCsv, procedureCsvHeaders } from '../../app/core/procedure-csv.js';
import { eventName, eventLabels, localTimeWithOffset } from '../../app/core/procedure-events.js';

describe('event names in the clinic’s words', () => {
  it('reads every code as words, never as the code', () => {
    expect(eventName('drugGiven')).toBe('Drug given');
    expect(eventName('vaporiserOff')).toBe('Vaporiser off');
    for (const [code, name] of Object.entries(eventLabels)) {
      expect(name).not.toBe(code);
      expect(name).not.toMatch(/[a-z][A-Z]/);
    }
  });

  it('shows an unknown code as it is', () => {
    expect(eventName('somethingNew')).toBe('somethingNew');
  });
});

describe('local time with its UTC offset (ISO 8601)', () => {
  it('shifts the clock by the offset and names it', () => {
    // ISO 8601 offsets: +01:00 central Europe in winter, -05:00 US Eastern in winter, +05:45 Nepal (common practice)
    expect(localTimeWithOffset('2026-12-01T10:01:00.000Z', 60)).toBe('2026-12-01T11:01:00+01:00');
    expect(localTimeWithOffset('2026-12-01T03:30:00.000Z', -300)).toBe('2026-11-30T22:30:00-05:00');
    expect(localTimeWithOffset('2026-12-01T10:00:00Z', 345)).toBe('2026-12-01T15:45:00+05:45');
    expect(localTimeWithOffset('2026-12-01T10:00:00Z', 0)).toBe('2026-12-01T10:00:00+00:00');
  });

  it('leaves a text that is not a time unchanged', () => {
    expect(localTimeWithOffset('not a time', 60)).toBe('not a time');
  });
});

describe('procedure CSV', () => {
  it('writes local times with their offset and readable event names', () => {
    const csv = procedureCsv({
      startedAt: '2026-12-01T10:00:00.000Z',
      title: [['patient', 'Pip']],
      agent: 'sevoflurane',
      utcOffsetMinAt: () => 60,
      entries: [
        {
          at: '2026-12-01T10:03:00.000Z',
          kind: 'event',
          vaporPct: null,
          oxygenLpm: null,
          heartRatePerMin: null,
          breathsPerMin: null,
          temperatureC: null,
          etco2Mmhg: null,
          spo2Pct: null,
          eventType: 'drugGiven',
          eventNote: '',
          drugName: 'Clinic drug A',
          drugDose: '0.02 mL',
          enteredBy: 'RW',
          enteredAt: '2026-12-01T10:04:00.000Z',
          corrected: false,
          workstationName: 'Theatre 1',
        },
        {
          at: '2026-12-01T10:05:00.000Z',
          kind: 'vitals',
          vaporPct: 3.5,
          oxygenLpm: 1,
          heartRatePerMin: 300,
          breathsPerMin: null,
          temperatureC: null,
          etco2Mmhg: null,
          spo2Pct: null,
          eventType: null,
          eventNote: '',
          drugName: '',
          drugDose: '',
          enteredBy: 'RW',
          enteredAt: '2026-12-01T10:05:00.000Z',
          corrected: false,
          workstationName: null,
        },
      ],
    });
    const lines = csv.split('\r\n');
    expect(lines[2]).toBe(procedureCsvHeaders.map((h) => (h.includes(',') ? `"${h}"` : h)).join(','));
    // Each row names the record's agent and the workstation that wrote it (blank when unknown).
    expect(procedureCsvHeaders).toContain('agent');
    expect(procedureCsvHeaders).toContain('workstation');
    expect(lines[3]).toBe(
      '2026-12-01T11:03:00+01:00,3,event,sevoflurane,,,,,,,,Drug given,,Clinic drug A,0.02 mL,RW,Theatre 1,2026-12-01T11:04:00+01:00,no',
    );
    expect(lines[4]).toBe(
      '2026-12-01T11:05:00+01:00,5,vitals,sevoflurane,3.5,1,300,,,,,,,,,RW,,2026-12-01T11:05:00+01:00,no',
    );
  });
});
