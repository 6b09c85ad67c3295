import path from 'node:path';
import { BackupError, backupDatabase } from '../../db/backup.js';
import { formatBytes } from '../../db/integrity.js';
import { databaseReadyForReading } from './command-guard.js';
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
  'Usage: tidewing backup --out FILE [--data DIR]\n  Copies the clinic database in DIR (default: the usual data folder) to FILE and checks the copy.';

/**
 * `tidewing backup --data DIR --out FILE`: an online copy of the database, integrity-checked before
 * it takes its name. Exit 0 done, 1 failed (nothing written under FILE), 2 bad arguments.
 */
export async function runBackupCommand(args: string[], io: CommandIo): Promise<number> {
  const parsed = parseOrExplain(io, 'backup', backupUsage, () => {
    const options = parseArguments(args, { valueOptions: ['--data', '--out'], maxPositionals: 0 });
    const out = options.values.get('--out');
    if (out === undefined) throw new UsageError('--out FILE is required: where to write the backup.');
    return { outFile: path.resolve(out), location: dataLocation(options) };
  });
  if (parsed === null) return 2;
  const { outFile, location } = parsed;
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
