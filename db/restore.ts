import Database from 'better-sqlite3';
import fs from 'node:fs';
import path from 'node:path';
import {
  BackupError,
  backupDatabase,
  fileTimestamp,
  flushToDisk,
  sidecarSuffixes,
  temporaryNameBeside,
  type ProgressListener,
} from './backup.js';
import { checkDatabaseFile, type DatabaseCheck } from './integrity.js';
import type { Migration } from './migrations/index.js';

/** The restore was refused before anything was changed; `check` says what is wrong with the source. */
export class RestoreRefusedError extends BackupError {
  readonly check: DatabaseCheck | null;
  constructor(message: string, check: DatabaseCheck | null = null) {
    super(message);
    this.name = 'RestoreRefusedError';
    this.check = check;
  }
}

export type RestoreOptions = {
  /** The backup (or other Tidewing database file) to restore from; it is only read. */
  readonly from: string;
  /** The clinic database to replace, normally `<data>/tidewing.db`; it need not exist. */
  readonly databaseFile: string;
  readonly now: Date;
  readonly onProgress?: ProgressListener;
  readonly migrations?: readonly Migration[];
  readonly nativeBinding?: string;
};

export type RestoreResult = {
  readonly databaseFile: string;
  /** Where the database that was replaced now is (`tidewing.db.replaced-<UTC time>`); null when there was none. */
  readonly replacedFile: string | null;
  /** A `-wal`, `-shm` or `-journal` found without its database, kept as `tidewing.db.replaced-<UTC time>-wal` and so on. */
  readonly setAside: readonly string[];
  /** The check of the source, made before anything was touched. */
  readonly sourceCheck: DatabaseCheck;
  /** The check of the database in its place after the restore. */
  readonly restoredCheck: DatabaseCheck;
};

