import Database from 'better-sqlite3';
import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { listBackups } from '../../db/backup.js';
import { startBackEnd } from '../../main/back-end/back-end.js';
import {
  checkBeforeStart,
  restoreCommand,
  shellWord,
  StartRefusedError,
} from '../../main/back-end/start-up-guard.js';
import { runRestoreCommand } from '../../main/cli/restore-command.js';
import { openDatabase } from '../../db/connection.js';
import { addEntries, damageMiddlePages, entryIdsIn, listing } from '../db/support/record-fixture.js';
import {
  backupFolder,
  clinicWithBackups,
  damages,
  snapshot,
  type ClinicWithBackups,
  type DamageName,
} from '../support/guarded-clinic.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

async function clinic(entries?: number): Promise<ClinicWithBackups> {
  const made = await clinicWithBackups(entries);
  cleanups.push(made.remove);
  return made;
}

function start(dataDirectory: string, newClinic = false) {
  const backEnd = startBackEnd({
    dataDirectory,
    appVersion: '9.8.7',
    host: 'browser',
    automaticBackup: true,
    newClinic,
    now: () => new Date(Date.UTC(2026, 3, 3, 8, 0, 0)),
  });
  cleanups.push(() => backEnd.close());
  return backEnd;
}

function refusal(dataDirectory: string, newClinic = false): StartRefusedError {
  try {
    start(dataDirectory, newClinic);
  } catch (error) {
    if (error instanceof StartRefusedError) return error;
    throw error;
  }
  throw new Error('the start was not refused');
}

const cases: [DamageName, string, RegExp][] = [
  ['emptied', 'empty', /is empty \(0 bytes\), but .* holds 2 backups with records/],
  ['deleted', 'missing', /There is no clinic database at .*, but .* holds 2 backups with records/],
  ['damagedPage', 'damaged', /failed its check: .* is damaged/],
  ['foreign', 'notTidewing', /failed its check: .* not a Tidewing database/],
  ['missingTable', 'incomplete', /failed its check: .* lacks the table emergency_drugs/],
];

