import Database from 'better-sqlite3';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it, onTestFinished } from 'vitest';
import { sql, type RawBuilder } from 'kysely';
import type { ClinicDb } from '../../db/clinic-db.js';
import { DatabaseTooNewError, migrate, openDatabase, schemaVersion } from '../../db/connection.js';
import { latestSchemaVersion, migrations, type Migration } from '../../db/migrations/index.js';
import {
  migratePostgres,
  openPostgresClinic,
  PostgresSchemaTooNewError,
  postgresSchemaVersion,
} from '../../db/postgres-connection.js';
import { agentIds } from '../../app/core/agents.js';
import { openTestClinic, testEngines } from '../support/clinic-engines.js';
import { needPostgres, scratchPostgresDatabase } from '../support/postgres-database.js';
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

/**
 * One row in every clinical table, through the same SQL on both engines, each given id 1 by its
 * table (an explicit id would not advance a PostgreSQL identity), and a second patient with a
 * version but no current pointer yet.
 */
async function oneOfEach(db: ClinicDb): Promise<void> {
  for (const statement of [
    sql`INSERT INTO species (species_key, origin, common_name, mass_min_g, mass_max_g, mass_basis, entered_at, entered_by)
        VALUES ('testbird', 'clinic', 'Test bird', 10, 20, 'test row', ${at}, 'RW')`,
    sql`INSERT INTO patients (created_at) VALUES (${at})`,
    sql`INSERT INTO patient_versions (patient_id, name, species_key, sex, entered_at, entered_by)
        VALUES (1, 'Pip', 'testbird', 'female', ${at}, 'RW')`,
    sql`INSERT INTO patient_current (patient_id, version_id) VALUES (1, 1)`,
    sql`INSERT INTO patient_search (rowid, search_text) VALUES (1, 'Pip Test bird')`,
    sql`INSERT INTO weights (patient_id, weighed_on, mass_g, entered_at, entered_by)
        VALUES (1, '2026-12-01', 350, ${at}, 'RW')`,
    sql`INSERT INTO plans (patient_id, planned_for, input_json, result_json, model_version, entered_at, entered_by)
        VALUES (1, '2026-12-02', '{}', '{}', 'm1', ${at}, 'RW')`,
    sql`INSERT INTO plan_choices (comparison_id, chosen_id, entered_at, entered_by) VALUES (1, 1, ${at}, 'RW')`,
    sql`INSERT INTO procedure_records (patient_id, created_at) VALUES (1, ${at})`,
    sql`INSERT INTO procedure_record_versions (record_id, plan_id, started_at, procedure_name, airway, circuit, staff_initials, entered_at, entered_by)
        VALUES (1, 1, ${at}, 'Wing radiographs', 'mask', 'nonRebreathing', 'RW', ${at}, 'RW')`,
    sql`INSERT INTO procedure_entries (record_id, at, kind, heart_rate_per_min, entered_at, entered_by)
        VALUES (1, ${at}, 'vitals', 280, ${at}, 'RW')`,
    sql`INSERT INTO emergency_drugs (name, concentration_mg_per_ml, dose_low_mg_per_kg, route, dose_source, entered_at, entered_by)
        VALUES ('Drug A', 1, 1, 'IV', 'Clinic protocol 2026', ${at}, 'RW')`,
    sql`INSERT INTO evidence_exclusions (record_id, excluded, reason, entered_at, entered_by)
        VALUES (1, 1, 'premedicated', ${at}, 'RW')`,
    sql`INSERT INTO evidence_calibration_switch (calibration_on, entered_at, entered_by) VALUES (0, ${at}, 'RW')`,
    sql`INSERT INTO patients (created_at) VALUES (${at})`,
    sql`INSERT INTO patient_versions (patient_id, name, species_key, sex, entered_at, entered_by)
        VALUES (2, 'Wren', 'testbird', 'unknown', ${at}, 'RW')`,
  ])
    await statement.execute(db.kysely);
  const ids = await sql<{
    id: number;
  }>`SELECT id FROM procedure_entries UNION ALL SELECT id FROM emergency_drugs`.execute(db.kysely);
  expect(ids.rows).toEqual([{ id: 1 }, { id: 1 }]);
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

  it('migration 12 gives procedure records an agent: old records keep none, new ones one of the agents', async (context) => {
    const db = await openTestClinic(engine, context, { migrations: migrations.slice(0, 11) });
    await oneOfEach(db);
    expect(await migrateOn(db, migrations.slice(0, 12))).toBe(12);
    // The record written before the migration is not given an agent.
    const before = await sql<{ agent: string | null }>`SELECT agent FROM procedure_record_versions`.execute(
      db.kysely,
    );
    expect(before.rows).toEqual([{ agent: null }]);
    const version = (agent: string | null) =>
      sql`INSERT INTO procedure_record_versions (record_id, corrects_id, started_at, procedure_name, airway, circuit, staff_initials, agent, entered_at, entered_by, reason)
          VALUES (1, (SELECT max(id) FROM procedure_record_versions), ${at}, 'Wing radiographs', 'mask', 'nonRebreathing', 'RW', ${agent}, ${at}, 'RW', 'agent added')`;
    // The stored list is the agents of app/core/agents.ts, exactly.
    for (const agent of agentIds) await version(agent).execute(db.kysely);
    for (const wrong of ['halothane', 'Isoflurane', 'sevoflurane ', ''])
      expect((await refusal(db, version(wrong))).kind).toBe('check');
    const chain = await sql<{
      agent: string | null;
    }>`SELECT agent FROM procedure_record_versions ORDER BY id`.execute(db.kysely);
    expect(chain.rows.map((row) => row.agent)).toEqual([null, ...agentIds]);
    // Still append-only: the agent of a version is corrected by a new version, never in place.
    expect(
      (await refusal(db, sql`UPDATE procedure_record_versions SET agent = 'isoflurane' WHERE id = 1`)).kind,
    ).toBe('append-only');
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

// ---------------------------------------------------------------------------------------------
// The two engines side by side.

type ColumnShape = { type: string; notNull: boolean; default: string | null };

/** Every column as `table.column` with its type (PostgreSQL's spelling), nullability and default. */
async function columnShapes(db: ClinicDb): Promise<Record<string, ColumnShape>> {
  const shapes: Record<string, ColumnShape> = {};
  if (db.engine === 'sqlite') {
    const rows = await sql<{
      table: string;
      name: string;
      type: string;
      notnull: number;
      dflt_value: string | null;
      pk: number;
    }>`
      SELECT m.name AS "table", p.name, p.type, p."notnull", p.dflt_value, p.pk
      FROM sqlite_schema m JOIN pragma_table_info(m.name) p
      WHERE m.type = 'table' AND m.name NOT LIKE 'sqlite\_%' ESCAPE '\\' AND m.name NOT LIKE 'patient\_search\_%' ESCAPE '\\'`.execute(
      db.kysely,
    );
    const types: Record<string, string> = {
      INTEGER: 'integer',
      REAL: 'double precision',
      TEXT: 'text',
      '': '(none)',
    };
    for (const row of rows.rows) {
      // An INTEGER PRIMARY KEY is the rowid: never null, and given the next id when left out.
      const rowid = row.pk === 1 && row.type === 'INTEGER';
      shapes[`${row.table}.${row.name}`] = {
        type: types[row.type] ?? row.type,
        notNull: row.notnull === 1 || row.pk > 0,
        default: rowid ? '(next id)' : row.dflt_value,
      };
    }
    return shapes;
  }
  const rows = await sql<{
    table: string;
    name: string;
    type: string;
    nullable: string;
    column_default: string | null;
    identity: string;
  }>`
    SELECT table_name AS "table", column_name AS name, data_type AS type, is_nullable AS nullable, column_default,
      is_identity AS identity
    FROM information_schema.columns WHERE table_schema = current_schema() AND table_name <> 'tidewing_schema'`.execute(
    db.kysely,
  );
  for (const row of rows.rows)
    shapes[`${row.table}.${row.name}`] = {
      type: row.type,
      notNull: row.nullable === 'NO',
      default: row.identity === 'YES' ? '(next id)' : (row.column_default?.replace(/::text$/, '') ?? null),
    };
  return shapes;
}

/** Every single-column foreign key as `table.column -> table.column`. */
async function foreignKeys(db: ClinicDb): Promise<string[]> {
  const rows =
    db.engine === 'sqlite'
      ? await sql<{ key: string }>`
          SELECT m.name || '.' || f."from" || ' -> ' || f."table" || '.' || f."to" AS key
          FROM sqlite_schema m JOIN pragma_foreign_key_list(m.name) f WHERE m.type = 'table'`.execute(
          db.kysely,
        )
      : await sql<{ key: string }>`
          SELECT c.conrelid::regclass::text || '.' || a.attname || ' -> ' || c.confrelid::regclass::text || '.' || r.attname
            || CASE WHEN cardinality(c.conkey) = 1 THEN '' ELSE ' (more columns)' END AS key
          FROM pg_constraint c
          JOIN pg_attribute a ON a.attrelid = c.conrelid AND a.attnum = c.conkey[1]
          JOIN pg_attribute r ON r.attrelid = c.confrelid AND r.attnum = c.confkey[1]
          WHERE c.contype = 'f' AND c.connamespace = current_schema()::regnamespace`.execute(db.kysely);
  return rows.rows.map((row) => row.key).sort();
}

/**
 * Primary keys, UNIQUE constraints and named indexes, each as `table(columns)` with `unique`,
 * `partial` and the index name where the schema names it.
 */
async function keysAndIndexes(db: ClinicDb): Promise<string[]> {
  if (db.engine === 'sqlite') {
    const keys = await sql<{ key: string }>`
      SELECT m.name || '(' || group_concat(p.name, ',') || ') primary key' AS key
      FROM sqlite_schema m JOIN pragma_table_info(m.name) p
      WHERE m.type = 'table' AND p.pk > 0 AND m.name NOT LIKE 'patient\_search\_%' ESCAPE '\\' GROUP BY m.name`.execute(
      db.kysely,
    );
    const indexes = await sql<{ key: string }>`
      SELECT m.name || '(' || (SELECT group_concat(name, ',') FROM (SELECT coalesce(c.name, 'expression') AS name FROM pragma_index_info(i.name) c ORDER BY c.seqno)) || ')'
        || CASE WHEN i."unique" = 1 THEN ' unique' ELSE '' END || CASE WHEN i.partial = 1 THEN ' partial' ELSE '' END
        || CASE WHEN i.origin = 'c' THEN ' ' || i.name ELSE '' END AS key
      FROM sqlite_schema m JOIN pragma_index_list(m.name) i
      WHERE m.type = 'table' AND m.name NOT LIKE 'sqlite\_%' ESCAPE '\\' AND m.name NOT LIKE 'patient\_search\_%' ESCAPE '\\'
        AND i.origin <> 'pk'`.execute(db.kysely);
    return [...keys.rows, ...indexes.rows].map((row) => row.key).sort();
  }
  const rows = await sql<{ key: string }>`
    SELECT i.indrelid::regclass::text || '(' ||
      (SELECT string_agg(coalesce(a.attname, 'expression'), ',' ORDER BY k.n) FROM unnest(i.indkey::int2[]) WITH ORDINALITY k(attnum, n)
        LEFT JOIN pg_attribute a ON a.attrelid = i.indrelid AND a.attnum = k.attnum AND k.attnum <> 0) || ')'
      || CASE WHEN i.indisprimary THEN ' primary key' ELSE
        CASE WHEN i.indisunique THEN ' unique' ELSE '' END || CASE WHEN i.indpred IS NOT NULL THEN ' partial' ELSE '' END
        || CASE WHEN c.oid IS NULL THEN ' ' || i.indexrelid::regclass::text ELSE '' END END AS key
    FROM pg_index i JOIN pg_class t ON t.oid = i.indrelid
    LEFT JOIN pg_constraint c ON c.conindid = i.indexrelid AND c.contype IN ('p', 'u')
    WHERE t.relnamespace = current_schema()::regnamespace AND t.relname <> 'tidewing_schema'`.execute(
    db.kysely,
  );
  return rows.rows.map((row) => row.key).sort();
}

/** Reads `key` from a record, failing the test when it is missing. */
function pick<T>(record: Readonly<Record<string, T>>, key: string): T {
  const value = record[key];
  if (value === undefined) throw new Error(`${key} is missing`);
  return value;
}

describe('the two engines', () => {
  it('build the same tables and columns: types, nullability and defaults', async (context) => {
    const sqlite = await columnShapes(await openTestClinic('sqlite', context));
    const postgresql = await columnShapes(await openTestClinic('postgresql', context));
    expect(await tableNames(await openTestClinic('postgresql', context))).toEqual(
      await tableNames(await openTestClinic('sqlite', context)),
    );
    // The differences the dialects force, each on purpose:
    const expected = {
      ...sqlite,
      // Keyed by another table's id, never generated: an INTEGER PRIMARY KEY on SQLite is the
      // rowid (which would be generated if left out); on PostgreSQL a plain integer key.
      'patient_current.patient_id': { ...pick(sqlite, 'patient_current.patient_id'), default: null },
      'evidence_prediction_cache.record_id': {
        ...pick(sqlite, 'evidence_prediction_cache.record_id'),
        default: null,
      },
      // SQLite's FTS5 table has an untyped column and a hidden rowid; PostgreSQL's is a plain table.
      'patient_search.rowid': { type: 'integer', notNull: true, default: null },
      'patient_search.search_text': { type: 'text', notNull: true, default: null },
    };
    expect(pick(sqlite, 'patient_search.search_text')).toEqual({
      type: '(none)',
      notNull: false,
      default: null,
    });
    expect(postgresql).toEqual(expected);
    // Spot checks of the mapping itself.
    expect(pick(postgresql, 'weights.mass_g')).toEqual({
      type: 'double precision',
      notNull: true,
      default: null,
    });
    expect(pick(postgresql, 'procedure_record_versions.prompt_interval_min').default).toBe('5');
    expect(pick(postgresql, 'species.anatomy_notes_json').default).toBe("'[]'");
    expect(pick(postgresql, 'clinic_settings.date_format').default).toBe("'YYYY-MM-DD'");
    expect(pick(postgresql, 'plans.id')).toEqual({ type: 'integer', notNull: true, default: '(next id)' });
  });

  it('build the same foreign keys, keys, UNIQUE constraints and indexes', async (context) => {
    const sqlite = await openTestClinic('sqlite', context);
    const postgresql = await openTestClinic('postgresql', context);
    expect(await foreignKeys(postgresql)).toEqual(
      [...(await foreignKeys(sqlite)), 'patient_search.rowid -> patients.id'].sort(),
    );
    expect(await foreignKeys(postgresql)).toContain('weights.corrects_id -> weights.id');
    expect(await keysAndIndexes(postgresql)).toEqual(
      [
        ...(await keysAndIndexes(sqlite)),
        // The search table: its rowid key and trigram index (SQLite's FTS5 keeps its own).
        'patient_search(rowid) primary key',
        'patient_search(search_text) patient_search_trigram',
      ].sort(),
    );
    expect(await keysAndIndexes(postgresql)).toContain(
      'species(species_key) unique partial species_first_key',
    );
    // An index on an expression (the start-of-field indexes of patient search) is named as one.
    expect(await keysAndIndexes(postgresql)).toContain(
      'patient_versions(expression) patient_versions_name_start',
    );
  });
});

describe('a PostgreSQL clinic database', () => {
  it('refuses a database written by a newer schema and changes nothing in it', async (context) => {
    const { appUrl } = needPostgres(context);
    const scratch = await scratchPostgresDatabase(appUrl);
    onTestFinished(scratch.drop);
    const first = await openPostgresClinic(scratch.url);
    await sql`CREATE TABLE future_things (id integer PRIMARY KEY)`.execute(first.kysely);
    await sql`INSERT INTO future_things VALUES (1)`.execute(first.kysely);
    await sql`UPDATE tidewing_schema SET version = ${latestSchemaVersion + 5}`.execute(first.kysely);
    const snapshot = async () => ({
      columns: await columnShapes(first),
      keys: await keysAndIndexes(first),
      version: await postgresSchemaVersion(first),
      future: (await sql`SELECT * FROM future_things`.execute(first.kysely)).rows,
      // Every row version the database holds: a write anywhere would add one.
      rows: (
        await sql<{ table: string; xmin: string }>`
          SELECT 'tidewing_schema' AS "table", xmin::text FROM tidewing_schema
          UNION ALL SELECT 'future_things', xmin::text FROM future_things`.execute(first.kysely)
      ).rows,
    });
    const before = await snapshot();
    expect(before.version).toBe(latestSchemaVersion + 5);

    await expect(openPostgresClinic(scratch.url)).rejects.toThrow(PostgresSchemaTooNewError);
    await expect(openPostgresClinic(scratch.url)).rejects.toThrow(
      /newer version of Tidewing .*schema \d+.*has not been changed/,
    );
    expect(await snapshot()).toEqual(before);
    await first.close();
  });

  it('migrates once when two workstations open an empty database at the same moment', async (context) => {
    const { appUrl } = needPostgres(context);
    const scratch = await scratchPostgresDatabase(appUrl);
    onTestFinished(scratch.drop);
    const opened = await Promise.all([openPostgresClinic(scratch.url), openPostgresClinic(scratch.url)]);
    onTestFinished(async () => {
      for (const db of opened) await db.close();
    });
    const [one, two] = opened;
    if (one === undefined || two === undefined) throw new Error('two databases expected');
    expect(await postgresSchemaVersion(one)).toBe(latestSchemaVersion);
    expect(await postgresSchemaVersion(two)).toBe(latestSchemaVersion);
    expect((await sql`SELECT * FROM tidewing_schema`.execute(one.kysely)).rows).toEqual([
      { only_row: true, version: latestSchemaVersion },
    ]);
    // Each trigger made once, and both connections write to the one schema.
    expect((await tablesWithTriggers(two)).sort()).toEqual(appendOnlyTables.map(({ table }) => table).sort());
    await sql`INSERT INTO patients (created_at) VALUES (${at})`.execute(one.kysely);
    await sql`INSERT INTO patients (created_at) VALUES (${at})`.execute(two.kysely);
    expect((await sql`SELECT id FROM patients ORDER BY id`.execute(one.kysely)).rows).toEqual([
      { id: 1 },
      { id: 2 },
    ]);
  });

  it('refuses TRUNCATE of a record table, which runs no row trigger', async (context) => {
    const db = await openTestClinic('postgresql', context);
    await oneOfEach(db);
    for (const { table, deleted } of appendOnlyTables)
      expect(await refusal(db, sql`TRUNCATE ${sql.table(table)} CASCADE`)).toEqual({
        kind: 'append-only',
        message: `${table} rows are never deleted; ${deleted}`,
      });
    await sql`TRUNCATE evidence_prediction_cache`.execute(db.kysely);
  });

  it('names the refused table and trigger in the error, beside the message', async (context) => {
    const db = await openTestClinic('postgresql', context);
    await oneOfEach(db);
    const error: unknown = await sql`DELETE FROM weights`.execute(db.kysely).then(
      () => null,
      (caught: unknown) => caught,
    );
    expect(error).toMatchObject({
      code: 'P0001',
      message: 'weights rows are never deleted; add a correction that voids the row',
      table: 'weights',
      constraint: 'weights_never_deleted',
    });
  });

  it('finds a patient by any part of the search text, ignoring case, through the trigram index', async (context) => {
    const db = await openTestClinic('postgresql', context);
    await oneOfEach(db);
    await sql`DELETE FROM patient_search WHERE rowid = ${1}`.execute(db.kysely);
    await sql`INSERT INTO patient_search (rowid, search_text) VALUES (${1}, ${'Pip • African grey parrot • RING-0042'})`.execute(
      db.kysely,
    );
    await sql`INSERT INTO patient_search (rowid, search_text) VALUES (${2}, ${'Wren • Barn owl'})`.execute(
      db.kysely,
    );
    const find = async (words: string) =>
      (
        await sql<{
          rowid: number;
        }>`SELECT rowid FROM patient_search WHERE search_text ILIKE ${`%${words}%`} ORDER BY rowid`.execute(
          db.kysely,
        )
      ).rows.map((row) => row.rowid);
    expect(await find('ring-0042')).toEqual([1]);
    expect(await find('GREY')).toEqual([1]);
    expect(await find('owl')).toEqual([2]);
    expect(await find(' • ')).toEqual([1, 2]);
    expect(
      (await refusal(db, sql`INSERT INTO patient_search (rowid, search_text) VALUES (${9}, 'x')`)).kind,
    ).toBe('foreign key');
    // With sequential scans priced out, the planner uses the trigram index for ILIKE.
    const plan = await db.kysely.connection().execute(async (connection) => {
      await sql`SET enable_seqscan = off`.execute(connection);
      const explained = await sql<{
        'QUERY PLAN': string;
      }>`EXPLAIN SELECT rowid FROM patient_search WHERE search_text ILIKE '%grey%'`.execute(connection);
      await sql`RESET enable_seqscan`.execute(connection);
      return explained.rows.map((row) => row['QUERY PLAN']).join('\n');
    });
    expect(plan).toContain('patient_search_trigram');
  });

  it('names every CHECK after its table and first column, which constraint errors read as the field', async (context) => {
    const db = await openTestClinic('postgresql', context);
    const checks = await sql<{ table: string; name: string; definition: string; columns: string[] }>`
      SELECT t.relname AS "table", c.conname AS name, pg_get_constraintdef(c.oid) AS definition,
        array(SELECT attname::text FROM pg_attribute WHERE attrelid = t.oid AND attnum > 0 AND NOT attisdropped) AS columns
      FROM pg_constraint c JOIN pg_class t ON t.oid = c.conrelid
      WHERE c.contype = 'c' AND t.relnamespace = current_schema()::regnamespace AND t.relname <> 'tidewing_schema'`.execute(
      db.kysely,
    );
    // As many as SQLite's schema text holds, one constraint for each.
    const sqlite = await openTestClinic('sqlite', context);
    const texts = await sql<{
      text: string;
    }>`SELECT sql AS text FROM sqlite_schema WHERE type = 'table' AND sql IS NOT NULL`.execute(sqlite.kysely);
    const sqliteChecks = texts.rows.reduce(
      (count, row) => count + (row.text.match(/CHECK \(/g) ?? []).length,
      0,
    );
    expect(checks.rows.length).toBe(sqliteChecks);
    for (const check of checks.rows) {
      const first = (check.definition.match(/[a-z_][a-z0-9_]*/g) ?? []).find((word) =>
        check.columns.includes(word),
      );
      expect({
        check: check.name,
        ok: new RegExp(`^${check.table}_${first ?? '?'}(_with_[a-z0-9_]+)?_check$`).test(check.name),
      }).toEqual({
        check: check.name,
        ok: true,
      });
    }
  });

  it('takes as JSON exactly the text SQLite json_valid takes', async (context) => {
    const sqlite = await openTestClinic('sqlite', context, { migrations: [] });
    const postgresql = await openTestClinic('postgresql', context);
    const texts = [
      '{}',
      '[]',
      '  [ 1, 2 ]  ',
      '\n[]\n',
      '{"a":1,"a":2}',
      'true',
      'null',
      '-0',
      '1e5',
      '"\\u0000"',
      '"\\ud800"',
      '"é"',
      '{"a":{"b":[1,{"c":null}]}}',
      '',
      ' ',
      '01',
      '1.',
      '.5',
      '{"a":1,}',
      '[1,]',
      "'a'",
      'NaN',
      'Infinity',
      '"a\tb"',
      '[]x',
      '"\\x41"',
      '0x10',
      '{a:1}',
      '/*c*/[]',
      '{"a" 1}',
      '[',
      '"',
    ];
    for (const text of texts) {
      const valid = await sql<{ valid: number }>`SELECT json_valid(${text}) AS valid`.execute(sqlite.kysely);
      const checked = await sql<{ valid: boolean }>`SELECT tidewing_is_json(${text}) AS valid`.execute(
        postgresql.kysely,
      );
      expect({ text, valid: checked.rows[0]?.valid }).toEqual({ text, valid: valid.rows[0]?.valid === 1 });
    }
    const nothing = await sql<{ valid: boolean | null; type: string | null }>`
      SELECT tidewing_is_json(NULL) AS valid, tidewing_json_type('[1') AS type`.execute(postgresql.kysely);
    expect(nothing.rows).toEqual([{ valid: null, type: null }]);
  });
});

// ---------------------------------------------------------------------------------------------
// Every column against a spread of values: each engine's CHECK, NOT NULL, UNIQUE and FOREIGN
// KEY rules must accept and refuse exactly the same rows.

/** A valid row of every table (beside `oneOfEach`'s rows), each with an id of its own. */
const validRows: Readonly<Record<string, Readonly<Record<string, string | number>>>> = {
  clinic_settings: {
    id: 1,
    clinic_name: 'Riverside',
    mass_unit: 'g',
    pressure_unit: 'mmHg',
    temperature_unit: 'C',
    default_agent: 'isoflurane',
    paper_size: 'A4',
    updated_at: at,
  },
  safety_acknowledgements: { id: 100, acknowledged_at: at, app_version: '0.1.0', acknowledged_by: 'RW' },
  species: {
    id: 100,
    species_key: 'otherbird',
    origin: 'clinic',
    common_name: 'Other bird',
    mass_min_g: 10,
    mass_max_g: 20,
    mass_basis: 'test row',
    entered_at: at,
    entered_by: 'RW',
  },
  patients: { id: 100, created_at: at },
  patient_versions: {
    id: 100,
    patient_id: 1,
    name: 'Pip',
    species_key: 'testbird',
    sex: 'female',
    entered_at: at,
    entered_by: 'RW',
  },
  patient_current: { patient_id: 2, version_id: 2 },
  weights: {
    id: 100,
    patient_id: 1,
    weighed_on: '2026-12-01',
    mass_g: 350,
    entered_at: at,
    entered_by: 'RW',
  },
  plans: {
    id: 100,
    planned_for: '2026-12-02',
    input_json: '{}',
    result_json: '{}',
    model_version: 'm1',
    entered_at: at,
    entered_by: 'RW',
  },
  plan_choices: { id: 100, comparison_id: 1, chosen_id: 1, entered_at: at, entered_by: 'RW' },
  procedure_records: { id: 100, patient_id: 1, created_at: at },
  procedure_record_versions: {
    id: 100,
    record_id: 1,
    started_at: at,
    procedure_name: 'Wing radiographs',
    airway: 'mask',
    circuit: 'circle',
    staff_initials: 'RW',
    agent: 'sevoflurane',
    entered_at: at,
    entered_by: 'RW',
  },
  procedure_entries: { id: 100, record_id: 1, at, kind: 'vitals', entered_at: at, entered_by: 'RW' },
  emergency_drugs: {
    id: 100,
    name: 'Drug A',
    concentration_mg_per_ml: 1,
    dose_low_mg_per_kg: 1,
    route: 'IV',
    dose_source: 'Clinic protocol 2026',
    entered_at: at,
    entered_by: 'RW',
  },
  evidence_exclusions: {
    id: 100,
    record_id: 1,
    excluded: 1,
    reason: 'premedicated',
    entered_at: at,
    entered_by: 'RW',
  },
  evidence_calibration_switch: { id: 100, calibration_on: 1, entered_at: at, entered_by: 'RW' },
  workstations: { id: '0b7e8a52-2f4c-4d0e-9a57-1c2d3e4f5a6b', name: 'Theatre 1', updated_at: at },
  evidence_prediction_cache: { record_id: 1, cache_key: 'k', row_json: '{}', computed_at: at },
};

const leftOut = Symbol('left out');
type Candidate = string | number | null | typeof leftOut;

/**
 * The values tried in a column, drawn from its SQLite definition: left out, null, each number
 * its definition names and the values either side, lengths at each limit, dates for a date
 * pattern, JSON for a JSON check, each listed value and each changed a little.
 */
function candidates(createText: string, column: string, type: string): Candidate[] {
  const line =
    new RegExp(`(^|[(,])\\s*${column} (INTEGER|REAL|TEXT)[^\\n]*`, 'm').exec(createText)?.[0] ?? '';
  const numbers = [...line.matchAll(/(?<![a-z_0-9.])\d+(\.\d+)?/g)].map((match) => Number(match[0]));
  const found: Candidate[] = [leftOut, null];
  if (type === 'INTEGER') found.push(-1, 0, 1, 2, 99, 100, ...numbers.flatMap((n) => [n - 1, n, n + 1]));
  if (type === 'REAL')
    found.push(-1, 0, 1e-300, 1, 10, 20, ...numbers.flatMap((n) => [n - 0.01, n, n + 0.01]));
  if (type === 'TEXT') {
    found.push(
      '',
      '   ',
      'Pip',
      ' Pip ',
      ...numbers.flatMap((n) => [n - 1, n, n + 1].map((length) => 'x'.repeat(Math.max(0, length)))),
    );
    if (/trim/.test(line)) found.push(...numbers.map((n) => '   ' + 'x'.repeat(n)));
    if (/GLOB '\[0-9\]/.test(line))
      found.push(
        at,
        '2026-12-01',
        '2026-12-1',
        '2026-12-01T10:00',
        '26-12-01',
        '2026-12-01\n',
        '２０２６-12-01',
      );
    if (/GLOB '\[a-z/.test(line)) found.push('testbird', 'Testbird', '-bird', '9bird', 'éider');
    if (/json/.test(line))
      found.push(
        '[]',
        '{}',
        '[1,]',
        '"a"',
        '{"a":1}',
        '01',
        'null',
        '[]x',
        '"a\tb"',
        '{"a":1,"a":2}',
        '["air sacs"]',
      );
    const list = new RegExp(`\\b${column} IN \\(([^)]*)\\)`).exec(createText)?.[1] ?? '';
    for (const [, value = ''] of list.matchAll(/'([^']*)'/g))
      found.push(value, value.toUpperCase(), `${value} `);
  }
  return [...new Set(found)];
}

/**
 * Each row's fate on `db` (`accepted` or the refusal's kind), keyed by table, column and value;
 * tables, columns and values are read from `sqlite`'s schema. Nothing is kept.
 */
async function fates(db: ClinicDb, sqlite: ClinicDb): Promise<Record<string, string>> {
  await oneOfEach(db);
  const tables = await sql<{ name: string; text: string }>`SELECT name, sql AS text FROM sqlite_schema
    WHERE type = 'table' AND name NOT LIKE 'sqlite\\_%' ESCAPE '\\' AND name NOT LIKE 'patient\\_search%' ESCAPE '\\'`.execute(
    sqlite.kysely,
  );
  expect(tables.rows.map((row) => row.name).sort()).toEqual(Object.keys(validRows).sort());
  const outcome: Record<string, string> = {};
  await db.kysely.connection().execute(async (connection) => {
    await sql`BEGIN`.execute(connection);
    // Rolling back to a savepoint keeps it, on both engines: one savepoint serves every attempt.
    await sql`SAVEPOINT attempt`.execute(connection);
    const attempt = async (key: string, table: string, row: Readonly<Record<string, unknown>>) => {
      const columns = Object.keys(row);
      try {
        await sql`INSERT INTO ${sql.table(table)} (${sql.join(columns.map((column) => sql.ref(column)))})
          VALUES (${sql.join(columns.map((column) => row[column]))})`.execute(connection);
        outcome[key] = 'accepted';
      } catch (error) {
        const code = String((error as { code?: unknown }).code);
        outcome[key] = (db.engine === 'sqlite' ? sqliteCodes : postgresCodes)[code] ?? `other (${code})`;
      }
      await sql`ROLLBACK TO SAVEPOINT attempt`.execute(connection);
    };
    for (const { name: table, text } of tables.rows) {
      const valid = pick(validRows, table);
      await attempt(`${table} (the valid row)`, table, valid);
      const columns = await sql<{
        name: string;
        type: string;
      }>`SELECT name, type FROM pragma_table_info(${table})`.execute(sqlite.kysely);
      for (const { name: column, type } of columns.rows) {
        for (const value of candidates(text, column, type)) {
          const row = Object.fromEntries([
            ...Object.entries(valid).filter(([name]) => name !== column),
            ...(value === leftOut ? [] : [[column, value] as const]),
          ]);
          await attempt(
            `${table}.${column} = ${value === leftOut ? '(left out)' : JSON.stringify(value)}`,
            table,
            row,
          );
        }
      }
    }
    await sql`ROLLBACK`.execute(connection);
  });
  return outcome;
}

describe('the two engines, column by column', () => {
  it('accept and refuse the same rows for a spread of values in every column', async (context) => {
    const schema = await openTestClinic('sqlite', context);
    const sqlite = await fates(await openTestClinic('sqlite', context), schema);
    const postgresql = await fates(await openTestClinic('postgresql', context), schema);
    const keys = [...new Set([...Object.keys(sqlite), ...Object.keys(postgresql)])];
    const differing = keys
      .filter((key) => sqlite[key] !== postgresql[key])
      .map((key) => `${key}: SQLite ${sqlite[key] ?? '-'}, PostgreSQL ${postgresql[key] ?? '-'}`);
    // The one difference, on purpose: SQLite's INTEGER PRIMARY KEY is the rowid, given the next
    // id for a NULL (and, where the key is another table's id, when left out too); PostgreSQL's
    // identity is filled only when the id is left out, and a key copied from another table never.
    // Repositories leave ids out.
    const idTables = Object.keys(validRows).filter(
      (table) => table !== 'workstations' && 'id' in pick(validRows, table),
    );
    expect(differing.sort()).toEqual(
      [
        ...idTables.map((table) => `${table}.id = null: SQLite accepted, PostgreSQL not null`),
        ...['patient_current.patient_id', 'evidence_prediction_cache.record_id'].flatMap((column) => [
          `${column} = null: SQLite accepted, PostgreSQL not null`,
          `${column} = (left out): SQLite accepted, PostgreSQL not null`,
        ]),
      ].sort(),
    );
    // The valid rows pass, and the spread meets every kind of rule.
    for (const table of Object.keys(validRows))
      expect(postgresql[`${table} (the valid row)`]).toBe('accepted');
    const kinds = new Map<string, number>();
    for (const fate of Object.values(postgresql)) kinds.set(fate, (kinds.get(fate) ?? 0) + 1);
    expect([...kinds.keys()].sort()).toEqual(['accepted', 'check', 'foreign key', 'not null', 'unique']);
    expect(keys.length).toBeGreaterThan(1500);
  }, 180_000);
});
