import { sqliteClinicDb } from '../../db/clinic-db.js';
import Database from 'better-sqlite3';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { migrate, openDatabase, type TidewingDatabase } from '../../db/connection.js';
import { emergencyDrugsMigration } from '../../db/migrations/0003-emergency-drugs.js';
import { migrations } from '../../db/migrations/index.js';
import {
  createEmergencyDrugRepository,
  DrugCorrectionError,
} from '../../db/repositories/emergency-drug-repository.js';
import { createDispatcher, createHandlers } from '../../main/back-end/handlers.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

const t0 = new Date('2026-12-01T08:00:00Z');
const t1 = new Date('2026-12-01T09:00:00Z');
const meta = { enteredBy: 'RW', reason: '' };
// Neutral placeholder entered "by the clinic": Tidewing ships no drug and no dose.
const drugA = {
  name: 'Drug A',
  concentrationMgPerMl: 1,
  doseLowMgPerKg: 0.5,
  doseHighMgPerKg: 1,
  route: 'IV',
  doseSource: 'Clinic protocol 2026',
  notes: '',
};

function freshFile(): string {
  const temp = temporaryFolder();
  cleanups.push(temp.remove);
  return path.join(temp.folder, 'tidewing.db');
}

function fresh(): TidewingDatabase {
  const db = openDatabase(freshFile());
  cleanups.push(() => db.close());
  return db;
}

describe('migration 3: emergency drugs', () => {
  it('applies on a fresh database after migrations 1 and 2 and creates no drug', () => {
    const db = new Database(freshFile());
    cleanups.push(() => db.close());
    expect(migrations[2]).toBe(emergencyDrugsMigration);
    expect(migrate(db, migrations.slice(0, 3))).toBe(3);
    expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
    expect(db.prepare('SELECT count(*) FROM emergency_drugs').pluck().get()).toBe(0);
  });

  it('refuses a row without a dose source, a high dose below the low one and a zero concentration', () => {
    const db = fresh();
    const insert = (source: string, low: number, high: number | null, concentration: number) =>
      db
        .prepare(
          "INSERT INTO emergency_drugs (name, concentration_mg_per_ml, dose_low_mg_per_kg, dose_high_mg_per_kg, route, dose_source, entered_at, entered_by) VALUES ('X', ?, ?, ?, 'IV', ?, '2026-12-01T08:00:00.000Z', 'RW')",
        )
        .run(concentration, low, high, source);
    expect(() => insert('  ', 1, null, 1)).toThrow(/CHECK/);
    expect(() => insert('Clinic protocol', 2, 1, 1)).toThrow(/CHECK/);
    expect(() => insert('Clinic protocol', 1, null, 0)).toThrow(/CHECK/);
    expect(() => insert('Clinic protocol', 1, 2, 1)).not.toThrow();
  });

  it('never changes or deletes a row in place', () => {
    const db = fresh();
    createEmergencyDrugRepository(db).add(drugA, meta, t0);
    expect(() => db.prepare("UPDATE emergency_drugs SET name = 'Y'").run()).toThrow(/never changed in place/);
    expect(() => db.prepare('DELETE FROM emergency_drugs').run()).toThrow(/never deleted/);
  });
});

describe('emergency drug repository', () => {
  it('lists the current drugs by name; a correction replaces and a void removes, both keeping history', () => {
    const db = fresh();
    const drugs = createEmergencyDrugRepository(db);
    const a = drugs.add(drugA, meta, t0);
    const b = drugs.add({ ...drugA, name: 'Another drug', doseHighMgPerKg: null }, meta, t0);
    expect(drugs.list().map((drug) => drug.values.name)).toEqual(['Another drug', 'Drug A']);

    const corrected = drugs.correct(
      a.id,
      { ...drugA, concentrationMgPerMl: 2 },
      { enteredBy: 'CD', reason: 'New stock is 2 mg/mL' },
      t1,
    );
    expect(corrected?.stamp).toMatchObject({
      correctsId: a.id,
      enteredBy: 'CD',
      reason: 'New stock is 2 mg/mL',
      enteredAt: t1.toISOString(),
    });
    expect(drugs.list().find((drug) => drug.values.name === 'Drug A')?.values.concentrationMgPerMl).toBe(2);

    const voided = drugs.void(b.id, { enteredBy: 'CD', reason: 'No longer stocked' }, t1);
    expect(voided?.voided).toBe(true);
    expect(drugs.list().map((drug) => drug.values.name)).toEqual(['Drug A']);
    expect(db.prepare('SELECT count(*) FROM emergency_drugs').pluck().get()).toBe(4);
  });

  it('refuses to correct a version that was already replaced, and answers null for a missing id', () => {
    const db = fresh();
    const drugs = createEmergencyDrugRepository(db);
    const a = drugs.add(drugA, meta, t0);
    drugs.correct(a.id, { ...drugA, notes: 'first' }, { enteredBy: 'CD', reason: 'note' }, t1);
    expect(() => drugs.correct(a.id, drugA, { enteredBy: 'CD', reason: 'again' }, t1)).toThrow(
      DrugCorrectionError,
    );
    expect(drugs.correct(999, drugA, { enteredBy: 'CD', reason: 'x' }, t1)).toBeNull();
  });
});

describe('drug channels', () => {
  function dispatcher() {
    const db = fresh();
    return createDispatcher(
      createHandlers({
        db,
        clinic: sqliteClinicDb(db),
        appVersion: '0.1.0',
        dataDirectory: '/tmp',
        host: 'browser',
        now: () => t0,
      }),
    );
  }

  it('names the missing dose source in the message and the field', async () => {
    const dispatch = dispatcher();
    const answer = await dispatch('drugs:add', { values: { ...drugA, doseSource: '' }, meta });
    expect(answer).toMatchObject({
      ok: false,
      error: { code: 'invalid-request', field: 'values.doseSource' },
    });
    expect(answer.ok ? '' : answer.error.message).toMatch(/source of the dose/);
  });

  it('names the high dose when it is below the low one, and requires a reason to correct', async () => {
    const dispatch = dispatcher();
    const low = await dispatch('drugs:add', { values: { ...drugA, doseHighMgPerKg: 0.1 }, meta });
    expect(low).toMatchObject({
      ok: false,
      error: { field: 'values.doseHighMgPerKg', message: 'Dose (high) must not be below dose (low).' },
    });
    const added = await dispatch('drugs:add', { values: drugA, meta });
    if (!added.ok) throw new Error(added.error.message);
    const id = (added.value as { id: number }).id;
    const noReason = await dispatch('drugs:correct', { id, values: drugA, meta });
    expect(noReason).toMatchObject({ ok: false, error: { field: 'meta.reason' } });
    const voided = await dispatch('drugs:void', { id, meta: { enteredBy: 'RW', reason: 'Entered twice' } });
    expect(voided).toMatchObject({ ok: true, value: { voided: true } });
    expect(await dispatch('drugs:list', {})).toEqual({ ok: true, value: [] });
    expect(await dispatch('drugs:void', { id: 999, meta: { enteredBy: 'RW', reason: 'x' } })).toMatchObject({
      ok: false,
      error: { code: 'not-found' },
    });
  });
});
