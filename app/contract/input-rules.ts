/**
 * Input rules shared by every schema of the contract: one helper per rule, so that a name, a
 * date or a body mass is checked the same way on every channel and in every form, and each
 * message names the field and says what to do.
 *
 * Rules that need today's date (a hatch date in the future, a weighing more than a year ago)
 * take `today` as an argument: the contract never reads the clock. The back end passes its own
 * clock's date and reports a field error; the screens pass theirs to warn before sending.
 */
import { z } from 'zod';
import { agentLabels, type AgentId } from '../core/agents.js';

// Text --------------------------------------------------------------------------------------------

/**
 * True for C0 controls (U+0000-U+001F), DEL and C1 controls (U+007F-U+009F); tab, line feed and
 * carriage return pass when `multiLine` (notes keep their lines). A loop over char codes, because
 * a regular expression of control characters is itself unreadable.
 */
function hasControlCharacter(text: string, multiLine: boolean): boolean {
  for (let index = 0; index < text.length; index += 1) {
    const code = text.charCodeAt(index);
    const isControl = code <= 0x1f || (code >= 0x7f && code <= 0x9f);
    if (isControl && !(multiLine && (code === 0x09 || code === 0x0a || code === 0x0d))) return true;
  }
  return false;
}
/** Bidirectional embeddings, overrides and isolates, which reorder what a screen or printout shows. */
const bidiControl = /[\u202A-\u202E\u2066-\u2069]/;
/** A UTF-16 surrogate without its partner: not a character at all. */
const loneSurrogate = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;
/** A visible letter or digit in any script. */
const letterOrDigit = /[\p{L}\p{N}]/u;

/**
 * Why a text may not be stored, or null when it may. Names the field (`what`) and says what to do.
 * @param multiLine true for notes, where tab and line breaks are part of the text
 */
export function hiddenCharacterProblem(what: string, text: string, multiLine = false): string | null {
  if (hasControlCharacter(text, multiLine))
    return `${what} contains a control character (an invisible code that can disturb screens and printouts); retype it instead of pasting it.`;
  if (bidiControl.test(text))
    return `${what} contains a hidden text-direction character that changes how it is shown; retype it instead of pasting it.`;
  if (loneSurrogate.test(text))
    return `${what} contains a broken character (half of an emoji or symbol); retype it.`;
  return null;
}

/** True when the text holds at least one visible letter or digit (any script). */
export function hasLetterOrDigit(text: string): boolean {
  return letterOrDigit.test(text);
}

type TextOptions = {
  /** Longest text kept, in UTF-16 code units. */
  readonly max: number;
  /** Message when the field is left blank. */
  readonly blank?: string;
  /** Notes keep tab and line breaks. */
  readonly multiLine?: boolean;
};

function checkedText(what: string, options: TextOptions & { readonly needsLetter: boolean }) {
  return z
    .string({ error: `${what} must be text.` })
    .trim()
    .max(options.max, { error: `${what} must be at most ${String(options.max)} characters.` })
    .superRefine((text, context) => {
      const hidden = hiddenCharacterProblem(what, text, options.multiLine === true);
      if (hidden !== null) context.addIssue({ code: 'custom', message: hidden });
      else if (options.needsLetter && text !== '' && !hasLetterOrDigit(text))
        context.addIssue({
          code: 'custom',
          message: `${what} must contain at least one letter or digit; spaces and invisible characters alone do not identify anything.`,
        });
    });
}

/**
 * A required text that names or attributes (initials, a bird's name, a species' name, a source):
 * trimmed, at least one visible letter or digit, no control, text-direction or broken characters.
 */
export function namingText(what: string, options: TextOptions) {
  const blank = options.blank ?? `Enter ${what.toLowerCase()}.`;
  return checkedText(what, { ...options, needsLetter: true }).refine((text) => text !== '', {
    error: blank,
    // A blank field gets only this message, not the one about letters as well.
    abort: true,
  });
}

