import Database from 'better-sqlite3';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { sql, type RawBuilder } from 'kysely';
import type { ClinicDb } from '../../db/clinic-db.js';
import { DatabaseTooNewError, migrate, openDatabase, schemaVersion } from '../../db/connection.js';
import { latestSchemaVersion, migrations, type Migration } from '../../db/migrations/index.js';
import { migratePostgres, postgresSchemaVersion } from '../../db/postgres-connection.js';
import { openTestClinic, testEngines } from '../support/clinic-engines.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

function freshFile(): string {
  const temp = temporaryFolder();
  cleanups.push(temp.remove);
  return path.join(temp.folder, 'tidewing.db');
}

const sha256 = (file: string) => crypto.createHash('sha256').update(fs.readFileSync(file)).digest('hex');

describe('migrations', () => {
  it('are numbered 1..n without gaps', () => {
    expect(migrations.map((migration) => migration.version)).toEqual(
      migrations.map((_migration, index) => index + 1),
    );
    expect(latestSchemaVersion).toBe(migrations.length);
  });

  it.each(migrations.map((migration) => [migration.version, migration.name] as const))(
    'migration %i (%s) applies on a fresh database up to itself',
    (version) => {
      const db = new Database(freshFile());
      cleanups.push(() => db.close());
      expect(migrate(db, migrations.slice(0, version))).toBe(version);
      expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
    },
  );

  it('migration 1 creates the settings and acknowledgement tables with their constraints', () => {
    const db = openDatabase(freshFile());
    cleanups.push(() => db.close());
    const tables = db
      .prepare("SELECT name FROM sqlite_schema WHERE type = 'table' ORDER BY name")
      .pluck()
      .all();
    expect(tables).toEqual(expect.arrayContaining(['clinic_settings', 'safety_acknowledgements']));
    expect(() =>
      db
        .prepare(
          `INSERT INTO clinic_settings (id, clinic_name, address_line, mass_unit, pressure_unit, temperature_unit, default_agent, paper_size, updated_at) VALUES (1, 'A', '', 'lb', 'mmHg', 'C', 'isoflurane', 'A4', 'now')`,
        )
        .run(),
    ).toThrow(/CHECK constraint failed/);
    expect(() =>
      db
        .prepare(
          `INSERT INTO clinic_settings (id, clinic_name, address_line, mass_unit, pressure_unit, temperature_unit, default_agent, paper_size, updated_at) VALUES (2, 'A', '', 'g', 'mmHg', 'C', 'isoflurane', 'A4', 'now')`,
        )
        .run(),
    ).toThrow(/CHECK constraint failed/);
    // Migration 5: settings saved before it read year-month-day; only the listed formats are kept.
    db.prepare(
      `INSERT INTO clinic_settings (id, clinic_name, address_line, mass_unit, pressure_unit, temperature_unit, default_agent, paper_size, updated_at) VALUES (1, 'A', '', 'g', 'mmHg', 'C', 'isoflurane', 'A4', 'now')`,
    ).run();
    expect(db.prepare('SELECT date_format FROM clinic_settings').pluck().get()).toBe('YYYY-MM-DD');
    expect(() => db.prepare("UPDATE clinic_settings SET date_format = 'DD.MM.YY'").run()).toThrow(
      /CHECK constraint failed/,
    );
  });

  it('opens with WAL, foreign keys on, synchronous FULL and a busy timeout', () => {
    const db = openDatabase(freshFile());
    cleanups.push(() => db.close());
    expect(db.pragma('journal_mode', { simple: true })).toBe('wal');
    expect(db.pragma('foreign_keys', { simple: true })).toBe(1);
    expect(db.pragma('synchronous', { simple: true })).toBe(2);
    expect(db.pragma('busy_timeout', { simple: true })).toBe(5000);
    expect(schemaVersion(db)).toBe(latestSchemaVersion);
  });

  it('rolls back a failing migration whole, leaving the version unchanged', () => {
    const db = new Database(freshFile());
    cleanups.push(() => db.close());
    const broken = [
      ...migrations,
      {
        version: migrations.length + 1,
        name: 'broken',
        sql: 'CREATE TABLE half_done (id INTEGER); SELECT nonsense FROM missing_table;',
        postgresql: 'CREATE TABLE half_done (id integer); SELECT nonsense FROM missing_table;',
      },
    ];
    expect(() => migrate(db, broken)).toThrow();
    expect(schemaVersion(db)).toBe(migrations.length);
    expect(db.prepare("SELECT count(*) FROM sqlite_schema WHERE name = 'half_done'").pluck().get()).toBe(0);
  });

  it('refuses a database written by a newer schema and leaves the file byte-for-byte untouched', () => {
    const file = freshFile();
    const writer = new Database(file);
    writer.exec('CREATE TABLE future_things (id INTEGER PRIMARY KEY); INSERT INTO future_things VALUES (1);');
    writer.pragma(`user_version = ${latestSchemaVersion + 5}`);
    writer.close();
    const before = sha256(file);
    const filesBefore = fs.readdirSync(path.dirname(file)).sort();

    expect(() => openDatabase(file)).toThrow(DatabaseTooNewError);
    expect(() => openDatabase(file)).toThrow(/newer version of Tidewing .*schema \d+.*has not been changed/);
    expect(sha256(file)).toBe(before);
    expect(fs.readdirSync(path.dirname(file)).sort()).toEqual(filesBefore);
  });
});

