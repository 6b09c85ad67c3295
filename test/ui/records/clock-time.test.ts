import { describe, expect, it } from 'vitest';
import {
  clockText,
  formatElapsed,
  fromLocalInputValue,
  resolveClockTime,
  toLocalInputValue,
} from '../../../app/ui/records/clock-time.js';

// Times are built on the local clock so the checks hold in any time zone.
const at = (day: number, hours: number, minutes: number, seconds = 0) =>
  new Date(2026, 2, day, hours, minutes, seconds);

function resolved(text: string, now: Date, reference?: Date): Date {
  const result = resolveClockTime(text, now, reference);
  if (!result.ok) throw new Error(result.message);
  return result.date;
}

describe('typed clock times', () => {
  it('takes a blank time box as now', () => {
    const now = at(10, 14, 30, 12);
    expect(resolved('', now).getTime()).toBe(now.getTime());
  });

  it('places HH:MM on the same day when that is nearest', () => {
    expect(resolved('14:05', at(10, 14, 30)).getTime()).toBe(at(10, 14, 5).getTime());
    expect(resolved('1405', at(10, 14, 30)).getTime()).toBe(at(10, 14, 5).getTime());
    expect(resolved('9:07:30', at(10, 9, 30)).getTime()).toBe(at(10, 9, 7, 30).getTime());
  });

  it('puts a time typed just after midnight for 23:58 on the previous day', () => {
    expect(resolved('23:58', at(11, 0, 5)).getTime()).toBe(at(10, 23, 58).getTime());
  });

  it('refuses a time more than two minutes ahead of now but accepts clock drift within two minutes', () => {
    const now = at(11, 0, 5);
    const ahead = resolveClockTime('00:10', now);
    expect(ahead.ok).toBe(false);
    expect(resolved('00:06', now).getTime()).toBe(at(11, 0, 6).getTime());
  });

  it('refuses text that is not a time of day, with a message to show beside the box', () => {
    for (const text of ['25:00', '12:61', 'noon', '12.30.4']) {
      const result = resolveClockTime(text, at(10, 12, 0));
      expect(result.ok).toBe(false);
      if (!result.ok) expect(result.message).toMatch(/HH:MM/);
    }
  });

  it('places a corrected time nearest the original row, not nearest now, and keeps the original when blank', () => {
    const now = at(11, 10, 0);
    const original = at(10, 22, 0);
    expect(resolved('21:50', now, original).getTime()).toBe(at(10, 21, 50).getTime());
    expect(resolved('', now, original).getTime()).toBe(original.getTime());
  });

  it('formats clock times and elapsed time for the screen', () => {
    expect(clockText(at(10, 7, 4, 9).toISOString())).toBe('07:04:09');
    expect(formatElapsed(0)).toBe('0:00');
    expect(formatElapsed(65_000)).toBe('1:05');
    expect(formatElapsed(3_725_000)).toBe('1:02:05');
    expect(formatElapsed(-5_000)).toBe('0:00');
  });

  it('reads back a datetime-local value it wrote, and refuses a malformed one', () => {
    const start = at(10, 8, 45);
    expect(toLocalInputValue(start)).toBe('2026-03-10T08:45');
    expect(fromLocalInputValue(toLocalInputValue(start))).toBe(start.toISOString());
    expect(fromLocalInputValue('10/03/2026 08:45')).toBeNull();
  });
});
