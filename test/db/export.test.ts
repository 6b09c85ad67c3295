import Database from 'better-sqlite3';
import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { sqliteClinicDb } from '../../db/clinic-db.js';
import { openDatabase } from '../../db/connection.js';
import { exportDatabaseJson, writeDatabaseJson, type DatabaseExport } from '../../db/export.js';
import { latestSchemaVersion } from '../../db/migrations/index.js';
import { temporaryFolder } from '../support/temporary-folder.js';
import {
  addEntries,
  addPatientAndRecord,
  enteredAt,
  fixtureFolder,
  listing,
} from './support/record-fixture.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

const exportedAt = new Date(Date.UTC(2026, 2, 1, 8, 0, 0, 0));

function populated() {
  const fixture = fixtureFolder();
  cleanups.push(fixture.remove);
  const db = openDatabase(fixture.databaseFile);
  cleanups.push(() => db.close());
  const recordId = addPatientAndRecord(db, 'Kiwi');
  addPatientAndRecord(db, 'Pip');
  const [firstEntry] = addEntries(db, recordId, 3);
  // A correction: a new row pointing at the one it replaces, which stays.
  db.prepare(
    "INSERT INTO procedure_entries (record_id, corrects_id, at, kind, vapor_pct, entered_at, entered_by, reason) VALUES (?, ?, ?, 'vitals', 2, ?, 'CD', 'typed 2.5 for 2')",
  ).run(recordId, firstEntry, enteredAt, enteredAt);
  return { ...fixture, db };
}

describe('exportDatabaseJson', () => {
  it('holds every clinic table with all its rows and columns, the schema and app versions and the export time', async () => {
    const { db } = populated();
    const exported = await exportDatabaseJson(sqliteClinicDb(db), { appVersion: '0.1.0', exportedAt });
    const expectedTables = db
      .prepare(
        "SELECT name FROM pragma_table_list WHERE schema = 'main' AND type = 'table' AND name NOT LIKE 'sqlite_%' ORDER BY name",
      )
      .pluck()
      .all() as string[];
    expect(Object.keys(exported.tables).sort()).toEqual(expectedTables);
    expect(expectedTables).toEqual(
      expect.arrayContaining([
        'patients',
        'patient_versions',
        'procedure_entries',
        'species',
        'weights',
        'plans',
        'clinic_settings',
      ]),
    );
    for (const name of expectedTables) {
      const count = db.prepare(`SELECT count(*) FROM "${name}"`).pluck().get();
      expect(exported.tables[name]?.rows.length, name).toBe(count);
      const columns = db.prepare(`SELECT name FROM pragma_table_info(?)`).pluck().all(name);
      expect(exported.tables[name]?.columns, name).toEqual(columns);
    }
    expect(exported).toMatchObject({
      format: 'tidewing-database-export',
      formatVersion: 1,
      appVersion: '0.1.0',
      schemaVersion: latestSchemaVersion,
      exportedAt: '2026-03-01T08:00:00.000Z',
    });
  });

  it('keeps corrections and the rows they correct, in id order', async () => {
    const { db } = populated();
    const entries =
      (await exportDatabaseJson(sqliteClinicDb(db), { appVersion: '0.1.0', exportedAt })).tables[
        'procedure_entries'
      ]?.rows ?? [];
    expect(entries.map((row) => row['id'])).toEqual([1, 2, 3, 4]);
    expect(entries[0]).toMatchObject({ id: 1, corrects_id: null, vapor_pct: 2.5 });
    expect(entries[3]).toMatchObject({
      id: 4,
      corrects_id: 1,
      vapor_pct: 2,
      entered_by: 'CD',
      reason: 'typed 2.5 for 2',
    });
  });

  it('leaves out the search index, which is rebuilt from the rows, and says so', async () => {
    const { db } = populated();
    const exported = await exportDatabaseJson(sqliteClinicDb(db), { appVersion: '0.1.0', exportedAt });
    expect(exported.derivedTablesLeftOut).toContain('patient_search');
    expect(Object.keys(exported.tables).some((name) => name.startsWith('patient_search'))).toBe(false);
  });

  it('survives a JSON round trip unchanged', async () => {
    const { db } = populated();
    const exported = await exportDatabaseJson(sqliteClinicDb(db), { appVersion: '0.1.0', exportedAt });
    expect(JSON.parse(JSON.stringify(exported))).toEqual(exported);
  });

  it('writes BLOBs as base64 and leaves text, numbers and nulls as they are', async () => {
    const db = new Database(':memory:');
    cleanups.push(() => db.close());
    db.exec(
      "CREATE TABLE attachments (id INTEGER PRIMARY KEY, label TEXT, bytes BLOB, grams REAL); INSERT INTO attachments VALUES (2, 'scan', x'00ff10', 38.5), (1, NULL, NULL, NULL)",
    );
    const rows = (await exportDatabaseJson(sqliteClinicDb(db), { appVersion: 'test', exportedAt })).tables[
      'attachments'
    ]?.rows;
    expect(rows).toEqual([
      { id: 1, label: null, bytes: null, grams: null },
      { id: 2, label: 'scan', bytes: { base64: Buffer.from([0, 255, 16]).toString('base64') }, grams: 38.5 },
    ]);
  });
});

describe('writeDatabaseJson', () => {
  it('writes the export as JSON that parses back to the same object', async () => {
    const { db } = populated();
    const folder = temporaryFolder();
    cleanups.push(folder.remove);
    const percents: number[] = [];
    const written = await writeDatabaseJson(sqliteClinicDb(db), path.join(folder.folder, 'archive.json'), {
      appVersion: '0.1.0',
      exportedAt,
      onProgress: (percent) => percents.push(percent),
    });
    const parsed = JSON.parse(fs.readFileSync(written.file, 'utf8')) as DatabaseExport;
    expect(parsed).toEqual(await exportDatabaseJson(sqliteClinicDb(db), { appVersion: '0.1.0', exportedAt }));
    expect(written.rowCount).toBe(
      Object.values(parsed.tables).reduce((sum, table) => sum + table.rows.length, 0),
    );
    expect(percents.at(-1)).toBe(100);
    expect(listing(folder.folder)).toEqual(['archive.json']);
  });

  it('refuses to replace an existing file', async () => {
    const { db } = populated();
    const folder = temporaryFolder();
    cleanups.push(folder.remove);
    const file = path.join(folder.folder, 'archive.json');
    fs.writeFileSync(file, '{"earlier": true}');
    await expect(
      writeDatabaseJson(sqliteClinicDb(db), file, { appVersion: '0.1.0', exportedAt }),
    ).rejects.toThrow(/already exists.*Nothing was written/);
    expect(fs.readFileSync(file, 'utf8')).toBe('{"earlier": true}');
  });
});
