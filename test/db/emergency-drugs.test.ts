import { sqliteClinicDb, type ClinicDb } from '../../db/clinic-db.js';
import Database from 'better-sqlite3';
import { sql } from 'kysely';
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
import { openTestClinic, testEngines } from '../support/clinic-engines.js';
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

async function drugRows(clinic: ClinicDb): Promise<number> {
  const count = await sql<{ n: number }>`SELECT count(*) AS n FROM emergency_drugs`.execute(clinic.kysely);
  return Number(count.rows[0]?.n);
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
});

describe.each(testEngines)('emergency drugs on %s', (engine) => {
  it('refuses a row without a dose source, a high dose below the low one and a zero concentration', async (context) => {
    const clinic = await openTestClinic(engine, context);
    const insert = (source: string, low: number, high: number | null, concentration: number) =>
      sql`INSERT INTO emergency_drugs (name, concentration_mg_per_ml, dose_low_mg_per_kg, dose_high_mg_per_kg, route, dose_source, entered_at, entered_by)
          VALUES ('X', ${concentration}, ${low}, ${high}, 'IV', ${source}, '2026-12-01T08:00:00.000Z', 'RW')`.execute(
        clinic.kysely,
      );
    const checkFailed = /CHECK constraint failed|violates check constraint/i;
    await expect(insert('  ', 1, null, 1)).rejects.toThrow(checkFailed);
    await expect(insert('Clinic protocol', 2, 1, 1)).rejects.toThrow(checkFailed);
    await expect(insert('Clinic protocol', 1, null, 0)).rejects.toThrow(checkFailed);
    await insert('Clinic protocol', 1, 2, 1);
    expect(await drugRows(clinic)).toBe(1);
  });

  it('never changes or deletes a row in place', async (context) => {
    const clinic = await openTestClinic(engine, context);
    await createEmergencyDrugRepository(clinic).add(drugA, meta, t0);
    await expect(sql`UPDATE emergency_drugs SET name = 'Y'`.execute(clinic.kysely)).rejects.toThrow(
      /never changed in place/,
    );
    await expect(sql`DELETE FROM emergency_drugs`.execute(clinic.kysely)).rejects.toThrow(/never deleted/);
  });

  it('lists the current drugs by name; a correction replaces and a void removes, both keeping history', async (context) => {
    const clinic = await openTestClinic(engine, context);
    const drugs = createEmergencyDrugRepository(clinic);
    const a = await drugs.add(drugA, meta, t0);
    const b = await drugs.add({ ...drugA, name: 'another drug', doseHighMgPerKg: null }, meta, t0);
    expect(a).toEqual({
      id: a.id,
      voided: false,
      values: drugA,
      stamp: { versionId: a.id, enteredAt: t0.toISOString(), enteredBy: 'RW', reason: '', correctsId: null },
    });
    // By name whatever the letter case: 'another drug' before 'Drug A'.
    expect((await drugs.list()).map((drug) => drug.values.name)).toEqual(['another drug', 'Drug A']);

    const corrected = await drugs.correct(
      a.id,
      { ...drugA, concentrationMgPerMl: 2.5 },
      { enteredBy: 'CD', reason: 'New stock is 2.5 mg/mL' },
      t1,
    );
    expect(corrected?.stamp).toMatchObject({
      correctsId: a.id,
      enteredBy: 'CD',
      reason: 'New stock is 2.5 mg/mL',
      enteredAt: t1.toISOString(),
    });
    const current = await drugs.list();
    expect(current.find((drug) => drug.values.name === 'Drug A')?.values.concentrationMgPerMl).toBe(2.5);

    const voided = await drugs.void(b.id, { enteredBy: 'CD', reason: 'No longer stocked' }, t1);
    expect(voided?.voided).toBe(true);
    expect(voided?.values.doseHighMgPerKg).toBeNull();
    expect((await drugs.list()).map((drug) => drug.values.name)).toEqual(['Drug A']);
    expect(await drugRows(clinic)).toBe(4);
  });

  it('refuses to correct a replaced version or a voided drug, writing nothing, and answers null for a missing id', async (context) => {
    const clinic = await openTestClinic(engine, context);
    const drugs = createEmergencyDrugRepository(clinic);
    const a = await drugs.add(drugA, meta, t0);
    await drugs.correct(a.id, { ...drugA, notes: 'first' }, { enteredBy: 'CD', reason: 'note' }, t1);
    await expect(drugs.correct(a.id, drugA, { enteredBy: 'CD', reason: 'again' }, t1)).rejects.toThrow(
      DrugCorrectionError,
    );
    expect(await drugs.correct(999, drugA, { enteredBy: 'CD', reason: 'x' }, t1)).toBeNull();
    expect(await drugs.void(999, { enteredBy: 'CD', reason: 'x' }, t1)).toBeNull();
    const b = await drugs.add({ ...drugA, name: 'Drug B' }, meta, t0);
    const voided = await drugs.void(b.id, { enteredBy: 'CD', reason: 'Gone' }, t1);
    await expect(
      drugs.correct(voided?.id ?? 0, drugA, { enteredBy: 'CD', reason: 'Back' }, t1),
    ).rejects.toThrow(/removed from the list/);
    expect(await drugRows(clinic)).toBe(4);
  });
});

describe('drug channels', () => {
  function dispatcher() {
    const db = fresh();
    return createDispatcher(
      createHandlers({
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
    expect(
      await dispatch('drugs:correct', { id, values: drugA, meta: { enteredBy: 'RW', reason: 'y' } }),
    ).toMatchObject({
      ok: false,
      error: { code: 'conflict', field: 'id' },
    });
  });
});
