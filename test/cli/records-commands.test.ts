import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { DatabaseExport } from '../../db/export.js';
import { runBackupCommand } from '../../main/cli/backup-command.js';
import { runCheckCommand } from '../../main/cli/check-command.js';
import { parseArguments, progressPrinter, UsageError } from '../../main/cli/command-io.js';
import { runExportCommand } from '../../main/cli/export-command.js';
import { runRestoreCommand } from '../../main/cli/restore-command.js';
import { runCli } from '../../main/cli/cli.js';
import {
  damageMiddlePages,
  entryIdsIn,
  fixtureWithEntries,
  listing,
  sha256,
} from '../db/support/record-fixture.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => void)[] = [];
afterEach(() => {
  cleanups.splice(0).forEach((cleanup) => cleanup());
  vi.restoreAllMocks();
});

function captured() {
  const out: string[] = [];
  const err: string[] = [];
  return {
    io: { stdout: (text: string) => out.push(text), stderr: (text: string) => err.push(text) },
    stdout: () => out.join(''),
    stderr: () => err.join(''),
  };
}

function dataFolder(entries: number) {
  const fixture = fixtureWithEntries(entries);
  cleanups.push(fixture.remove);
  return fixture;
}

function scratch(): string {
  const temp = temporaryFolder('tidewing-cli-');
  cleanups.push(temp.remove);
  return temp.folder;
}

describe('tidewing backup', () => {
  it('writes a checked copy and prints progress on stderr', async () => {
    const data = dataFolder(20);
    const out = path.join(scratch(), 'monday.db');
    const run = captured();
    expect(await runBackupCommand(['--data', data.folder, '--out', out], run.io)).toBe(0);
    expect(entryIdsIn(out)).toEqual(data.entryIds);
    expect(run.stdout()).toContain(`Backed up ${data.databaseFile} to ${out}`);
    expect(run.stderr()).toMatch(/backup: 100%\n$/);
  });

  it('exits 2 with the usage when --out is missing or an option is unknown', async () => {
    const data = dataFolder(1);
    for (const args of [
      ['--data', data.folder],
      ['--data', data.folder, '--out', 'x.db', '--force'],
      ['--data', data.folder, '--out'],
      ['--data', data.folder, '--out', 'a.db', 'extra'],
    ]) {
      const run = captured();
      expect(await runBackupCommand(args, run.io), args.join(' ')).toBe(2);
      expect(run.stderr()).toContain('Usage: tidewing backup');
    }
  });

  it('exits 1 and writes nothing when the data folder has no database', async () => {
    const empty = scratch();
    const run = captured();
    expect(await runBackupCommand(['--data', empty, '--out', path.join(empty, 'copy.db')], run.io)).toBe(1);
    expect(run.stderr()).toContain('there is no Tidewing database in');
    expect(listing(empty)).toEqual([]);
  });

  it('exits 1 and leaves an existing file alone', async () => {
    const data = dataFolder(1);
    const out = path.join(scratch(), 'taken.db');
    fs.writeFileSync(out, 'keep');
    const run = captured();
    expect(await runBackupCommand(['--data', data.folder, `--out=${out}`], run.io)).toBe(1);
    expect(run.stderr()).toContain('already exists');
    expect(fs.readFileSync(out, 'utf8')).toBe('keep');
  });
});

describe('tidewing restore', () => {
  it('restores a backup and says where the replaced database is kept', async () => {
    const source = dataFolder(4);
    const backup = path.join(scratch(), 'backup.db');
    expect(await runBackupCommand(['--data', source.folder, '--out', backup], captured().io)).toBe(0);
    const live = dataFolder(9);
    const run = captured();
    const at = new Date(Date.UTC(2026, 4, 6, 7, 8, 9, 10));
    expect(await runRestoreCommand([backup, '--data', live.folder], run.io, () => at)).toBe(0);
    expect(entryIdsIn(live.databaseFile)).toEqual(source.entryIds);
    expect(run.stdout()).toContain(
      `kept at ${path.join(live.folder, 'tidewing.db.replaced-2026-05-06T07-08-09.010Z')}`,
    );
    expect(run.stdout()).toContain('Check after restore:');
    expect(run.stderr()).toContain('restore: 100%');
  });

  it('exits 1 and changes nothing for a damaged backup', async () => {
    const source = dataFolder(3000);
    const backup = path.join(scratch(), 'backup.db');
    expect(await runBackupCommand(['--data', source.folder, '--out', backup], captured().io)).toBe(0);
    damageMiddlePages(backup);
    const live = dataFolder(2);
    const before = sha256(live.databaseFile);
    const run = captured();
    expect(await runRestoreCommand([backup, '--data', live.folder], run.io)).toBe(1);
    expect(run.stderr()).toMatch(/Restore refused: .*damaged.*Nothing was changed/);
    expect(sha256(live.databaseFile)).toBe(before);
    expect(listing(live.folder)).toEqual(['tidewing.db']);
  });

  it('exits 2 without a FILE or with two', async () => {
    const live = dataFolder(1);
    for (const args of [
      ['--data', live.folder],
      ['a.db', 'b.db', '--data', live.folder],
    ]) {
      const run = captured();
      expect(await runRestoreCommand(args, run.io)).toBe(2);
      expect(run.stderr()).toContain('Usage: tidewing restore');
    }
  });
});

