/**
 * A procedure record as CSV (RFC 4180): one row per logged time point or event, with units in
 * the headers, local times with their UTC offset and events by their readable names. Each row
 * names the record's agent (blank when the record does not say: records made before records
 * carried one) and the workstation that wrote the row (blank when unknown). Text cells that a
 * spreadsheet would run as a formula are prefixed with an apostrophe.
 */
import type { AgentId } from './agents.js';
import { eventName, localTimeWithOffset } from './procedure-events.js';

export type CsvEntry = {
  readonly at: string;
  readonly kind: 'vitals' | 'event';
  readonly vaporPct: number | null;
  readonly oxygenLpm: number | null;
  readonly heartRatePerMin: number | null;
  readonly breathsPerMin: number | null;
  readonly temperatureC: number | null;
  readonly etco2Mmhg: number | null;
  readonly spo2Pct: number | null;
  readonly eventType: string | null;
  readonly eventNote: string;
  readonly drugName: string;
  readonly drugDose: string;
  readonly enteredBy: string;
  readonly enteredAt: string;
  readonly corrected: boolean;
  /** The current name of the workstation that wrote the row; null when unknown (older rows). */
  readonly workstationName: string | null;
};

export const procedureCsvHeaders = [
  'time (local, with UTC offset)',
  'minutes from start',
  'kind',
  'agent',
  'vaporiser (%)',
  'oxygen (L/min)',
  'heart rate (/min)',
  'breathing rate (/min)',
  'temperature (C)',
  'EtCO2 (mmHg)',
  'SpO2 (%, trend only in birds)',
  'event',
  'note',
  'drug',
  'dose (entered by the clinic)',
  'entered by',
  'workstation',
  'entered at (local, with UTC offset)',
  'corrected',
] as const;

function cell(value: string | number | null): string {
  if (value === null) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  const guarded = /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
  return /[",\r\n]/.test(guarded) ? `"${guarded.replace(/"/g, '""')}"` : guarded;
}

/** Minutes between two ISO times, one decimal. */
function minutesBetween(startIso: string, atIso: string): number {
  return Math.round((Date.parse(atIso) - Date.parse(startIso)) / 6000) / 10;
}

/**
 * CSV text for a procedure record. `title` lines (patient, species, procedure) come first as
 * comment-free key,value rows so the file stands on its own.
 * @param input.utcOffsetMinAt the local offset from UTC at an instant, minutes (east positive);
 *   the caller reads the time zone, so that this stays a plain function
 */
export function procedureCsv(input: {
  readonly startedAt: string;
  readonly title: readonly (readonly [string, string])[];
  /** The record's agent; null when the record does not name one. */
  readonly agent: AgentId | null;
  readonly entries: readonly CsvEntry[];
  readonly utcOffsetMinAt: (iso: string) => number;
}): string {
  const local = (iso: string) => localTimeWithOffset(iso, input.utcOffsetMinAt(iso));
  const lines: string[] = [];
  for (const [key, value] of input.title) lines.push(`${cell(key)},${cell(value)}`);
  lines.push('');
  lines.push(procedureCsvHeaders.map(cell).join(','));
  const sorted = [...input.entries].sort((a, b) => a.at.localeCompare(b.at));
  for (const entry of sorted) {
    lines.push(
      [
        local(entry.at),
        minutesBetween(input.startedAt, entry.at),
        entry.kind,
        input.agent,
        entry.vaporPct,
        entry.oxygenLpm,
        entry.heartRatePerMin,
        entry.breathsPerMin,
        entry.temperatureC,
        entry.etco2Mmhg,
        entry.spo2Pct,
        entry.eventType === null ? '' : eventName(entry.eventType),
        entry.eventNote,
        entry.drugName,
        entry.drugDose,
        entry.enteredBy,
        entry.workstationName,
        local(entry.enteredAt),
        entry.corrected ? 'yes' : 'no',
      ]
        .map(cell)
        .join(','),
    );
  }
  return `${lines.join('\r\n')}\r\n`;
}

/** One RFC 4180 cell, formula-guarded, for the other CSV exports. */
export { cell as csvCell };
