/**
 * Times typed on the clinic's clock. The person monitoring types what the wall clock or the
 * monitor shows (14:05); the day is the one that puts that time nearest to now, so a reading
 * typed just after midnight for 23:58 lands on the previous day.
 */

/** How far ahead of now a typed time may be: clocks in a theatre disagree by a minute or two. */
export const futureToleranceMs = 2 * 60_000;

export type ClockTimeResult =
  | { readonly ok: true; readonly iso: string; readonly date: Date }
  | { readonly ok: false; readonly message: string };

/**
 * Resolves a typed time of day to an instant.
 * @param text blank for the reference time; `HH:MM`, `HH:MM:SS`, `HHMM` or `H:MM` in 24-hour time
 * @param now the current instant: a time more than two minutes after it is refused
 * @param reference the instant the typed time is placed nearest to (now for a new row, the
 *   original time when a row is corrected)
 */
export function resolveClockTime(text: string, now: Date, reference: Date = now): ClockTimeResult {
  const trimmed = text.trim();
  if (trimmed === '') return { ok: true, iso: reference.toISOString(), date: reference };
  const match = /^(\d{1,2}):?(\d{2})(?::(\d{2}))?$/.exec(trimmed);
  if (match === null)
    return { ok: false, message: 'Type the time as HH:MM (24-hour), or leave it blank for now.' };
  const hours = Number(match[1]);
  const minutes = Number(match[2]);
  const seconds = match[3] === undefined ? 0 : Number(match[3]);
  if (hours > 23 || minutes > 59 || seconds > 59)
    return { ok: false, message: 'That is not a time of day; type HH:MM from 00:00 to 23:59.' };
  const candidates = [-1, 0, 1].map(
    (offset) =>
      new Date(
        reference.getFullYear(),
        reference.getMonth(),
        reference.getDate() + offset,
        hours,
        minutes,
        seconds,
      ),
  );
  let best = candidates[1] as Date;
  for (const candidate of candidates)
    if (Math.abs(candidate.getTime() - reference.getTime()) < Math.abs(best.getTime() - reference.getTime()))
      best = candidate;
  if (best.getTime() - now.getTime() > futureToleranceMs)
    return { ok: false, message: 'That time is still to come; type the time the reading was taken.' };
  return { ok: true, iso: best.toISOString(), date: best };
}

/** `HH:MM:SS` on the clinic's clock, for tables. */
export function clockText(iso: string): string {
  const date = new Date(iso);
  return [date.getHours(), date.getMinutes(), date.getSeconds()]
    .map((part) => String(part).padStart(2, '0'))
    .join(':');
}

/** `HH:MM` on the clinic's clock, for the time box. */
export function clockMinutesText(date: Date): string {
  return [date.getHours(), date.getMinutes()].map((part) => String(part).padStart(2, '0')).join(':');
}

/**
 * Elapsed time as H:MM:SS (or M:SS under an hour), for the header clock.
 * @param elapsedMs milliseconds, negative shown as 0:00
 */
export function formatElapsed(elapsedMs: number): string {
  const totalSeconds = Math.max(0, Math.floor(elapsedMs / 1000));
  const hours = Math.floor(totalSeconds / 3600);
  const minutes = Math.floor((totalSeconds % 3600) / 60);
  const seconds = totalSeconds % 60;
  const mmss = `${String(minutes).padStart(hours > 0 ? 2 : 1, '0')}:${String(seconds).padStart(2, '0')}`;
  return hours > 0 ? `${hours}:${mmss}` : mmss;
}

/**
 * A `datetime-local` input value (local clock, minutes) for an instant, and back.
 */
export function toLocalInputValue(date: Date): string {
  const pad = (value: number) => String(value).padStart(2, '0');
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}T${pad(date.getHours())}:${pad(date.getMinutes())}`;
}

/** Parses a `datetime-local` value on the local clock to an ISO instant, or null when malformed. */
export function fromLocalInputValue(value: string): string | null {
  const match = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/.exec(value);
  if (match === null) return null;
  const [, year, month, day, hours, minutes, seconds] = match;
  const date = new Date(
    Number(year),
    Number(month) - 1,
    Number(day),
    Number(hours),
    Number(minutes),
    Number(seconds ?? 0),
  );
  return Number.isNaN(date.getTime()) ? null : date.toISOString();
}
