import { afterEach, describe, expect, it } from 'vitest';
import { displayDateTime, displayLaterTime, setClinicDateFormat } from '../../../app/ui/common/display.js';

/** An instant at a local wall-clock time, whatever the time zone the tests run in. */
const local = (year: number, month: number, day: number, hours: number, minutes: number) =>
  new Date(year, month - 1, day, hours, minutes);

describe('dates and times in the clinic date format', () => {
  afterEach(() => setClinicDateFormat(undefined));

  it('writes a moment (text or Date) as the clinic date and a 24-hour local time', () => {
    const printed = local(2026, 12, 2, 14, 5);
    expect(displayDateTime(printed)).toBe('2026-12-02 14:05');
    setClinicDateFormat('D MMM YYYY');
    expect(displayDateTime(printed)).toBe('2 Dec 2026 14:05');
    expect(displayDateTime(printed.toISOString())).toBe('2 Dec 2026 14:05');
    setClinicDateFormat('MM/DD/YYYY');
    expect(displayDateTime(printed)).toBe('12/02/2026 14:05');
    expect(displayDateTime('not a time')).toBe('not a time');
  });

  it('writes a procedure end beside its start: the time alone on the same day, else with the date', () => {
    setClinicDateFormat('DD/MM/YYYY');
    const start = local(2026, 12, 1, 22, 40).toISOString();
    expect(displayLaterTime(start, local(2026, 12, 1, 23, 15).toISOString())).toBe('23:15');
    expect(displayLaterTime(start, local(2026, 12, 2, 0, 20).toISOString())).toBe('02/12/2026 00:20');
  });
});
