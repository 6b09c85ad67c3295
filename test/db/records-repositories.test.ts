import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { speciesReference } from '../../app/core/species-reference.js';
import { openDatabase, type TidewingDatabase } from '../../db/connection.js';
import { createPatientRepository } from '../../db/repositories/patient-repository.js';
import { createProcedureEntryRepository } from '../../db/repositories/procedure-entry-repository.js';
import { createProcedureRecordRepository } from '../../db/repositories/procedure-record-repository.js';
import { createSpeciesRepository } from '../../db/repositories/species-repository.js';
import { createWeightRepository, WeightCorrectionError } from '../../db/repositories/weight-repository.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

const t0 = new Date('2026-12-01T08:00:00Z');
const meta = { enteredBy: 'RW', reason: '' };

function fresh(): TidewingDatabase {
  const temp = temporaryFolder();
  const db = openDatabase(path.join(temp.folder, 'tidewing.db'));
  cleanups.push(() => {
    db.close();
    temp.remove();
  });
  createSpeciesRepository(db).seedReference(speciesReference, t0);
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

describe('species repository', () => {
  it('seeds the shipped reference once and never twice', () => {
    const db = fresh();
    const species = createSpeciesRepository(db);
    expect(species.list()).toHaveLength(speciesReference.length);
    expect(species.seedReference(speciesReference, t0)).toBe(0);
    // Pekin duck isoflurane MAC 1.30 +/- 0.23 % (Ludders, Mitchell & Rode 1990)
    const duck = species.list().find((entry) => entry.values.mac.isoflurane?.macPct === 1.3);
    expect(duck?.values.mac.isoflurane?.basis).toMatch(/Ludders/);
  });

  it('keeps the old value and its source when a clinic edits a species', () => {
    const db = fresh();
    const species = createSpeciesRepository(db);
    const before = species.get('budgerigar');
    expect(before).not.toBeNull();
    if (before === null) return;
    const edited = species.correct(
      'budgerigar',
      {
        ...before.values,
        massMaxG: 60,
        massBasis: 'Exhibition budgerigars in our clinic, 30-60 g (common practice)',
      },
      { enteredBy: 'MK', reason: 'Many exhibition birds' },
      new Date('2026-12-02T09:00:00Z'),
    );
    expect(edited?.values.massMaxG).toBe(60);
    const history = species.history('budgerigar');
    expect(history.map((entry) => entry.values.massMaxG)).toEqual([60, before.values.massMaxG]);
    expect(history[1]?.values.massBasis).toBe(before.values.massBasis);
    expect(history[0]?.stamp).toMatchObject({
      enteredBy: 'MK',
      reason: 'Many exhibition birds',
      correctsId: before.stamp.versionId,
    });
    expect(species.list()).toHaveLength(speciesReference.length);
  });

  it('refuses to change or delete a species row in place', () => {
    const db = fresh();
    expect(() =>
      db.prepare("UPDATE species SET mass_max_g = 1 WHERE species_key = 'budgerigar'").run(),
    ).toThrow(/never changed in place/);
    expect(() => db.prepare("DELETE FROM species WHERE species_key = 'budgerigar'").run()).toThrow(
      /never deleted/,
    );
  });
});

describe('patient repository', () => {
  it('creates, corrects with history and finds patients by any identifier', () => {
    const db = fresh();
    const patients = createPatientRepository(db);
    const created = patients.create(pip, meta, t0);
    patients.create({ ...pip, name: 'Kiwi', ringId: 'HL-25-002', ownerReference: 'Owner 7000' }, meta, t0);
    const corrected = patients.correct(
      created.id,
      { ...pip, microchipId: '985112004455667' },
      { enteredBy: 'MK', reason: 'Chip read at check-in' },
      new Date('2026-12-01T09:00:00Z'),
    );
    expect(corrected?.values.microchipId).toBe('985112004455667');
    expect(patients.history(created.id).map((version) => version.values.microchipId)).toEqual([
      '985112004455667',
      '',
    ]);
    expect(patients.search('004455').map((summary) => summary.name)).toEqual(['Pip']);
    expect(patients.search('HL-2').map((summary) => summary.name)).toEqual(['Kiwi', 'Pip']);
    expect(patients.search('budgerigar')).toHaveLength(2);
    expect(patients.search('owner 70').map((summary) => summary.name)).toEqual(['Kiwi']);
    expect(patients.search('Pi').map((summary) => summary.name)).toEqual(['Pip']);
    expect(patients.search('"; DROP TABLE patients; --')).toEqual([]);
    expect(patients.count()).toBe(2);
  });
});

describe('weight repository', () => {
  it('lists current weights, keeps corrections and voids in the history, and refuses a stale correction', () => {
    const db = fresh();
    const patient = createPatientRepository(db).create(pip, meta, t0);
    const weights = createWeightRepository(db);
    const first = weights.add(
      patient.id,
      { weighedOn: '2026-11-01', massG: 34, bodyCondition: 'ideal', weighedBy: 'RW' },
      meta,
      t0,
    );
    const second = weights.add(
      patient.id,
      { weighedOn: '2026-11-30', massG: 3.1, bodyCondition: '', weighedBy: 'RW' },
      meta,
      t0,
    );
    const fixed = weights.correct(
      second.id,
      { ...second.values, massG: 31 },
      { enteredBy: 'RW', reason: 'Decimal point slipped' },
      t0,
    );
    expect(weights.list(patient.id).map((weight) => weight.values.massG)).toEqual([34, 31]);
    expect(() =>
      weights.correct(second.id, { ...second.values, massG: 30 }, { enteredBy: 'RW', reason: 'again' }, t0),
    ).toThrow(WeightCorrectionError);
    expect(weights.history(second.id).map((weight) => weight.values.massG)).toEqual([31, 3.1]);
    weights.void(first.id, { enteredBy: 'RW', reason: 'Wrong bird on the scale' }, t0);
    expect(weights.list(patient.id).map((weight) => weight.values.massG)).toEqual([31]);
    expect(weights.history(first.id).map((weight) => weight.voided)).toEqual([true, false]);
    expect(fixed?.stamp.reason).toBe('Decimal point slipped');
  });
});

describe('procedure records and entries', () => {
  it('logs entries, corrects one with its history and refuses edits in place', () => {
    const db = fresh();
    const patient = createPatientRepository(db).create(pip, meta, t0);
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

  it('rejects an entry that breaks the table constraints', () => {
    const db = fresh();
    expect(() =>
      db
        .prepare(
          "INSERT INTO procedure_entries (record_id, at, kind, entered_at, entered_by) VALUES (999, '2026-12-01T08:00:00Z', 'event', '2026-12-01T08:00:00.000Z', 'RW')",
        )
        .run(),
    ).toThrow(/CHECK constraint failed|FOREIGN KEY/);
  });
});
