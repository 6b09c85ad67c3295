/**
 * Rows of an invented record's log, as the model reads them (`LoggedEntry`), placed by minutes
 * from an invented start. For the evidence tests that build logs by hand.
 */
import type { LoggedEntry } from '../../app/core/evidence/record-log.js';

/** The invented record's start (ms since the epoch). */
export const logStartMs = Date.parse('2026-03-02T09:00:00Z');

/** The time `minutes` after the invented start (ms since the epoch). */
export const at = (minutes: number): number => logStartMs + minutes * 60_000;

/** A vitals row at `minutes`, nothing measured but what `values` gives. */
export const row = (minutes: number, values: Partial<LoggedEntry>): LoggedEntry => ({
  atMs: at(minutes),
  kind: 'vitals',
  vaporPct: null,
  oxygenLpm: null,
  heartRatePerMin: null,
  breathsPerMin: null,
  eventType: null,
  ...values,
});

/** An event row at `minutes`. */
export const event = (minutes: number, eventType: LoggedEntry['eventType']): LoggedEntry =>
  row(minutes, { kind: 'event', eventType });
