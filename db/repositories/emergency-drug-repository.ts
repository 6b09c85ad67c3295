import type { EmergencyDrug, EmergencyDrugValues } from '../../app/contract/drug-channels.js';
import type { TidewingDatabase } from '../connection.js';
import { writeTransaction } from '../write-transaction.js';
import { stampOf, type StampRow } from './version-chain.js';

type DrugRow = StampRow & {
  voided: number;
  name: string;
  concentration_mg_per_ml: number;
  dose_low_mg_per_kg: number;
  dose_high_mg_per_kg: number | null;
  route: string;
  dose_source: string;
  notes: string;
};

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

/** All SQL for the clinic's emergency drugs. Corrections and voids are new rows. */
export function createEmergencyDrugRepository(db: TidewingDatabase) {
  const insert = db.prepare(
    `INSERT INTO emergency_drugs (corrects_id, voided, name, concentration_mg_per_ml, dose_low_mg_per_kg, dose_high_mg_per_kg, route, dose_source, notes, entered_at, entered_by, reason)
     VALUES (@correctsId, @voided, @name, @concentrationMgPerMl, @doseLowMgPerKg, @doseHighMgPerKg, @route, @doseSource, @notes, @enteredAt, @enteredBy, @reason)`,
  );
  const byId = db.prepare<[number], DrugRow>('SELECT * FROM emergency_drugs WHERE id = ?');
  const correctedBy = db.prepare<[number], { id: number }>(
    'SELECT id FROM emergency_drugs WHERE corrects_id = ?',
  );
  const listCurrent = db.prepare<[], DrugRow>(
    `SELECT * FROM emergency_drugs d WHERE voided = 0 AND NOT EXISTS (SELECT 1 FROM emergency_drugs later WHERE later.corrects_id = d.id)
     ORDER BY name COLLATE NOCASE, id`,
  );

  function newestVersion(drugId: number): DrugRow | null {
    const row = byId.get(drugId);
    if (row === undefined) return null;
    if (correctedBy.get(drugId) !== undefined)
      throw new DrugCorrectionError(
        'That drug has already been changed since you opened it; open the list again and change its newest version.',
      );
    if (row.voided === 1)
      throw new DrugCorrectionError('That drug was removed from the list; add it again instead.');
    return row;
  }

  function write(
    values: EmergencyDrugValues,
    correctsId: number | null,
    voided: boolean,
    meta: Meta,
    at: Date,
  ): EmergencyDrug {
    const id = Number(
      insert.run({ ...values, correctsId, voided: voided ? 1 : 0, enteredAt: at.toISOString(), ...meta })
        .lastInsertRowid,
    );
    return rowToDrug(byId.get(id) as DrugRow);
  }

  return {
    add(values: EmergencyDrugValues, meta: Meta, at: Date): EmergencyDrug {
      return write(values, null, false, meta, at);
    },
    /** A new version of a drug; null when there is no such row. */
    correct(drugId: number, values: EmergencyDrugValues, meta: Meta, at: Date): EmergencyDrug | null {
      return writeTransaction(db, () => {
        const previous = newestVersion(drugId);
        return previous === null ? null : write(values, previous.id, false, meta, at);
      });
    },
    /** Takes a drug off the card; the row and its history stay, marked void. */
    void(drugId: number, meta: Meta, at: Date): EmergencyDrug | null {
      return writeTransaction(db, () => {
        const previous = newestVersion(drugId);
        return previous === null ? null : write(rowToDrug(previous).values, previous.id, true, meta, at);
      });
    },
    /** The current, not voided drugs, by name. */
    list(): EmergencyDrug[] {
      return listCurrent.all().map(rowToDrug);
    },
  };
}

export type EmergencyDrugRepository = ReturnType<typeof createEmergencyDrugRepository>;
