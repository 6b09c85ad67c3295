import Database from 'better-sqlite3';
import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import {
  BackupError,
  backupDatabase,
  fileTimestamp,
  listBackups,
  rollingBackup,
  type BackupProgress,
} from '../../db/backup.js';
import { openDatabase } from '../../db/connection.js';
import { checkDatabaseFile } from '../../db/integrity.js';
import { temporaryFolder } from '../support/temporary-folder.js';
import {
  addEntries,
  damageMiddlePages,
  entryIdsIn,
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

function outFolder(): string {
  const temp = temporaryFolder('tidewing-backups-');
  cleanups.push(temp.remove);
  return temp.folder;
}

describe('backupDatabase', () => {
  it('copies an open database, including rows still in its WAL, into one self-contained checked file', async () => {
    const { databaseFile, entryIds } = withEntries(500);
    const db = openDatabase(databaseFile);
    cleanups.push(() => db.close());
    const recordId = db.prepare('SELECT id FROM procedure_records').pluck().get() as number;
    const later = addEntries(db, recordId, 5);
    const folder = outFolder();
    const progress: BackupProgress[] = [];

    const made = await backupDatabase(db, path.join(folder, 'copy.db'), (step) => progress.push(step), {
      pagesPerStep: 10,
    });

    expect(made).toMatchObject({ file: path.join(folder, 'copy.db'), verified: 'full' });
    expect(entryIdsIn(made.file)).toEqual([...entryIds, ...later]);
    // Rollback-journal header bytes: the copy needs no -wal beside it.
    expect(fs.readFileSync(made.file).subarray(18, 20)).toEqual(Buffer.from([1, 1]));
    expect(listing(folder)).toEqual(['copy.db']);
    expect(checkDatabaseFile(made.file).ok).toBe(true);
    expect(progress.length).toBeGreaterThan(2);
    expect(progress.map((step) => step.percent)).toEqual(
      [...progress.map((step) => step.percent)].sort((a, b) => a - b),
    );
    expect(progress.at(-1)?.percent).toBe(100);
    expect(made.sizeBytes).toBe(fs.statSync(made.file).size);
  });

  it('copies a database file by path while another connection holds committed rows in the WAL', async () => {
    const { databaseFile, entryIds } = withEntries(10);
    const writer = openDatabase(databaseFile);
    cleanups.push(() => writer.close());
    const later = addEntries(
      writer,
      writer.prepare('SELECT id FROM procedure_records').pluck().get() as number,
      3,
    );
    const made = await backupDatabase(databaseFile, path.join(outFolder(), 'by-path.db'));
    expect(entryIdsIn(made.file)).toEqual([...entryIds, ...later]);
  });

  it('refuses to write over an existing file and leaves it as it was', async () => {
    const { databaseFile } = withEntries(1);
    const folder = outFolder();
    const existing = path.join(folder, 'keep-me.db');
    fs.writeFileSync(existing, 'an older backup');
    await expect(backupDatabase(databaseFile, existing)).rejects.toThrow(
      /already exists.*Nothing was written/,
    );
    expect(fs.readFileSync(existing, 'utf8')).toBe('an older backup');
    expect(listing(folder)).toEqual(['keep-me.db']);
  });

  it('refuses to back a database up onto itself', async () => {
    const { databaseFile } = withEntries(1);
    const before = sha256(databaseFile);
    await expect(backupDatabase(databaseFile, databaseFile, undefined, { overwrite: true })).rejects.toThrow(
      /must differ from the database itself/,
    );
    expect(sha256(databaseFile)).toBe(before);
  });

  it('reports a missing source clearly and writes nothing', async () => {
    const folder = outFolder();
    await expect(
      backupDatabase(path.join(folder, 'absent.db'), path.join(folder, 'copy.db')),
    ).rejects.toThrow(BackupError);
    await expect(
      backupDatabase(path.join(folder, 'absent.db'), path.join(folder, 'copy.db')),
    ).rejects.toThrow(/no database at/);
    expect(listing(folder)).toEqual([]);
  });

  it('keeps no file when the copy of a damaged database fails its check', async () => {
    const { databaseFile } = withEntries(3000);
    damageMiddlePages(databaseFile);
    const folder = outFolder();
    await expect(backupDatabase(databaseFile, path.join(folder, 'copy.db'))).rejects.toThrow(
      /failed the integrity check.*No backup was kept/,
    );
    expect(listing(folder)).toEqual([]);
  });
});

describe('rollingBackup', () => {
  const at = (minute: number) => new Date(Date.UTC(2026, 0, 5, 9, minute, 0, 0));

  it('names each backup with a sortable UTC time and keeps only the newest `keep`', async () => {
    const { databaseFile } = withEntries(5);
    const folder = outFolder();
    fs.writeFileSync(path.join(folder, 'notes.txt'), 'not a backup');
    fs.writeFileSync(path.join(folder, 'tidewing-backup-before-surgery.db'), 'made by hand');
    const removedPerRun: number[] = [];
    for (let minute = 0; minute < 5; minute += 1) {
      const made = await rollingBackup({ databaseFile, backupFolder: folder, keep: 3, now: at(minute) });
      expect(path.basename(made.file)).toBe(`tidewing-backup-2026-01-05T09-0${minute}-00.000Z.db`);
      removedPerRun.push(made.removed.length);
    }
    expect(removedPerRun).toEqual([0, 0, 0, 1, 1]);
    expect(listing(folder)).toEqual([
      'notes.txt',
      'tidewing-backup-2026-01-05T09-02-00.000Z.db',
      'tidewing-backup-2026-01-05T09-03-00.000Z.db',
      'tidewing-backup-2026-01-05T09-04-00.000Z.db',
      'tidewing-backup-before-surgery.db',
    ]);
    expect(listBackups(folder).map((backup) => backup.takenAt)).toEqual([
      '2026-01-05T09:04:00.000Z',
      '2026-01-05T09:03:00.000Z',
      '2026-01-05T09:02:00.000Z',
    ]);
  });

  it('keeps the default of ten', async () => {
    const { databaseFile } = withEntries(1);
    const folder = outFolder();
    for (let minute = 0; minute < 12; minute += 1)
      await rollingBackup({ databaseFile, backupFolder: folder, now: at(minute) });
    expect(listBackups(folder)).toHaveLength(10);
    expect(listBackups(folder).at(-1)?.takenAt).toBe('2026-01-05T09:02:00.000Z');
  });

  it('keeps the newest backup of each of the last 7 days (UTC) beyond `keep`', async () => {
    const { databaseFile } = withEntries(1);
    const folder = outFolder();
    const hours = [8, 12, 16];
    for (let day = 1; day <= 9; day += 1)
      for (const hour of hours)
        await rollingBackup({
          databaseFile,
          backupFolder: folder,
          keep: 3,
          now: new Date(Date.UTC(2026, 3, day, hour, 0, 0, 0)),
        });
    // The last 3, then each of the six days before (2026-04-03 to 04-08) by its newest backup;
    // 2026-04-01 and 04-02 are more than 7 days back.
    expect(listBackups(folder).map((backup) => backup.takenAt)).toEqual([
      '2026-04-09T16:00:00.000Z',
      '2026-04-09T12:00:00.000Z',
      '2026-04-09T08:00:00.000Z',
      ...[8, 7, 6, 5, 4, 3].map((day) => `2026-04-0${day}T16:00:00.000Z`),
    ]);
  });

  it('never deletes a backup that holds more clinic records than the new one', async () => {
    const clinic = withEntries(20);
    const folder = outFolder();
    for (let minute = 0; minute < 3; minute += 1)
      await rollingBackup({
        databaseFile: clinic.databaseFile,
        backupFolder: folder,
        keep: 2,
        now: at(minute),
      });
    const withRecords = listBackups(folder).map((backup) => backup.file);
    // The database is replaced by one holding fewer records (a mistaken fresh start), and the
    // app starts five times more.
    const smaller = withEntries(1);
    const kept: string[][] = [];
    for (let minute = 10; minute < 15; minute += 1) {
      const made = await rollingBackup({
        databaseFile: smaller.databaseFile,
        backupFolder: folder,
        keep: 2,
        now: at(minute),
      });
      kept.push(
        made.keptBeyondLimit.filter((item) => item.reason === 'moreRecords').map((item) => item.file),
      );
    }
    for (const file of withRecords) expect(fs.existsSync(file)).toBe(true);
    expect(kept.at(-1)).toEqual(withRecords);
    // Only the smaller database's own older backups were rotated: 2 newest kept, 3 removed.
    expect(listBackups(folder)).toHaveLength(withRecords.length + 2);
    expect(entryIdsIn(withRecords[0] ?? '')).toEqual(clinic.entryIds);
  });

  it('gives a second backup in the same millisecond its own name', async () => {
    const { databaseFile } = withEntries(1);
    const folder = outFolder();
    const first = await rollingBackup({ databaseFile, backupFolder: folder, now: at(1) });
    const second = await rollingBackup({ databaseFile, backupFolder: folder, now: at(1) });
    expect(path.basename(second.file)).toBe('tidewing-backup-2026-01-05T09-01-00.000Z-2.db');
    expect(listBackups(folder).map((backup) => backup.file)).toEqual([second.file, first.file]);
  });

  it('never deletes the backup it has just made, even when the clock was set back', async () => {
    const { databaseFile } = withEntries(1);
    const folder = outFolder();
    for (let minute = 10; minute < 13; minute += 1)
      await rollingBackup({ databaseFile, backupFolder: folder, keep: 3, now: at(minute) });
    const made = await rollingBackup({ databaseFile, backupFolder: folder, keep: 3, now: at(1) });
    expect(fs.existsSync(made.file)).toBe(true);
    expect(made.removed.map((file) => path.basename(file))).toEqual([
      'tidewing-backup-2026-01-05T09-10-00.000Z.db',
    ]);
  });

  it('deletes no older backup when the new one cannot be made', async () => {
    const { databaseFile } = withEntries(3000);
    const folder = outFolder();
    for (let minute = 0; minute < 3; minute += 1)
      await rollingBackup({ databaseFile, backupFolder: folder, keep: 3, now: at(minute) });
    const before = listing(folder);
    damageMiddlePages(databaseFile);
    await expect(rollingBackup({ databaseFile, backupFolder: folder, keep: 3, now: at(9) })).rejects.toThrow(
      /failed the integrity check/,
    );
    expect(listing(folder)).toEqual(before);
  });

  it('refuses a keep count that is not a whole number from 1 to 1000', async () => {
    const { databaseFile } = withEntries(1);
    const folder = outFolder();
    for (const keep of [0, 2.5, -1, 1001]) {
      await expect(rollingBackup({ databaseFile, backupFolder: folder, keep, now: at(0) })).rejects.toThrow(
        /keep must be a whole number/,
      );
    }
    expect(listing(folder)).toEqual([]);
  });

  it('writes file times that sort in time order', () => {
    const times = [
      new Date(Date.UTC(2026, 8, 30, 23, 59, 59, 999)),
      new Date(Date.UTC(2026, 9, 1, 0, 0, 0, 0)),
      new Date(Date.UTC(2027, 0, 1, 0, 0, 0, 1)),
    ];
    const stamps = times.map(fileTimestamp);
    expect([...stamps].sort()).toEqual(stamps);
    expect(stamps.every((stamp) => !stamp.includes(':'))).toBe(true);
  });
});

describe('a backup made while the database stays in use', () => {
  it('lets the app write between its steps, and the copy includes those writes', async () => {
    const { databaseFile } = withEntries(2000);
    const db = openDatabase(databaseFile);
    cleanups.push(() => db.close());
    const recordId = db.prepare('SELECT id FROM procedure_records').pluck().get() as number;
    const writtenDuring: number[] = [];
    const made = await backupDatabase(
      db,
      path.join(outFolder(), 'copy.db'),
      (step) => {
        if (step.percent > 0 && step.percent < 100 && writtenDuring.length === 0)
          writtenDuring.push(...addEntries(db, recordId, 3));
      },
      { pagesPerStep: 5 },
    );
    expect(writtenDuring).toHaveLength(3);
    const copy = new Database(made.file, { readonly: true });
    cleanups.push(() => copy.close());
    expect(copy.prepare('SELECT count(*) FROM procedure_entries').pluck().get()).toBe(2003);
    expect(copy.pragma('integrity_check', { simple: true })).toBe('ok');
  });
});
