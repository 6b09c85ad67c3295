import type { z } from 'zod';
import { procedureEntryValuesSchema, type ProcedureEntryValues } from '../../contract/records.js';
import type { EventType } from '../../core/procedure-events.js';
import { describeIssues } from '../../contract/result.js';
import {
  cToF,
  fToC,
  kpaToMmHg,
  mmHgToKpa,
  type PressureUnit,
  type TemperatureUnit,
} from '../../core/units.js';
import type { FieldErrors } from '../common/field-errors.js';
import { fieldErrorsFrom } from '../common/field-errors.js';
import { resolveClockTime } from './clock-time.js';

/** The readings of one row, in the order the keyboard visits them. */
export const readingFields = [
  'vaporPct',
  'oxygenLpm',
  'heartRatePerMin',
  'breathsPerMin',
  'temperatureC',
  'etco2Mmhg',
  'spo2Pct',
] as const;
export type ReadingField = (typeof readingFields)[number];

/** What the person typed: text per box, in the clinic's display units; blank means not measured. */
export type ReadingDraft = Readonly<Record<ReadingField, string>>;

export const emptyReadings: ReadingDraft = {
  vaporPct: '',
  oxygenLpm: '',
  heartRatePerMin: '',
  breathsPerMin: '',
  temperatureC: '',
  etco2Mmhg: '',
  spo2Pct: '',
};

export type DisplayUnits = { readonly temperature: TemperatureUnit; readonly pressure: PressureUnit };

/** Stored values are rounded so that a value typed in either unit reads back as typed. */
const storedDecimals = 2;

function round(value: number, decimals: number): number {
  const scale = 10 ** decimals;
  return Math.round(value * scale) / scale;
}

/** Label with the unit shown on screen for each reading. */
export function readingLabel(
  field: ReadingField,
  units: DisplayUnits,
): { readonly label: string; readonly unit: string } {
  switch (field) {
    case 'vaporPct':
      return { label: 'Vaporiser', unit: '%' };
    case 'oxygenLpm':
      return { label: 'O2', unit: 'L/min' };
    case 'heartRatePerMin':
      return { label: 'HR', unit: '/min' };
    case 'breathsPerMin':
      return { label: 'RR', unit: '/min' };
    case 'temperatureC':
      return { label: 'Temp', unit: units.temperature === 'C' ? '°C' : '°F' };
    case 'etco2Mmhg':
      return { label: 'EtCO2', unit: units.pressure };
    case 'spo2Pct':
      return { label: 'SpO2', unit: '%' };
  }
}

/**
 * A reading typed in display units to the contract's unit (°C, mmHg); other readings pass through.
 * @param value the number typed, any finite number
 */
export function toStoredReading(field: ReadingField, value: number, units: DisplayUnits): number {
  if (field === 'temperatureC' && units.temperature === 'F') return round(fToC(value), storedDecimals);
  if (field === 'etco2Mmhg' && units.pressure === 'kPa') return round(kpaToMmHg(value), storedDecimals);
  return value;
}

/**
 * A stored reading (°C, mmHg) in display units, rounded as a monitor shows it: one decimal for
 * temperature, kPa to two decimals, mmHg whole; other readings unchanged.
 */
export function toDisplayReading(field: ReadingField, value: number, units: DisplayUnits): number {
  if (field === 'temperatureC') return round(units.temperature === 'F' ? cToF(value) : value, 1);
  if (field === 'etco2Mmhg') return units.pressure === 'kPa' ? round(mmHgToKpa(value), 2) : round(value, 1);
  return value;
}

/** Stored values back to typed text, for the correction form. */
export function readingsToDraft(values: ProcedureEntryValues, units: DisplayUnits): ReadingDraft {
  const draft: Record<ReadingField, string> = { ...emptyReadings };
  for (const field of readingFields) {
    const value = values[field];
    draft[field] = value === null ? '' : String(toDisplayReading(field, value, units));
  }
  return draft;
}

/** The lower and upper bound the contract accepts for a reading, in its stored unit. */
export function readingBounds(field: ReadingField): { readonly min: number; readonly max: number } {
  // The bounds live in the contract's schema; read them there so screen and back end cannot drift.
  const outer = procedureEntryValuesSchema.shape[field] as unknown as { unwrap(): { unwrap(): z.ZodNumber } };
  const inner = outer.unwrap().unwrap();
  return { min: inner.minValue ?? Number.NEGATIVE_INFINITY, max: inner.maxValue ?? Number.POSITIVE_INFINITY };
}