function errorText(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

/**
 * Takes the database's write lock alone and folds its WAL into the main file, so that the file
 * can be set aside whole. SQLite's exclusive locking mode cannot be had while any other
 * connection (the running app, another command) has the file open, which is how a restore
 * under a running Tidewing is refused. A file SQLite cannot read at all is set aside as it is.
 */
function quiesce(databaseFile: string, binding: { nativeBinding?: string }): 'quiet' | 'unreadable' {
  let db: Database.Database;
  try {
    db = new Database(databaseFile, { fileMustExist: true, timeout: 0, ...binding });
  } catch {
    return 'unreadable';
  }
  try {
    db.pragma('locking_mode = EXCLUSIVE');
    db.exec('BEGIN EXCLUSIVE; COMMIT');
    if (db.pragma('journal_mode', { simple: true }) === 'wal') db.pragma('wal_checkpoint(TRUNCATE)');
    return 'quiet';
  } catch (error) {
    const code = (error as { code?: unknown }).code;
    if (code === 'SQLITE_BUSY' || code === 'SQLITE_LOCKED') {
      throw new RestoreRefusedError(
        `The database ${databaseFile} is in use (Tidewing or another program has it open). Close Tidewing and try again. Nothing was changed.`,
      );
    }
    return 'unreadable';
  } finally {
    db.close();
  }
}

function freeName(base: string): string {
  let name = base;
  for (
    let sequence = 2;
    [name, ...sidecarSuffixes.map((suffix) => `${name}${suffix}`)].some((candidate) =>
      fs.existsSync(candidate),
    );
    sequence += 1
  ) {
    name = `${base}-${sequence}`;
  }
  return name;
}

/**
 * Replaces the clinic database with a backup.
 * 1. Checks the source (integrity_check, schema version, tables, foreign keys) before touching
 *    anything; a bad source is refused with RestoreRefusedError and a sentence saying why.
 * 2. Copies the source with SQLite's online backup to a temporary file beside the database
 *    (progress 0-100 %), checked again and flushed to disk.
 * 3. Refuses if another connection has the database open; otherwise keeps the database being
 *    replaced as `tidewing.db.replaced-<UTC time>` (its `-wal`/`-shm`, if any, beside it under the
 *    same name) and renames the copy into place. The live name always holds one whole
 *    database: the old one until the rename, the restored one after it.
 * A source at an older schema is restored as it is; Tidewing migrates it when it next opens it.
 */
export async function restoreDatabase(options: RestoreOptions): Promise<RestoreResult> {
  const from = path.resolve(options.from);
  const databaseFile = path.resolve(options.databaseFile);
  const binding = options.nativeBinding === undefined ? {} : { nativeBinding: options.nativeBinding };
  if (from === databaseFile || sidecarSuffixes.some((suffix) => from === `${databaseFile}${suffix}`)) {
    throw new RestoreRefusedError(
      `${from} is the database itself; choose a backup file to restore from. Nothing was changed.`,
    );
  }
  if (Number.isNaN(options.now.getTime()))
    throw new RestoreRefusedError('The restore time is not a valid date. Nothing was changed.');

  const sourceCheck = checkDatabaseFile(from, {
    ...binding,
    ...(options.migrations === undefined ? {} : { migrations: options.migrations }),
  });
  if (!sourceCheck.ok) {
    throw new RestoreRefusedError(
      `Restore refused: ${sourceCheck.message} Nothing was changed.`,
      sourceCheck,
    );
  }

  fs.mkdirSync(path.dirname(databaseFile), { recursive: true });
  const staged = temporaryNameBeside(databaseFile, 'restoring');
  try {
    await backupDatabase(from, staged, options.onProgress, { verify: 'full', ...binding });
  } catch (error) {
    throw new RestoreRefusedError(
      `Restore refused: the copy of ${from} could not be made (${errorText(error)}). Nothing was changed.`,
    );
  }

  let replacedFile: string | null = null;
  const setAside: string[] = [];
  try {
    if (fs.existsSync(databaseFile)) {
      quiesce(databaseFile, binding);
      replacedFile = freeName(`${databaseFile}.replaced-${fileTimestamp(options.now)}`);
      // A second name for the old file, so that the live name is never missing: the rename
      // below then swaps the database in one step.
      try {
        fs.linkSync(databaseFile, replacedFile);
      } catch {
        fs.copyFileSync(databaseFile, replacedFile, fs.constants.COPYFILE_EXCL);
      }
      flushToDisk(replacedFile);
      // A WAL left beside the restored file would be replayed into it; it belongs to the old one.
      for (const suffix of sidecarSuffixes) {
        if (fs.existsSync(`${databaseFile}${suffix}`))
          fs.renameSync(`${databaseFile}${suffix}`, `${replacedFile}${suffix}`);
      }
    } else {
      // No database, but the log of one that was there (deleted or moved without it): it would
      // be replayed into the restored file. Kept under the name a replaced database would get.
      const base = freeName(`${databaseFile}.replaced-${fileTimestamp(options.now)}`);
      for (const suffix of sidecarSuffixes) {
        if (!fs.existsSync(`${databaseFile}${suffix}`)) continue;
        fs.renameSync(`${databaseFile}${suffix}`, `${base}${suffix}`);
        setAside.push(`${base}${suffix}`);
      }
    }
    fs.renameSync(staged, databaseFile);
    flushToDisk(path.dirname(databaseFile));
  } catch (error) {
    for (const name of [staged, ...sidecarSuffixes.map((suffix) => `${staged}${suffix}`)])
      fs.rmSync(name, { force: true });
    if (error instanceof RestoreRefusedError) {
      if (replacedFile !== null && fs.existsSync(replacedFile)) fs.rmSync(replacedFile, { force: true });
      throw error;
    }
    throw new BackupError(
      `The restore stopped part way: ${errorText(error)}. ${databaseFile} is still the database it was${replacedFile === null ? '' : `; a copy of it is at ${replacedFile}`}.`,
      { cause: error },
    );
  }

  const restoredCheck = checkDatabaseFile(databaseFile, {
    ...binding,
    ...(options.migrations === undefined ? {} : { migrations: options.migrations }),
  });
  return { databaseFile, replacedFile, setAside, sourceCheck, restoredCheck };
}
