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

/** Plain names of the event kinds, as the live record, the log and the export show them. */
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