function boundsMessage(field: ReadingField, units: DisplayUnits): string | null {
  const converted =
    (field === 'temperatureC' && units.temperature === 'F') ||
    (field === 'etco2Mmhg' && units.pressure === 'kPa');
  if (!converted) return null;
  const { min, max } = readingBounds(field);
  const { label, unit } = readingLabel(field, units);
  return `${label} must be ${toDisplayReading(field, min, units)} to ${toDisplayReading(field, max, units)} ${unit}.`;
}

/** Parses a typed number; accepts a decimal comma as many clinics type it. */
export function parseNumber(text: string): number | null | 'invalid' {
  const trimmed = text.trim().replace(',', '.');
  if (trimmed === '') return null;
  if (!/^[-+]?(\d+\.?\d*|\.\d+)$/.test(trimmed)) return 'invalid';
  return Number(trimmed);
}

export type EntryInput = {
  /** The time box: blank for now (or the original time), or HH:MM or HH:MM:SS on the clinic's clock. */
  readonly timeText: string;
  /** When correcting a row, its original time: a blank box keeps it and HH:MM lands on its day. */
  readonly originalAt?: string;
  readonly readings: ReadingDraft;
  readonly kind: 'vitals' | 'event';
  readonly eventType?: EventType | null;
  readonly eventNote?: string;
  readonly drugName?: string;
  readonly drugDose?: string;
};

export type EntryCheck =
  | { readonly ok: true; readonly values: ProcedureEntryValues }
  | { readonly ok: false; readonly errors: FieldErrors };

/**
 * Turns a typed row into contract values (°C, mmHg) and checks it with the contract's own schema,
 * so that each message can be shown beside its box before anything is sent.
 * @param now the current time, used for a blank time box and to place HH:MM on the right day
 */
export function checkEntry(input: EntryInput, units: DisplayUnits, now: Date): EntryCheck {
  const errors: Record<string, string> = {};
  const at = resolveClockTime(
    input.timeText,
    now,
    input.originalAt === undefined ? now : new Date(input.originalAt),
  );
  if (!at.ok) errors['at'] = at.message;
  const readings: Partial<Record<ReadingField, number | null>> = {};
  for (const field of readingFields) {
    const parsed = parseNumber(input.readings[field]);
    if (parsed === 'invalid') {
      const { label, unit } = readingLabel(field, units);
      errors[field] = `${label} must be a number in ${unit}.`;
      readings[field] = null;
    } else readings[field] = parsed === null ? null : toStoredReading(field, parsed, units);
  }
  const candidate = {
    at: at.ok ? at.iso : (input.originalAt ?? now.toISOString()),
    kind: input.kind,
    ...readings,
    eventType: input.eventType ?? null,
    eventNote: input.eventNote ?? '',
    drugName: input.drugName ?? '',
    drugDose: input.drugDose ?? '',
  };
  const parsed = procedureEntryValuesSchema.safeParse(candidate);
  if (!parsed.success) {
    const fromSchema = fieldErrorsFrom(describeIssues(parsed.error.issues));
    for (const [field, message] of Object.entries(fromSchema)) {
      if (errors[field] !== undefined) continue;
      const converted =
        (readingFields as readonly string[]).includes(field) && message.includes(' to ')
          ? boundsMessage(field as ReadingField, units)
          : null;
      errors[field] = converted ?? message;
    }
  }
  if (Object.keys(errors).length > 0 || !parsed.success) return { ok: false, errors };
  return { ok: true, values: parsed.data };
}

/** One line for a row's readings in display units, e.g. "Vaporiser 2 % · HR 320 /min". */
export function readingsSummary(values: ProcedureEntryValues, units: DisplayUnits): string {
  const parts: string[] = [];
  for (const field of readingFields) {
    const value = values[field];
    if (value === null) continue;
    const { label, unit } = readingLabel(field, units);
    parts.push(`${label} ${toDisplayReading(field, value, units)} ${unit}`);
  }
  return parts.join(' · ');
}
