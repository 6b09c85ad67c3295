/**
 * The clinic's own evidence: records the clinic leaves out of the calibration (each with who, when
 * and why; taking a record back in is a later row), and the calibration switch (each change a row).
 * Rows are never changed or deleted: the newest row decides.
 */
export const clinicEvidenceMigration = {
  version: 6,
  name: 'clinic evidence: exclusions and the calibration switch',
  sql: `
    CREATE TABLE evidence_exclusions (
      id INTEGER PRIMARY KEY,
      record_id INTEGER NOT NULL REFERENCES procedure_records (id),
      excluded INTEGER NOT NULL CHECK (excluded IN (0, 1)),
      reason TEXT NOT NULL CHECK (length(trim(reason)) BETWEEN 1 AND 500),
      entered_at TEXT NOT NULL CHECK (length(entered_at) >= 20),
      entered_by TEXT NOT NULL CHECK (length(trim(entered_by)) BETWEEN 1 AND 80)
    ) STRICT;
    CREATE INDEX evidence_exclusions_record ON evidence_exclusions (record_id, id);
    CREATE TRIGGER evidence_exclusions_never_updated BEFORE UPDATE ON evidence_exclusions
      BEGIN SELECT RAISE(ABORT, 'evidence_exclusions rows are never changed in place; add a later row'); END;
    CREATE TRIGGER evidence_exclusions_never_deleted BEFORE DELETE ON evidence_exclusions
      BEGIN SELECT RAISE(ABORT, 'evidence_exclusions rows are never deleted; add a later row'); END;

    CREATE TABLE evidence_calibration_switch (
      id INTEGER PRIMARY KEY,
      calibration_on INTEGER NOT NULL CHECK (calibration_on IN (0, 1)),
      reason TEXT NOT NULL DEFAULT '' CHECK (length(reason) <= 500),
      entered_at TEXT NOT NULL CHECK (length(entered_at) >= 20),
      entered_by TEXT NOT NULL CHECK (length(trim(entered_by)) BETWEEN 1 AND 80)
    ) STRICT;
    CREATE TRIGGER evidence_calibration_switch_never_updated BEFORE UPDATE ON evidence_calibration_switch
      BEGIN SELECT RAISE(ABORT, 'evidence_calibration_switch rows are never changed in place; add a later row'); END;
    CREATE TRIGGER evidence_calibration_switch_never_deleted BEFORE DELETE ON evidence_calibration_switch
      BEGIN SELECT RAISE(ABORT, 'evidence_calibration_switch rows are never deleted; add a later row'); END;
  `,
} as const;
