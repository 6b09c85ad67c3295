import path from 'node:path';
import { onTestFinished } from 'vitest';
import { sqliteClinicDb, type ClinicDb, type Engine } from '../../db/clinic-db.js';
import { openDatabase } from '../../db/connection.js';
import type { Migration } from '../../db/migrations/index.js';
import { openPostgresClinic } from '../../db/postgres-connection.js';
import { needPostgres, scratchPostgresDatabase } from './postgres-database.js';
import { temporaryFolder } from './temporary-folder.js';

/** Both engines, for `describe.each(testEngines)`: every repository suite runs on each. */
export const testEngines: readonly Engine[] = ['sqlite', 'postgresql'];

/**
 * A fresh, migrated clinic database on `engine`, closed and removed when the calling test
 * finishes: a temporary SQLite file, or a new database on the run's PostgreSQL cluster
 * (see test/support/postgres-global-setup.ts). Call it inside a test.
 */
export async function openTestClinic(
  engine: Engine,
  context: { skip: (note?: string) => never },
  options: { readonly migrations?: readonly Migration[] } = {},
): Promise<ClinicDb> {
  if (engine === 'sqlite') {
    const temp = temporaryFolder();
    const db = sqliteClinicDb(
      openDatabase(
        path.join(temp.folder, 'tidewing.db'),
        options.migrations === undefined ? {} : { migrations: options.migrations },
      ),
    );
    onTestFinished(async () => {
      await db.close();
      temp.remove();
    });
    return db;
  }
  const { appUrl } = needPostgres(context);
  const scratch = await scratchPostgresDatabase(appUrl);
  onTestFinished(scratch.drop);
  const db = await openPostgresClinic(
    scratch.url,
    options.migrations === undefined ? {} : { migrations: options.migrations },
  );
  onTestFinished(() => db.close());
  return db;
}
