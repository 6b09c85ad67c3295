/**
 * Body mass up to 200 kg. The contract keeps a body mass between 0.5 g and 200 kg; the weights
 * table of migration 2 stopped at 20 kg, so a large bird's weight passed every check and then
 * met a CHECK failure. SQLite cannot change a CHECK in place, so the table is rebuilt with the
 * same columns and rows (ids included), then its index and the triggers that keep rows
 * unchanged are made again. The lower bound stays `mass_g > 0` so that every weight saved
 * before the 0.5 g rule existed is carried over unchanged, as evidence.
 *
 * Dropping the old table runs no trigger (SQLite: "the implicit DELETE FROM does not cause any
 * SQL triggers to fire"), and only the table itself refers to its rows (corrects_id).
 * PostgreSQL changes the CHECK in place (named in migration 2 for this).
 */
export const bodyMassTo200KgMigration = {
  version: 4,
  name: 'body mass up to 200 kg',
  sql: `
    CREATE TABLE weights_rebuilt (
      id INTEGER PRIMARY KEY,
      patient_id INTEGER NOT NULL REFERENCES patients (id),
      corrects_id INTEGER UNIQUE REFERENCES weights_rebuilt (id),
      voided INTEGER NOT NULL DEFAULT 0 CHECK (voided IN (0, 1)),
      weighed_on TEXT NOT NULL CHECK (weighed_on GLOB '[0-9][0-9][0-9][0-9]-[0-9][0-9]-[0-9][0-9]*'),
      mass_g REAL NOT NULL CHECK (mass_g > 0 AND mass_g <= 200000),
      body_condition TEXT NOT NULL DEFAULT '' CHECK (body_condition IN ('', 'emaciated', 'thin', 'ideal', 'overweight', 'obese')),
      weighed_by TEXT NOT NULL DEFAULT '' CHECK (length(weighed_by) <= 80),
      entered_at TEXT NOT NULL CHECK (length(entered_at) >= 20),
      entered_by TEXT NOT NULL CHECK (length(trim(entered_by)) BETWEEN 1 AND 80),
      reason TEXT NOT NULL DEFAULT '' CHECK (length(reason) <= 500)
    ) STRICT;
    INSERT INTO weights_rebuilt (id, patient_id, corrects_id, voided, weighed_on, mass_g, body_condition, weighed_by, entered_at, entered_by, reason)
      SELECT id, patient_id, corrects_id, voided, weighed_on, mass_g, body_condition, weighed_by, entered_at, entered_by, reason
      FROM weights ORDER BY id;
    DROP TABLE weights;
    ALTER TABLE weights_rebuilt RENAME TO weights;
    CREATE INDEX weights_patient ON weights (patient_id, weighed_on);
    CREATE TRIGGER weights_never_updated BEFORE UPDATE ON weights
      BEGIN SELECT RAISE(ABORT, 'weights rows are never changed in place; add a correction'); END;
    CREATE TRIGGER weights_never_deleted BEFORE DELETE ON weights
      BEGIN SELECT RAISE(ABORT, 'weights rows are never deleted; add a correction that voids the row'); END;
  `,
  postgresql: `
    -- PostgreSQL changes the CHECK in place: same table, rows, ids, index and triggers.
    ALTER TABLE weights
      DROP CONSTRAINT weights_mass_g_check,
      ADD CONSTRAINT weights_mass_g_check CHECK (mass_g > 0 AND mass_g <= 200000);
  `,
} as const;
