import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it, onTestFinished } from 'vitest';
import type { Migration } from '../../db/migrations/index.js';
import { PostgresConnectionError } from '../../db/postgres-checks.js';
import { startBackEndOn } from '../../main/back-end/back-end.js';
import { needPostgres, scratchPostgresDatabase } from '../support/postgres-database.js';
import { temporaryFolder } from '../support/temporary-folder.js';

// A one-table schema: this suite is about choosing and opening the engine, not the clinic's tables.
const testMigrations: readonly Migration[] = [
  {
    version: 1,
    name: '0001-start-test',
    sql: 'CREATE TABLE start_test (id INTEGER PRIMARY KEY)',
    postgresql: 'CREATE TABLE start_test (id integer PRIMARY KEY)',
  },
];

function dataFolder(): string {
  const made = temporaryFolder('tidewing-start-pg-');
  onTestFinished(made.remove);
  return made.folder;
}

describe('startBackEndOn', () => {
  it('without an address starts on the file in the data folder, as startBackEnd does', async () => {
    const folder = dataFolder();
    const log: string[] = [];
    const started = await startBackEndOn({
      dataDirectory: folder,
      appVersion: '9.8.7',
      host: 'browser',
      automaticBackup: true,
      log: (message) => log.push(message),
    });
    onTestFinished(() => started.close());
    expect(started.clinic.engine).toBe('sqlite');
    expect(started.location).toBe(path.join(folder, 'tidewing.db'));
    expect(fs.existsSync(path.join(folder, 'tidewing.db'))).toBe(true);
    expect(await started.backupSettled).toMatch(/backup/i);
    const current = await started.dispatch('database:current', {});
    expect(current).toMatchObject({ ok: true, value: { engine: 'sqlite', chosenBy: 'default' } });
  });

  it('with an address opens PostgreSQL, logs the server without the password, skips the file backup and keeps the identity file', async (context) => {
    const { appUrl } = needPostgres(context);
    const scratch = await scratchPostgresDatabase(appUrl);
    onTestFinished(scratch.drop);
    const folder = dataFolder();
    const log: string[] = [];
    const started = await startBackEndOn({
      dataDirectory: folder,
      appVersion: '9.8.7',
      host: 'browser',
      automaticBackup: true,
      database: { url: scratch.url, source: 'command line' },
      env: { PGPASSFILE: '/nonexistent/tidewing-pgpass' },
      openOptions: { migrations: testMigrations },
      log: (message) => log.push(message),
    });
    onTestFinished(() => started.close());
    expect(started.clinic.engine).toBe('postgresql');
    const text = log.join('\n');
    expect(text).toMatch(
      /Clinic database: PostgreSQL \d+.* at postgresql:\/\/tidewing_test@127\.0\.0\.1:\d+\/tw_[0-9a-f]+ \(named by --database\)/,
    );
    expect(text).toMatch(/Warning: The database address holds a password/);
    expect(text).not.toContain('tidewing-test-password');
    expect(await started.backupSettled).toMatch(/No file backup at start.*docs\/postgresql\.md/);
    expect(fs.existsSync(path.join(folder, 'tidewing.db'))).toBe(false);
    expect(fs.existsSync(path.join(folder, 'workstation.json'))).toBe(true);
    expect(await started.dispatch('app:info', {})).toMatchObject({ ok: true, value: { schemaVersion: 1 } });
    expect(await started.dispatch('database:current', {})).toMatchObject({
      ok: true,
      value: {
        engine: 'postgresql',
        chosenBy: 'command line',
        location: expect.not.stringContaining('password') as unknown,
      },
    });
    // A channel whose repository is not yet on the shared query layer says so instead of failing.
    const unconverted = await started.dispatch('settings:get', {});
    expect(unconverted).toMatchObject({
      ok: false,
      error: {
        code: 'unavailable',
        message: expect.stringMatching(
          /does not work yet with a clinic database on a PostgreSQL server/,
        ) as unknown,
      },
    });
  });

  it('refuses a superuser role before writing anything', async (context) => {
    const { adminUrl } = needPostgres(context);
    const folder = dataFolder();
    const start = startBackEndOn({
      dataDirectory: folder,
      appVersion: '9.8.7',
      host: 'browser',
      database: { url: adminUrl, source: 'environment' },
      env: {},
      openOptions: { migrations: testMigrations },
    });
    await expect(start).rejects.toThrow(PostgresConnectionError);
    await expect(start).rejects.toThrow(/refuses to run as a superuser/);
    expect(fs.existsSync(path.join(folder, 'tidewing.db'))).toBe(false);
  });
});
