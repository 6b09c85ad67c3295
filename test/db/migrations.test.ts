import Database from 'better-sqlite3';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { DatabaseTooNewError, migrate, openDatabase, schemaVersion } from '../../db/connection.js';
import { latestSchemaVersion, migrations } from '../../db/migrations/index.js';
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
