import type { Weight, WeightValues } from '../../app/contract/records.js';
import type { TidewingDatabase } from '../connection.js';
import { writeTransaction } from '../write-transaction.js';
import { chainIdsSync, stampOf, type StampRow } from './version-chain.js';

type WeightRow = StampRow & {
  patient_id: number;
  voided: number;
  weighed_on: string;
  mass_g: number;
  body_condition: WeightValues['bodyCondition'];
  weighed_by: string;
};

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
export function createWeightRepository(db: TidewingDatabase) {
  const insert = db.prepare(
    `INSERT INTO weights (patient_id, corrects_id, voided, weighed_on, mass_g, body_condition, weighed_by, entered_at, entered_by, reason)
     VALUES (@patientId, @correctsId, @voided, @weighedOn, @massG, @bodyCondition, @weighedBy, @enteredAt, @enteredBy, @reason)`,
  );
  const byId = db.prepare<[number], WeightRow>('SELECT * FROM weights WHERE id = ?');
  const isCurrent = db.prepare<[number], { found: number }>(
    'SELECT 1 AS found FROM weights WHERE corrects_id = ?',
  );
  const listCurrent = db.prepare<[number], WeightRow>(
    `SELECT * FROM weights w WHERE patient_id = ? AND voided = 0 AND NOT EXISTS (SELECT 1 FROM weights later WHERE later.corrects_id = w.id)
     ORDER BY weighed_on, id`,
  );

  function latestVersion(weightId: number): WeightRow | null {
    const row = byId.get(weightId);
    if (row === undefined) return null;
    if (isCurrent.get(weightId) !== undefined)
      throw new WeightCorrectionError('That weight has already been corrected; correct its newest version.');
    return row;
  }

  return {
    add(patientId: number, values: WeightValues, meta: Meta, at: Date): Weight {
      const id = Number(
        insert.run({
          ...values,
          patientId,
          correctsId: null,
          voided: 0,
          enteredAt: at.toISOString(),
          ...meta,
        }).lastInsertRowid,
      );
      return rowToWeight(byId.get(id) as WeightRow);
    },
    correct(weightId: number, values: WeightValues, meta: Meta, at: Date): Weight | null {
      return writeTransaction(db, () => {
        const previous = latestVersion(weightId);
        if (previous === null) return null;
        const id = Number(
          insert.run({
            ...values,
            patientId: previous.patient_id,
            correctsId: previous.id,
            voided: 0,
            enteredAt: at.toISOString(),
            ...meta,
          }).lastInsertRowid,
        );
        return rowToWeight(byId.get(id) as WeightRow);
      });
    },
    /** Withdraws a weight entered in error; it stays in the history, marked void. */
    void(weightId: number, meta: Meta, at: Date): Weight | null {
      return writeTransaction(db, () => {
        const previous = latestVersion(weightId);
        if (previous === null) return null;
        const id = Number(
          insert.run({
            patientId: previous.patient_id,
            correctsId: previous.id,
            voided: 1,
            weighedOn: previous.weighed_on,
            massG: previous.mass_g,
            bodyCondition: previous.body_condition,
            weighedBy: previous.weighed_by,
            enteredAt: at.toISOString(),
            ...meta,
          }).lastInsertRowid,
        );
        return rowToWeight(byId.get(id) as WeightRow);
      });
    },
    /** Current, not voided weights of a patient, oldest first. */
    list(patientId: number): Weight[] {
      return listCurrent.all(patientId).map(rowToWeight);
    },
    history(weightId: number): Weight[] {
      return chainIdsSync(db, 'weights', weightId).map((id) => rowToWeight(byId.get(id) as WeightRow));
    },
  };
}

export class WeightCorrectionError extends Error {}

export type WeightRepository = ReturnType<typeof createWeightRepository>;
