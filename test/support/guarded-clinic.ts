import Database from 'better-sqlite3';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { openDatabase } from '../../db/connection.js';
import { automaticBackupOnStart, backupFolder } from '../../main/back-end/automatic-backup.js';
import {
  addEntries,
  damageMiddlePages,
  fixtureWithEntries,
  type Fixture,
} from '../db/support/record-fixture.js';

export type ClinicWithBackups = Fixture & {
  /** The rolling backups, oldest first; the last holds the most recent records. */
  readonly backups: readonly string[];
};

const day = (n: number) => new Date(Date.UTC(2026, 3, n, 8, 0, 0, 0));

/**
 * A data folder as a clinic leaves it after a few days: a database with a patient, a record
 * and `entries` entries (large enough to damage a page in the middle), and two automatic
 * backups, the second taken after more entries were saved.
 */
export async function clinicWithBackups(entries = 3000): Promise<ClinicWithBackups> {
  const fixture = fixtureWithEntries(entries);
  const backups: string[] = [];
  for (const [index, at] of [day(1), day(2)].entries()) {
    if (index > 0) {
      const db = openDatabase(fixture.databaseFile);
      const recordId = db.prepare('SELECT id FROM procedure_records').pluck().get() as number;
      db.transaction(() => addEntries(db, recordId, 5)).immediate();
      db.close();
    }
    const made = await automaticBackupOnStart({
      dataDirectory: fixture.folder,
      databaseFile: fixture.databaseFile,
      now: at,
    });
    if (made.status !== 'made') throw new Error(made.message);
    backups.push(made.file);
  }
  return { ...fixture, backups };
}

/** The ways a clinic database goes wrong that the start-up guard must catch. */
export const damages = {
  /** Cut to 0 bytes, as a failed copy or sync leaves it. */
  emptied: (file: string) => fs.truncateSync(file, 0),
  /** Moved away or deleted. */
  deleted: (file: string) => fs.rmSync(file),
  /** Pages in the middle overwritten, as a failing disk leaves it. */
  damagedPage: (file: string) => damageMiddlePages(file),
  /** Replaced by a SQLite database of another program. */
  foreign: (file: string) => {
    fs.rmSync(file);
    const other = new Database(file);
    other.exec(
      'CREATE TABLE invoices (id INTEGER PRIMARY KEY, total REAL); INSERT INTO invoices VALUES (1, 12.5);',
    );
    other.close();
  },
  /** A Tidewing database that lost one of its tables. */
  missingTable: (file: string) => {
    const db = new Database(file);
    db.exec('DROP TABLE emergency_drugs');
    db.pragma('journal_mode = DELETE');
    db.close();
  },
} as const;

export type DamageName = keyof typeof damages;

/** Every file under `folder` (sub-folders included) with its SHA-256, to prove nothing changed. */
export function snapshot(folder: string): Record<string, string> {
  const result: Record<string, string> = {};
  const walk = (current: string) => {
    for (const entry of fs.readdirSync(current, { withFileTypes: true })) {
      const full = path.join(current, entry.name);
      if (entry.isDirectory()) walk(full);
      else
        result[path.relative(folder, full)] = crypto
          .createHash('sha256')
          .update(fs.readFileSync(full))
          .digest('hex');
    }
  };
  walk(folder);
  return result;
}

export { backupFolder };
