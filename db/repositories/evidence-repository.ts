import type { Generated } from 'kysely';
import type { Sql } from '../clinic-db.js';

type Meta = { enteredBy: string; reason: string };

export type Exclusion = {
  readonly recordId: number;
  readonly excluded: boolean;
  readonly reason: string;
  readonly enteredAt: string;
  readonly enteredBy: string;
};

export type CalibrationSwitch = {
  readonly on: boolean;
  readonly enteredAt: string | null;
  readonly enteredBy: string | null;
  readonly reason: string;
};

type EvidenceExclusionsTable = {
  id: Generated<number>;
  record_id: number;
  excluded: number;
  reason: string;
  entered_at: string;
  entered_by: string;
};

type EvidenceCalibrationSwitchTable = {
  id: Generated<number>;
  calibration_on: number;
  reason: string;
  entered_at: string;
  entered_by: string;
};

/** The columns of the record tables the fingerprints read (those tables' own modules write them). */
type FingerprintTables = {
  procedure_records: { id: number; patient_id: number };
  procedure_record_versions: { id: number; record_id: number; ended_at: string | null };
  procedure_entries: { id: number; record_id: number };
  weights: { id: number; patient_id: number };
  patient_versions: { id: number; patient_id: number };
};

type Tables = FingerprintTables & {
  evidence_exclusions: EvidenceExclusionsTable;
  evidence_calibration_switch: EvidenceCalibrationSwitchTable;
};

/**
 * All SQL for evidence_exclusions and evidence_calibration_switch (new rows only; the newest
 * decides), and the records' fingerprints the clinic view's stored rows are keyed by. Works on
 * SQLite and PostgreSQL alike.
 */
export function createEvidenceRepository(sql: Sql) {
  const db = sql.kysely.withTables<Tables>();

  return {
    /** Leaves a record out of the calibration (or takes it back in); one insert. */
    async setExcluded(recordId: number, excluded: boolean, meta: Meta, at: Date): Promise<Exclusion> {
      await db
        .insertInto('evidence_exclusions')
        .values({
          record_id: recordId,
          excluded: excluded ? 1 : 0,
          reason: meta.reason,
          entered_at: at.toISOString(),
          entered_by: meta.enteredBy,
        })
        .execute();
      return {
        recordId,
        excluded,
        reason: meta.reason,
        enteredAt: at.toISOString(),
        enteredBy: meta.enteredBy,
      };
    },
    /** The newest decision per record that has one (one query). */
    async exclusions(): Promise<Map<number, Exclusion>> {
      const rows = await db
        .selectFrom('evidence_exclusions as e')
        .selectAll('e')
        .where('e.id', '=', (eb) =>
          eb
            .selectFrom('evidence_exclusions as later')
            .select((inner) => inner.fn.max('later.id').as('newest'))
            .whereRef('later.record_id', '=', 'e.record_id'),
        )
        .execute();
      return new Map(
        rows.map((row) => [
          row.record_id,
          {
            recordId: row.record_id,
            excluded: row.excluded === 1,
            reason: row.reason,
            enteredAt: row.entered_at,
            enteredBy: row.entered_by,
          },
        ]),
      );
    },
    /**
     * For every record, what its evidence depends on (newest record version, entries, weights,
     * patient version: rows are only ever added, so the newest ids change with every write),
     * and whether it has ended. One query, so an unchanged clinic is checked without reading it;
     * `only` narrows it to some records or one patient's.
     */
    async recordFingerprints(
      only: { readonly recordIds?: readonly number[]; readonly patientId?: number } = {},
    ): Promise<{ recordId: number; ended: boolean; key: string }[]> {
      if (only.recordIds !== undefined && only.recordIds.length === 0) return [];
      const rows = await db
        .selectFrom('procedure_records as r')
        .$if(only.recordIds !== undefined, (query) => query.where('r.id', 'in', only.recordIds ?? []))
        .$if(only.patientId !== undefined, (query) => query.where('r.patient_id', '=', only.patientId ?? 0))
        .innerJoin('procedure_record_versions as v', (join) =>
          join.on((eb) =>
            eb(
              'v.id',
              '=',
              eb
                .selectFrom('procedure_record_versions as newest')
                .select((inner) => inner.fn.max('newest.id').as('id'))
                .whereRef('newest.record_id', '=', 'r.id'),
            ),
          ),
        )
        .select((eb) => [
          'r.id as record_id',
          'v.id as version_id',
          'v.ended_at',
          eb
            .selectFrom('procedure_entries as e')
            .select((inner) => inner.fn.countAll().as('count'))
            .whereRef('e.record_id', '=', 'r.id')
            .as('entry_count'),
          eb
            .selectFrom('procedure_entries as e')
            .select((inner) => inner.fn.max('e.id').as('id'))
            .whereRef('e.record_id', '=', 'r.id')
            .as('entry_id'),
          eb
            .selectFrom('weights as w')
            .select((inner) => inner.fn.max('w.id').as('id'))
            .whereRef('w.patient_id', '=', 'r.patient_id')
            .as('weight_id'),
          eb
            .selectFrom('patient_versions as p')
            .select((inner) => inner.fn.max('p.id').as('id'))
            .whereRef('p.patient_id', '=', 'r.patient_id')
            .as('patient_version_id'),
        ])
        .execute();
      // The key keeps the format the stored rows were keyed with before (count:newest entry id).
      return rows.map((row) => ({
        recordId: row.record_id,
        ended: row.ended_at !== null,
        key: `${row.version_id}|${Number(row.entry_count ?? 0)}:${row.entry_id ?? 0}|${String(row.weight_id ?? null)}|${String(row.patient_version_id ?? null)}`,
      }));
    },
    async calibrationSwitch(): Promise<CalibrationSwitch> {
      const row = await db
        .selectFrom('evidence_calibration_switch')
        .selectAll()
        .orderBy('id', 'desc')
        .limit(1)
        .executeTakeFirst();
      return row === undefined
        ? { on: true, enteredAt: null, enteredBy: null, reason: '' }
        : {
            on: row.calibration_on === 1,
            enteredAt: row.entered_at,
            enteredBy: row.entered_by,
            reason: row.reason,
          };
    },
    async setCalibration(on: boolean, meta: Meta, at: Date): Promise<CalibrationSwitch> {
      await db
        .insertInto('evidence_calibration_switch')
        .values({
          calibration_on: on ? 1 : 0,
          reason: meta.reason,
          entered_at: at.toISOString(),
          entered_by: meta.enteredBy,
        })
        .execute();
      return { on, enteredAt: at.toISOString(), enteredBy: meta.enteredBy, reason: meta.reason };
    },
  };
}

export type EvidenceRepository = ReturnType<typeof createEvidenceRepository>;
