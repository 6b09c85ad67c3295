import type { Generated, Selectable } from 'kysely';
import type { ProcedureEntry, ProcedureEntryValues } from '../../app/contract/records.js';
import { writeTransaction, type Sql } from '../clinic-db.js';
import { chainIds, stampOf } from './version-chain.js';

type ProcedureEntriesTable = {
  id: Generated<number>;
  record_id: number;
  corrects_id: number | null;
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
  entered_at: string;
  entered_by: string;
  reason: string;
  /** The workstation that wrote the row (migration 10); null for rows written before it. */
  workstation_id: string | null;
};

/** Read here only for the name of the workstation that wrote each entry. */
type WorkstationsTable = { id: string; name: string };

type Tables = { procedure_entries: ProcedureEntriesTable; workstations: WorkstationsTable };

type EntryRow = Selectable<ProcedureEntriesTable> & { workstation_name: string | null };

/** Who wrote a row: initials and reason, and the workstation it was written on (null when unknown). */
type Meta = { enteredBy: string; reason: string; workstationId?: string | null };

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
    workstationName: row.workstation_name,
  };
}

/**
 * All SQL for procedure_entries: one row per time point or event; corrections are new rows. A
 * correction or void names the version it replaces in `corrects_id`, which is UNIQUE: when
 * another workstation corrected that version first, the database refuses the second one and
 * nothing is overwritten (see main/back-end/concurrent-change.ts for what the user is told).
 */
export function createProcedureEntryRepository(sql: Sql) {
  const db = sql.kysely.withTables<Tables>();

  /** Entries with the current name of the workstation that wrote each (by id; none when unknown). */
  const entries = (from = db) =>
    from
      .selectFrom('procedure_entries as e')
      .leftJoin('workstations as w', 'w.id', 'e.workstation_id')
      .selectAll('e')
      .select('w.name as workstation_name');

  /** A record's rows that nothing corrects, in time order. */
  const currentOf = (recordId: number, voided: boolean) =>
    entries()
      .where('e.record_id', '=', recordId)
      .where('e.voided', '=', voided ? 1 : 0)
      .where(({ not, exists, selectFrom }) =>
        not(
          exists(
            selectFrom('procedure_entries as later')
              .select('later.id')
              .whereRef('later.corrects_id', '=', 'e.id'),
          ),
        ),
      )
      .orderBy('e.at')
      .orderBy('e.id');

  async function byId(id: number, from = db): Promise<EntryRow | undefined> {
    return entries(from).where('e.id', '=', id).executeTakeFirst();
  }

  async function write(
    tx: Sql,
    recordId: number,
    correctsId: number | null,
    voided: boolean,
    values: ProcedureEntryValues,
    meta: Meta,
    at: Date,
  ): Promise<ProcedureEntry> {
    const from = tx.kysely.withTables<Tables>();
    const inserted = await from
      .insertInto('procedure_entries')
      .values({
        record_id: recordId,
        corrects_id: correctsId,
        voided: voided ? 1 : 0,
        at: values.at,
        kind: values.kind,
        vapor_pct: values.vaporPct,
        oxygen_lpm: values.oxygenLpm,
        heart_rate_per_min: values.heartRatePerMin,
        breaths_per_min: values.breathsPerMin,
        temperature_c: values.temperatureC,
        etco2_mmhg: values.etco2Mmhg,
        spo2_pct: values.spo2Pct,
        event_type: values.eventType,
        event_note: values.eventNote,
        drug_name: values.drugName,
        drug_dose: values.drugDose,
        entered_at: at.toISOString(),
        entered_by: meta.enteredBy,
        reason: meta.reason,
        workstation_id: meta.workstationId ?? null,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    return rowToEntry((await byId(inserted.id, from)) as EntryRow);
  }

  /** Writes a row replacing version `entryId`; null when there is no such entry. */
  async function replace(
    entryId: number,
    voided: boolean,
    values: ((previous: ProcedureEntry) => ProcedureEntryValues) | ProcedureEntryValues,
    meta: Meta,
    at: Date,
  ): Promise<ProcedureEntry | null> {
    return writeTransaction(sql, async (tx) => {
      const row = await byId(entryId, tx.kysely.withTables<Tables>());
      if (row === undefined) return null;
      const previous = rowToEntry(row);
      const next = typeof values === 'function' ? values(previous) : values;
      return write(tx, previous.recordId, previous.id, voided, next, meta, at);
    });
  }

  return {
    /** One insert, its own transaction: a committed entry survives a crash right after. */
    async add(recordId: number, values: ProcedureEntryValues, meta: Meta, at: Date): Promise<ProcedureEntry> {
      return write(sql, recordId, null, false, values, meta, at);
    },
    /**
     * Saves `values` as the correction of version `entryId`. Refused by the database (UNIQUE
     * `corrects_id`) when that version was already corrected or voided.
     */
    async correct(
      entryId: number,
      values: ProcedureEntryValues,
      meta: Meta,
      at: Date,
    ): Promise<ProcedureEntry | null> {
      return replace(entryId, false, values, meta, at);
    },
    /** Voids version `entryId`: a row with its values, marked voided. Refused like `correct`. */
    async void(entryId: number, meta: Meta, at: Date): Promise<ProcedureEntry | null> {
      return replace(entryId, true, (previous) => previous.values, meta, at);
    },
    /** Current entries of a record in time order, each flagged when it has earlier versions. */
    async list(recordId: number): Promise<(ProcedureEntry & { corrected: boolean })[]> {
      const rows = await currentOf(recordId, false).execute();
      // A current row with `corrects_id` has an earlier version: it was corrected.
      return rows.map((row) => ({ ...rowToEntry(row), corrected: row.corrects_id !== null }));
    },
    /** The rows that voided a row of the record (the values as they stood, who voided, when, why), in time order. */
    async voided(recordId: number): Promise<ProcedureEntry[]> {
      return (await currentOf(recordId, true).execute()).map(rowToEntry);
    },
    /** Every version of the entry holding `entryId`, newest first. */
    async history(entryId: number): Promise<ProcedureEntry[]> {
      const ids = await chainIds(sql, 'procedure_entries', entryId);
      if (ids.length === 0) return [];
      const rows = await entries().where('e.id', 'in', ids).orderBy('e.id', 'desc').execute();
      return rows.map(rowToEntry);
    },
  };
}

export type ProcedureEntryRepository = ReturnType<typeof createProcedureEntryRepository>;
