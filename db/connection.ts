import Database from 'better-sqlite3';
import fs from 'node:fs';
import { latestSchemaVersion, migrations, type Migration } from './migrations/index.js';

export type TidewingDatabase = Database.Database;

/** The database file was written by a newer Tidewing; it is left exactly as found. */
export class DatabaseTooNewError extends Error {
  readonly fileSchemaVersion: number;
  readonly supportedSchemaVersion: number;
  constructor(file: string, fileSchemaVersion: number, supportedSchemaVersion: number) {
    super(
      `The database ${file} was written by a newer version of Tidewing (schema ${fileSchemaVersion}; this version understands up to ${supportedSchemaVersion}). ` +
        'Install the newer version of Tidewing to open it. The file has not been changed.',
    );
    this.name = 'DatabaseTooNewError';
    this.fileSchemaVersion = fileSchemaVersion;
    this.supportedSchemaVersion = supportedSchemaVersion;
  }
}

export type OpenOptions = {
  /** Path of a better-sqlite3 binary built for the running runtime (Electron builds its own). */
  readonly nativeBinding?: string;
  /** Milliseconds a writer waits for a lock held by another connection. */
  readonly busyTimeoutMs?: number;
  /** Migrations to apply; tests pass their own lists. */
  readonly migrations?: readonly Migration[];
  /** Called with the text of every statement the connection runs (diagnostics and tests). */
  readonly trace?: (sql: string) => void;
};

function readSchemaVersion(file: string, options: OpenOptions): number {
  if (!fs.existsSync(file)) return 0;
  // Read-only, so that a refused file is not touched (no journal mode change, no migration).
  const probe = new Database(file, { readonly: true, fileMustExist: true, ...bindingOption(options) });
  try {
    return probe.pragma('user_version', { simple: true }) as number;
  } finally {
    probe.close();
  }
}

function bindingOption(options: OpenOptions): { nativeBinding?: string } {
  return options.nativeBinding === undefined ? {} : { nativeBinding: options.nativeBinding };
}

/**
 * Opens (creating if needed) the clinic database and brings its schema up to date.
 * Refuses, without writing, a database whose schema is newer than this code.
 * Every write transaction in db/ starts with BEGIN IMMEDIATE, so that a writer waits up to
 * `busyTimeoutMs` for another process on the same file instead of failing at once when a
 * deferred transaction's read lock cannot be upgraded.
 */
export function openDatabase(file: string, options: OpenOptions = {}): TidewingDatabase {
  const list = options.migrations ?? migrations;
  const known = list.length;
  const fileVersion = readSchemaVersion(file, options);
  if (fileVersion > known) throw new DatabaseTooNewError(file, fileVersion, known);

  const busyTimeoutMs = Math.round(options.busyTimeoutMs ?? 5000);
  const db = new Database(file, {
    ...bindingOption(options),
    timeout: busyTimeoutMs,
    ...(options.trace === undefined ? {} : { verbose: (sql: unknown) => options.trace?.(String(sql)) }),
  });
  try {
    db.pragma(`busy_timeout = ${busyTimeoutMs}`);
    db.pragma('journal_mode = WAL');
    db.pragma('synchronous = FULL');
    db.pragma('foreign_keys = ON');
    migrate(db, list);
    return db;
  } catch (error) {
    db.close();
    throw error;
  }
}

/** Applies every migration above the database's `user_version`, each in its own transaction. */
export function migrate(db: TidewingDatabase, list: readonly Migration[] = migrations): number {
  list.forEach((migration, index) => {
    if (migration.version !== index + 1)
      throw new Error(`Migration ${migration.name} is numbered ${migration.version}, expected ${index + 1}`);
  });
  const current = db.pragma('user_version', { simple: true }) as number;
  if (current > list.length) throw new DatabaseTooNewError(db.name, current, list.length);
  for (const migration of list.slice(current)) {
    // IMMEDIATE takes the write lock first (waiting up to the busy timeout), and the version is
    // read again under it: a second Tidewing starting on the same folder at the same moment
    // then finds the migration done instead of applying it twice.
    db.transaction(() => {
      const now = db.pragma('user_version', { simple: true }) as number;
      if (now >= migration.version) return;
      db.exec(migration.sql);
      db.pragma(`user_version = ${migration.version}`);
    }).immediate();
  }
  return db.pragma('user_version', { simple: true }) as number;
}

/** Schema version of an open database. */
export function schemaVersion(db: TidewingDatabase): number {
  return db.pragma('user_version', { simple: true }) as number;
}

export { latestSchemaVersion };
