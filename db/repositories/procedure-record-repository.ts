import type { Generated, Selectable } from 'kysely';
import type { ProcedureRecord, ProcedureRecordValues } from '../../app/contract/records.js';
import { writeTransaction, type Sql } from '../clinic-db.js';
import { chainIds, stampOf } from './version-chain.js';

type ProcedureRecordsTable = { id: Generated<number>; patient_id: number; created_at: string };

type ProcedureRecordVersionsTable = {
  id: Generated<number>;
  record_id: number;
  corrects_id: number | null;
  plan_id: number | null;
  started_at: string;
  ended_at: string | null;
  asa_grade: number | null;
  emergency: number;
  procedure_name: string;
  fasting: string;
  crop_checked: ProcedureRecordValues['cropChecked'];
  airway: ProcedureRecordValues['airway'];
  tube_size_mm: number | null;
  tube_type: ProcedureRecordValues['tubeType'];
  circuit: ProcedureRecordValues['circuit'];
  /** Migration 12; null on records made before it (never guessed). */
  agent: ProcedureRecordValues['agent'];
  staff_initials: string;
  prompt_interval_min: number;
  entered_at: string;
  entered_by: string;
  reason: string;
};

type Tables = {
  procedure_records: ProcedureRecordsTable;
  procedure_record_versions: ProcedureRecordVersionsTable;
};

type RecordVersionRow = Selectable<ProcedureRecordVersionsTable> & { patient_id: number };

type Meta = { enteredBy: string; reason: string };

/** A correction named a version of another record (or none that exists). */
export class RecordVersionMismatchError extends Error {}

function rowToRecord(row: RecordVersionRow): ProcedureRecord {
  return {
    id: row.record_id,
    patientId: row.patient_id,
    values: {
      planId: row.plan_id,
      startedAt: row.started_at,
      endedAt: row.ended_at,
      asaGrade: row.asa_grade,
      emergency: row.emergency === 1,
      procedureName: row.procedure_name,
      fasting: row.fasting,
      cropChecked: row.crop_checked,
      airway: row.airway,
      tubeSizeMm: row.tube_size_mm,
      tubeType: row.tube_type,
      circuit: row.circuit,
      agent: row.agent,
      staffInitials: row.staff_initials,
      promptIntervalMin: row.prompt_interval_min,
    },
    stamp: stampOf(row),
  };
}

/** All SQL for procedure_records and procedure_record_versions. */
export function createProcedureRecordRepository(sql: Sql) {
  const db = sql.kysely.withTables<Tables>();

  /** Each record version joined with its record's patient. */
  const versions = (from = db) =>
    from
      .selectFrom('procedure_record_versions as v')
      .innerJoin('procedure_records as r', 'r.id', 'v.record_id')
      .selectAll('v')
      .select('r.patient_id');

  /** Only the versions nothing corrects: each record's current details. */
  const currentVersions = (from = db) =>
    versions(from).where(({ not, exists, selectFrom }) =>
      not(
        exists(
          selectFrom('procedure_record_versions as later')
            .select('later.id')
            .whereRef('later.corrects_id', '=', 'v.id'),
        ),
      ),
    );

  async function current(recordId: number, from = db): Promise<RecordVersionRow | undefined> {
    return currentVersions(from).where('v.record_id', '=', recordId).executeTakeFirst();
  }

  async function insertVersion(
    tx: Sql,
    recordId: number,
    correctsId: number | null,
    values: ProcedureRecordValues,
    meta: Meta,
    at: Date,
  ): Promise<void> {
    await tx.kysely
      .withTables<Tables>()
      .insertInto('procedure_record_versions')
      .values({
        record_id: recordId,
        corrects_id: correctsId,
        plan_id: values.planId,
        started_at: values.startedAt,
        ended_at: values.endedAt,
        asa_grade: values.asaGrade,
        emergency: values.emergency ? 1 : 0,
        procedure_name: values.procedureName,
        fasting: values.fasting,
        crop_checked: values.cropChecked,
        airway: values.airway,
        tube_size_mm: values.tubeSizeMm,
        tube_type: values.tubeType,
        circuit: values.circuit,
        agent: values.agent,
        staff_initials: values.staffInitials,
        prompt_interval_min: values.promptIntervalMin,
        entered_at: at.toISOString(),
        entered_by: meta.enteredBy,
        reason: meta.reason,
      })
      .execute();
  }

  return {
    async create(
      patientId: number,
      values: ProcedureRecordValues,
      meta: Meta,
      at: Date,
    ): Promise<ProcedureRecord> {
      return writeTransaction(sql, async (tx) => {
        const inserted = await tx.kysely
          .withTables<Tables>()
          .insertInto('procedure_records')
          .values({ patient_id: patientId, created_at: at.toISOString() })
          .returning('id')
          .executeTakeFirstOrThrow();
        await insertVersion(tx, inserted.id, null, values, meta, at);
        return rowToRecord((await current(inserted.id, tx.kysely.withTables<Tables>())) as RecordVersionRow);
      });
    },
    /**
     * Saves new details as a version correcting `versionId` (the version the user saw; the
     * current one when not given). When another correction of that version was saved first the
     * database refuses this one (`corrects_id` is UNIQUE): nothing is overwritten.
     * @returns the record as corrected, or null when there is no such record
     */
    async correct(
      recordId: number,
      values: ProcedureRecordValues,
      meta: Meta,
      at: Date,
      versionId?: number,
    ): Promise<ProcedureRecord | null> {
      return writeTransaction(sql, async (tx) => {
        const from = tx.kysely.withTables<Tables>();
        const previous = await current(recordId, from);
        if (previous === undefined) return null;
        let correctsId = previous.id;
        if (versionId !== undefined && versionId !== previous.id) {
          const named = await from
            .selectFrom('procedure_record_versions')
            .select('record_id')
            .where('id', '=', versionId)
            .executeTakeFirst();
          if (named?.record_id !== recordId)
            throw new RecordVersionMismatchError(
              `Version ${String(versionId)} is not a version of procedure record ${String(recordId)}.`,
            );
          correctsId = versionId;
        }
        await insertVersion(tx, recordId, correctsId, values, meta, at);
        return rowToRecord((await current(recordId, from)) as RecordVersionRow);
      });
    },
    async get(recordId: number): Promise<ProcedureRecord | null> {
      const row = await current(recordId);
      return row === undefined ? null : rowToRecord(row);
    },
    /** The latest records across all patients, newest start first. */
    async listRecent(limit: number): Promise<ProcedureRecord[]> {
      const rows = await currentVersions()
        .orderBy('v.started_at', 'desc')
        .orderBy('v.record_id', 'desc')
        .limit(limit)
        .execute();
      return rows.map(rowToRecord);
    },
    async listForPatient(patientId: number): Promise<ProcedureRecord[]> {
      const rows = await currentVersions()
        .where('r.patient_id', '=', patientId)
        .orderBy('v.started_at', 'desc')
        .orderBy('v.record_id', 'desc')
        .execute();
      return rows.map(rowToRecord);
    },
    /** Every version of the record's details, newest first. */
    async history(recordId: number): Promise<ProcedureRecord[]> {
      const row = await current(recordId);
      if (row === undefined) return [];
      const ids = await chainIds(sql, 'procedure_record_versions', row.id);
      const rows = await versions().where('v.id', 'in', ids).orderBy('v.id', 'desc').execute();
      return rows.map(rowToRecord);
    },
  };
}

export type ProcedureRecordRepository = ReturnType<typeof createProcedureRecordRepository>;
