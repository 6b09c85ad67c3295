import { describe, expect, it } from 'vitest';
import { dateFormats, formatCalendarDate } from '../../app/core/date-format.js';

describe("the clinic's one date format", () => {
  it('writes 2 December 2026 in each format', () => {
    expect(formatCalendarDate('2026-12-02', 'YYYY-MM-DD')).toBe('2026-12-02');
    expect(formatCalendarDate('2026-12-02', 'DD/MM/YYYY')).toBe('02/12/2026');
    expect(formatCalendarDate('2026-12-02', 'MM/DD/YYYY')).toBe('12/02/2026');
    expect(formatCalendarDate('2026-12-02', 'D MMM YYYY')).toBe('2 Dec 2026');
  });

  it('reads the date part of a longer text and leaves anything else as it is', () => {
    expect(formatCalendarDate('2026-01-09T08:00', 'D MMM YYYY')).toBe('9 Jan 2026');
    for (const format of dateFormats) expect(formatCalendarDate('not a date', format)).toBe('not a date');
  });
});
