import type { Patient, PatientSummary, PatientValues } from '../../app/contract/records.js';
import type { TidewingDatabase } from '../connection.js';
import { writeTransaction } from '../write-transaction.js';
import { chainIdsSync, stampOf, type StampRow } from './version-chain.js';

type PatientVersionRow = StampRow & {
  patient_id: number;
  name: string;
  species_key: string;
  sex: PatientValues['sex'];
  hatch_date: string | null;
  age_text: string;
  ring_id: string;
  microchip_id: string;
  owner_reference: string;
  notes: string;
  created_at: string;
};

type SummaryRow = {
  id: number;
  name: string;
  species_key: string;
  species_name: string | null;
  ring_id: string;
  microchip_id: string;
  owner_reference: string;
  latest_mass_g: number | null;
  latest_weighed_on: string | null;
};

type Meta = { enteredBy: string; reason: string };

function rowToPatient(row: PatientVersionRow): Patient {
  return {
    id: row.patient_id,
    createdAt: row.created_at,
    values: {
      name: row.name,
      speciesKey: row.species_key,
      sex: row.sex,
      hatchDate: row.hatch_date,
      ageText: row.age_text,
      ringId: row.ring_id,
      microchipId: row.microchip_id,
      ownerReference: row.owner_reference,
      notes: row.notes,
    },
    stamp: stampOf(row),
  };
}

function rowToSummary(row: SummaryRow): PatientSummary {
  return {
    id: row.id,
    name: row.name,
    speciesKey: row.species_key,
    speciesName: row.species_name,
    ringId: row.ring_id,
    microchipId: row.microchip_id,
    ownerReference: row.owner_reference,
    latestMassG: row.latest_mass_g,
    latestWeighedOn: row.latest_weighed_on,
  };
}

/** What the search index holds for a patient: every field staff search by. */
function searchText(values: PatientValues, speciesName: string | null): string {
  return [
    values.name,
    speciesName ?? '',
    values.speciesKey,
    values.ringId,
    values.microchipId,
    values.ownerReference,
    values.hatchDate ?? '',
    values.sex,
    values.notes,
  ]
    .filter((part) => part !== '')
    .join(' \u2022 ');
}

/** Quotes a search for FTS5 so that punctuation in IDs is matched literally. */
function ftsPhrase(query: string): string {
  return `"${query.replace(/"/g, '""')}"`;
}

