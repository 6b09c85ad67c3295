import type { TidewingDatabase } from '../connection.js';

type Meta = { enteredBy: string; reason: string };

export type Exclusion = {
  readonly recordId: number;
  readonly excluded: boolean;
  readonly reason: string;
  readonly enteredAt: string;
  readonly enteredBy: string;
};

export type CalibrationSwitch = {
  readonly on: boolean;
  readonly enteredAt: string | null;
  readonly enteredBy: string | null;
  readonly reason: string;
};

type ExclusionRow = {
  record_id: number;
  excluded: number;
  reason: string;
  entered_at: string;
  entered_by: string;
};

/** All SQL for evidence_exclusions and evidence_calibration_switch: new rows only; the newest decides. */
export function createEvidenceRepository(db: TidewingDatabase) {
  const insertExclusion = db.prepare(
    'INSERT INTO evidence_exclusions (record_id, excluded, reason, entered_at, entered_by) VALUES (?, ?, ?, ?, ?)',
  );
  const latestExclusions = db.prepare<[], ExclusionRow>(
    `SELECT e.* FROM evidence_exclusions e
     WHERE e.id = (SELECT max(id) FROM evidence_exclusions later WHERE later.record_id = e.record_id)`,
  );
  const insertSwitch = db.prepare(
    'INSERT INTO evidence_calibration_switch (calibration_on, reason, entered_at, entered_by) VALUES (?, ?, ?, ?)',
  );
  const latestSwitch = db.prepare<
    [],
    { calibration_on: number; reason: string; entered_at: string; entered_by: string }
  >('SELECT * FROM evidence_calibration_switch ORDER BY id DESC LIMIT 1');

  const fingerprints = db.prepare<
    [],
    {
      record_id: number;
      patient_id: number;
      version_id: number;
      ended_at: string | null;
      entries: string;
      weight_id: number | null;
      patient_version_id: number | null;
    }
  >(
    `SELECT r.id AS record_id, r.patient_id,
       v.id AS version_id, v.ended_at,
       (SELECT count(*) || ':' || ifnull(max(e.id), 0) FROM procedure_entries e WHERE e.record_id = r.id) AS entries,
       (SELECT max(w.id) FROM weights w WHERE w.patient_id = r.patient_id) AS weight_id,
       (SELECT max(p.id) FROM patient_versions p WHERE p.patient_id = r.patient_id) AS patient_version_id
     FROM procedure_records r
     JOIN procedure_record_versions v ON v.id = (SELECT max(id) FROM procedure_record_versions WHERE record_id = r.id)`,
  );

  const toExclusion = (row: ExclusionRow): Exclusion => ({
    recordId: row.record_id,
    excluded: row.excluded === 1,
    reason: row.reason,
    enteredAt: row.entered_at,
    enteredBy: row.entered_by,
  });

  return {
    /** Leaves a record out of the calibration (or takes it back in); one insert. */
    setExcluded(recordId: number, excluded: boolean, meta: Meta, at: Date): Exclusion {
      insertExclusion.run(recordId, excluded ? 1 : 0, meta.reason, at.toISOString(), meta.enteredBy);
      return {
        recordId,
        excluded,
        reason: meta.reason,
        enteredAt: at.toISOString(),
        enteredBy: meta.enteredBy,
      };
    },
    /** The newest decision per record that has one. */
    exclusions(): Map<number, Exclusion> {
      return new Map(latestExclusions.all().map((row) => [row.record_id, toExclusion(row)]));
    },
    /**
     * For every record, what its evidence depends on (newest record version, entries, weights,
     * patient version: rows are only ever added, so the newest ids change with every write),
     * and whether it has ended. One query, so an unchanged clinic is checked without reading it.
     */
    recordFingerprints(): { recordId: number; ended: boolean; key: string }[] {
      return fingerprints.all().map((row) => ({
        recordId: row.record_id,
        ended: row.ended_at !== null,
        key: `${row.version_id}|${row.entries}|${String(row.weight_id)}|${String(row.patient_version_id)}`,
      }));
    },
    calibrationSwitch(): CalibrationSwitch {
      const row = latestSwitch.get();
      return row === undefined
        ? { on: true, enteredAt: null, enteredBy: null, reason: '' }
        : {
            on: row.calibration_on === 1,
            enteredAt: row.entered_at,
            enteredBy: row.entered_by,
            reason: row.reason,
          };
    },
    setCalibration(on: boolean, meta: Meta, at: Date): CalibrationSwitch {
      insertSwitch.run(on ? 1 : 0, meta.reason, at.toISOString(), meta.enteredBy);
      return { on, enteredAt: at.toISOString(), enteredBy: meta.enteredBy, reason: meta.reason };
    },
  };
}

export type EvidenceRepository = ReturnType<typeof createEvidenceRepository>;
