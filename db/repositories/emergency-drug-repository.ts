import { sql as sqlText, type Generated, type Selectable } from 'kysely';
import type { EmergencyDrug, EmergencyDrugValues } from '../../app/contract/drug-channels.js';
import { writeTransaction, type Sql } from '../clinic-db.js';
import { stampOf } from './version-chain.js';

type EmergencyDrugsTable = {
  id: Generated<number>;
  corrects_id: number | null;
  voided: number;
  name: string;
  concentration_mg_per_ml: number;
  dose_low_mg_per_kg: number;
  dose_high_mg_per_kg: number | null;
  route: string;
  dose_source: string;
  notes: string;
  entered_at: string;
  entered_by: string;
  reason: string;
};

type Tables = { emergency_drugs: EmergencyDrugsTable };

type DrugRow = Selectable<EmergencyDrugsTable>;

type Meta = { enteredBy: string; reason: string };

function rowToDrug(row: DrugRow): EmergencyDrug {
  return {
    id: row.id,
    voided: row.voided === 1,
    values: {
      name: row.name,
      concentrationMgPerMl: row.concentration_mg_per_ml,
      doseLowMgPerKg: row.dose_low_mg_per_kg,
      doseHighMgPerKg: row.dose_high_mg_per_kg,
      route: row.route,
      doseSource: row.dose_source,
      notes: row.notes,
    },
    stamp: stampOf(row),
  };
}

/** A correction or void was asked of a row that a later row already replaces. */
export class DrugCorrectionError extends Error {}

/** The statements of the emergency_drugs table on one connection or transaction. */
function drugQueries(sql: Sql) {
  const db = sql.kysely.withTables<Tables>();

  async function newestVersion(drugId: number): Promise<DrugRow | null> {
    const row = await db
      .selectFrom('emergency_drugs')
      .selectAll()
      .where('id', '=', drugId)
      .executeTakeFirst();
    if (row === undefined) return null;
    const later = await db
      .selectFrom('emergency_drugs')
      .select('id')
      .where('corrects_id', '=', drugId)
      .executeTakeFirst();
    if (later !== undefined)
      throw new DrugCorrectionError(
        'That drug has already been changed since you opened it; open the list again and change its newest version.',
      );
    if (row.voided === 1)
      throw new DrugCorrectionError('That drug was removed from the list; add it again instead.');
    return row;
  }

  async function write(
    values: EmergencyDrugValues,
    correctsId: number | null,
    voided: boolean,
    meta: Meta,
    at: Date,
  ): Promise<EmergencyDrug> {
    const row = await db
      .insertInto('emergency_drugs')
      .values({
        corrects_id: correctsId,
        voided: voided ? 1 : 0,
        name: values.name,
        concentration_mg_per_ml: values.concentrationMgPerMl,
        dose_low_mg_per_kg: values.doseLowMgPerKg,
        dose_high_mg_per_kg: values.doseHighMgPerKg,
        route: values.route,
        dose_source: values.doseSource,
        notes: values.notes,
        entered_at: at.toISOString(),
        entered_by: meta.enteredBy,
        reason: meta.reason,
      })
      .returningAll()
      .executeTakeFirstOrThrow();
    return rowToDrug(row);
  }

  return { db, newestVersion, write };
}

/** All SQL for the clinic's emergency drugs, on SQLite and PostgreSQL. Corrections and voids are new rows. */
export function createEmergencyDrugRepository(sql: Sql) {
  const queries = drugQueries(sql);

  return {
    add(values: EmergencyDrugValues, meta: Meta, at: Date): Promise<EmergencyDrug> {
      return queries.write(values, null, false, meta, at);
    },
    /** A new version of a drug; null when there is no such row. */
    correct(
      drugId: number,
      values: EmergencyDrugValues,
      meta: Meta,
      at: Date,
    ): Promise<EmergencyDrug | null> {
      return writeTransaction(sql, async (tx) => {
        const inTx = drugQueries(tx);
        const previous = await inTx.newestVersion(drugId);
        return previous === null ? null : inTx.write(values, previous.id, false, meta, at);
      });
    },
    /** Takes a drug off the card; the row and its history stay, marked void. */
    void(drugId: number, meta: Meta, at: Date): Promise<EmergencyDrug | null> {
      return writeTransaction(sql, async (tx) => {
        const inTx = drugQueries(tx);
        const previous = await inTx.newestVersion(drugId);
        return previous === null ? null : inTx.write(rowToDrug(previous).values, previous.id, true, meta, at);
      });
    },
    /** The current, not voided drugs, by name (letter case ignored), then id. */
    async list(): Promise<EmergencyDrug[]> {
      const rows = await queries.db
        .selectFrom('emergency_drugs as d')
        .selectAll('d')
        .where('d.voided', '=', 0)
        .where(({ not, exists, selectFrom }) =>
          not(
            exists(
              selectFrom('emergency_drugs as later')
                .select('later.id')
                .whereRef('later.corrects_id', '=', 'd.id'),
            ),
          ),
        )
        .orderBy(sqlText`lower(d.name)`)
        .orderBy('d.id')
        .execute();
      return rows.map(rowToDrug);
    },
  };
}

export type EmergencyDrugRepository = ReturnType<typeof createEmergencyDrugRepository>;
