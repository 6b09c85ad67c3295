import Database from 'better-sqlite3';
import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { backupDatabase, type BackupProgress } from '../../db/backup.js';
import { migrate, openDatabase, schemaVersion } from '../../db/connection.js';
import { latestSchemaVersion, migrations } from '../../db/migrations/index.js';
import { restoreDatabase, RestoreRefusedError } from '../../db/restore.js';
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

const now = new Date(Date.UTC(2026, 1, 3, 14, 15, 16, 789));
const replacedName = 'tidewing.db.replaced-2026-02-03T14-15-16.789Z';

function withEntries(count: number) {
  const fixture = fixtureWithEntries(count);
  cleanups.push(fixture.remove);
  return fixture;
}

function scratchFolder(): string {
  const temp = temporaryFolder('tidewing-restore-');
  cleanups.push(temp.remove);
  return temp.folder;
}

/** A backup of a database holding `count` entries, in its own folder. */
async function backupWith(count: number): Promise<{ file: string; entryIds: number[] }> {
  const source = withEntries(count);
  const made = await backupDatabase(source.databaseFile, path.join(scratchFolder(), 'backup.db'));
  return { file: made.file, entryIds: source.entryIds };
}

describe('restoreDatabase', () => {
  it('puts the backup in place, keeps the replaced database whole beside it, and leaves the backup untouched', async () => {
    const backup = await backupWith(7);
    const live = withEntries(40);
    const backupBefore = sha256(backup.file);
    const progress: BackupProgress[] = [];

    const result = await restoreDatabase({
      from: backup.file,
      databaseFile: live.databaseFile,
      now,
      onProgress: (step) => progress.push(step),
    });

    expect(result.replacedFile).toBe(path.join(live.folder, replacedName));
    expect(entryIdsIn(live.databaseFile)).toEqual(backup.entryIds);
    expect(entryIdsIn(path.join(live.folder, replacedName))).toEqual(live.entryIds);
    expect(sha256(backup.file)).toBe(backupBefore);
    expect(result.sourceCheck.ok).toBe(true);
    expect(result.restoredCheck.ok).toBe(true);
    expect(progress.at(-1)?.percent).toBe(100);
    expect(listing(live.folder)).toEqual(['tidewing.db', replacedName]);
    const reopened = openDatabase(live.databaseFile);
    expect(reopened.pragma('journal_mode', { simple: true })).toBe('wal');
    reopened.close();
  });

  it('keeps rows the replaced database held only in its WAL after a crash', async () => {
    const backup = await backupWith(2);
    const live = withEntries(3);
    // Copying the files of an open database gives exactly what a power cut leaves: rows committed to the WAL only.
    const crashed = scratchFolder();
    const writer = openDatabase(live.databaseFile);
    const later = addEntries(
      writer,
      writer.prepare('SELECT id FROM procedure_records').pluck().get() as number,
      4,
    );
    for (const name of ['tidewing.db', 'tidewing.db-wal'])
      fs.copyFileSync(path.join(live.folder, name), path.join(crashed, name));
    writer.close();
    expect(fs.statSync(path.join(crashed, 'tidewing.db-wal')).size).toBeGreaterThan(0);

    const result = await restoreDatabase({
      from: backup.file,
      databaseFile: path.join(crashed, 'tidewing.db'),
      now,
    });

    expect(entryIdsIn(path.join(crashed, 'tidewing.db'))).toEqual(backup.entryIds);
    expect(result.replacedFile).not.toBeNull();
    expect(entryIdsIn(result.replacedFile ?? '')).toEqual([...live.entryIds, ...later]);
    expect(listing(crashed).filter((name) => name.startsWith('tidewing.db-'))).toEqual([]);
  });

  it('replaces a damaged database, keeping the damaged file byte for byte for later recovery', async () => {
    const backup = await backupWith(6);
    const live = withEntries(3000);
    damageMiddlePages(live.databaseFile);
    const damaged = sha256(live.databaseFile);
    const result = await restoreDatabase({ from: backup.file, databaseFile: live.databaseFile, now });
    expect(result.restoredCheck.ok).toBe(true);
    expect(entryIdsIn(live.databaseFile)).toEqual(backup.entryIds);
    expect(sha256(result.replacedFile ?? '')).toBe(damaged);
  });

  it('replaces a file that is not a database at all', async () => {
    const backup = await backupWith(2);
    const folder = scratchFolder();
    fs.writeFileSync(path.join(folder, 'tidewing.db'), 'overwritten by mistake');
    const result = await restoreDatabase({
      from: backup.file,
      databaseFile: path.join(folder, 'tidewing.db'),
      now,
    });
    expect(fs.readFileSync(result.replacedFile ?? '', 'utf8')).toBe('overwritten by mistake');
    expect(entryIdsIn(path.join(folder, 'tidewing.db'))).toEqual(backup.entryIds);
  });

  it('restores into a data folder that has no database yet', async () => {
    const backup = await backupWith(3);
    const folder = path.join(scratchFolder(), 'new-data');
    const result = await restoreDatabase({
      from: backup.file,
      databaseFile: path.join(folder, 'tidewing.db'),
      now,
    });
    expect(result.replacedFile).toBeNull();
    expect(entryIdsIn(path.join(folder, 'tidewing.db'))).toEqual(backup.entryIds);
    expect(listing(folder)).toEqual(['tidewing.db']);
  });

  it('restores a backup from an older schema as it is, and opening it brings it up to date', async () => {
    const folder = scratchFolder();
    const old = new Database(path.join(folder, 'old.db'));
    migrate(old, migrations.slice(0, 1));
    old.close();
    const live = withEntries(1);
    await restoreDatabase({ from: path.join(folder, 'old.db'), databaseFile: live.databaseFile, now });
    const db = openDatabase(live.databaseFile);
    expect(schemaVersion(db)).toBe(latestSchemaVersion);
    db.close();
  });

  it('keeps a second replaced database under its own name when two restores share a time', async () => {
    const backup = await backupWith(1);
    const live = withEntries(1);
    await restoreDatabase({ from: backup.file, databaseFile: live.databaseFile, now });
    const second = await restoreDatabase({ from: backup.file, databaseFile: live.databaseFile, now });
    expect(second.replacedFile).toBe(path.join(live.folder, `${replacedName}-2`));
    expect(listing(live.folder)).toEqual(['tidewing.db', replacedName, `${replacedName}-2`]);
  });

  describe('refuses, changing nothing', () => {
    async function expectRefusal(from: string, databaseFile: string, message: RegExp): Promise<void> {
      const folder = path.dirname(databaseFile);
      const before = sha256(databaseFile);
      const filesBefore = listing(folder);
      const refusal = restoreDatabase({ from, databaseFile, now });
      await expect(refusal).rejects.toThrow(RestoreRefusedError);
      await expect(restoreDatabase({ from, databaseFile, now })).rejects.toThrow(message);
      expect(sha256(databaseFile)).toBe(before);
      expect(listing(folder)).toEqual(filesBefore);
    }

    it('a damaged backup', async () => {
      const backup = await backupWith(3000);
      damageMiddlePages(backup.file);
      const live = withEntries(5);
      await expectRefusal(
        backup.file,
        live.databaseFile,
        /Restore refused: .* is damaged.*Nothing was changed/,
      );
      expect(entryIdsIn(live.databaseFile)).toEqual(live.entryIds);
    });

    it('a file that is not a database', async () => {
      const file = path.join(scratchFolder(), 'backup.db');
      fs.writeFileSync(file, 'not a database at all '.repeat(100));
      await expectRefusal(
        file,
        withEntries(1).databaseFile,
        /not a SQLite database file.*Nothing was changed/,
      );
    });

    it('a backup from a newer Tidewing', async () => {
      const backup = await backupWith(1);
      const writer = new Database(backup.file);
      writer.pragma(`user_version = ${latestSchemaVersion + 1}`);
      writer.close();
      await expectRefusal(backup.file, withEntries(1).databaseFile, /newer version of Tidewing/);
    });

    it('a missing backup file', async () => {
      await expectRefusal(
        path.join(scratchFolder(), 'nowhere.db'),
        withEntries(1).databaseFile,
        /There is no database file at/,
      );
    });

    it('the database itself as the source', async () => {
      const live = withEntries(1);
      await expectRefusal(live.databaseFile, live.databaseFile, /is the database itself/);
    });

    it('while another connection (the running app) has the database open', async () => {
      const backup = await backupWith(1);
      const live = withEntries(2);
      const app = openDatabase(live.databaseFile);
      cleanups.push(() => app.close());
      const filesBefore = listing(live.folder);
      await expect(
        restoreDatabase({ from: backup.file, databaseFile: live.databaseFile, now }),
      ).rejects.toThrow(/is in use.*Close Tidewing.*Nothing was changed/);
      expect(listing(live.folder)).toEqual(filesBefore);
      expect(app.prepare('SELECT count(*) FROM procedure_entries').pluck().get()).toBe(2);
    });
  });
});