/** An optional naming text (ring ID, owner reference): blank, or as `namingText`. Defaults to ''. */
export function optionalNamingText(what: string, options: TextOptions) {
  return checkedText(what, { ...options, needsLetter: true }).default('');
}

/** Text without control, text-direction or broken characters; may be blank; no default. */
export function textWithoutHiddenCharacters(what: string, options: TextOptions) {
  return checkedText(what, { ...options, needsLetter: false });
}

/** Free text (notes, address, dose): no control, text-direction or broken characters. Defaults to ''. */
export function freeText(what: string, options: TextOptions) {
  return checkedText(what, { ...options, needsLetter: false }).default('');
}

// Dates -------------------------------------------------------------------------------------------

/** Earliest and latest year any date in the clinic's records may carry. */
export const earliestYear = 1900;
export const latestYear = 2100;

/** Days from today a weighing or planned date may lie without a reason (a year, leap day included). */
export const recentDateWindowDays = 366;

function yearOf(text: string): number {
  return Number(text.slice(0, 4));
}

/**
 * A calendar date as YYYY-MM-DD: 2023-02-30, 2024-13-45 and 0000-00-00 are refused, and so is
 * any year outside 1900 to 2100.
 */
export function calendarDate(what: string) {
  return z.iso
    .date({
      error: (issue) =>
        typeof issue.input === 'string'
          ? `${what} "${issue.input}" is not a date on the calendar; enter it as YYYY-MM-DD, e.g. 2024-03-15.`
          : `${what} must be a date as YYYY-MM-DD.`,
    })
    .refine((text) => yearOf(text) >= earliestYear && yearOf(text) <= latestYear, {
      error: `${what} must lie between ${String(earliestYear)} and ${String(latestYear)}; check the year.`,
    });
}

/**
 * A date and time with its offset (ISO 8601, e.g. 2024-03-15T09:30:00.000Z), calendar-checked and
 * between 1900 and 2100.
 */
export function calendarDateTime(what: string) {
  return z.iso
    .datetime({
      offset: true,
      error: `${what} must be a real date and time, e.g. 2024-03-15T09:30:00Z.`,
    })
    .refine((text) => yearOf(text) >= earliestYear && yearOf(text) <= latestYear, {
      error: `${what} must lie between ${String(earliestYear)} and ${String(latestYear)}; check the year.`,
    });
}

/** The date (YYYY-MM-DD) of a moment on the clock of the computer running this code. */
export function localDateOf(moment: Date): string {
  const pad = (value: number) => String(value).padStart(2, '0');
  return `${String(moment.getFullYear()).padStart(4, '0')}-${pad(moment.getMonth() + 1)}-${pad(moment.getDate())}`;
}

/** A YYYY-MM-DD date moved by whole days (negative for earlier). */
export function addDays(date: string, days: number): string {
  const moved = new Date(`${date}T00:00:00Z`);
  moved.setUTCDate(moved.getUTCDate() + days);
  return moved.toISOString().slice(0, 10);
}

/**
 * Why a hatch date cannot be kept given today's date (YYYY-MM-DD), or null. A bird cannot hatch
 * after today; the year bounds are the schema's.
 */
export function hatchDateProblem(hatchDate: string | null, today: string): string | null {
  if (hatchDate === null || hatchDate <= today) return null;
  return `Hatch date ${hatchDate} is after today (${today}); enter the date the bird hatched, or leave it blank and give the age.`;
}

/**
 * Why a weighing date cannot be kept, or null. A weighing cannot be after today; one more than a
 * year ago is kept only when a reason is given (a correction always has one), e.g. a weight copied
 * from an old paper record.
 */
export function weighingDateProblem(weighedOn: string, today: string, reasonGiven: boolean): string | null {
  if (weighedOn > today)
    return `Weighing date ${weighedOn} is after today (${today}); enter the day the bird was weighed.`;
  if (!reasonGiven && weighedOn < addDays(today, -recentDateWindowDays))
    return `Weighing date ${weighedOn} is more than a year ago; check the year, or give a reason (e.g. copied from a paper record) to keep it.`;
  return null;
}

