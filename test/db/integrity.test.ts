import Database from 'better-sqlite3';
import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { migrate, openDatabase } from '../../db/connection.js';
import { checkDatabaseFile, openReadOnly } from '../../db/integrity.js';
import { latestSchemaVersion, migrations } from '../../db/migrations/index.js';
import { temporaryFolder } from '../support/temporary-folder.js';
import {
  addEntries,
  addPatientAndRecord,
  damageMiddlePages,
  fixtureWithEntries,
  listing,
  sha256,
} from './support/record-fixture.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

function withEntries(count: number) {
  const fixture = fixtureWithEntries(count);
  cleanups.push(fixture.remove);
  return fixture;
}

function scratchFile(name = 'other.db'): string {
  const temp = temporaryFolder();
  cleanups.push(temp.remove);
  return path.join(temp.folder, name);
}

describe('checkDatabaseFile', () => {
  it('passes a sound database and reports its schema version against the supported one', () => {
    const { databaseFile } = withEntries(50);
    const check = checkDatabaseFile(databaseFile);
    expect(check).toMatchObject({
      ok: true,
      status: 'ok',
      integrity: ['ok'],
      schemaVersion: latestSchemaVersion,
      supportedSchemaVersion: latestSchemaVersion,
      foreignKeyProblems: [],
      missingTables: [],
    });
    expect(check.sizeBytes).toBe(fs.statSync(databaseFile).size);
    expect(check.message).toMatch(/passed the full integrity check; schema version \d+/);
  });

  it('leaves a closed WAL-mode database byte for byte as it was, with no files added beside it', () => {
    const { folder, databaseFile } = withEntries(50);
    expect(fs.readFileSync(databaseFile).subarray(18, 20)).toEqual(Buffer.from([2, 2]));
    const before = sha256(databaseFile);
    const filesBefore = listing(folder);
    expect(checkDatabaseFile(databaseFile).ok).toBe(true);
    expect(checkDatabaseFile(databaseFile, { quick: true }).ok).toBe(true);
    expect(sha256(databaseFile)).toBe(before);
    expect(listing(folder)).toEqual(filesBefore);
  });

  it('sees rows committed only to the WAL of a database another connection has open', () => {
    const { databaseFile } = withEntries(1);
    const writer = openDatabase(databaseFile);
    cleanups.push(() => writer.close());
    const recordId = writer.prepare('SELECT id FROM procedure_records').pluck().get() as number;
    addEntries(writer, recordId, 20);
    expect(fs.statSync(`${databaseFile}-wal`).size).toBeGreaterThan(0);
    const mainBefore = sha256(databaseFile);
    expect(checkDatabaseFile(databaseFile).ok).toBe(true);
    const opened = openReadOnly(databaseFile);
    expect(opened.db.prepare('SELECT count(*) FROM procedure_entries').pluck().get()).toBe(21);
    opened.close();
    expect(sha256(databaseFile)).toBe(mainBefore);
  });

  it('reports a missing file as missing', () => {
    const file = scratchFile('absent.db');
    const check = checkDatabaseFile(file);
    expect(check).toMatchObject({ ok: false, status: 'missing', schemaVersion: null, integrity: [] });
    expect(check.message).toContain('There is no database file at');
    expect(fs.existsSync(file)).toBe(false);
  });

  it('reports a file that is not SQLite as not a database and leaves it unchanged', () => {
    const file = scratchFile('notes.db');
    fs.writeFileSync(file, 'Patient list\nKiwi, budgerigar, 38 g\n'.repeat(200));
    const before = sha256(file);
    const check = checkDatabaseFile(file);
    expect(check).toMatchObject({ ok: false, status: 'notDatabase', schemaVersion: null });
    expect(check.message).toMatch(/is not a SQLite database file/);
    expect(sha256(file)).toBe(before);
  });

  it('reports a database with pages overwritten in the middle as damaged, naming what SQLite found', () => {
    const { folder, databaseFile } = withEntries(3000);
    damageMiddlePages(databaseFile);
    const before = sha256(databaseFile);
    const filesBefore = listing(folder);
    const check = checkDatabaseFile(databaseFile);
    expect(check.ok).toBe(false);
    expect(check.status).toBe('corrupt');
    expect(check.integrity.length).toBeGreaterThan(0);
    expect(check.integrity).not.toEqual(['ok']);
    expect(check.message).toMatch(/is damaged.*Restore the most recent good backup/);
    expect(sha256(databaseFile)).toBe(before);
    expect(listing(folder)).toEqual(filesBefore);
  });

  it('reports a copy cut short half way as damaged', () => {
    const { databaseFile } = withEntries(3000);
    const bytes = fs.readFileSync(databaseFile);
    const truncated = scratchFile('half.db');
    fs.writeFileSync(truncated, bytes.subarray(0, Math.floor(bytes.length / 2)));
    const check = checkDatabaseFile(truncated);
    expect(check.ok).toBe(false);
    expect(check.status).toBe('corrupt');
  });

  it('reports a database written by a newer schema as too new, with both version numbers', () => {
    const { databaseFile } = withEntries(1);
    const writer = new Database(databaseFile);
    writer.pragma(`user_version = ${latestSchemaVersion + 3}`);
    writer.close();
    const check = checkDatabaseFile(databaseFile);
    expect(check).toMatchObject({
      ok: false,
      status: 'tooNew',
      schemaVersion: latestSchemaVersion + 3,
      supportedSchemaVersion: latestSchemaVersion,
      integrity: ['ok'],
    });
    expect(check.message).toContain(
      `schema ${latestSchemaVersion + 3}; this version understands up to ${latestSchemaVersion}`,
    );
  });

  it('reports a SQLite database of another program, or an empty one, as not a Tidewing database', () => {
    const other = scratchFile();
    const db = new Database(other);
    db.exec('CREATE TABLE invoices (id INTEGER PRIMARY KEY, total REAL)');
    db.close();
    expect(checkDatabaseFile(other)).toMatchObject({ ok: false, status: 'notTidewing', schemaVersion: 0 });
    expect(checkDatabaseFile(other).message).toContain('invoices');
    const empty = scratchFile('empty.db');
    fs.writeFileSync(empty, '');
    expect(checkDatabaseFile(empty)).toMatchObject({ ok: false, status: 'notTidewing', schemaVersion: 0 });
  });

  it('reports a table missing from the schema its version promises', () => {
    const file = scratchFile();
    const db = new Database(file);
    migrate(db, migrations);
    db.exec('DROP TABLE weights');
    db.close();
    const check = checkDatabaseFile(file);
    expect(check).toMatchObject({ ok: false, status: 'schemaIncomplete', missingTables: ['weights'] });
    expect(check.message).toContain('lacks the table weights');
  });

  it('accepts an older schema version whose tables are all there', () => {
    const file = scratchFile();
    const db = new Database(file);
    migrate(db, migrations.slice(0, 1));
    db.close();
    expect(checkDatabaseFile(file)).toMatchObject({ ok: true, status: 'ok', schemaVersion: 1 });
  });

  it('lists rows whose foreign keys point at rows that do not exist', () => {
    const { databaseFile } = withEntries(2);
    const db = new Database(databaseFile);
    db.pragma('foreign_keys = OFF');
    addEntries(db, 999, 1);
    const recordId = addPatientAndRecord(db, 'Pip');
    expect(recordId).toBeGreaterThan(0);
    db.close();
    const check = checkDatabaseFile(databaseFile);
    expect(check.status).toBe('foreignKeyProblems');
    expect(check.ok).toBe(false);
    expect(check.foreignKeyProblems).toEqual([
      { table: 'procedure_entries', rowId: 3, parentTable: 'procedure_records' },
    ]);
    expect(check.message).toContain('1 row pointing at rows that do not exist (in procedure_entries)');
  });
});
