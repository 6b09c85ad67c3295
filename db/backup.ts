import Database from 'better-sqlite3';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { clinicContentsOfFile } from './clinic-contents.js';
import type { TidewingDatabase } from './connection.js';
import { checkDatabaseFile, openReadOnly, type ReadOnlyDatabase } from './integrity.js';

/** A backup, restore or export could not be done; nothing that existed was changed. */
export class BackupError extends Error {
  constructor(message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = 'BackupError';
  }
}

export type BackupProgress = {
  readonly totalPages: number;
  readonly remainingPages: number;
  /** 0 to 100. */
  readonly percent: number;
};

export type ProgressListener = (progress: BackupProgress) => void;

export type BackupOptions = {
  /** Check the finished copy before it takes its name: `full` integrity_check, `quick` quick_check, or `none`. Default `full`. */
  readonly verify?: 'full' | 'quick' | 'none';
  /** Replace an existing file at the destination. Default false: an existing file is never touched. */
  readonly overwrite?: boolean;
  /** Pages copied per step; between steps the source stays usable. Default 256 (1 MB at 4 KB pages). */
  readonly pagesPerStep?: number;
  readonly nativeBinding?: string;
};

export type BackupResult = {
  readonly file: string;
  readonly sizeBytes: number;
  readonly pages: number;
  readonly verified: 'full' | 'quick' | 'none';
};

