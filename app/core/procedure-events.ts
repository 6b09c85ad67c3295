/**
 * The kinds of event a procedure record logs, declared once with their plain names. The
 * contract's enum and the screens' labels read this list (the database's CHECK constraint in
 * migration 0002 was written from it and must stay in step: add a kind with a new migration).
 */

export const eventTypes = [
  'induction',
  'intubation',
  'apnoea',
  'ippvOn',
  'ippvOff',
  'vaporiserOff',
  'extubation',
  'regurgitation',
  'drugGiven',
  'note',
  'firstMovement',
  'standing',
] as const;
export type EventType = (typeof eventTypes)[number];

/**
 * Plain names of the event kinds, in the clinic's words, for the screens, the printed record and
 * the CSV export (never the internal codes such as `drugGiven`).
 */
export const eventLabels: Readonly<Record<EventType, string>> = {
  induction: 'Induction',
  intubation: 'Intubation',
  apnoea: 'Apnoea',
  ippvOn: 'IPPV on',
  ippvOff: 'IPPV off',
  vaporiserOff: 'Vaporiser off',
  extubation: 'Extubation',
  regurgitation: 'Regurgitation',
  drugGiven: 'Drug given',
  note: 'Note',
  firstMovement: 'First movement',
  standing: 'Standing / perching',
};

/**
 * The readable name of an event code; an unknown code is shown as it is rather than hidden.
 * @param code an event code such as `drugGiven`
 */
export function eventName(code: string): string {
  return Object.hasOwn(eventLabels, code) ? eventLabels[code as EventType] : code;
}

/**
 * An instant as local ISO 8601 time with its UTC offset, to the second, e.g.
 * `2026-12-01T11:01:00+01:00`: what the clock on the theatre wall showed, and unambiguous.
 * The offset comes in as an argument (this layer reads no clock and no time zone).
 * @param iso an ISO 8601 instant
 * @param offsetMin the local offset from UTC at that instant, minutes, -720 to +840 (east positive)
 * @returns the local time, or the input unchanged when it is not a date
 */
export function localTimeWithOffset(iso: string, offsetMin: number): string {
  const ms = Date.parse(iso);
  if (Number.isNaN(ms)) return iso;
  const local = new Date(ms + offsetMin * 60_000).toISOString().slice(0, 19);
  const sign = offsetMin < 0 ? '-' : '+';
  const hours = String(Math.floor(Math.abs(offsetMin) / 60)).padStart(2, '0');
  const minutes = String(Math.abs(offsetMin) % 60).padStart(2, '0');
  return `${local}${sign}${hours}:${minutes}`;
}
