import fs from 'node:fs';
import path from 'node:path';
import { rollingBackup, type KeptReason } from '../../db/backup.js';
import type { TidewingDatabase } from '../../db/connection.js';

export type AutomaticBackupOptions = {
  readonly dataDirectory: string;
  readonly databaseFile: string;
  /** The back end's open connection, when the backup runs after the database was opened. */
  readonly connection?: TidewingDatabase;
  readonly now: Date;
  /** Rolling backups kept in `<data>/backups/`, counting the new one; 1 to 1000. Default 10. */
  readonly keep?: number;
  readonly nativeBinding?: string;
};

export type AutomaticBackupResult =
  | {
      readonly status: 'made';
      readonly file: string;
      readonly sizeBytes: number;
      readonly removed: readonly string[];
      readonly message: string;
    }
  | { readonly status: 'skipped'; readonly message: string }
  | { readonly status: 'failed'; readonly message: string };

function keptNote(kept: readonly { reason: KeptReason }[], keep: number): string {
  const count = (reason: KeptReason) => kept.filter((item) => item.reason === reason).length;
  const parts = [
    count('day') > 0 ? `${count('day')} as the last of a day this week` : '',
    count('moreRecords') > 0 ? `${count('moreRecords')} holding more records than the database now` : '',
    count('unreadable') > 0 ? `${count('unreadable')} that could not be read` : '',
  ].filter((part) => part !== '');
  return parts.length === 0 ? '' : `; kept beyond the last ${keep}: ${parts.join(', ')}`;
}

/** The folder inside a data folder that holds the rolling backups. */
export function backupFolder(dataDirectory: string): string {
  return path.join(dataDirectory, 'backups');
}

/**
 * The backup made each time Tidewing starts: a rolling copy of the database in
 * `<data>/backups/`, keeping the last `keep` (and the older ones `rollingBackup` protects). Call it
 * only once the start-up guard has passed (`checkBeforeStart`), so that an emptied or damaged
 * database is never copied over the good backups. Call it before the database is opened (or with it
 * open; SQLite's online backup reads a consistent snapshot either way). Skipped on first run,
 * when there is no database yet. Never throws: a failure is returned as a message for the log,
 * and never deletes an older backup unless the new one was made and passed its check. Uses
 * SQLite's quick_check on the copy, to keep start-up fast.
 */
export async function automaticBackupOnStart(
  options: AutomaticBackupOptions,
): Promise<AutomaticBackupResult> {
  try {
    if (!fs.existsSync(options.databaseFile))
      return { status: 'skipped', message: 'No database yet, so no automatic backup.' };
    const made = await rollingBackup({
      databaseFile: options.databaseFile,
      ...(options.connection === undefined ? {} : { connection: options.connection }),
      backupFolder: backupFolder(options.dataDirectory),
      keep: options.keep ?? 10,
      now: options.now,
      verify: 'quick',
      ...(options.nativeBinding === undefined ? {} : { nativeBinding: options.nativeBinding }),
    });
    return {
      status: 'made',
      file: made.file,
      sizeBytes: made.sizeBytes,
      removed: made.removed,
      message: `Automatic backup: ${made.file}${made.removed.length > 0 ? ` (removed ${made.removed.length} older)` : ''}${keptNote(made.keptBeyondLimit, options.keep ?? 10)}.`,
    };
  } catch (error) {
    return {
      status: 'failed',
      message: `Automatic backup failed: ${error instanceof Error ? error.message : String(error)}`,
    };
  }
}
