import type { ProcedureEntry, ProcedureEntryValues } from '../../app/contract/records.js';
import type { TidewingDatabase } from '../connection.js';
import { writeTransaction } from '../write-transaction.js';
import { chainIds, stampOf, type StampRow } from './version-chain.js';

type EntryRow = StampRow & {
  record_id: number;
  voided: number;
  at: string;
  kind: ProcedureEntryValues['kind'];
  vapor_pct: number | null;
  oxygen_lpm: number | null;
  heart_rate_per_min: number | null;
  breaths_per_min: number | null;
  temperature_c: number | null;
  etco2_mmhg: number | null;
  spo2_pct: number | null;
  event_type: ProcedureEntryValues['eventType'];
  event_note: string;
  drug_name: string;
  drug_dose: string;
};

type Meta = { enteredBy: string; reason: string };

function rowToEntry(row: EntryRow): ProcedureEntry {
  return {
    id: row.id,
    recordId: row.record_id,
    voided: row.voided === 1,
    values: {
      at: row.at,
      kind: row.kind,
      vaporPct: row.vapor_pct,
      oxygenLpm: row.oxygen_lpm,
      heartRatePerMin: row.heart_rate_per_min,
      breathsPerMin: row.breaths_per_min,
      temperatureC: row.temperature_c,
      etco2Mmhg: row.etco2_mmhg,
      spo2Pct: row.spo2_pct,
      eventType: row.event_type,
      eventNote: row.event_note,
      drugName: row.drug_name,
      drugDose: row.drug_dose,
    },
    stamp: stampOf(row),
  };
}

export class EntryCorrectionError extends Error {}

/** All SQL for procedure_entries: one row per time point or event; corrections are new rows. */
export function createProcedureEntryRepository(db: TidewingDatabase) {
  const insert = db.prepare(
    `INSERT INTO procedure_entries (record_id, corrects_id, voided, at, kind, vapor_pct, oxygen_lpm, heart_rate_per_min, breaths_per_min,
       temperature_c, etco2_mmhg, spo2_pct, event_type, event_note, drug_name, drug_dose, entered_at, entered_by, reason)
     VALUES (@recordId, @correctsId, @voided, @at, @kind, @vaporPct, @oxygenLpm, @heartRatePerMin, @breathsPerMin,
       @temperatureC, @etco2Mmhg, @spo2Pct, @eventType, @eventNote, @drugName, @drugDose, @enteredAt, @enteredBy, @reason)`,
  );
  const byId = db.prepare<[number], EntryRow>('SELECT * FROM procedure_entries WHERE id = ?');
  const corrected = db.prepare<[number], { found: number }>(
    'SELECT 1 AS found FROM procedure_entries WHERE corrects_id = ?',
  );
  const listCurrent = db.prepare<[number], EntryRow>(
    `SELECT * FROM procedure_entries e WHERE record_id = ? AND voided = 0 AND NOT EXISTS (SELECT 1 FROM procedure_entries later WHERE later.corrects_id = e.id)
     ORDER BY at, id`,
  );
  const listVoided = db.prepare<[number], EntryRow>(
    `SELECT * FROM procedure_entries e WHERE record_id = ? AND voided = 1 AND NOT EXISTS (SELECT 1 FROM procedure_entries later WHERE later.corrects_id = e.id)
     ORDER BY at, id`,
  );
  const correctedIds = db.prepare<[number], { id: number }>(
    'SELECT DISTINCT corrects_id AS id FROM procedure_entries WHERE record_id = ? AND corrects_id IS NOT NULL',
  );

  function newest(entryId: number): EntryRow | null {
    const row = byId.get(entryId);
    if (row === undefined) return null;
    if (corrected.get(entryId) !== undefined)
      throw new EntryCorrectionError('That entry has already been corrected; correct its newest version.');
    return row;
  }

  function write(
    recordId: number,
    correctsId: number | null,
    voided: boolean,
    values: ProcedureEntryValues,
    meta: Meta,
    at: Date,
  ): ProcedureEntry {
    const id = Number(
      insert.run({
        ...values,
        recordId,
        correctsId,
        voided: voided ? 1 : 0,
        enteredAt: at.toISOString(),
        ...meta,
      }).lastInsertRowid,
    );
    return rowToEntry(byId.get(id) as EntryRow);
  }

  return {
    /** One insert, its own transaction: a committed entry survives a crash right after. */
    add(recordId: number, values: ProcedureEntryValues, meta: Meta, at: Date): ProcedureEntry {
      return write(recordId, null, false, values, meta, at);
    },
    correct(entryId: number, values: ProcedureEntryValues, meta: Meta, at: Date): ProcedureEntry | null {
      return writeTransaction(db, () => {
        const previous = newest(entryId);
        return previous === null ? null : write(previous.record_id, previous.id, false, values, meta, at);
      });
    },
    void(entryId: number, meta: Meta, at: Date): ProcedureEntry | null {
      return writeTransaction(db, () => {
        const previous = newest(entryId);
        return previous === null
          ? null
          : write(previous.record_id, previous.id, true, rowToEntry(previous).values, meta, at);
      });
    },
    /** Current entries of a record in time order, each flagged when it has earlier versions. */
    list(recordId: number): (ProcedureEntry & { corrected: boolean })[] {
      const withHistory = new Set(correctedIds.all(recordId).map((row) => row.id));
      return listCurrent.all(recordId).map((row) => ({
        ...rowToEntry(row),
        corrected: row.corrects_id !== null && withHistory.has(row.corrects_id),
      }));
    },
    /** The rows that voided a row of the record (the values as they stood, who voided, when, why), in time order. */
    voided(recordId: number): ProcedureEntry[] {
      return listVoided.all(recordId).map(rowToEntry);
    },
    history(entryId: number): ProcedureEntry[] {
      return chainIds(db, 'procedure_entries', entryId).map((id) => rowToEntry(byId.get(id) as EntryRow));
    },
  };
}

export type ProcedureEntryRepository = ReturnType<typeof createProcedureEntryRepository>;