describe('migration 4 (body mass up to 200 kg)', () => {
  it('carries every weight over unchanged, ids and correction chains included, and accepts up to 200 kg', () => {
    const file = freshFile();
    const db = new Database(file);
    cleanups.push(() => db.close());
    db.pragma('foreign_keys = ON');
    migrate(db, migrations.slice(0, 3));
    db.prepare("INSERT INTO patients (id, created_at) VALUES (1, '2026-11-01T08:00:00.000Z')").run();
    const insert = db.prepare(
      `INSERT INTO weights (id, patient_id, corrects_id, voided, weighed_on, mass_g, entered_at, entered_by, reason)
       VALUES (?, 1, ?, ?, ?, ?, '2026-11-01T08:00:00.000Z', 'RW', ?)`,
    );
    insert.run(1, null, 0, '2026-11-01', 5e-324, '');
    insert.run(2, 1, 0, '2026-11-01', 32, 'typing error');
    insert.run(3, null, 0, '2023-02-30', 20000, '');
    insert.run(4, 3, 1, '2023-02-30', 20000, 'entered in error');
    const before = db.prepare('SELECT * FROM weights ORDER BY id').all();

    expect(migrate(db, migrations.slice(0, 4))).toBe(4);
    expect(db.prepare('SELECT * FROM weights ORDER BY id').all()).toEqual(before);
    expect(db.pragma('foreign_key_check')).toEqual([]);
    expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
    // An ostrich-sized bird: 150 kg fits; above 200 kg does not.
    insert.run(5, null, 0, '2026-11-02', 150_000, '');
    expect(() => insert.run(6, null, 0, '2026-11-02', 200_001, '')).toThrow(/CHECK constraint failed/);
    expect(() => insert.run(7, 99, 0, '2026-11-02', 30, '')).toThrow(/FOREIGN KEY constraint failed/);
    expect(() => insert.run(8, 5, 0, '2026-11-02', 30, '')).not.toThrow();
    expect(() => insert.run(9, 5, 0, '2026-11-02', 30, '')).toThrow(/UNIQUE constraint failed/);
    expect(() => db.prepare('UPDATE weights SET mass_g = 1 WHERE id = 2').run()).toThrow(/never changed/);
    expect(() => db.prepare('DELETE FROM weights WHERE id = 2').run()).toThrow(/never deleted/);
    expect(
      db.prepare("SELECT sql FROM sqlite_schema WHERE name = 'weights'").pluck().get() as string,
    ).toContain('REFERENCES "weights"');
  });
});

describe('migration 6 (clinic evidence)', () => {
  it('keeps exclusions and the calibration switch as rows never changed, each with who and why', () => {
    const file = freshFile();
    const db = new Database(file);
    cleanups.push(() => db.close());
    db.pragma('foreign_keys = ON');
    expect(migrate(db, migrations.slice(0, 6))).toBe(6);
    db.prepare("INSERT INTO patients (id, created_at) VALUES (1, '2026-11-01T08:00:00.000Z')").run();
    db.prepare(
      "INSERT INTO procedure_records (id, patient_id, created_at) VALUES (1, 1, '2026-11-01T08:00:00.000Z')",
    ).run();
    const exclude = db.prepare(
      "INSERT INTO evidence_exclusions (record_id, excluded, reason, entered_at, entered_by) VALUES (?, ?, ?, '2026-11-01T08:00:00.000Z', 'RW')",
    );
    exclude.run(1, 1, 'premedicated with midazolam');
    expect(() => exclude.run(1, 1, '  ')).toThrow(/CHECK constraint failed/);
    expect(() => exclude.run(2, 1, 'no such record')).toThrow(/FOREIGN KEY constraint failed/);
    expect(() => exclude.run(1, 2, 'neither')).toThrow(/CHECK constraint failed/);
    expect(() => db.prepare('UPDATE evidence_exclusions SET excluded = 0').run()).toThrow(/never changed/);
    expect(() => db.prepare('DELETE FROM evidence_exclusions').run()).toThrow(/never deleted/);
    const toggle = db.prepare(
      "INSERT INTO evidence_calibration_switch (calibration_on, reason, entered_at, entered_by) VALUES (?, '', '2026-11-01T08:00:00.000Z', 'RW')",
    );
    toggle.run(0);
    expect(() => toggle.run(3)).toThrow(/CHECK constraint failed/);
    expect(() => db.prepare('DELETE FROM evidence_calibration_switch').run()).toThrow(/never deleted/);
  });
});

