import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it, onTestFinished } from 'vitest';
import { latestSchemaVersion, type Migration } from '../../db/migrations/index.js';
import { PostgresConnectionError } from '../../db/postgres-checks.js';
import { startBackEndOn } from '../../main/back-end/back-end.js';
import { needPostgres, scratchPostgresDatabase } from '../support/postgres-database.js';
import { temporaryFolder } from '../support/temporary-folder.js';

// A one-table schema for the refusals: they must come before any clinic table is made.
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
    // The whole clinic schema, and the start-up writes done (the shipped species seeded).
    expect(await started.dispatch('app:info', {})).toMatchObject({
      ok: true,
      value: { schemaVersion: latestSchemaVersion },
    });
    const species = await started.dispatch('species:list', {});
    expect(species.ok && Array.isArray(species.value) && species.value.length > 10).toBe(true);
    expect(await started.dispatch('database:current', {})).toMatchObject({
      ok: true,
      value: {
        engine: 'postgresql',
        chosenBy: 'command line',
        location: expect.not.stringContaining('password') as unknown,
      },
    });
    // Every repository is on the shared query layer: the clinic works on the server.
    const settings = await started.dispatch('settings:get', {});
    expect(settings.ok, JSON.stringify(settings)).toBe(true);
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