/**
 * Why a planned date cannot be kept, or null: more than a year before or after today needs a
 * reason (a correction always has one).
 */
export function plannedDateProblem(plannedFor: string, today: string, reasonGiven: boolean): string | null {
  if (reasonGiven) return null;
  if (plannedFor < addDays(today, -recentDateWindowDays))
    return `Planned date ${plannedFor} is more than a year ago; check the year, or give a reason to keep it.`;
  if (plannedFor > addDays(today, recentDateWindowDays))
    return `Planned date ${plannedFor} is more than a year ahead; check the year, or give a reason to keep it.`;
  return null;
}

// Procedure times ---------------------------------------------------------------------------------

/** Entries may be timed up to this long before the record's start: baseline readings before induction. */
export const entryEarlyToleranceMin = 60;
/**
 * Entries may be timed up to this long after the record's end: recovery events (first movement,
 * standing) are often noted after the anaesthetic has ended (assumption: recovery within 6 h).
 */
export const entryLateToleranceMin = 360;
/** Slack for a clock a little ahead of another: an entry may be this far ahead of the back end's clock. */
export const clockSlackMin = 5;

const minuteMs = 60_000;

/**
 * Why an entry's time does not fit its record, or null. Accepted from 60 min before the start to
 * 6 h after the end; while the record is open, not later than the clock (with 5 min slack).
 * @param at the entry's time (ISO 8601)
 * @param record the record's start and end (ISO 8601; end null while it runs)
 * @param now the back end's or the screen's clock
 */
export function entryTimeProblem(
  at: string,
  record: { readonly startedAt: string; readonly endedAt: string | null },
  now: Date,
): string | null {
  const atMs = Date.parse(at);
  const startMs = Date.parse(record.startedAt);
  if (atMs < startMs - entryEarlyToleranceMin * minuteMs)
    return `Time ${at} is more than ${String(entryEarlyToleranceMin)} min before the procedure started (${record.startedAt}); check the time and the day.`;
  if (record.endedAt !== null) {
    const endMs = Date.parse(record.endedAt);
    if (atMs > endMs + entryLateToleranceMin * minuteMs)
      return `Time ${at} is more than ${String(entryLateToleranceMin / 60)} h after the procedure ended (${record.endedAt}); check the time and the day.`;
  } else if (atMs > now.getTime() + clockSlackMin * minuteMs)
    return `Time ${at} is in the future; enter the time the reading was taken.`;
  return null;
}

// Procedure agent -------------------------------------------------------------------------------

/**
 * Why a correction's agent cannot stand, or null. A record that names its agent may have it
 * corrected to another agent, never removed: the log's dial readings mean nothing without it. A
 * record that never named one (made before records carried an agent) may stay without.
 * @param recorded the agent of the version being corrected (null: not recorded)
 * @param next the agent the correction gives
 */
export function recordAgentProblem(recorded: AgentId | null, next: AgentId | null): string | null {
  if (recorded === null || next !== null) return null;
  return `The record names ${agentLabels[recorded]} as the agent given; choose the agent given (a recorded agent can be corrected, not removed).`;
}

// Body mass ---------------------------------------------------------------------------------------

/** Lightest and heaviest body mass Tidewing keeps (g): a hummingbird's egg-sized chick to an ostrich. */
export const bodyMassMinG = 0.5;
export const bodyMassMaxG = 200_000;

/** A bird's body mass in grams, 0.5 g to 200 kg, finite. */
export function bodyMassG(what: string) {
  const range = `${what} must be between ${String(bodyMassMinG)} g and ${String(bodyMassMaxG)} g (200 kg); check the scale and the unit.`;
  return z
    .number({
      error: (issue) =>
        issue.input === undefined || issue.input === null
          ? `Enter the ${what.toLowerCase()} in grams.`
          : `${what} must be a number in grams.`,
    })
    .min(bodyMassMinG, { error: range })
    .max(bodyMassMaxG, { error: range });
}
