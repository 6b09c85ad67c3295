import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { listBackups } from '../../db/backup.js';
import { openDatabase } from '../../db/connection.js';
import { automaticBackupOnStart, backupFolder } from '../../main/back-end/automatic-backup.js';
import {
  addEntries,
  damageMiddlePages,
  entryIdsIn,
  fixtureWithEntries,
  listing,
} from '../db/support/record-fixture.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

const start = (day: number) => new Date(Date.UTC(2026, 3, day, 8, 0, 0, 0));

describe('automaticBackupOnStart', () => {
  it('makes a rolling backup in <data>/backups and keeps the last ten', async () => {
    const data = fixtureWithEntries(5);
    cleanups.push(data.remove);
    for (let day = 1; day <= 12; day += 1) {
      const result = await automaticBackupOnStart({
        dataDirectory: data.folder,
        databaseFile: data.databaseFile,
        now: start(day),
      });
      expect(result.status).toBe('made');
    }
    const backups = listBackups(backupFolder(data.folder));
    expect(backups).toHaveLength(10);
    expect(backups[0]?.takenAt).toBe('2026-04-12T08:00:00.000Z');
    expect(entryIdsIn(backups[0]?.file ?? '')).toEqual(data.entryIds);
  });

  it('backs up while the app already has the database open', async () => {
    const data = fixtureWithEntries(5);
    cleanups.push(data.remove);
    const db = openDatabase(data.databaseFile);
    cleanups.push(() => db.close());
    const byPath = await automaticBackupOnStart({
      dataDirectory: data.folder,
      databaseFile: data.databaseFile,
      now: start(1),
      keep: 3,
    });
    expect(byPath).toMatchObject({ status: 'made', removed: [] });
    const later = addEntries(db, db.prepare('SELECT id FROM procedure_records').pluck().get() as number, 2);
    const throughConnection = await automaticBackupOnStart({
      dataDirectory: data.folder,
      databaseFile: data.databaseFile,
      connection: db,
      now: start(2),
      keep: 3,
    });
    expect(throughConnection.status).toBe('made');
    expect(entryIdsIn(throughConnection.status === 'made' ? throughConnection.file : '')).toEqual([
      ...data.entryIds,
      ...later,
    ]);
  });

  it('skips the first start, when there is no database yet', async () => {
    const temp = temporaryFolder();
    cleanups.push(temp.remove);
    const result = await automaticBackupOnStart({
      dataDirectory: temp.folder,
      databaseFile: path.join(temp.folder, 'tidewing.db'),
      now: start(1),
    });
    expect(result).toEqual({ status: 'skipped', message: 'No database yet, so no automatic backup.' });
    expect(listing(temp.folder)).toEqual([]);
  });

  it('returns a message instead of throwing when the database is damaged, and keeps the older backups', async () => {
    const data = fixtureWithEntries(3000);
    cleanups.push(data.remove);
    await automaticBackupOnStart({
      dataDirectory: data.folder,
      databaseFile: data.databaseFile,
      now: start(1),
    });
    damageMiddlePages(data.databaseFile);
    const result = await automaticBackupOnStart({
      dataDirectory: data.folder,
      databaseFile: data.databaseFile,
      now: start(2),
    });
    expect(result.status).toBe('failed');
    expect(result.message).toMatch(/^Automatic backup failed: .*integrity check/);
    expect(fs.readdirSync(backupFolder(data.folder))).toEqual([
      'tidewing-backup-2026-04-01T08-00-00.000Z.db',
    ]);
  });

  it('returns a message for an impossible keep count rather than throwing', async () => {
    const data = fixtureWithEntries(1);
    cleanups.push(data.remove);
    const result = await automaticBackupOnStart({
      dataDirectory: data.folder,
      databaseFile: data.databaseFile,
      now: start(1),
      keep: 0,
    });
    expect(result).toMatchObject({ status: 'failed' });
    expect(result.message).toContain('keep must be a whole number');
  });
});