describe('tidewing check', () => {
  it('reports a sound database with its schema version and exits 0', async () => {
    const data = dataFolder(3);
    const run = captured();
    expect(await runCheckCommand(['--data', data.folder], run.io)).toBe(0);
    expect(run.stdout()).toContain('Result: OK (ok)');
    expect(run.stdout()).toMatch(/Schema version: \d+ \(this version of Tidewing understands up to \d+\)/);
    expect(run.stdout()).toContain('integrity_check:\n  ok');
    expect(run.stdout()).toContain('Automatic backups: none');
  });

  it('reports a damaged database with the integrity lines and exits 1', async () => {
    const data = dataFolder(3000);
    damageMiddlePages(data.databaseFile);
    const run = captured();
    expect(await runCheckCommand(['--data', data.folder], run.io)).toBe(1);
    expect(run.stdout()).toContain('Result: PROBLEM (corrupt)');
  });

  it('checks a backup file named on the command line', async () => {
    const data = dataFolder(3);
    const backup = path.join(scratch(), 'backup.db');
    expect(await runBackupCommand(['--data', data.folder, '--out', backup], captured().io)).toBe(0);
    const run = captured();
    expect(await runCheckCommand([backup, '--quick'], run.io)).toBe(0);
    expect(run.stdout()).toContain(`Database: ${backup}`);
    expect(run.stdout()).toContain('quick_check:\n  ok');
  });

  it('exits 1 for a folder with no database and 2 for a FILE together with --data', async () => {
    const empty = scratch();
    const missing = captured();
    expect(await runCheckCommand(['--data', empty], missing.io)).toBe(1);
    expect(missing.stdout()).toContain('Result: PROBLEM (missing)');
    const both = captured();
    expect(await runCheckCommand(['x.db', '--data', empty], both.io)).toBe(2);
    expect(both.stderr()).toContain('either a FILE or --data DIR');
  });
});

describe('tidewing export', () => {
  it('writes the whole database as JSON', async () => {
    const data = dataFolder(6);
    const out = path.join(scratch(), 'archive.json');
    const run = captured();
    const at = new Date(Date.UTC(2026, 6, 1, 12, 0, 0, 0));
    expect(await runExportCommand(['--data', data.folder, '--out', out], run.io, () => at)).toBe(0);
    const parsed = JSON.parse(fs.readFileSync(out, 'utf8')) as DatabaseExport;
    expect(parsed.exportedAt).toBe('2026-07-01T12:00:00.000Z');
    expect(parsed.tables['procedure_entries']?.rows.map((row) => row['id'])).toEqual(data.entryIds);
    expect(run.stderr()).toContain('export: 100%');
    expect(listing(data.folder)).toEqual(['tidewing.db']);
  });

  it('exits 2 without --out and 1 for a damaged database, writing nothing', async () => {
    const data = dataFolder(3000);
    expect(await runExportCommand(['--data', data.folder], captured().io)).toBe(2);
    damageMiddlePages(data.databaseFile);
    const folder = scratch();
    const run = captured();
    expect(
      await runExportCommand(['--data', data.folder, '--out', path.join(folder, 'archive.json')], run.io),
    ).toBe(1);
    expect(run.stderr()).toContain('damaged');
    expect(listing(folder)).toEqual([]);
  });
});

describe('the command line', () => {
  it('knows backup, restore, check and export', async () => {
    const written: string[] = [];
    vi.spyOn(process.stdout, 'write').mockImplementation(
      (chunk: string | Uint8Array) => written.push(String(chunk)) > 0,
    );
    vi.spyOn(process.stderr, 'write').mockImplementation(
      (chunk: string | Uint8Array) => written.push(String(chunk)) > 0,
    );
    expect(await runCli(['--help'])).toBe(0);
    for (const name of ['backup', 'restore', 'check', 'export'])
      expect(written.join('')).toContain(`tidewing ${name}`);
    const data = dataFolder(1);
    expect(await runCli(['check', '--data', data.folder])).toBe(0);
    expect(await runCli(['backup', '--data', data.folder])).toBe(2);
  });

  it('parses --name value and --name=value, and refuses repeats', () => {
    const parsed = parseArguments(['file.db', '--data=/tmp/a', '--quick'], {
      valueOptions: ['--data'],
      flagOptions: ['--quick'],
      maxPositionals: 1,
    });
    expect(parsed.values.get('--data')).toBe('/tmp/a');
    expect(parsed.flags.has('--quick')).toBe(true);
    expect(parsed.positionals).toEqual(['file.db']);
    expect(() =>
      parseArguments(['--data', 'a', '--data', 'b'], { valueOptions: ['--data'], maxPositionals: 0 }),
    ).toThrow(UsageError);
  });

  it('prints each tenth of progress once, in order', () => {
    const run = captured();
    const print = progressPrinter(run.io, 'backup');
    for (const percent of [0, 3, 12, 15, 47, 47, 99, 100, 100]) print({ percent });
    expect(run.stderr()).toBe('backup: 0%\nbackup: 10%\nbackup: 40%\nbackup: 90%\nbackup: 100%\n');
  });
});
