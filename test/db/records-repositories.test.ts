import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { speciesReference } from '../../app/core/species-reference.js';
import { sqliteClinicDb } from '../../db/clinic-db.js';
import { openDatabase, type TidewingDatabase } from '../../db/connection.js';
import { createPatientRepository } from '../../db/repositories/patient-repository.js';
import { createProcedureEntryRepository } from '../../db/repositories/procedure-entry-repository.js';
import { createProcedureRecordRepository } from '../../db/repositories/procedure-record-repository.js';
import { createSpeciesRepository } from '../../db/repositories/species-repository.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

const t0 = new Date('2026-12-01T08:00:00Z');
const meta = { enteredBy: 'RW', reason: '' };

// Species, patients and weights have their suite on both engines in people-repositories.test.ts.
async function fresh(): Promise<TidewingDatabase> {
  const temp = temporaryFolder();
  const db = openDatabase(path.join(temp.folder, 'tidewing.db'));
  cleanups.push(() => {
    db.close();
    temp.remove();
  });
  await createSpeciesRepository(sqliteClinicDb(db)).seedReference(speciesReference, t0);
  return db;
}

const pip = {
  name: 'Pip',
  speciesKey: 'budgerigar',
  sex: 'male',
  hatchDate: '2024-04-02',
  ageText: '',
  ringId: 'HL-24-117',
  microchipId: '',
  ownerReference: 'Owner 5521',
  notes: 'Plucks when stressed',
} as const;

describe('procedure records and entries', () => {
  it('logs entries, corrects one with its history and refuses edits in place', async () => {
    const db = await fresh();
    const patient = await createPatientRepository(sqliteClinicDb(db)).create(pip, meta, t0);
    const records = createProcedureRecordRepository(db);
    const entries = createProcedureEntryRepository(db);
    const record = records.create(
      patient.id,
      {
        planId: null,
        startedAt: '2026-12-01T08:30:00.000Z',
        endedAt: null,
        asaGrade: 2,
        emergency: false,
        procedureName: 'Crop biopsy',
        fasting: '1 h',
        cropChecked: 'empty',
        airway: 'mask',
        tubeSizeMm: null,
        tubeType: '',
        circuit: 'nonRebreathing',
        staffInitials: 'RW',
        promptIntervalMin: 5,
      },
      meta,
      t0,
    );
    const blank = {
      vaporPct: null,
      oxygenLpm: null,
      heartRatePerMin: null,
      breathsPerMin: null,
      temperatureC: null,
      etco2Mmhg: null,
      spo2Pct: null,
      eventType: null,
      eventNote: '',
      drugName: '',
      drugDose: '',
    };
    const row = entries.add(
      record.id,
      { ...blank, at: '2026-12-01T08:35:00.000Z', kind: 'vitals', vaporPct: 2, heartRatePerMin: 420 },
      meta,
      t0,
    );
    entries.add(
      record.id,
      { ...blank, at: '2026-12-01T08:32:00.000Z', kind: 'event', eventType: 'induction' },
      meta,
      t0,
    );
    entries.correct(
      row.id,
      { ...row.values, heartRatePerMin: 240 },
      { enteredBy: 'RW', reason: 'Miscounted' },
      t0,
    );
    const listed = entries.list(record.id);
    expect(listed.map((entry) => [entry.values.kind, entry.values.heartRatePerMin, entry.corrected])).toEqual(
      [
        ['event', null, false],
        ['vitals', 240, true],
      ],
    );
    expect(entries.history(row.id).map((entry) => entry.values.heartRatePerMin)).toEqual([240, 420]);
    expect(() => db.prepare('UPDATE procedure_entries SET heart_rate_per_min = 1').run()).toThrow(
      /never changed in place/,
    );
    expect(() => db.prepare('DELETE FROM procedure_entries').run()).toThrow(/never deleted/);
    expect(records.listForPatient(patient.id)).toHaveLength(1);
    expect(records.listRecent(10)[0]?.values.procedureName).toBe('Crop biopsy');
  });

  it('rejects an entry that breaks the table constraints', async () => {
    const db = await fresh();
    expect(() =>
      db
        .prepare(
          "INSERT INTO procedure_entries (record_id, at, kind, entered_at, entered_by) VALUES (999, '2026-12-01T08:00:00Z', 'event', '2026-12-01T08:00:00.000Z', 'RW')",
        )
        .run(),
    ).toThrow(/CHECK constraint failed|FOREIGN KEY/);
  });
});
