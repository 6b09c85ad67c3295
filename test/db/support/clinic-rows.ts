import type { Generated } from 'kysely';
import type { ProcedureEntryValues, ProcedureRecordValues } from '../../../app/contract/records.js';
import type { Sql } from '../../../db/clinic-db.js';

/**
 * Rows a record-repository test needs from tables other repositories own, written with the
 * shared query layer so the same fixture serves SQLite and PostgreSQL.
 */
type Tables = {
  patients: { id: Generated<number>; created_at: string };
  workstations: { id: string; name: string; theme: string; initials: string; updated_at: string };
};

const tables = (db: Sql) => db.kysely.withTables<Tables>();

/** A patient row (no versions: the record tables only need its id). */
export async function insertPatient(db: Sql, createdAt = '2026-12-01T08:00:00.000Z'): Promise<number> {
  const row = await tables(db)
    .insertInto('patients')
    .values({ created_at: createdAt })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

/** A workstation's settings row, as Settings saves it. */
export async function insertWorkstation(db: Sql, id: string, name: string): Promise<void> {
  await tables(db)
    .insertInto('workstations')
    .values({ id, name, theme: 'system', initials: '', updated_at: '2026-12-01T08:00:00.000Z' })
    .execute();
}

/** Renames a workstation (Settings replaces its row). */
export async function renameWorkstation(db: Sql, id: string, name: string): Promise<void> {
  await tables(db).updateTable('workstations').set({ name }).where('id', '=', id).execute();
}

/** A crop biopsy under mask, started 08:30 UTC on 2026-12-01 (invented). */
export const cropBiopsy: ProcedureRecordValues = {
  planId: null,
  startedAt: '2026-12-01T08:30:00.000Z',
  endedAt: null,
  asaGrade: 2,
  emergency: false,
  procedureName: 'Crop biopsy',
  fasting: '1 h',
  cropChecked: 'empty',
  airway: 'mask',
  tubeSizeMm: null,
  tubeType: '',
  circuit: 'nonRebreathing',
  agent: 'isoflurane',
  staffInitials: 'RW',
  promptIntervalMin: 5,
};

const blank = {
  vaporPct: null,
  oxygenLpm: null,
  heartRatePerMin: null,
  breathsPerMin: null,
  temperatureC: null,
  etco2Mmhg: null,
  spo2Pct: null,
  eventType: null,
  eventNote: '',
  drugName: '',
  drugDose: '',
} as const;

/** A vitals row at `at` with the readings given. */
export function vitalsAt(at: string, readings: Partial<ProcedureEntryValues> = {}): ProcedureEntryValues {
  return { ...blank, at, kind: 'vitals', ...readings };
}

/** An event row at `at`. */
export function eventAt(
  at: string,
  eventType: NonNullable<ProcedureEntryValues['eventType']>,
): ProcedureEntryValues {
  return { ...blank, at, kind: 'event', eventType };
}
