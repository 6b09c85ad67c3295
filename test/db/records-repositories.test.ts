import { afterEach, describe, expect, it } from 'vitest';
import { createProcedureEntryRepository } from '../../db/repositories/procedure-entry-repository.js';
import {
  createProcedureRecordRepository,
  RecordVersionMismatchError,
} from '../../db/repositories/procedure-record-repository.js';
import { openTestClinic, testEngines } from '../support/clinic-engines.js';
import { sql } from 'kysely';
import {
  cropBiopsy,
  eventAt,
  insertPatient,
  insertWorkstation,
  renameWorkstation,
  vitalsAt,
} from './support/clinic-rows.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

const t0 = new Date('2026-12-01T08:00:00Z');
const meta = { enteredBy: 'RW', reason: '' };

// Species, patients and weights have their suite on both engines in people-repositories.test.ts.

describe.each(testEngines)('procedure records and entries on %s', (engine) => {
  it('logs entries, corrects one with its history and refuses edits in place', async (context) => {
    const db = await openTestClinic(engine, context);
    const patientId = await insertPatient(db);
    const records = createProcedureRecordRepository(db);
    const entries = createProcedureEntryRepository(db);
    const record = await records.create(patientId, cropBiopsy, meta, t0);
    const row = await entries.add(
      record.id,
      vitalsAt('2026-12-01T08:35:00.000Z', { vaporPct: 2, heartRatePerMin: 420 }),
      meta,
      t0,
    );
    await entries.add(record.id, eventAt('2026-12-01T08:32:00.000Z', 'induction'), meta, t0);
    await entries.correct(
      row.id,
      { ...row.values, heartRatePerMin: 240 },
      { enteredBy: 'RW', reason: 'Miscounted' },
      t0,
    );
    const listed = await entries.list(record.id);
    expect(listed.map((entry) => [entry.values.kind, entry.values.heartRatePerMin, entry.corrected])).toEqual(
      [
        ['event', null, false],
        ['vitals', 240, true],
      ],
    );
    expect((await entries.history(row.id)).map((entry) => entry.values.heartRatePerMin)).toEqual([240, 420]);
    await expect(sql`UPDATE procedure_entries SET heart_rate_per_min = 1`.execute(db.kysely)).rejects.toThrow(
      /never changed in place/,
    );
    await expect(sql`DELETE FROM procedure_entries`.execute(db.kysely)).rejects.toThrow(/never deleted/);
    expect(await records.listForPatient(patientId)).toHaveLength(1);
    expect((await records.listRecent(10))[0]?.values.procedureName).toBe('Crop biopsy');
  });

  it('keeps the agent on each version of the details, and null for a record that never named one', async (context) => {
    const db = await openTestClinic(engine, context);
    const patientId = await insertPatient(db);
    const records = createProcedureRecordRepository(db);
    const record = await records.create(patientId, { ...cropBiopsy, agent: 'sevoflurane' }, meta, t0);
    expect(record.values.agent).toBe('sevoflurane');
    expect((await records.get(record.id))?.values).toEqual({ ...cropBiopsy, agent: 'sevoflurane' });
    await records.correct(
      record.id,
      { ...cropBiopsy, agent: 'isoflurane' },
      { enteredBy: 'MK', reason: 'Isoflurane was given, not sevoflurane' },
      t0,
    );
    expect((await records.history(record.id)).map((version) => version.values.agent)).toEqual([
      'isoflurane',
      'sevoflurane',
    ]);
    expect((await records.listForPatient(patientId))[0]?.values.agent).toBe('isoflurane');
    // A record made before records carried an agent reads back with none: nothing is filled in.
    const older = await records.create(patientId, { ...cropBiopsy, agent: null }, meta, t0);
    expect((await records.get(older.id))?.values.agent).toBeNull();
    const stored = await sql<{
      agent: string | null;
    }>`SELECT agent FROM procedure_record_versions ORDER BY id`.execute(db.kysely);
    expect(stored.rows).toEqual([{ agent: 'sevoflurane' }, { agent: 'isoflurane' }, { agent: null }]);
    // The stored CHECK lists the agents and nothing else; the versions stay append-only.
    await expect(
      sql`INSERT INTO procedure_record_versions (record_id, started_at, procedure_name, airway, circuit, staff_initials, agent, entered_at, entered_by)
          VALUES (${record.id}, ${t0.toISOString()}, 'x', 'mask', 'circle', 'RW', 'halothane', ${t0.toISOString()}, 'RW')`.execute(
        db.kysely,
      ),
    ).rejects.toThrow(/check/i);
    await expect(
      sql`UPDATE procedure_record_versions SET agent = 'desflurane'`.execute(db.kysely),
    ).rejects.toThrow(/never changed in place/);
  });

  it('keeps every version of the details, newest first, and voided rows apart from the log', async (context) => {
    const db = await openTestClinic(engine, context);
    const patientId = await insertPatient(db);
    const records = createProcedureRecordRepository(db);
    const entries = createProcedureEntryRepository(db);
    const record = await records.create(patientId, cropBiopsy, meta, t0);
    const ended = await records.correct(
      record.id,
      { ...cropBiopsy, endedAt: '2026-12-01T09:10:00.000Z' },
      { enteredBy: 'MK', reason: 'Procedure ended' },
      new Date('2026-12-01T09:10:00.000Z'),
    );
    expect(ended).toMatchObject({
      id: record.id,
      patientId,
      values: { endedAt: '2026-12-01T09:10:00.000Z', emergency: false, asaGrade: 2 },
      stamp: { enteredBy: 'MK', correctsId: record.stamp.versionId },
    });
    expect((await records.history(record.id)).map((version) => version.values.endedAt)).toEqual([
      '2026-12-01T09:10:00.000Z',
      null,
    ]);
    expect(await records.get(record.id + 1)).toBeNull();
    expect(await records.correct(record.id + 1, cropBiopsy, meta, t0)).toBeNull();

    const wrong = await entries.add(
      record.id,
      vitalsAt('2026-12-01T08:40:00.000Z', { spo2Pct: 91 }),
      meta,
      t0,
    );
    const voided = await entries.void(wrong.id, { enteredBy: 'RW', reason: 'Probe off the bird' }, t0);
    expect(voided).toMatchObject({ voided: true, values: wrong.values, stamp: { correctsId: wrong.id } });
    expect(await entries.list(record.id)).toEqual([]);
    expect((await entries.voided(record.id)).map((entry) => entry.stamp.reason)).toEqual([
      'Probe off the bird',
    ]);
    expect((await entries.history(wrong.id)).map((entry) => entry.voided)).toEqual([true, false]);
    expect(await entries.correct(999_999, wrong.values, meta, t0)).toBeNull();
  });

  it('stamps each entry with its workstation and shows that workstation by its current name', async (context) => {
    const db = await openTestClinic(engine, context);
    const record = await createProcedureRecordRepository(db).create(
      await insertPatient(db),
      cropBiopsy,
      meta,
      t0,
    );
    const entries = createProcedureEntryRepository(db);
    const theatre = '0c6f1a52-8d1e-4f7b-9a43-2b1f0e9d7c11';
    const prep = '5d2e7b90-1f3c-4a8e-b6d4-9e0f1a2b3c4d';
    await insertWorkstation(db, theatre, 'Theatre 1');
    const fromTheatre = await entries.add(
      record.id,
      vitalsAt('2026-12-01T08:35:00.000Z', { heartRatePerMin: 400 }),
      { ...meta, workstationId: theatre },
      t0,
    );
    // A workstation that never saved its settings has no row: its entries show no name.
    const fromPrep = await entries.add(
      record.id,
      vitalsAt('2026-12-01T08:36:00.000Z', { heartRatePerMin: 390 }),
      { ...meta, workstationId: prep },
      t0,
    );
    // Rows written before entries carried a workstation have none.
    const older = await entries.add(record.id, eventAt('2026-12-01T08:31:00.000Z', 'induction'), meta, t0);
    expect([fromTheatre.workstationName, fromPrep.workstationName, older.workstationName]).toEqual([
      'Theatre 1',
      null,
      null,
    ]);
    await renameWorkstation(db, theatre, 'Theatre A');
    await insertWorkstation(db, prep, 'Prep room');
    expect((await entries.list(record.id)).map((entry) => entry.workstationName)).toEqual([
      null,
      'Theatre A',
      'Prep room',
    ]);
    // A correction from another workstation carries that one; the history shows each version's.
    const corrected = await entries.correct(
      fromTheatre.id,
      { ...fromTheatre.values, heartRatePerMin: 410 },
      { enteredBy: 'MK', reason: 'Miscounted', workstationId: prep },
      t0,
    );
    expect(corrected?.workstationName).toBe('Prep room');
    expect((await entries.history(fromTheatre.id)).map((entry) => entry.workstationName)).toEqual([
      'Prep room',
      'Theatre A',
    ]);
  });

  it('refuses a second correction of the same version: the UNIQUE corrects_id keeps the first', async (context) => {
    const db = await openTestClinic(engine, context);
    const patientId = await insertPatient(db);
    const records = createProcedureRecordRepository(db);
    const entries = createProcedureEntryRepository(db);
    const record = await records.create(patientId, cropBiopsy, meta, t0);
    const row = await entries.add(
      record.id,
      vitalsAt('2026-12-01T08:35:00.000Z', { heartRatePerMin: 420 }),
      meta,
      t0,
    );
    await entries.correct(
      row.id,
      { ...row.values, heartRatePerMin: 240 },
      { enteredBy: 'RW', reason: 'a' },
      t0,
    );
    await expect(
      entries.correct(row.id, { ...row.values, heartRatePerMin: 250 }, { enteredBy: 'MK', reason: 'b' }, t0),
    ).rejects.toThrow(/corrects_id|UNIQUE|duplicate key/);
    await expect(entries.void(row.id, { enteredBy: 'MK', reason: 'c' }, t0)).rejects.toThrow(
      /corrects_id|UNIQUE|duplicate key/,
    );
    expect((await entries.history(row.id)).map((entry) => entry.values.heartRatePerMin)).toEqual([240, 420]);

    // The record's details: a correction naming the version it replaces.
    const first = record.stamp.versionId;
    await records.correct(
      record.id,
      { ...cropBiopsy, fasting: '2 h' },
      { enteredBy: 'RW', reason: 'a' },
      t0,
      first,
    );
    await expect(
      records.correct(
        record.id,
        { ...cropBiopsy, fasting: '3 h' },
        { enteredBy: 'MK', reason: 'b' },
        t0,
        first,
      ),
    ).rejects.toThrow(/corrects_id|UNIQUE|duplicate key/);
    expect((await records.get(record.id))?.values.fasting).toBe('2 h');
    // A version of another record is refused before anything is written.
    const other = await records.create(patientId, cropBiopsy, meta, t0);
    await expect(
      records.correct(record.id, cropBiopsy, { enteredBy: 'MK', reason: 'b' }, t0, other.stamp.versionId),
    ).rejects.toThrow(RecordVersionMismatchError);
    expect(await records.history(record.id)).toHaveLength(2);
  });

  it('rejects an entry that breaks the table constraints', async (context) => {
    const db = await openTestClinic(engine, context);
    await expect(
      sql`INSERT INTO procedure_entries (record_id, at, kind, entered_at, entered_by) VALUES (999, '2026-12-01T08:00:00Z', 'event', '2026-12-01T08:00:00.000Z', 'RW')`.execute(
        db.kysely,
      ),
    ).rejects.toThrow(/CHECK constraint failed|FOREIGN KEY|violates check constraint|violates foreign key/);
  });
});