function errorText(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

/** Files SQLite may keep beside a database file. */
export const sidecarSuffixes = ['-wal', '-shm', '-journal'] as const;

function removeQuietly(file: string): void {
  for (const name of [file, ...sidecarSuffixes.map((suffix) => `${file}${suffix}`)]) {
    try {
      fs.rmSync(name, { force: true });
    } catch {
      // A leftover temporary file is harmless; the original error matters more.
    }
  }
}

/** Flushes a file, or a folder's entry list, to the disk; folders cannot be opened this way on Windows. */
export function flushToDisk(target: string): void {
  let handle: number | null = null;
  try {
    handle = fs.openSync(target, 'r');
    fs.fsyncSync(handle);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    if (!(code === 'EISDIR' || code === 'EPERM' || code === 'EBADF' || code === 'EINVAL')) throw error;
  } finally {
    if (handle !== null) fs.closeSync(handle);
  }
}

/** A name in the destination's folder, so that the final rename cannot cross file systems. */
export function temporaryNameBeside(file: string, purpose: string): string {
  return path.join(
    path.dirname(file),
    `.${path.basename(file)}.${purpose}-${process.pid}-${crypto.randomBytes(4).toString('hex')}`,
  );
}

/**
 * Copies a database with SQLite's online backup into `outFile`: the copy is written under a
 * temporary name in the same folder, switched to a single self-contained file (rollback
 * journal, no `-wal`), checked, flushed to disk and only then renamed to `outFile`, so a crash
 * or a failed check never leaves a half-written file under the final name.
 * `source` is an open connection (the copy sees its committed data, including its WAL) or a
 * file path, opened read-only. `onProgress` gets 0-100 % after each step.
 * Throws BackupError (destination exists, source missing or unreadable, copy failed its check).
 */
export async function backupDatabase(
  source: TidewingDatabase | string,
  outFile: string,
  onProgress?: ProgressListener,
  options: BackupOptions = {},
): Promise<BackupResult> {
  const target = path.resolve(outFile);
  const verify = options.verify ?? 'full';
  if (typeof source === 'string' && path.resolve(source) === target) {
    throw new BackupError(`The backup file must differ from the database itself (${target}).`);
  }
  if (typeof source !== 'string' && source.name !== '' && path.resolve(source.name) === target) {
    throw new BackupError(`The backup file must differ from the database itself (${target}).`);
  }
  if (options.overwrite !== true && fs.existsSync(target)) {
    throw new BackupError(`${target} already exists; choose another file name. Nothing was written.`);
  }
  const pagesPerStep = Math.max(1, Math.round(options.pagesPerStep ?? 256));

  let opened: ReadOnlyDatabase;
  if (typeof source === 'string') {
    if (!fs.existsSync(source))
      throw new BackupError(`There is no database at ${source}; nothing to back up.`);
    try {
      opened = openReadOnly(source, options);
    } catch (error) {
      throw new BackupError(`The database ${source} could not be opened: ${errorText(error)}`, {
        cause: error,
      });
    }
  } else {
    opened = { db: source, close: () => undefined };
  }

  try {
    fs.mkdirSync(path.dirname(target), { recursive: true });
  } catch (error) {
    opened.close();
    throw new BackupError(`The folder for ${target} could not be made: ${errorText(error)}`, {
      cause: error,
    });
  }
  const temporary = temporaryNameBeside(target, 'partial');
  try {
    let pages = 0;
    await opened.db.backup(temporary, {
      progress: ({ totalPages, remainingPages }) => {
        pages = totalPages;
        const percent =
          totalPages === 0 ? 100 : Math.floor((100 * (totalPages - remainingPages)) / totalPages);
        onProgress?.({ totalPages, remainingPages, percent });
        return pagesPerStep;
      },
    });
    // The copy carries the source's WAL flag; a single file is easier to keep, move and check.
    const copy = new Database(
      temporary,
      options.nativeBinding === undefined ? {} : { nativeBinding: options.nativeBinding },
    );
    try {
      copy.pragma('journal_mode = DELETE');
      pages = copy.pragma('page_count', { simple: true }) as number;
    } finally {
      copy.close();
    }
    if (verify !== 'none') {
      const check = checkDatabaseFile(temporary, {
        quick: verify === 'quick',
        ...(options.nativeBinding === undefined ? {} : { nativeBinding: options.nativeBinding }),
      });
      if (check.status === 'corrupt' || check.status === 'notDatabase' || check.status === 'unreadable') {
        const name = typeof source === 'string' ? source : source.name;
        throw new BackupError(
          `The copy of ${name} failed the integrity check (${check.integrity.slice(0, 3).join('; ')}), so the database itself is probably damaged. No backup was kept; earlier backups are untouched. Run \`tidewing check\`.`,
        );
      }
    }
    flushToDisk(temporary);
    fs.renameSync(temporary, target);
    flushToDisk(path.dirname(target));
    onProgress?.({ totalPages: pages, remainingPages: 0, percent: 100 });
    return { file: target, sizeBytes: fs.statSync(target).size, pages, verified: verify };
  } catch (error) {
    removeQuietly(temporary);
    if (error instanceof BackupError) throw error;
    throw new BackupError(
      `The backup to ${target} failed: ${errorText(error)}. Nothing was written under that name.`,
      { cause: error },
    );
  } finally {
    opened.close();
  }
}

const backupNamePattern = /^tidewing-backup-(\d{4}-\d{2}-\d{2}T\d{2}-\d{2}-\d{2}\.\d{3}Z)(?:-(\d+))?\.db$/;

/** `2026-03-04T05:06:07.089Z` -> `2026-03-04T05-06-07.089Z`: sortable, and valid on every file system. */
export function fileTimestamp(at: Date): string {
  return at.toISOString().replace(/:/g, '-');
}

export type BackupFile = {
  readonly file: string;
  /** ISO 8601 time the backup was started, from its name. */
  readonly takenAt: string;
  readonly sizeBytes: number;
};

type NamedBackup = BackupFile & { readonly stamp: string; readonly sequence: number };

function namedBackups(backupFolder: string): NamedBackup[] {
  let names: string[];
  try {
    names = fs.readdirSync(backupFolder);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return [];
    throw error;
  }
  const found: NamedBackup[] = [];
  for (const name of names) {
    const match = backupNamePattern.exec(name);
    if (match === null) continue;
    const stamp = match[1] ?? '';
    const file = path.join(backupFolder, name);
    const stat = fs.statSync(file, { throwIfNoEntry: false });
    if (stat === undefined || !stat.isFile()) continue;
    const takenAt = stamp.replace(/T(\d{2})-(\d{2})-(\d{2})/, 'T$1:$2:$3');
    found.push({ file, takenAt, sizeBytes: stat.size, stamp, sequence: Number(match[2] ?? '1') });
  }
  return found.sort((a, b) => (a.stamp === b.stamp ? b.sequence - a.sequence : a.stamp < b.stamp ? 1 : -1));
}

/** The rolling backups in a folder (only files named by `rollingBackup`), newest first. */
export function listBackups(backupFolder: string): BackupFile[] {
  return namedBackups(backupFolder).map(({ file, takenAt, sizeBytes }) => ({ file, takenAt, sizeBytes }));
}

export type RollingBackupOptions = {
  readonly databaseFile: string;
  /** The app's open connection to `databaseFile`, if any: its own writes then go into the copy instead of restarting it. */
  readonly connection?: TidewingDatabase;
  readonly backupFolder: string;
  /** How many rolling backups to keep, counting the new one; 1 to 1000. Default 10. */
  readonly keep?: number;
  readonly now: Date;
  readonly onProgress?: ProgressListener;
  readonly verify?: 'full' | 'quick' | 'none';
  readonly nativeBinding?: string;
};

/** Why a rolling backup beyond the newest `keep` was not deleted. */
export type KeptReason = 'day' | 'moreRecords' | 'unreadable';

export type RollingBackupResult = BackupResult & {
  /** Older rolling backups deleted to stay within `keep`. */
  readonly removed: readonly string[];
  /** Older rolling backups beyond `keep` that were kept, and why. */
  readonly keptBeyondLimit: readonly { readonly file: string; readonly reason: KeptReason }[];
};

/** Days (UTC) back from `now`, today included, for which one backup each is kept beyond `keep`. */
export const dailyBackupDays = 7;

const dayMs = 24 * 60 * 60 * 1000;

/**
 * Makes `tidewing-backup-<UTC time>.db` in `backupFolder`, then deletes the oldest files of that
 * name pattern beyond `keep`, except:
 * - the newest backup of each UTC day of the last 7 days (today included), so that a burst of
 *   starts cannot push every backup of last week out;
 * - any backup holding more clinic records than the new one (a database emptied or replaced
 *   by mistake must not rotate the real clinic away);
 * - any backup whose records cannot be counted (nothing unreadable is deleted unseen).
 * Only after the new backup is complete and checked is anything deleted, and the new file is
 * never among them (even when the clock was set back); files of any other name in the folder
 * are never touched.
 */
export async function rollingBackup(options: RollingBackupOptions): Promise<RollingBackupResult> {
  const keep = options.keep ?? 10;
  if (!Number.isInteger(keep) || keep < 1 || keep > 1000)
    throw new BackupError(`keep must be a whole number from 1 to 1000; got ${keep}.`);
  if (Number.isNaN(options.now.getTime())) throw new BackupError('The backup time is not a valid date.');
  fs.mkdirSync(options.backupFolder, { recursive: true });
  const stamp = fileTimestamp(options.now);
  let name = `tidewing-backup-${stamp}.db`;
  for (let sequence = 2; fs.existsSync(path.join(options.backupFolder, name)); sequence += 1)
    name = `tidewing-backup-${stamp}-${sequence}.db`;

  const made = await backupDatabase(
    options.connection ?? options.databaseFile,
    path.join(options.backupFolder, name),
    options.onProgress,
    {
      verify: options.verify ?? 'full',
      ...(options.nativeBinding === undefined ? {} : { nativeBinding: options.nativeBinding }),
    },
  );
  const older = namedBackups(options.backupFolder).filter((backup) => backup.file !== made.file);
  const binding = options.nativeBinding === undefined ? {} : { nativeBinding: options.nativeBinding };
  const firstDailyDay = new Date(options.now.getTime() - (dailyBackupDays - 1) * dayMs)
    .toISOString()
    .slice(0, 10);
  const dayOf = (backup: { takenAt: string }) => backup.takenAt.slice(0, 10);
  const coveredDays = new Set([
    options.now.toISOString().slice(0, 10),
    ...older.slice(0, keep - 1).map(dayOf),
  ]);
  let newestRecords: number | null | undefined;
  const removed: string[] = [];
  const keptBeyondLimit: { file: string; reason: KeptReason }[] = [];
  // Newest first, so that the backup kept for a day is that day's newest.
  for (const backup of older.slice(keep - 1)) {
    const day = dayOf(backup);
    if (day >= firstDailyDay && !coveredDays.has(day)) {
      coveredDays.add(day);
      keptBeyondLimit.push({ file: backup.file, reason: 'day' });
      continue;
    }
    newestRecords ??= clinicContentsOfFile(made.file, binding)?.recordCount ?? null;
    const contents = clinicContentsOfFile(backup.file, binding);
    if (contents === null) {
      keptBeyondLimit.push({ file: backup.file, reason: 'unreadable' });
      continue;
    }
    if (newestRecords === null || contents.recordCount > newestRecords) {
      keptBeyondLimit.push({ file: backup.file, reason: 'moreRecords' });
      continue;
    }
    fs.rmSync(backup.file, { force: true });
    removed.push(backup.file);
  }
  return { ...made, removed, keptBeyondLimit };
}
