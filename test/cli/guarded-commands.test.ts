import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { runBackupCommand } from '../../main/cli/backup-command.js';
import { runCheckCommand } from '../../main/cli/check-command.js';
import { runExportCommand } from '../../main/cli/export-command.js';
import { runWorksheetCommand } from '../../main/cli/worksheet-command.js';
import {
  clinicWithBackups,
  damages,
  snapshot,
  type ClinicWithBackups,
  type DamageName,
} from '../support/guarded-clinic.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

function captured() {
  const out: string[] = [];
  const err: string[] = [];
  return {
    io: { stdout: (text: string) => out.push(text), stderr: (text: string) => err.push(text) },
    stdout: () => out.join(''),
    stderr: () => err.join(''),
  };
}

async function clinic(): Promise<ClinicWithBackups> {
  const made = await clinicWithBackups();
  cleanups.push(made.remove);
  return made;
}

function outFolder(): string {
  const temp = temporaryFolder('tidewing-guarded-out-');
  cleanups.push(temp.remove);
  return temp.folder;
}

const damageNames: DamageName[] = ['emptied', 'deleted', 'damagedPage', 'foreign', 'missingTable'];

describe('commands on a live database the start-up guard refuses', () => {
  it.each(damageNames)(
    'backup and export exit 1 on a database %s, name the newest good backup and the restore command, and write nothing',
    async (damage) => {
      const data = await clinic();
      damages[damage](data.databaseFile);
      const before = snapshot(data.folder);
      const out = outFolder();
      const newest = data.backups.at(-1) ?? '';
      const command = `npx tidewing restore ${newest} --data ${data.folder}`;

      const backup = captured();
      expect(
        await runBackupCommand(['--data', data.folder, '--out', path.join(out, 'copy.db')], backup.io),
      ).toBe(1);
      expect(backup.stderr()).toMatch(/^tidewing backup: /);
      expect(backup.stderr()).toContain(`The newest good backup is ${newest}`);
      expect(backup.stderr()).toContain(command);

      const exported = captured();
      expect(
        await runExportCommand(['--data', data.folder, '--out', path.join(out, 'all.json')], exported.io),
      ).toBe(1);
      expect(exported.stderr()).toMatch(/^tidewing export: /);
      expect(exported.stderr()).toContain(command);

      expect(fs.readdirSync(out)).toEqual([]);
      expect(snapshot(data.folder)).toEqual(before);
    },
  );

  it.each(damageNames)(
    'check reports a database %s with exit 1, adds the backup to restore and its command, and changes nothing',
    async (damage) => {
      const data = await clinic();
      damages[damage](data.databaseFile);
      const before = snapshot(data.folder);
      const check = captured();
      expect(await runCheckCommand(['--data', data.folder], check.io)).toBe(1);
      expect(check.stdout()).toMatch(/Result: PROBLEM/);
      expect(check.stdout()).toContain(
        `npx tidewing restore ${data.backups.at(-1) ?? ''} --data ${data.folder}`,
      );
      expect(snapshot(data.folder)).toEqual(before);
    },
  );

  it('worksheet exits 1 on a deleted database with the backup to restore and its command', async () => {
    const data = await clinic();
    damages.deleted(data.databaseFile);
    const before = snapshot(data.folder);
    const out = outFolder();
    const worksheet = captured();
    expect(
      await runWorksheetCommand(
        ['--plan', '1', '--data', data.folder, '--out', path.join(out, 'sheet.pdf')],
        worksheet.io,
      ),
    ).toBe(1);
    expect(worksheet.stderr()).toContain(
      `npx tidewing restore ${data.backups.at(-1) ?? ''} --data ${data.folder}`,
    );
    expect(fs.readdirSync(out)).toEqual([]);
    expect(snapshot(data.folder)).toEqual(before);
  });

  it('backup and export of an emptied database with no backups say there is no clinic in it', async () => {
    const temp = temporaryFolder();
    cleanups.push(temp.remove);
    fs.writeFileSync(path.join(temp.folder, 'tidewing.db'), '');
    const out = outFolder();
    const backup = captured();
    expect(
      await runBackupCommand(['--data', temp.folder, '--out', path.join(out, 'copy.db')], backup.io),
    ).toBe(1);
    expect(backup.stderr()).toMatch(/is empty: it holds no clinic to back up\. Nothing was written\./);
    expect(fs.readdirSync(out)).toEqual([]);
    expect(fs.readdirSync(temp.folder)).toEqual(['tidewing.db']);
  });

  it('a sound database is backed up and checked as before, with no advice added', async () => {
    const data = await clinic();
    const out = outFolder();
    const backup = captured();
    expect(
      await runBackupCommand(['--data', data.folder, '--out', path.join(out, 'copy.db')], backup.io),
    ).toBe(0);
    const check = captured();
    expect(await runCheckCommand(['--data', data.folder], check.io)).toBe(0);
    expect(check.stdout()).not.toContain('npx tidewing restore');
  });
});
