import type { ProcedureRecord, ProcedureRecordValues } from '../../app/contract/records.js';
import type { TidewingDatabase } from '../connection.js';
import { writeTransaction } from '../write-transaction.js';
import { chainIds, stampOf, type StampRow } from './version-chain.js';

type RecordVersionRow = StampRow & {
  record_id: number;
  patient_id: number;
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
  staff_initials: string;
  prompt_interval_min: number;
};

type Meta = { enteredBy: string; reason: string };

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
      staffInitials: row.staff_initials,
      promptIntervalMin: row.prompt_interval_min,
    },
    stamp: stampOf(row),
  };
}

/** All SQL for procedure_records and procedure_record_versions. */
export function createProcedureRecordRepository(db: TidewingDatabase) {
  const insertRecord = db.prepare('INSERT INTO procedure_records (patient_id, created_at) VALUES (?, ?)');
  const insertVersion = db.prepare(
    `INSERT INTO procedure_record_versions (record_id, corrects_id, plan_id, started_at, ended_at, asa_grade, emergency, procedure_name, fasting,
       crop_checked, airway, tube_size_mm, tube_type, circuit, staff_initials, prompt_interval_min, entered_at, entered_by, reason)
     VALUES (@recordId, @correctsId, @planId, @startedAt, @endedAt, @asaGrade, @emergency, @procedureName, @fasting,
       @cropChecked, @airway, @tubeSizeMm, @tubeType, @circuit, @staffInitials, @promptIntervalMin, @enteredAt, @enteredBy, @reason)`,
  );
  const select = `SELECT v.*, r.patient_id FROM procedure_record_versions v JOIN procedure_records r ON r.id = v.record_id`;
  const current = db.prepare<[number], RecordVersionRow>(
    `${select} WHERE v.record_id = ? AND NOT EXISTS (SELECT 1 FROM procedure_record_versions later WHERE later.corrects_id = v.id)`,
  );
  const byVersion = db.prepare<[number], RecordVersionRow>(`${select} WHERE v.id = ?`);
  const forPatient = db.prepare<[number], RecordVersionRow>(
    `${select} WHERE r.patient_id = ? AND NOT EXISTS (SELECT 1 FROM procedure_record_versions later WHERE later.corrects_id = v.id) ORDER BY v.started_at DESC`,
  );

  const recent = db.prepare<[number], RecordVersionRow>(
    `${select} WHERE NOT EXISTS (SELECT 1 FROM procedure_record_versions later WHERE later.corrects_id = v.id) ORDER BY v.started_at DESC, v.record_id DESC LIMIT ?`,
  );

  function parameters(
    recordId: number,
    correctsId: number | null,
    values: ProcedureRecordValues,
    meta: Meta,
    at: Date,
  ) {
    return {
      ...values,
      emergency: values.emergency ? 1 : 0,
      recordId,
      correctsId,
      enteredAt: at.toISOString(),
      ...meta,
    };
  }

  return {
    create(patientId: number, values: ProcedureRecordValues, meta: Meta, at: Date): ProcedureRecord {
      return writeTransaction(db, () => {
        const recordId = Number(insertRecord.run(patientId, at.toISOString()).lastInsertRowid);
        insertVersion.run(parameters(recordId, null, values, meta, at));
        return rowToRecord(current.get(recordId) as RecordVersionRow);
      });
    },
    correct(recordId: number, values: ProcedureRecordValues, meta: Meta, at: Date): ProcedureRecord | null {
      return writeTransaction(db, () => {
        const previous = current.get(recordId);
        if (previous === undefined) return null;
        insertVersion.run(parameters(recordId, previous.id, values, meta, at));
        return rowToRecord(current.get(recordId) as RecordVersionRow);
      });
    },
    get(recordId: number): ProcedureRecord | null {
      const row = current.get(recordId);
      return row === undefined ? null : rowToRecord(row);
    },
    /** The latest records across all patients, newest start first. */
    listRecent(limit: number): ProcedureRecord[] {
      return recent.all(limit).map(rowToRecord);
    },
    listForPatient(patientId: number): ProcedureRecord[] {
      return forPatient.all(patientId).map(rowToRecord);
    },
    history(recordId: number): ProcedureRecord[] {
      const row = current.get(recordId);
      if (row === undefined) return [];
      return chainIds(db, 'procedure_record_versions', row.id).map((id) =>
        rowToRecord(byVersion.get(id) as RecordVersionRow),
      );
    },
  };
}

export type ProcedureRecordRepository = ReturnType<typeof createProcedureRecordRepository>;