describe('migration 7 (workstations)', () => {
  it('keeps one row per workstation id with a name, a theme of the three choices and short initials', () => {
    const db = new Database(freshFile());
    cleanups.push(() => db.close());
    migrate(db, migrations.slice(0, 6));
    expect(migrate(db, migrations.slice(0, 7))).toBe(7);
    const insert = db.prepare(
      'INSERT INTO workstations (id, name, theme, initials, updated_at) VALUES (?, ?, ?, ?, ?)',
    );
    const at = '2026-12-01T09:30:00.000Z';
    insert.run('0b7e8a52-2f4c-4d0e-9a57-1c2d3e4f5a6b', 'Theatre 1', 'dim', 'RW', at);
    expect(db.prepare('SELECT name, theme, initials FROM workstations').get()).toEqual({
      name: 'Theatre 1',
      theme: 'dim',
      initials: 'RW',
    });
    expect(() => insert.run('0b7e8a52-2f4c-4d0e-9a57-1c2d3e4f5a6b', 'Again', 'light', '', at)).toThrow(
      /UNIQUE constraint failed|PRIMARY KEY/,
    );
    expect(() => insert.run('1b7e8a52-2f4c-4d0e-9a57-1c2d3e4f5a6b', 'Prep', 'dark', '', at)).toThrow(
      /CHECK constraint failed/,
    );
    expect(() => insert.run('2b7e8a52-2f4c-4d0e-9a57-1c2d3e4f5a6b', '   ', 'light', '', at)).toThrow(
      /CHECK constraint failed/,
    );
    expect(() =>
      insert.run('3b7e8a52-2f4c-4d0e-9a57-1c2d3e4f5a6b', 'Prep', 'light', 'x'.repeat(41), at),
    ).toThrow(/CHECK constraint failed/);
    expect(() => insert.run('short', 'Prep', 'light', '', at)).toThrow(/CHECK constraint failed/);
    expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
  });
});

describe('migration 8 (plan variants)', () => {
  it('marks a variant plan by the plan it was compared with and keeps every choice unchanged', () => {
    const db = new Database(freshFile());
    cleanups.push(() => db.close());
    migrate(db, migrations.slice(0, 7));
    const at = '2026-12-01T09:30:00.000Z';
    const plan = db.prepare(
      `INSERT INTO plans (patient_id, corrects_id, planned_for, label, input_json, result_json, checklist_json, model_version, entered_at, entered_by, reason)
       VALUES (NULL, NULL, '2026-12-02', 'Before', '{}', '{}', '{}', 'm1', ?, 'RW', '')`,
    );
    const before = Number(plan.run(at).lastInsertRowid);
    expect(migrate(db, migrations.slice(0, 8))).toBe(8);
    // A plan saved before the migration is in no comparison.
    expect(db.prepare('SELECT variant_of FROM plans WHERE id = ?').get(before)).toEqual({ variant_of: null });
    const variant = Number(
      db
        .prepare(
          `INSERT INTO plans (patient_id, corrects_id, variant_of, planned_for, label, input_json, result_json, checklist_json, model_version, entered_at, entered_by, reason)
           VALUES (NULL, NULL, ?, '2026-12-02', 'Variant', '{}', '{}', '{}', 'm1', ?, 'RW', '')`,
        )
        .run(before, at).lastInsertRowid,
    );
    const choose = db.prepare(
      'INSERT INTO plan_choices (comparison_id, chosen_id, entered_at, entered_by, reason) VALUES (?, ?, ?, ?, ?)',
    );
    choose.run(before, variant, at, 'RW', '');
    expect(() => choose.run(before, variant, at, '  ', '')).toThrow(/CHECK constraint failed/);
    expect(() => db.prepare('UPDATE plan_choices SET chosen_id = ?').run(before)).toThrow(/never changed/);
    expect(() => db.prepare('DELETE FROM plan_choices').run()).toThrow(/never deleted/);
    expect(() => db.prepare('UPDATE plans SET variant_of = NULL').run()).toThrow(/never changed/);
    expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
  });
});

describe('migration 9 (evidence prediction cache)', () => {
  it('keeps one derived row per record, replaced when stale, with no triggers and no tie to the clinical tables', () => {
    const db = new Database(freshFile());
    cleanups.push(() => db.close());
    db.pragma('foreign_keys = ON');
    const version = migrations.findIndex((migration) => migration.name === 'evidence prediction cache') + 1;
    migrate(db, migrations.slice(0, version - 1));
    expect(migrate(db, migrations.slice(0, version))).toBe(version);
    const upsert = db.prepare(
      `INSERT INTO evidence_prediction_cache (record_id, cache_key, row_json, computed_at) VALUES (?, ?, ?, ?)
       ON CONFLICT (record_id) DO UPDATE SET cache_key = excluded.cache_key, row_json = excluded.row_json,
         computed_at = excluded.computed_at`,
    );
    const at = '2026-12-01T09:30:00.000Z';
    // Derived data: a row for a record id the clinic does not hold is allowed (no foreign key).
    upsert.run(1, 'model-1|4|3:9|2|1', '{"recordId":1}', at);
    upsert.run(1, 'model-1|5|3:9|2|1', '{"recordId":1,"staffInitials":"RW"}', '2026-12-02T08:00:00.000Z');
    expect(db.prepare('SELECT cache_key, row_json FROM evidence_prediction_cache').all()).toEqual([
      { cache_key: 'model-1|5|3:9|2|1', row_json: '{"recordId":1,"staffInitials":"RW"}' },
    ]);
    expect(() => upsert.run(2, '', '{}', at)).toThrow(/CHECK constraint failed/);
    expect(() => upsert.run(2, 'k', 'not json', at)).toThrow(/CHECK constraint failed/);
    expect(() => upsert.run(2, 'k', '{}', '2026-12-01')).toThrow(/CHECK constraint failed/);
    // Unlike the clinical tables, emptying it is allowed: the rows are computed again.
    expect(db.prepare('DELETE FROM evidence_prediction_cache').run().changes).toBe(1);
    expect(
      db
        .prepare(
          "SELECT count(*) FROM sqlite_schema WHERE type = 'trigger' AND tbl_name = 'evidence_prediction_cache'",
        )
        .pluck()
        .get(),
    ).toBe(0);
    expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
  });
});

