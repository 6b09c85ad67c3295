/**
 * The clinic's own emergency drugs for the worksheet's emergency card. Tidewing ships no drug and
 * no dose: every row is entered by the clinic with the source it relies on. Rows are never
 * changed or deleted; a correction or a void is a new row whose `corrects_id` points at the row
 * it replaces, as in the other record tables.
 */
export const emergencyDrugsMigration = {
  version: 3,
  name: 'clinic emergency drugs',
  sql: `
    CREATE TABLE emergency_drugs (
      id INTEGER PRIMARY KEY,
      corrects_id INTEGER UNIQUE REFERENCES emergency_drugs (id),
      voided INTEGER NOT NULL DEFAULT 0 CHECK (voided IN (0, 1)),
      name TEXT NOT NULL CHECK (length(trim(name)) BETWEEN 1 AND 120),
      concentration_mg_per_ml REAL NOT NULL CHECK (concentration_mg_per_ml > 0 AND concentration_mg_per_ml <= 1000),
      dose_low_mg_per_kg REAL NOT NULL CHECK (dose_low_mg_per_kg > 0 AND dose_low_mg_per_kg <= 1000),
      dose_high_mg_per_kg REAL CHECK (dose_high_mg_per_kg IS NULL OR (dose_high_mg_per_kg >= dose_low_mg_per_kg AND dose_high_mg_per_kg <= 1000)),
      route TEXT NOT NULL CHECK (length(trim(route)) BETWEEN 1 AND 60),
      dose_source TEXT NOT NULL CHECK (length(trim(dose_source)) BETWEEN 1 AND 300),
      notes TEXT NOT NULL DEFAULT '' CHECK (length(notes) <= 500),
      entered_at TEXT NOT NULL CHECK (length(entered_at) >= 20),
      entered_by TEXT NOT NULL CHECK (length(trim(entered_by)) BETWEEN 1 AND 80),
      reason TEXT NOT NULL DEFAULT '' CHECK (length(reason) <= 500)
    ) STRICT;
    CREATE TRIGGER emergency_drugs_never_updated BEFORE UPDATE ON emergency_drugs
      BEGIN SELECT RAISE(ABORT, 'emergency_drugs rows are never changed in place; add a correction'); END;
    CREATE TRIGGER emergency_drugs_never_deleted BEFORE DELETE ON emergency_drugs
      BEGIN SELECT RAISE(ABORT, 'emergency_drugs rows are never deleted; add a correction that voids the row'); END;
  `,
} as const;
