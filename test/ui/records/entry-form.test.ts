import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  checkEntry,
  emptyReadings,
  parseNumber,
  readingBounds,
  readingsSummary,
  readingsToDraft,
  toDisplayReading,
  toStoredReading,
  type DisplayUnits,
} from '../../../app/ui/records/entry-form.js';

const metric: DisplayUnits = { temperature: 'C', pressure: 'mmHg' };
const imperial: DisplayUnits = { temperature: 'F', pressure: 'kPa' };
const now = new Date(2026, 2, 10, 9, 30, 0);

function values(units: DisplayUnits, readings: Partial<typeof emptyReadings>, timeText = '') {
  const checked = checkEntry(
    { timeText, readings: { ...emptyReadings, ...readings }, kind: 'vitals' },
    units,
    now,
  );
  if (!checked.ok) throw new Error(JSON.stringify(checked.errors));
  return checked.values;
}

describe('unit conversion when a row is typed', () => {
  it('stores a temperature typed in °F as °C', () => {
    // 104 °F = 40 °C and 101.3 °F = 38.5 °C (definition of the Fahrenheit scale).
    expect(values(imperial, { temperatureC: '104' }).temperatureC).toBe(40);
    expect(values(imperial, { temperatureC: '101.3' }).temperatureC).toBe(38.5);
  });

  it('stores an EtCO2 typed in kPa as mmHg, to two decimals', () => {
    // 5.3 kPa x 760 / 101.325 = 39.7533 mmHg (definitions of the standard atmosphere and the torr).
    expect(values(imperial, { etco2Mmhg: '5.3' }).etco2Mmhg).toBe(39.75);
    expect(toStoredReading('etco2Mmhg', 101.325, imperial)).toBe(760);
  });

  it('leaves readings typed in the contract units untouched', () => {
    const stored = values(metric, {
      vaporPct: '2,5',
      oxygenLpm: '0.8',
      heartRatePerMin: '320',
      temperatureC: '39.4',
      etco2Mmhg: '38',
      spo2Pct: '94',
    });
    expect(stored).toMatchObject({
      vaporPct: 2.5,
      oxygenLpm: 0.8,
      heartRatePerMin: 320,
      temperatureC: 39.4,
      etco2Mmhg: 38,
      spo2Pct: 94,
      breathsPerMin: null,
      kind: 'vitals',
      eventType: null,
    });
  });

  it('reads back a temperature typed in °F to one decimal exactly as typed', () => {
    fc.assert(
      fc.property(fc.integer({ min: 680, max: 1148 }), (tenths) => {
        const typed = tenths / 10;
        return (
          toDisplayReading('temperatureC', toStoredReading('temperatureC', typed, imperial), imperial) ===
          typed
        );
      }),
    );
  });

  it('reads back an EtCO2 typed in kPa to two decimals exactly as typed', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1999 }), (hundredths) => {
        const typed = hundredths / 100;
        return (
          toDisplayReading('etco2Mmhg', toStoredReading('etco2Mmhg', typed, imperial), imperial) === typed
        );
      }),
    );
  });

  it('fills the correction form with the stored values in display units', () => {
    const stored = values(imperial, { heartRatePerMin: '310', temperatureC: '103.1', etco2Mmhg: '5.9' });
    expect(readingsToDraft(stored, imperial)).toMatchObject({
      heartRatePerMin: '310',
      temperatureC: '103.1',
      etco2Mmhg: '5.9',
      vaporPct: '',
    });
    expect(readingsSummary(stored, imperial)).toBe('HR 310 /min · Temp 103.1 °F · EtCO2 5.9 kPa');
  });
});

describe('checking a row before it is sent', () => {
  it('refuses a row with no reading, naming the row', () => {
    const checked = checkEntry({ timeText: '', readings: emptyReadings, kind: 'vitals' }, metric, now);
    expect(checked).toEqual({
      ok: false,
      errors: { heartRatePerMin: 'Enter at least one reading in the row.' },
    });
  });

  it('names the box that holds text that is not a number', () => {
    const checked = checkEntry(
      {
        timeText: '',
        readings: { ...emptyReadings, heartRatePerMin: '3l0', breathsPerMin: '20' },
        kind: 'vitals',
      },
      metric,
      now,
    );
    expect(checked.ok).toBe(false);
    if (!checked.ok) expect(checked.errors['heartRatePerMin']).toBe('HR must be a number in /min.');
  });

  it('gives the accepted range in the unit the clinic typed', () => {
    // The contract accepts 20-46 °C: 68-114.8 °F (definition of the Fahrenheit scale).
    expect(readingBounds('temperatureC')).toEqual({ min: 20, max: 46 });
    const checked = checkEntry(
      { timeText: '', readings: { ...emptyReadings, temperatureC: '120' }, kind: 'vitals' },
      imperial,
      now,
    );
    expect(checked.ok).toBe(false);
    if (!checked.ok) expect(checked.errors['temperatureC']).toBe('Temp must be 68 to 114.8 °F.');
    const celsius = checkEntry(
      { timeText: '', readings: { ...emptyReadings, temperatureC: '50' }, kind: 'vitals' },
      metric,
      now,
    );
    if (!celsius.ok) expect(celsius.errors['temperatureC']).toBe('Temperature must be 20 to 46 °C.');
    expect(celsius.ok).toBe(false);
  });

  it('places a typed time on the clinic clock and reports a bad one against the time box', () => {
    expect(values(metric, { heartRatePerMin: '300' }, '09:25').at).toBe(
      new Date(2026, 2, 10, 9, 25).toISOString(),
    );
    const checked = checkEntry(
      { timeText: '9h25', readings: { ...emptyReadings, heartRatePerMin: '300' }, kind: 'vitals' },
      metric,
      now,
    );
    expect(checked.ok).toBe(false);
    if (!checked.ok) expect(Object.keys(checked.errors)).toEqual(['at']);
  });

  it('requires the drug name on a drug event and accepts an event with no readings', () => {
    const missing = checkEntry(
      { timeText: '', readings: emptyReadings, kind: 'event', eventType: 'drugGiven' },
      metric,
      now,
    );
    expect(missing).toEqual({ ok: false, errors: { drugName: 'Name the drug given.' } });
    const induction = checkEntry(
      { timeText: '', readings: emptyReadings, kind: 'event', eventType: 'induction' },
      metric,
      now,
    );
    expect(induction.ok).toBe(true);
  });

  it('parses decimal points and commas and refuses anything else', () => {
    expect(parseNumber(' 2,5 ')).toBe(2.5);
    expect(parseNumber('.5')).toBe(0.5);
    expect(parseNumber('')).toBeNull();
    expect(parseNumber('1e3')).toBe('invalid');
    expect(parseNumber('2..5')).toBe('invalid');
  });
});