// ---------------------------------------------------------------------------------------------
// Both engines: the PostgreSQL text of every migration builds the same schema as SQLite's.

/** Brings `db` up to the end of `list` on its engine; returns the schema version reached. */
async function migrateOn(db: ClinicDb, list: readonly Migration[]): Promise<number> {
  return db.sqlite === null ? migratePostgres(db, list) : migrate(db.sqlite, list);
}

async function versionOf(db: ClinicDb): Promise<number> {
  return db.sqlite === null ? postgresSchemaVersion(db) : schemaVersion(db.sqlite);
}

/** The constraint a failure is, from either engine's error code. */
type Refusal = 'check' | 'foreign key' | 'unique' | 'not null' | 'append-only';
const sqliteCodes: Readonly<Record<string, Refusal>> = {
  SQLITE_CONSTRAINT_CHECK: 'check',
  SQLITE_CONSTRAINT_FOREIGNKEY: 'foreign key',
  SQLITE_CONSTRAINT_UNIQUE: 'unique',
  SQLITE_CONSTRAINT_PRIMARYKEY: 'unique',
  SQLITE_CONSTRAINT_NOTNULL: 'not null',
  SQLITE_CONSTRAINT_TRIGGER: 'append-only',
};
const postgresCodes: Readonly<Record<string, Refusal>> = {
  '23514': 'check',
  '23503': 'foreign key',
  '23505': 'unique',
  '23502': 'not null',
  P0001: 'append-only',
};

/** What `query` was refused with (kind and message); fails the test when it was not refused. */
async function refusal(
  db: ClinicDb,
  query: RawBuilder<unknown>,
): Promise<{ kind: Refusal; message: string }> {
  try {
    await query.execute(db.kysely);
  } catch (error) {
    const code = String((error as { code?: unknown }).code);
    const kind = (db.engine === 'sqlite' ? sqliteCodes : postgresCodes)[code];
    if (kind === undefined) throw error;
    return { kind, message: (error as Error).message };
  }
  throw new Error(`Not refused: ${query.compile(db.kysely).sql}`);
}

const at = '2026-12-01T09:30:00.000Z';

/** One row in every clinical table (ids 1), through the same SQL on both engines. */
async function oneOfEach(db: ClinicDb): Promise<void> {
  for (const statement of [
    sql`INSERT INTO species (id, species_key, origin, common_name, mass_min_g, mass_max_g, mass_basis, entered_at, entered_by)
        VALUES (1, 'testbird', 'clinic', 'Test bird', 10, 20, 'test row', ${at}, 'RW')`,
    sql`INSERT INTO patients (id, created_at) VALUES (1, ${at})`,
    sql`INSERT INTO patient_versions (id, patient_id, name, species_key, sex, entered_at, entered_by)
        VALUES (1, 1, 'Pip', 'testbird', 'female', ${at}, 'RW')`,
    sql`INSERT INTO patient_current (patient_id, version_id) VALUES (1, 1)`,
    sql`INSERT INTO patient_search (rowid, search_text) VALUES (1, 'Pip Test bird')`,
    sql`INSERT INTO weights (id, patient_id, weighed_on, mass_g, entered_at, entered_by)
        VALUES (1, 1, '2026-12-01', 350, ${at}, 'RW')`,
    sql`INSERT INTO plans (id, patient_id, planned_for, input_json, result_json, model_version, entered_at, entered_by)
        VALUES (1, 1, '2026-12-02', '{}', '{}', 'm1', ${at}, 'RW')`,
    sql`INSERT INTO plan_choices (id, comparison_id, chosen_id, entered_at, entered_by) VALUES (1, 1, 1, ${at}, 'RW')`,
    sql`INSERT INTO procedure_records (id, patient_id, created_at) VALUES (1, 1, ${at})`,
    sql`INSERT INTO procedure_record_versions (id, record_id, plan_id, started_at, procedure_name, airway, circuit, staff_initials, entered_at, entered_by)
        VALUES (1, 1, 1, ${at}, 'Wing radiographs', 'mask', 'nonRebreathing', 'RW', ${at}, 'RW')`,
    sql`INSERT INTO procedure_entries (id, record_id, at, kind, heart_rate_per_min, entered_at, entered_by)
        VALUES (1, 1, ${at}, 'vitals', 280, ${at}, 'RW')`,
    sql`INSERT INTO emergency_drugs (id, name, concentration_mg_per_ml, dose_low_mg_per_kg, route, dose_source, entered_at, entered_by)
        VALUES (1, 'Drug A', 1, 1, 'IV', 'Clinic protocol 2026', ${at}, 'RW')`,
    sql`INSERT INTO evidence_exclusions (id, record_id, excluded, reason, entered_at, entered_by)
        VALUES (1, 1, 1, 'premedicated', ${at}, 'RW')`,
    sql`INSERT INTO evidence_calibration_switch (id, calibration_on, entered_at, entered_by) VALUES (1, 0, ${at}, 'RW')`,
  ])
    await statement.execute(db.kysely);
}

