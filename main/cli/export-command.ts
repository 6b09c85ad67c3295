import path from 'node:path';
import { BackupError } from '../../db/backup.js';
import { writeDatabaseJson } from '../../db/export.js';
import { formatBytes, openReadOnly } from '../../db/integrity.js';
import { readAppVersion } from '../back-end/project-paths.js';
import { sqliteClinicDb } from '../../db/clinic-db.js';
import { storedSchemaVersion } from '../../db/clinic-tables.js';
import { redactedUrl } from '../../db/postgres-connection.js';
import { connectPostgresForReading } from '../../db/postgres-reading.js';
import { databaseReadyForReading } from './command-guard.js';
import { databaseUrl } from './database-option.js';
import {
  dataLocation,
  errorText,
  parseArguments,
  parseOrExplain,
  progressPrinter,
  UsageError,
  type CommandIo,
} from './command-io.js';

export const exportUsage =
  'Usage: tidewing export --out FILE.json [--data DIR]\n       tidewing export --out FILE.json --database postgresql://USER@HOST:PORT/DBNAME\n  Writes every table of the clinic database in DIR (default: the usual data folder), or on the PostgreSQL\n  server (also from TIDEWING_DATABASE_URL), to one JSON file.';

/**
 * `tidewing export --data DIR --out FILE.json`: the whole database as JSON, read-only on the
 * database. Exit 0 written, 1 failed (nothing written under FILE), 2 bad arguments.
 */
export async function runExportCommand(
  args: string[],
  io: CommandIo,
  now: () => Date = () => new Date(),
  environment: NodeJS.ProcessEnv = process.env,
): Promise<number> {
  const parsed = parseOrExplain(io, 'export', exportUsage, () => {
    const options = parseArguments(args, {
      valueOptions: ['--data', '--out', '--database'],
      maxPositionals: 0,
    });
    const out = options.values.get('--out');
    if (out === undefined) throw new UsageError('--out FILE.json is required: where to write the export.');
    return {
      outFile: path.resolve(out),
      location: dataLocation(options),
      url: databaseUrl(options, environment),
    };
  });
  if (parsed === null) return 2;
  const { outFile, location, url } = parsed;
  if (url !== null) return exportFromPostgres(url, outFile, io, now());
  // A damaged file could export partly and look complete; the guard refuses it instead.
  if (!databaseReadyForReading(io, 'export', location)) return 1;
  let opened;
  try {
    opened = openReadOnly(location.databaseFile);
  } catch (error) {
    io.stderr(
      `tidewing export: the database could not be opened: ${errorText(error)}. Nothing was written.\n`,
    );
    return 1;
  }
  try {
    const progress = progressPrinter(io, 'export');
    const written = await writeDatabaseJson(sqliteClinicDb(opened.db), outFile, {
      appVersion: readAppVersion(),
      exportedAt: now(),
      onProgress: (percent) => progress({ percent }),
    });
    io.stdout(
      `Exported ${written.rowCount} row${written.rowCount === 1 ? '' : 's'} from ${written.tableCount} tables of ${location.databaseFile} to ${written.file} (${formatBytes(written.sizeBytes)}).\n`,
    );
    return 0;
  } catch (error) {
    io.stderr(
      `tidewing export: ${error instanceof BackupError ? error.message : `the export failed: ${errorText(error)}. Nothing was written under ${outFile}.`}\n`,
    );
    return 1;
  } finally {
    opened.close();
  }
}

/** The export of a clinic database on a PostgreSQL server: the same JSON, read in one snapshot. */
async function exportFromPostgres(url: string, outFile: string, io: CommandIo, at: Date): Promise<number> {
  let db;
  try {
    db = await connectPostgresForReading(url);
  } catch (error) {
    io.stderr(
      `tidewing export: ${redactedUrl(url)} could not be reached: ${errorText(error)}. Nothing was written.\n`,
    );
    return 1;
  }
  try {
    if ((await storedSchemaVersion(db)) === 0) {
      io.stderr(`tidewing export: ${db.location} holds no Tidewing clinic. Nothing was written.\n`);
      return 1;
    }
    const progress = progressPrinter(io, 'export');
    const written = await writeDatabaseJson(db, outFile, {
      appVersion: readAppVersion(),
      exportedAt: at,
      onProgress: (percent) => progress({ percent }),
    });
    io.stdout(
      `Exported ${written.rowCount} row${written.rowCount === 1 ? '' : 's'} from ${written.tableCount} tables of ${db.location} to ${written.file} (${formatBytes(written.sizeBytes)}).\n`,
    );
    return 0;
  } catch (error) {
    io.stderr(
      `tidewing export: ${error instanceof BackupError ? error.message : `the export failed: ${errorText(error)}. Nothing was written under ${outFile}.`}\n`,
    );
    return 1;
  } finally {
    await db.close();
  }
}
