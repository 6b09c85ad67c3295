import { defaultDateFormat, formatCalendarDate, type DateFormat } from '../../core/date-format.js';
import { basisText, readBasis } from '../../core/sourced.js';

/** Mass as the clinic reads it (written once in app/core/units.ts, also for the back end's texts). */
export { displayMass } from '../../core/units.js';

/**
 * The clinic's date format, set where the settings arrive (the app's root, the printed sheet), so
 * that every date on a screen or sheet is written one way.
 */
let clinicDateFormat: DateFormat = defaultDateFormat;

/** Makes `format` (or the default, when the clinic has not chosen) the format of every date shown. */
export function setClinicDateFormat(format: DateFormat | undefined): void {
  clinicDateFormat = format ?? defaultDateFormat;
}

/** A calendar date (YYYY-MM-DD) in the clinic's format. */
export function displayDate(isoDate: string): string {
  return formatCalendarDate(isoDate, clinicDateFormat);
}

/** The local time of a moment, 24-hour ("08:05"). */
function localTime(date: Date): string {
  return `${String(date.getHours()).padStart(2, '0')}:${String(date.getMinutes()).padStart(2, '0')}`;
}

/**
 * Local date in the clinic's format and the local time (24-hour), for record stamps and the
 * "printed" line of the worksheet and the printed record; text that is not a moment is returned as it is.
 */
export function displayDateTime(moment: string | Date): string {
  const date = new Date(moment);
  if (Number.isNaN(date.getTime())) return typeof moment === 'string' ? moment : 'unknown time';
  return `${displayDate(todayIso(date))} ${localTime(date)}`;
}

/**
 * A later moment beside an earlier one already shown (a procedure's end beside its start): the
 * local time alone on the same local day, else the date in the clinic's format and the time.
 */
export function displayLaterTime(earlierIso: string, laterIso: string): string {
  const earlier = new Date(earlierIso);
  const later = new Date(laterIso);
  if (Number.isNaN(later.getTime())) return laterIso;
  const sameDay = !Number.isNaN(earlier.getTime()) && todayIso(earlier) === todayIso(later);
  return sameDay ? localTime(later) : displayDateTime(later);
}

/** Today as YYYY-MM-DD in local time. */
export function todayIso(now: Date = new Date()): string {
  const local = new Date(now.getTime() - now.getTimezoneOffset() * 60_000);
  return local.toISOString().slice(0, 10);
}

/**
 * A stored basis ("Typical adult mass [from memory]") in plain words for the clinic: "Typical adult
 * mass (unverified value)". Never shows the stored tag.
 */
export function displayBasis(stored: string): string {
  return plainBasis(basisText(readBasis(stored)));
}

/**
 * A basis written by the program (an estimate's, the MAC's) with "from memory" said as the clinic
 * reads it: "unverified value" (the primary source was not read here; check before relying on it).
 */
export function plainBasis(basis: string): string {
  return basis.replace(/\bfrom memory\b/gi, 'unverified value');
}
