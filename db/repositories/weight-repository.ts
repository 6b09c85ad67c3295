import type { Generated } from 'kysely';
import type { Weight, WeightValues } from '../../app/contract/records.js';
import { writeTransaction, type Sql } from '../clinic-db.js';
import { chainIds, stampOf, type StampRow } from './version-chain.js';

type WeightRow = StampRow & {
  patient_id: number;
  voided: number;
  weighed_on: string;
  mass_g: number;
  body_condition: WeightValues['bodyCondition'];
  weighed_by: string;
};

type Tables = { weights: Omit<WeightRow, 'id'> & { id: Generated<number> } };

type Meta = { enteredBy: string; reason: string };

function rowToWeight(row: WeightRow): Weight {
  return {
    id: row.id,
    patientId: row.patient_id,
    voided: row.voided === 1,
    values: {
      weighedOn: row.weighed_on,
      massG: row.mass_g,
      bodyCondition: row.body_condition,
      weighedBy: row.weighed_by,
    },
    stamp: stampOf(row),
  };
}

/** All SQL for the weights table. Corrections and voids are new rows. */
export function createWeightRepository(sql: Sql) {
  const tables = (on: Sql) => on.kysely.withTables<Tables>();

  async function byId(on: Sql, id: number): Promise<WeightRow | undefined> {
    return tables(on).selectFrom('weights').selectAll().where('id', '=', id).executeTakeFirst();
  }

  async function insert(
    on: Sql,
    values: WeightValues,
    row: { patientId: number; correctsId: number | null; voided: 0 | 1 },
    meta: Meta,
    at: Date,
  ): Promise<Weight> {
    const { id } = await tables(on)
      .insertInto('weights')
      .values({
        patient_id: row.patientId,
        corrects_id: row.correctsId,
        voided: row.voided,
        weighed_on: values.weighedOn,
        mass_g: values.massG,
        body_condition: values.bodyCondition,
        weighed_by: values.weighedBy,
        entered_at: at.toISOString(),
        entered_by: meta.enteredBy,
        reason: meta.reason,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    return rowToWeight((await byId(on, id)) as WeightRow);
  }

  async function latestVersion(on: Sql, weightId: number): Promise<WeightRow | null> {
    const row = await byId(on, weightId);
    if (row === undefined) return null;
    const later = await tables(on)
      .selectFrom('weights')
      .select('id')
      .where('corrects_id', '=', weightId)
      .executeTakeFirst();
    if (later !== undefined)
      throw new WeightCorrectionError('That weight has already been corrected; correct its newest version.');
    return row;
  }

  return {
    add(patientId: number, values: WeightValues, meta: Meta, at: Date): Promise<Weight> {
      return insert(sql, values, { patientId, correctsId: null, voided: 0 }, meta, at);
    },
    correct(weightId: number, values: WeightValues, meta: Meta, at: Date): Promise<Weight | null> {
      return writeTransaction(sql, async (tx) => {
        const previous = await latestVersion(tx, weightId);
        if (previous === null) return null;
        return insert(
          tx,
          values,
          { patientId: previous.patient_id, correctsId: previous.id, voided: 0 },
          meta,
          at,
        );
      });
    },
    /** Withdraws a weight entered in error; it stays in the history, marked void. */
    void(weightId: number, meta: Meta, at: Date): Promise<Weight | null> {
      return writeTransaction(sql, async (tx) => {
        const previous = await latestVersion(tx, weightId);
        if (previous === null) return null;
        return insert(
          tx,
          {
            weighedOn: previous.weighed_on,
            massG: previous.mass_g,
            bodyCondition: previous.body_condition,
            weighedBy: previous.weighed_by,
          },
          { patientId: previous.patient_id, correctsId: previous.id, voided: 1 },
          meta,
          at,
        );
      });
    },
    /** Current, not voided weights of a patient, oldest first. */
    async list(patientId: number): Promise<Weight[]> {
      const rows = await tables(sql)
        .selectFrom('weights as w')
        .selectAll('w')
        .where('w.patient_id', '=', patientId)
        .where('w.voided', '=', 0)
        .where(({ not, exists, selectFrom }) =>
          not(
            exists(
              selectFrom('weights as later').select('later.id').whereRef('later.corrects_id', '=', 'w.id'),
            ),
          ),
        )
        .orderBy('w.weighed_on')
        .orderBy('w.id')
        .execute();
      return rows.map(rowToWeight);
    },
    async history(weightId: number): Promise<Weight[]> {
      const ids = await chainIds(sql, 'weights', weightId);
      if (ids.length === 0) return [];
      // Newest first, as the chain is: a later version always has a higher id.
      const rows = await tables(sql)
        .selectFrom('weights')
        .selectAll()
        .where('id', 'in', ids)
        .orderBy('id', 'desc')
        .execute();
      return rows.map(rowToWeight);
    },
  };
}

export class WeightCorrectionError extends Error {}

export type WeightRepository = ReturnType<typeof createWeightRepository>;
