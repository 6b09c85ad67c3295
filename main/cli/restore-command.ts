import path from 'node:path';
import { BackupError } from '../../db/backup.js';
import { restoreDatabase } from '../../db/restore.js';
import {
  dataLocation,
  errorText,
  parseArguments,
  parseOrExplain,
  progressPrinter,
  UsageError,
  type CommandIo,
} from './command-io.js';

export const restoreUsage =
  'Usage: tidewing restore FILE [--data DIR]\n  Checks FILE, then puts it in place of the clinic database in DIR (default: the usual data folder),\n  keeping the replaced database as tidewing.db.replaced-<time>. Close Tidewing first.';

/**
 * `tidewing restore FILE --data DIR`. Exit 0 restored, 1 refused or failed (the database is as it
 * was), 2 bad arguments.
 */
export async function runRestoreCommand(
  args: string[],
  io: CommandIo,
  now: () => Date = () => new Date(),
): Promise<number> {
  const parsed = parseOrExplain(io, 'restore', restoreUsage, () => {
    const options = parseArguments(args, { valueOptions: ['--data'], maxPositionals: 1 });
    const file = options.positionals[0];
    if (file === undefined) throw new UsageError('name the backup FILE to restore from.');
    return { from: path.resolve(file), location: dataLocation(options) };
  });
  if (parsed === null) return 2;
  const { from, location } = parsed;
  try {
    const result = await restoreDatabase({
      from,
      databaseFile: location.databaseFile,
      now: now(),
      onProgress: progressPrinter(io, 'restore'),
    });
    io.stdout(`Restored ${from} into ${result.databaseFile}.\n`);
    io.stdout(
      result.replacedFile === null
        ? 'There was no database there before.\n'
        : `The database it replaced is kept at ${result.replacedFile}.\n`,
    );
    for (const file of result.setAside)
      io.stdout(`A log file left there without its database is kept at ${file}.\n`);
    io.stdout(`Check after restore: ${result.restoredCheck.message}\n`);
    return result.restoredCheck.ok ? 0 : 1;
  } catch (error) {
    io.stderr(
      `tidewing restore: ${error instanceof BackupError ? error.message : `the restore failed: ${errorText(error)}`}\n`,
    );
    return 1;
  }
}