describe('the start-up guard', () => {
  it.each(cases)(
    'refuses a database %s before writing anything, naming the newest good backup and the restore command',
    async (damage, problem, what) => {
      const data = await clinic();
      damages[damage](data.databaseFile);
      const before = snapshot(data.folder);

      const error = refusal(data.folder);
      expect(error.finding.problem).toBe(problem);
      expect(error.message).toMatch(what);
      expect(error.message).toContain('Nothing was changed');
      const newest = data.backups.at(-1) ?? '';
      expect(error.finding.goodBackup?.file).toBe(newest);
      expect(error.finding.restoreCommand).toBe(`npx tidewing restore ${newest} --data ${data.folder}`);
      expect(error.message).toContain(`The newest good backup is ${newest}`);
      expect(error.message).toContain(`  npx tidewing restore ${newest} --data ${data.folder}\n`);
      // Byte for byte, and no file added (no -wal or -shm, no new backup) or removed.
      expect(snapshot(data.folder)).toEqual(before);
    },
  );

  it('after the restore it names, the clinic starts with every entry of that backup', async () => {
    const data = await clinic();
    damages.emptied(data.databaseFile);
    const error = refusal(data.folder);
    const [npx, tidewing, restore, backup, dataOption, dataDirectory] = (
      error.finding.restoreCommand ?? ''
    ).split(' ');
    expect([npx, tidewing, restore, dataOption]).toEqual(['npx', 'tidewing', 'restore', '--data']);
    const output: string[] = [];
    const io = { stdout: (text: string) => output.push(text), stderr: (text: string) => output.push(text) };
    expect(await runRestoreCommand([backup ?? '', '--data', dataDirectory ?? ''], io)).toBe(0);
    const backEnd = start(data.folder);
    await backEnd.backupSettled;
    backEnd.close();
    expect(entryIdsIn(data.databaseFile)).toEqual(entryIdsIn(data.backups.at(-1) ?? ''));
  });

  it('refuses a deleted database whose write-ahead log is still there, even with --new-clinic; the restore keeps that log aside', async () => {
    const data = await clinic();
    // A log holding saved changes, as a database moved away while Tidewing ran leaves behind.
    const writer = openDatabase(data.databaseFile);
    const recordId = writer.prepare('SELECT id FROM procedure_records').pluck().get() as number;
    writer.transaction(() => addEntries(writer, recordId, 3)).immediate();
    const log = fs.readFileSync(`${data.databaseFile}-wal`);
    writer.close();
    fs.rmSync(data.databaseFile);
    fs.writeFileSync(`${data.databaseFile}-wal`, log);
    const before = snapshot(data.folder);

    for (const newClinic of [false, true]) {
      const error = refusal(data.folder, newClinic);
      expect(error.finding.problem).toBe('orphanLog');
      expect(error.message).toMatch(
        /There is no clinic database at .*, but its write-ahead log .*-wal \(\d+ KB\) is still there/,
      );
      expect(error.message).not.toContain('--new-clinic');
      expect(snapshot(data.folder)).toEqual(before);
    }

    const output: string[] = [];
    const io = { stdout: (text: string) => output.push(text), stderr: (text: string) => output.push(text) };
    expect(await runRestoreCommand([data.backups.at(-1) ?? '', '--data', data.folder], io)).toBe(0);
    expect(output.join('')).toMatch(
      /A log file left there without its database is kept at .*tidewing\.db\.replaced-.*-wal/,
    );
    const kept = fs.readdirSync(data.folder).filter((name) => name.endsWith('-wal'));
    expect(kept).toHaveLength(1);
    expect(fs.readFileSync(path.join(data.folder, kept[0] ?? ''))).toEqual(log);
    start(data.folder).close();
    expect(entryIdsIn(data.databaseFile)).toEqual(entryIdsIn(data.backups.at(-1) ?? ''));
  });

  it('offers the backup holding the most recent records that passes the check, not merely the newest file', async () => {
    const data = await clinic();
    const [older, newer] = data.backups;
    // The newer backup is damaged; a copy put in the folder by hand holds later records still.
    damageMiddlePages(newer ?? '');
    const handCopy = path.join(backupFolder(data.folder), 'before the move.db');
    fs.copyFileSync(older ?? '', handCopy);
    const db = new Database(handCopy);
    db.prepare(
      "INSERT INTO procedure_entries (record_id, at, kind, vapor_pct, entered_at, entered_by) VALUES (1, '2026-04-05T10:00:00.000Z', 'vitals', 2, '2026-04-05T10:00:00.000Z', 'AB')",
    ).run();
    db.close();
    damages.deleted(data.databaseFile);

    const error = refusal(data.folder);
    expect(error.finding.goodBackup).toMatchObject({
      file: handCopy,
      latestRecordAt: '2026-04-05T10:00:00.000Z',
    });
    expect(error.finding.restoreCommand).toBe(`npx tidewing restore '${handCopy}' --data ${data.folder}`);
  });

  it('says so when no backup passes the check', async () => {
    const data = await clinic();
    for (const backup of data.backups) damageMiddlePages(backup);
    damages.damagedPage(data.databaseFile);
    const error = refusal(data.folder);
    expect(error.finding.goodBackup).toBeNull();
    expect(error.finding.restoreCommand).toBeNull();
    expect(error.message).toMatch(/No backup in .* holds records and passes the check/);
  });

  it('starts a new clinic on a truly first start: no database and no backups', () => {
    const temp = temporaryFolder();
    cleanups.push(temp.remove);
    expect(checkBeforeStart({ dataDirectory: temp.folder })).toMatchObject({ ok: true, state: 'absent' });
    const backEnd = start(temp.folder);
    expect(listing(temp.folder)).toContain('tidewing.db');
    backEnd.close();
    expect(checkBeforeStart({ dataDirectory: temp.folder })).toMatchObject({ ok: true, state: 'sound' });
  });

  it('starts a new clinic with --new-clinic beside backups with records, and keeps those backups', async () => {
    const data = await clinic();
    damages.emptied(data.databaseFile);
    const before = snapshot(backupFolder(data.folder));
    const backEnd = start(data.folder, true);
    await backEnd.backupSettled;
    backEnd.close();
    expect(entryIdsIn(data.databaseFile)).toEqual([]);
    const after = snapshot(backupFolder(data.folder));
    for (const [name, hash] of Object.entries(before)) expect(after[name]).toBe(hash);
    expect(listBackups(backupFolder(data.folder))).toHaveLength(3);
  });

  it('an emptied database started twelve times, refused each time; then twelve --new-clinic starts keep the backups with records', async () => {
    const data = await clinic();
    damages.emptied(data.databaseFile);
    const withRecords = snapshot(backupFolder(data.folder));
    for (let attempt = 0; attempt < 12; attempt += 1) refusal(data.folder);
    expect(snapshot(backupFolder(data.folder))).toEqual(withRecords);
    for (let day = 3; day < 15; day += 1) {
      const backEnd = startBackEnd({
        dataDirectory: data.folder,
        appVersion: '9.8.7',
        host: 'browser',
        automaticBackup: true,
        newClinic: true,
        now: () => new Date(Date.UTC(2026, 3, day, 8, 0, 0)),
      });
      await backEnd.backupSettled;
      backEnd.close();
    }
    const after = snapshot(backupFolder(data.folder));
    for (const [name, hash] of Object.entries(withRecords)) expect(after[name]).toBe(hash);
    // The new clinic's own backups rotate as usual: its last 10 are kept beside the two.
    expect(listBackups(backupFolder(data.folder))).toHaveLength(2 + 10);
  });

  it('refuses --new-clinic where the database holds records, and where the file is damaged', async () => {
    const data = await clinic();
    const before = snapshot(data.folder);
    const overRecords = refusal(data.folder, true);
    expect(overRecords.finding.problem).toBe('newClinicOverRecords');
    expect(overRecords.message).toMatch(/--new-clinic refused: .* already holds a clinic \(\d+ records\)/);
    damages.damagedPage(data.databaseFile);
    const damaged = snapshot(data.folder);
    const overDamage = refusal(data.folder, true);
    expect(overDamage.finding.problem).toBe('damaged');
    expect(overDamage.message).toContain('--new-clinic never replaces an existing file');
    expect(snapshot(data.folder)).toEqual(damaged);
    expect(Object.keys(damaged)).toEqual(Object.keys(before));
  });

  it('lets an emptied database start over when the backups hold no records either', () => {
    const temp = temporaryFolder();
    cleanups.push(temp.remove);
    fs.writeFileSync(path.join(temp.folder, 'tidewing.db'), '');
    expect(checkBeforeStart({ dataDirectory: temp.folder })).toMatchObject({ ok: true, state: 'empty' });
  });

  it('quotes paths in the restore command only where the shell needs it', () => {
    expect(shellWord('/srv/clinic/backups/tidewing-backup-2026-04-02T08-00-00.000Z.db', 'linux')).toBe(
      '/srv/clinic/backups/tidewing-backup-2026-04-02T08-00-00.000Z.db',
    );
    expect(shellWord("/home/vet/Bird clinic's data", 'linux')).toBe("'/home/vet/Bird clinic'\\''s data'");
    expect(restoreCommand('C:\\Users\\vet\\My backups\\a.db', 'C:\\Data', 'win32')).toBe(
      'npx tidewing restore "C:\\Users\\vet\\My backups\\a.db" --data C:\\Data',
    );
  });
});