/** Every table whose rows are never changed or deleted, with the remedy its refusals name. */
const appendOnlyTables: readonly { table: string; changed: string; deleted: string }[] = [
  ...[
    'species',
    'patients',
    'patient_versions',
    'weights',
    'plans',
    'procedure_records',
    'procedure_record_versions',
    'procedure_entries',
    'emergency_drugs',
  ].map((table) => ({ table, changed: 'add a correction', deleted: 'add a correction that voids the row' })),
  ...['evidence_exclusions', 'evidence_calibration_switch'].map((table) => ({
    table,
    changed: 'add a later row',
    deleted: 'add a later row',
  })),
  { table: 'plan_choices', changed: 'add a new choice', deleted: 'add a new choice' },
];

describe.each(testEngines)('migrations on %s', (engine) => {
  it.for(migrations.map((migration) => [migration.version, migration.name] as const))(
    'migration %i (%s) applies on a fresh database up to itself',
    async ([version], context) => {
      const db = await openTestClinic(engine, context, { migrations: [] });
      expect(await migrateOn(db, migrations.slice(0, version))).toBe(version);
      expect(await versionOf(db)).toBe(version);
    },
  );

  it('brings a fresh database to the latest schema, and opening it again changes nothing', async (context) => {
    const db = await openTestClinic(engine, context);
    expect(await versionOf(db)).toBe(latestSchemaVersion);
    expect(await migrateOn(db, migrations)).toBe(latestSchemaVersion);
  });

  it('rolls back a failing migration whole, leaving the version unchanged', async (context) => {
    const db = await openTestClinic(engine, context);
    const broken: Migration[] = [
      ...migrations,
      {
        version: migrations.length + 1,
        name: 'broken',
        sql: 'CREATE TABLE half_done (id INTEGER); SELECT nonsense FROM missing_table;',
        postgresql: 'CREATE TABLE half_done (id integer); SELECT nonsense FROM missing_table;',
      },
    ];
    await expect(migrateOn(db, broken)).rejects.toThrow(/missing_table/);
    expect(await versionOf(db)).toBe(latestSchemaVersion);
    expect(await tableNames(db)).not.toContain('half_done');
  });

  it('migration 1 keeps one settings row of the listed units; migration 5 adds the date format', async (context) => {
    const db = await openTestClinic(engine, context);
    const settings = (id: number, massUnit: string) =>
      sql`INSERT INTO clinic_settings (id, clinic_name, address_line, mass_unit, pressure_unit, temperature_unit, default_agent, paper_size, updated_at)
          VALUES (${id}, 'A', '', ${massUnit}, 'mmHg', 'C', 'isoflurane', 'A4', 'now')`;
    expect((await refusal(db, settings(1, 'lb'))).kind).toBe('check');
    expect((await refusal(db, settings(2, 'g'))).kind).toBe('check');
    await settings(1, 'g').execute(db.kysely);
    const row = await sql<{ date_format: string }>`SELECT date_format FROM clinic_settings`.execute(
      db.kysely,
    );
    expect(row.rows).toEqual([{ date_format: 'YYYY-MM-DD' }]);
    expect((await refusal(db, sql`UPDATE clinic_settings SET date_format = 'DD.MM.YY'`)).kind).toBe('check');
    expect((await refusal(db, settings(1, 'kg'))).kind).toBe('unique');
  });

  it('migration 4 carries every weight over unchanged and accepts up to 200 kg', async (context) => {
    const db = await openTestClinic(engine, context, { migrations: [] });
    await migrateOn(db, migrations.slice(0, 3));
    await sql`INSERT INTO patients (id, created_at) VALUES (1, '2026-11-01T08:00:00.000Z')`.execute(
      db.kysely,
    );
    const insert = (
      id: number,
      correctsId: number | null,
      voided: number,
      on: string,
      mass: number,
      reason = '',
    ) =>
      sql`INSERT INTO weights (id, patient_id, corrects_id, voided, weighed_on, mass_g, entered_at, entered_by, reason)
          VALUES (${id}, 1, ${correctsId}, ${voided}, ${on}, ${mass}, '2026-11-01T08:00:00.000Z', 'RW', ${reason})`;
    await insert(1, null, 0, '2026-11-01', 5e-324).execute(db.kysely);
    await insert(2, 1, 0, '2026-11-01', 32, 'typing error').execute(db.kysely);
    await insert(3, null, 0, '2023-02-30', 20000).execute(db.kysely);
    await insert(4, 3, 1, '2023-02-30', 20000, 'entered in error').execute(db.kysely);
    expect((await refusal(db, insert(5, null, 0, '2026-11-02', 20_001))).kind).toBe('check');
    const all = sql`SELECT * FROM weights ORDER BY id`;
    const before = (await all.execute(db.kysely)).rows;

    expect(await migrateOn(db, migrations.slice(0, 4))).toBe(4);
    expect((await all.execute(db.kysely)).rows).toEqual(before);
    // An ostrich-sized bird: 150 kg fits; above 200 kg does not.
    await insert(5, null, 0, '2026-11-02', 150_000).execute(db.kysely);
    expect((await refusal(db, insert(6, null, 0, '2026-11-02', 200_001))).kind).toBe('check');
    expect((await refusal(db, insert(7, 99, 0, '2026-11-02', 30))).kind).toBe('foreign key');
    await insert(8, 5, 0, '2026-11-02', 30).execute(db.kysely);
    expect((await refusal(db, insert(9, 5, 0, '2026-11-02', 30))).kind).toBe('unique');
    expect(await refusal(db, sql`UPDATE weights SET mass_g = 1 WHERE id = 2`)).toEqual({
      kind: 'append-only',
      message: 'weights rows are never changed in place; add a correction',
    });
    expect(await refusal(db, sql`DELETE FROM weights WHERE id = 2`)).toEqual({
      kind: 'append-only',
      message: 'weights rows are never deleted; add a correction that voids the row',
    });
  });

  it('migration 6 keeps exclusions and the calibration switch as rows never changed', async (context) => {
    const db = await openTestClinic(engine, context, { migrations: migrations.slice(0, 6) });
    await sql`INSERT INTO patients (id, created_at) VALUES (1, ${at})`.execute(db.kysely);
    await sql`INSERT INTO procedure_records (id, patient_id, created_at) VALUES (1, 1, ${at})`.execute(
      db.kysely,
    );
    const exclude = (recordId: number, excluded: number, reason: string) =>
      sql`INSERT INTO evidence_exclusions (record_id, excluded, reason, entered_at, entered_by)
          VALUES (${recordId}, ${excluded}, ${reason}, ${at}, 'RW')`;
    await exclude(1, 1, 'premedicated with midazolam').execute(db.kysely);
    expect((await refusal(db, exclude(1, 1, '  '))).kind).toBe('check');
    expect((await refusal(db, exclude(2, 1, 'no such record'))).kind).toBe('foreign key');
    expect((await refusal(db, exclude(1, 2, 'neither'))).kind).toBe('check');
    expect((await refusal(db, sql`UPDATE evidence_exclusions SET excluded = 0`)).kind).toBe('append-only');
    expect((await refusal(db, sql`DELETE FROM evidence_exclusions`)).kind).toBe('append-only');
    const toggle = (on: number) =>
      sql`INSERT INTO evidence_calibration_switch (calibration_on, reason, entered_at, entered_by)
          VALUES (${on}, '', ${at}, 'RW')`;
    await toggle(0).execute(db.kysely);
    expect((await refusal(db, toggle(3))).kind).toBe('check');
    expect((await refusal(db, sql`DELETE FROM evidence_calibration_switch`)).kind).toBe('append-only');
  });

  it('migration 7 keeps one row per workstation id, replaceable, with a theme of the three choices', async (context) => {
    const db = await openTestClinic(engine, context, { migrations: migrations.slice(0, 7) });
    const insert = (id: string, name: string, theme: string, initials: string) =>
      sql`INSERT INTO workstations (id, name, theme, initials, updated_at) VALUES (${id}, ${name}, ${theme}, ${initials}, ${at})`;
    await insert('0b7e8a52-2f4c-4d0e-9a57-1c2d3e4f5a6b', 'Theatre 1', 'dim', 'RW').execute(db.kysely);
    const read = sql`SELECT name, theme, initials FROM workstations`;
    expect((await read.execute(db.kysely)).rows).toEqual([
      { name: 'Theatre 1', theme: 'dim', initials: 'RW' },
    ]);
    expect(
      (await refusal(db, insert('0b7e8a52-2f4c-4d0e-9a57-1c2d3e4f5a6b', 'Again', 'light', ''))).kind,
    ).toBe('unique');
    expect((await refusal(db, insert('1b7e8a52-2f4c-4d0e-9a57-1c2d3e4f5a6b', 'Prep', 'dark', ''))).kind).toBe(
      'check',
    );
    expect((await refusal(db, insert('2b7e8a52-2f4c-4d0e-9a57-1c2d3e4f5a6b', '   ', 'light', ''))).kind).toBe(
      'check',
    );
    expect(
      (await refusal(db, insert('3b7e8a52-2f4c-4d0e-9a57-1c2d3e4f5a6b', 'Prep', 'light', 'x'.repeat(41))))
        .kind,
    ).toBe('check');
    expect((await refusal(db, insert('short', 'Prep', 'light', ''))).kind).toBe('check');
    await sql`UPDATE workstations SET theme = 'light'`.execute(db.kysely);
    expect((await read.execute(db.kysely)).rows).toEqual([
      { name: 'Theatre 1', theme: 'light', initials: 'RW' },
    ]);
  });

  it('migration 8 marks a variant by the plan it was compared with and keeps every choice', async (context) => {
    const db = await openTestClinic(engine, context, { migrations: migrations.slice(0, 7) });
    const saved = await sql<{ id: number }>`
      INSERT INTO plans (patient_id, corrects_id, planned_for, label, input_json, result_json, checklist_json, model_version, entered_at, entered_by, reason)
      VALUES (NULL, NULL, '2026-12-02', 'Before', '{}', '{}', '{}', 'm1', ${at}, 'RW', '') RETURNING id`.execute(
      db.kysely,
    );
    const before = saved.rows[0]?.id ?? 0;
    expect(await migrateOn(db, migrations.slice(0, 8))).toBe(8);
    // A plan saved before the migration is in no comparison.
    const variantOf = await sql<{
      variant_of: number | null;
    }>`SELECT variant_of FROM plans WHERE id = ${before}`.execute(db.kysely);
    expect(variantOf.rows).toEqual([{ variant_of: null }]);
    const added = await sql<{ id: number }>`
      INSERT INTO plans (patient_id, corrects_id, variant_of, planned_for, label, input_json, result_json, checklist_json, model_version, entered_at, entered_by, reason)
      VALUES (NULL, NULL, ${before}, '2026-12-02', 'Variant', '{}', '{}', '{}', 'm1', ${at}, 'RW', '') RETURNING id`.execute(
      db.kysely,
    );
    const variant = added.rows[0]?.id ?? 0;
    expect(variant).toBeGreaterThan(before);
    const choose = (enteredBy: string) =>
      sql`INSERT INTO plan_choices (comparison_id, chosen_id, entered_at, entered_by, reason)
          VALUES (${before}, ${variant}, ${at}, ${enteredBy}, '')`;
    await choose('RW').execute(db.kysely);
    expect((await refusal(db, choose('  '))).kind).toBe('check');
    expect((await refusal(db, sql`UPDATE plan_choices SET chosen_id = ${before}`)).kind).toBe('append-only');
    expect((await refusal(db, sql`DELETE FROM plan_choices`)).kind).toBe('append-only');
    expect((await refusal(db, sql`UPDATE plans SET variant_of = NULL`)).kind).toBe('append-only');
    expect(
      (
        await refusal(
          db,
          sql`INSERT INTO plans (variant_of, planned_for, input_json, result_json, model_version, entered_at, entered_by)
      VALUES (999, '2026-12-02', '{}', '{}', 'm1', ${at}, 'RW')`,
        )
      ).kind,
    ).toBe('foreign key');
  });

  it('migration 9 keeps one derived row per record, replaceable and deletable, with no tie to the records', async (context) => {
    const db = await openTestClinic(engine, context, { migrations: migrations.slice(0, 9) });
    const upsert = (recordId: number, key: string, json: string, computedAt: string) =>
      sql`INSERT INTO evidence_prediction_cache (record_id, cache_key, row_json, computed_at) VALUES (${recordId}, ${key}, ${json}, ${computedAt})
          ON CONFLICT (record_id) DO UPDATE SET cache_key = excluded.cache_key, row_json = excluded.row_json,
            computed_at = excluded.computed_at`;
    // Derived data: a row for a record id the clinic does not hold is allowed (no foreign key).
    await upsert(1, 'model-1|4|3:9|2|1', '{"recordId":1}', at).execute(db.kysely);
    await upsert(
      1,
      'model-1|5|3:9|2|1',
      '{"recordId":1,"staffInitials":"RW"}',
      '2026-12-02T08:00:00.000Z',
    ).execute(db.kysely);
    expect(
      (await sql`SELECT cache_key, row_json FROM evidence_prediction_cache`.execute(db.kysely)).rows,
    ).toEqual([{ cache_key: 'model-1|5|3:9|2|1', row_json: '{"recordId":1,"staffInitials":"RW"}' }]);
    expect((await refusal(db, upsert(2, '', '{}', at))).kind).toBe('check');
    expect((await refusal(db, upsert(2, 'k', 'not json', at))).kind).toBe('check');
    expect((await refusal(db, upsert(2, 'k', '{}', '2026-12-01'))).kind).toBe('check');
    // Unlike the clinical tables, emptying it is allowed: the rows are computed again.
    expect(
      Number((await sql`DELETE FROM evidence_prediction_cache`.execute(db.kysely)).numAffectedRows),
    ).toBe(1);
  });

  it('refuses UPDATE and DELETE on every record table with the same message on both engines', async (context) => {
    const db = await openTestClinic(engine, context);
    await oneOfEach(db);
    expect((await tablesWithTriggers(db)).sort()).toEqual(appendOnlyTables.map(({ table }) => table).sort());
    for (const { table, changed, deleted } of appendOnlyTables) {
      const name = sql.table(table);
      expect(await refusal(db, sql`UPDATE ${name} SET id = id WHERE id = 1`)).toEqual({
        kind: 'append-only',
        message: `${table} rows are never changed in place; ${changed}`,
      });
      expect(await refusal(db, sql`DELETE FROM ${name} WHERE id = 1`)).toEqual({
        kind: 'append-only',
        message: `${table} rows are never deleted; ${deleted}`,
      });
      expect(await refusal(db, sql`DELETE FROM ${name}`)).toEqual({
        kind: 'append-only',
        message: `${table} rows are never deleted; ${deleted}`,
      });
    }
    // The derived tables beside the records stay writable: the current-version pointer, the
    // patient search text (deleted and written again with each version) and the prediction cache.
    await sql`INSERT INTO patient_current (patient_id, version_id) VALUES (1, 1)
      ON CONFLICT (patient_id) DO UPDATE SET version_id = excluded.version_id`.execute(db.kysely);
    await sql`DELETE FROM patient_search WHERE rowid = ${1}`.execute(db.kysely);
    await sql`INSERT INTO patient_search (rowid, search_text) VALUES (${1}, ${'Pip Test bird RING-7'})`.execute(
      db.kysely,
    );
    const search = await sql<{ rowid: number }>`SELECT rowid FROM patient_search`.execute(db.kysely);
    expect(search.rows).toEqual([{ rowid: 1 }]);
  });

  it('refuses the same bad values on both engines', async (context) => {
    const db = await openTestClinic(engine, context);
    await oneOfEach(db);
    const weight = (on: string, mass: number) =>
      sql`INSERT INTO weights (patient_id, weighed_on, mass_g, entered_at, entered_by) VALUES (1, ${on}, ${mass}, ${at}, 'RW')`;
    expect((await refusal(db, weight('1 Dec 2026', 350))).kind).toBe('check');
    expect((await refusal(db, weight('26-12-01', 350))).kind).toBe('check');
    expect((await refusal(db, weight('2026-12-01', -5))).kind).toBe('check');
    expect((await refusal(db, weight('2026-12-01', 0))).kind).toBe('check');
    // A time after the date is allowed for a weighing, as on SQLite (GLOB '....-..-..*').
    await weight('2026-12-01T10:00', 350).execute(db.kysely);

    const hatch = (date: string) =>
      sql`INSERT INTO patient_versions (patient_id, name, species_key, sex, hatch_date, entered_at, entered_by)
          VALUES (1, 'Pip', 'testbird', 'female', ${date}, ${at}, 'RW')`;
    expect((await refusal(db, hatch('2026-12-1'))).kind).toBe('check');
    expect((await refusal(db, hatch('2026-12-01T00:00'))).kind).toBe('check');
    await hatch('2026-12-01').execute(db.kysely);

    const plan = (day: string, input: string) =>
      sql`INSERT INTO plans (planned_for, input_json, result_json, model_version, entered_at, entered_by)
          VALUES (${day}, ${input}, '{}', 'm1', ${at}, 'RW')`;
    expect((await refusal(db, plan('2026-12-02', '{"massG": 350'))).kind).toBe('check');
    expect((await refusal(db, plan('2026-12-02', "{'massG': 350}"))).kind).toBe('check');
    expect((await refusal(db, plan('2026-12-02', ''))).kind).toBe('check');
    expect((await refusal(db, plan('02/12/2026', '{}'))).kind).toBe('check');
    await plan('2026-12-02', '{"massG": 350, "notes": ["a", 1.5e3, null, true]}').execute(db.kysely);

    const species = (key: string, notes: string) =>
      sql`INSERT INTO species (species_key, origin, common_name, mass_min_g, mass_max_g, mass_basis, anatomy_notes_json, entered_at, entered_by)
          VALUES (${key}, 'clinic', 'Other bird', 10, 20, 'test row', ${notes}, ${at}, 'RW')`;
    expect((await refusal(db, species('otherbird', '{}'))).kind).toBe('check');
    expect((await refusal(db, species('otherbird', '"a note"'))).kind).toBe('check');
    expect((await refusal(db, species('otherbird', '[unquoted]'))).kind).toBe('check');
    expect((await refusal(db, species('Otherbird', '[]'))).kind).toBe('check');
    expect((await refusal(db, species('-otherbird', '[]'))).kind).toBe('check');
    expect((await refusal(db, species('testbird', '[]'))).kind).toBe('unique');
    await species('otherbird', '["air sacs"]').execute(db.kysely);

    expect(
      (
        await refusal(
          db,
          sql`INSERT INTO procedure_entries (record_id, at, kind, entered_at, entered_by) VALUES (1, ${at}, 'event', ${at}, 'RW')`,
        )
      ).kind,
    ).toBe('check');
    expect(
      (
        await refusal(
          db,
          sql`INSERT INTO procedure_entries (record_id, at, kind, entered_at) VALUES (1, ${at}, 'vitals', ${at})`,
        )
      ).kind,
    ).toBe('not null');
  });
});

