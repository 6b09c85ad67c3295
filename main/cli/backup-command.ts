import path from 'node:path';
import { BackupError, backupDatabase } from '../../db/backup.js';
import { formatBytes } from '../../db/integrity.js';
import { describeClinicTables, storedSchemaVersion } from '../../db/clinic-tables.js';
import { fileTimestamp } from '../../db/backup.js';
import { writeDatabaseJson } from '../../db/export.js';
import { redactedUrl } from '../../db/postgres-connection.js';
import { dumpPostgres, findPostgresProgram } from '../../db/postgres-backup.js';
import { connectPostgresForReading } from '../../db/postgres-reading.js';
import { backupFolder } from '../back-end/automatic-backup.js';
import { readAppVersion } from '../back-end/project-paths.js';
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

export const backupUsage =
  'Usage: tidewing backup --out FILE [--data DIR]\n       tidewing backup --database postgresql://USER@HOST:PORT/DBNAME [--out FILE] [--data DIR]\n  Copies the clinic database in DIR (default: the usual data folder) to FILE and checks the copy; on PostgreSQL\n  (also from TIDEWING_DATABASE_URL) a pg_dump archive, by default in DIR/backups, read back by pg_restore --list\n  (the JSON export instead when pg_dump is not installed).';

export type BackupCommandOptions = {
  readonly environment?: NodeJS.ProcessEnv;
  readonly now?: () => Date;
  /** Where to look for pg_dump and pg_restore (PATH and /usr/lib/postgresql by default). */
  readonly programSearch?: { readonly searchPath?: string; readonly versionsFolder?: string };
};

/**
 * `tidewing backup --data DIR --out FILE`: an online copy of the database, integrity-checked before
 * it takes its name. Exit 0 done, 1 failed (nothing written under FILE), 2 bad arguments.
 */
export async function runBackupCommand(
  args: string[],
  io: CommandIo,
  commandOptions: BackupCommandOptions = {},
): Promise<number> {
  const parsed = parseOrExplain(io, 'backup', backupUsage, () => {
    const options = parseArguments(args, {
      valueOptions: ['--data', '--out', '--database'],
      maxPositionals: 0,
    });
    const url = databaseUrl(options, commandOptions.environment);
    const out = options.values.get('--out');
    if (out === undefined && url === null)
      throw new UsageError('--out FILE is required: where to write the backup.');
    return { outFile: out === undefined ? null : path.resolve(out), location: dataLocation(options), url };
  });
  if (parsed === null) return 2;
  const { location, url } = parsed;
  if (url !== null) return backupPostgres(url, parsed.outFile, location.dataDirectory, io, commandOptions);
  const outFile = parsed.outFile ?? '';
  if (!databaseReadyForReading(io, 'backup', location)) return 1;
  try {
    const made = await backupDatabase(location.databaseFile, outFile, progressPrinter(io, 'backup'), {
      verify: 'full',
    });
    io.stdout(
      `Backed up ${location.databaseFile} to ${made.file} (${formatBytes(made.sizeBytes)}; the copy passed the integrity check).\n`,
    );
    return 0;
  } catch (error) {
    io.stderr(
      `tidewing backup: ${error instanceof BackupError ? error.message : `the backup failed: ${errorText(error)}. Nothing was written under ${outFile}.`}\n`,
    );
    return 1;
  }
}

/**
 * The backup of a clinic database on a PostgreSQL server: `pg_dump --format=custom` when the
 * client programs are installed (read back by `pg_restore --list` before it takes its name),
 * otherwise the JSON export, saying so. Written to `outFile`, or with a timestamped name into
 * the data folder's backups/ (beside, and never counted among, the SQLite rolling backups).
 */
async function backupPostgres(
  url: string,
  outFile: string | null,
  dataDirectory: string,
  io: CommandIo,
  options: BackupCommandOptions,
): Promise<number> {
  const at = (options.now ?? (() => new Date()))();
  let db;
  try {
    db = await connectPostgresForReading(url);
  } catch (error) {
    io.stderr(
      `tidewing backup: ${redactedUrl(url)} could not be reached: ${errorText(error)}. Nothing was written.\n`,
    );
    return 1;
  }
  const base = path.join(backupFolder(dataDirectory), `tidewing-postgresql-${fileTimestamp(at)}`);
  try {
    if ((await storedSchemaVersion(db)) === 0) {
      io.stderr(`tidewing backup: ${db.location} holds no Tidewing clinic. Nothing was written.\n`);
      return 1;
    }
    const tables = (await describeClinicTables(db)).tables.map((table) => table.name);
    const pgDump = findPostgresProgram('pg_dump', options.programSearch);
    const pgRestore = findPostgresProgram('pg_restore', options.programSearch);
    let why: string;
    if (pgDump !== null && pgRestore !== null) {
      try {
        io.stderr(`backup: pg_dump (${pgDump}) of ${db.location}\n`);
        const made = await dumpPostgres(url, outFile ?? `${base}.dump`, { pgDump, pgRestore }, tables);
        io.stdout(
          `Backed up ${db.location} to ${made.file} (${formatBytes(made.sizeBytes)}; pg_dump custom format, read back by pg_restore --list with the data of all ${String(tables.length)} tables). Restore it with pg_restore into an empty database.\n`,
        );
        return 0;
      } catch (error) {
        why = `pg_dump did not make a backup (${errorText(error)})`;
      }
    } else {
      why = `${pgDump === null ? 'pg_dump' : 'pg_restore'} was not found (looked on PATH and in /usr/lib/postgresql/*/bin)`;
    }
    const jsonFile =
      outFile === null
        ? `${base}.json`
        : outFile.replace(/\.dump$/i, '') + (outFile.toLowerCase().endsWith('.json') ? '' : '.json');
    io.stderr(`backup: ${why}; writing the JSON export instead.\n`);
    const progress = progressPrinter(io, 'backup');
    const written = await writeDatabaseJson(db, jsonFile, {
      appVersion: readAppVersion(),
      exportedAt: at,
      onProgress: (percent) => progress({ percent }),
    });
    io.stdout(
      `Backed up ${db.location} as the JSON export to ${written.file} (${formatBytes(written.sizeBytes)}; ${String(written.rowCount)} rows), because ${why}. Install the PostgreSQL client programs for a backup pg_restore can load.\n`,
    );
    return 0;
  } catch (error) {
    io.stderr(
      `tidewing backup: ${error instanceof BackupError ? error.message : `the backup failed: ${errorText(error)}. Nothing was written.`}\n`,
    );
    return 1;
  } finally {
    await db.close();
  }
}