/** All SQL for patients, patient_versions, patient_current and patient_search. */
export function createPatientRepository(db: TidewingDatabase) {
  const insertPatient = db.prepare('INSERT INTO patients (created_at) VALUES (?)');
  const insertVersion = db.prepare(
    `INSERT INTO patient_versions (patient_id, corrects_id, name, species_key, sex, hatch_date, age_text, ring_id, microchip_id, owner_reference, notes, entered_at, entered_by, reason)
     VALUES (@patientId, @correctsId, @name, @speciesKey, @sex, @hatchDate, @ageText, @ringId, @microchipId, @ownerReference, @notes, @enteredAt, @enteredBy, @reason)`,
  );
  const setCurrent = db.prepare(
    'INSERT INTO patient_current (patient_id, version_id) VALUES (?, ?) ON CONFLICT (patient_id) DO UPDATE SET version_id = excluded.version_id',
  );
  const deleteSearch = db.prepare('DELETE FROM patient_search WHERE rowid = ?');
  const insertSearch = db.prepare('INSERT INTO patient_search (rowid, search_text) VALUES (?, ?)');
  const speciesName = db.prepare<[string], { common_name: string }>(
    'SELECT common_name FROM species s WHERE species_key = ? AND NOT EXISTS (SELECT 1 FROM species later WHERE later.corrects_id = s.id)',
  );
  const currentRow = db.prepare<[number], PatientVersionRow>(
    `SELECT v.*, p.created_at FROM patient_current c JOIN patient_versions v ON v.id = c.version_id JOIN patients p ON p.id = c.patient_id WHERE c.patient_id = ?`,
  );
  const versionRow = db.prepare<[number], PatientVersionRow>(
    'SELECT v.*, p.created_at FROM patient_versions v JOIN patients p ON p.id = v.patient_id WHERE v.id = ?',
  );

  const summarySelect = `
    SELECT p.id, v.name, v.species_key, v.ring_id, v.microchip_id, v.owner_reference,
      (SELECT common_name FROM species s WHERE s.species_key = v.species_key AND NOT EXISTS (SELECT 1 FROM species later WHERE later.corrects_id = s.id)) AS species_name,
      w.mass_g AS latest_mass_g, w.weighed_on AS latest_weighed_on
    FROM patients p
    JOIN patient_current c ON c.patient_id = p.id
    JOIN patient_versions v ON v.id = c.version_id
    LEFT JOIN weights w ON w.id = (
      SELECT id FROM weights x WHERE x.patient_id = p.id AND x.voided = 0 AND NOT EXISTS (SELECT 1 FROM weights later WHERE later.corrects_id = x.id)
      ORDER BY x.weighed_on DESC, x.id DESC LIMIT 1)`;
  const searchFts = db.prepare<[string, number], SummaryRow>(
    `${summarySelect} WHERE p.id IN (SELECT rowid FROM patient_search WHERE patient_search MATCH ? ORDER BY rank) ORDER BY v.name COLLATE NOCASE LIMIT ?`,
  );
  const searchShort = db.prepare<[string, number], SummaryRow>(
    `${summarySelect} WHERE p.id IN (SELECT rowid FROM patient_search WHERE search_text LIKE ? ESCAPE '\\') ORDER BY v.name COLLATE NOCASE LIMIT ?`,
  );
  const recent = db.prepare<[number], SummaryRow>(`${summarySelect} ORDER BY p.id DESC LIMIT ?`);
  const count = db.prepare<[], { total: number }>('SELECT count(*) AS total FROM patients');

  function index(patientId: number, values: PatientValues) {
    deleteSearch.run(patientId);
    insertSearch.run(patientId, searchText(values, speciesName.get(values.speciesKey)?.common_name ?? null));
  }

  return {
    create(values: PatientValues, meta: Meta, at: Date): Patient {
      return writeTransaction(db, () => {
        const patientId = Number(insertPatient.run(at.toISOString()).lastInsertRowid);
        const versionId = Number(
          insertVersion.run({ ...values, patientId, correctsId: null, enteredAt: at.toISOString(), ...meta })
            .lastInsertRowid,
        );
        setCurrent.run(patientId, versionId);
        index(patientId, values);
        return rowToPatient(currentRow.get(patientId) as PatientVersionRow);
      });
    },
    /** Adds a corrected version; the earlier one stays in the history. */
    correct(patientId: number, values: PatientValues, meta: Meta, at: Date): Patient | null {
      return writeTransaction(db, () => {
        const current = currentRow.get(patientId);
        if (current === undefined) return null;
        const versionId = Number(
          insertVersion.run({
            ...values,
            patientId,
            correctsId: current.id,
            enteredAt: at.toISOString(),
            ...meta,
          }).lastInsertRowid,
        );
        setCurrent.run(patientId, versionId);
        index(patientId, values);
        return rowToPatient(currentRow.get(patientId) as PatientVersionRow);
      });
    },
    get(patientId: number): Patient | null {
      const row = currentRow.get(patientId);
      return row === undefined ? null : rowToPatient(row);
    },
    history(patientId: number): Patient[] {
      const row = currentRow.get(patientId);
      if (row === undefined) return [];
      return chainIdsSync(db, 'patient_versions', row.id).map((id) =>
        rowToPatient(versionRow.get(id) as PatientVersionRow),
      );
    },
    /**
     * Finds patients by name or ID, species, ring, microchip, owner reference, hatch date or notes.
     * Three or more characters use the trigram index (substring match); shorter ones a scan.
     */
    search(query: string, limit = 50): PatientSummary[] {
      const trimmed = query.trim();
      if (trimmed === '') return recent.all(limit).map(rowToSummary);
      if ([...trimmed].length >= 3) return searchFts.all(ftsPhrase(trimmed), limit).map(rowToSummary);
      return searchShort
        .all(`%${trimmed.replace(/[\\%_]/g, (match) => `\\${match}`)}%`, limit)
        .map(rowToSummary);
    },
    count(): number {
      return count.get()?.total ?? 0;
    },
  };
}

export type PatientRepository = ReturnType<typeof createPatientRepository>;