/** Names of the tables of the clinic schema (not the engine's own, nor the schema version). */
async function tableNames(db: ClinicDb): Promise<string[]> {
  if (db.engine === 'sqlite') {
    const rows = await sql<{ name: string }>`SELECT name FROM sqlite_schema WHERE type = 'table'
      AND name NOT LIKE 'sqlite\_%' ESCAPE '\\' AND name NOT LIKE 'patient\_search\_%' ESCAPE '\\' ORDER BY name`.execute(
      db.kysely,
    );
    return rows.rows.map((row) => row.name);
  }
  const rows = await sql<{ name: string }>`SELECT table_name AS name FROM information_schema.tables
    WHERE table_schema = current_schema() AND table_type = 'BASE TABLE' AND table_name <> 'tidewing_schema'
    ORDER BY table_name`.execute(db.kysely);
  return rows.rows.map((row) => row.name);
}

/** Tables that have a trigger refusing UPDATE and one refusing DELETE. */
async function tablesWithTriggers(db: ClinicDb): Promise<string[]> {
  const rows =
    db.engine === 'sqlite'
      ? await sql<{
          table: string;
          name: string;
        }>`SELECT tbl_name AS "table", name FROM sqlite_schema WHERE type = 'trigger'`.execute(db.kysely)
      : await sql<{ table: string; name: string }>`SELECT event_object_table AS "table", trigger_name AS name
          FROM information_schema.triggers WHERE trigger_schema = current_schema()`.execute(db.kysely);
  const names = new Set(rows.rows.map((row) => `${row.table}.${row.name}`));
  return [...new Set(rows.rows.map((row) => row.table))].filter(
    (table) => names.has(`${table}.${table}_never_updated`) && names.has(`${table}.${table}_never_deleted`),
  );
}
