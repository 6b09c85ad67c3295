import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { openDatabase, type TidewingDatabase } from '../../../db/connection.js';
import { openReadOnly } from '../../../db/integrity.js';
import { temporaryFolder } from '../../support/temporary-folder.js';

/** Timestamps in the shape the schema wants (ISO 8601 with milliseconds, at least 20 characters). */
export const enteredAt = '2026-01-05T09:30:00.000Z';

export type Fixture = { readonly folder: string; readonly databaseFile: string; readonly remove: () => void };

/** A data folder with a fresh, fully migrated `tidewing.db` (closed). */
export function fixtureFolder(): Fixture {
  const temp = temporaryFolder('tidewing-records-');
  const databaseFile = path.join(temp.folder, 'tidewing.db');
  openDatabase(databaseFile).close();
  return { folder: temp.folder, databaseFile, remove: temp.remove };
}

/** One patient with a current version and one procedure record; returns the record id. */
export function addPatientAndRecord(db: TidewingDatabase, name = 'Kiwi'): number {
  const patientId = Number(
    db.prepare('INSERT INTO patients (created_at) VALUES (?)').run(enteredAt).lastInsertRowid,
  );
  const versionId = Number(
    db
      .prepare(
        "INSERT INTO patient_versions (patient_id, name, species_key, sex, entered_at, entered_by) VALUES (?, ?, 'budgerigar', 'female', ?, 'AB')",
      )
      .run(patientId, name, enteredAt).lastInsertRowid,
  );
  db.prepare('INSERT INTO patient_current (patient_id, version_id) VALUES (?, ?)').run(patientId, versionId);
  db.prepare('INSERT INTO patient_search (rowid, search_text) VALUES (?, ?)').run(patientId, name);
  const recordId = Number(
    db
      .prepare('INSERT INTO procedure_records (patient_id, created_at) VALUES (?, ?)')
      .run(patientId, enteredAt).lastInsertRowid,
  );
  db.prepare(
    "INSERT INTO procedure_record_versions (record_id, started_at, procedure_name, airway, circuit, staff_initials, entered_at, entered_by) VALUES (?, ?, 'Wing radiograph', 'mask', 'nonRebreathing', 'AB', ?, 'AB')",
  ).run(recordId, enteredAt, enteredAt);
  return recordId;
}

/** Adds `count` vitals entries to a record (each its own transaction unless inside one); returns their ids. */
export function addEntries(db: TidewingDatabase, recordId: number, count: number): number[] {
  const insert = db.prepare(
    "INSERT INTO procedure_entries (record_id, at, kind, vapor_pct, oxygen_lpm, heart_rate_per_min, breaths_per_min, entered_at, entered_by) VALUES (?, ?, 'vitals', 2.5, 1, 300, 30, ?, 'AB')",
  );
  const ids: number[] = [];
  for (let index = 0; index < count; index += 1)
    ids.push(Number(insert.run(recordId, enteredAt, enteredAt).lastInsertRowid));
  return ids;
}

/** A fixture database holding `entries` entries (closed again). */
export function fixtureWithEntries(entries: number): Fixture & { readonly entryIds: number[] } {
  const fixture = fixtureFolder();
  const db = openDatabase(fixture.databaseFile);
  try {
    const recordId = addPatientAndRecord(db);
    // One transaction for the whole fill: fsync per row would make a large fixture slow.
    const entryIds = db.transaction(() => addEntries(db, recordId, entries))();
    return { ...fixture, entryIds };
  } finally {
    db.close();
  }
}

export const sha256 = (file: string): string =>
  crypto.createHash('sha256').update(fs.readFileSync(file)).digest('hex');

export const listing = (folder: string): string[] => fs.readdirSync(folder).sort();

/** Entry ids in a database file, read without leaving files beside it. */
export function entryIdsIn(file: string): number[] {
  const opened = openReadOnly(file);
  try {
    return opened.db.prepare('SELECT id FROM procedure_entries ORDER BY id').pluck().all() as number[];
  } finally {
    opened.close();
  }
}

/**
 * Overwrites whole pages in the middle of a database file with a byte pattern, as a failing disk
 * or a bad copy would; the fixture must have more than `pages` + 2 pages.
 */
export function damageMiddlePages(file: string, pages = 3): void {
  const bytes = fs.readFileSync(file);
  const pageSize = bytes.readUInt16BE(16) === 1 ? 65536 : bytes.readUInt16BE(16);
  const pageCount = Math.floor(bytes.length / pageSize);
  if (pageCount < pages + 3) throw new Error(`fixture too small to damage: ${pageCount} pages`);
  const first = Math.floor(pageCount / 2) - Math.floor(pages / 2);
  bytes.fill(0x5a, first * pageSize, (first + pages) * pageSize);
  fs.writeFileSync(file, bytes);
}
