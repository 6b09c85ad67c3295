import type Database from 'better-sqlite3';
import fs from 'node:fs';
import path from 'node:path';
import { BackupError, flushToDisk, temporaryNameBeside } from './backup.js';

/** Identifies the file for whoever reads the archive years later. */
export const databaseExportFormat = 'tidewing-database-export';
export const databaseExportFormatVersion = 1;

/** A stored value as JSON: SQLite integers, reals and text as they are; BLOBs as base64. */
export type ExportedValue = string | number | null | { readonly base64: string };

export type ExportedTable = {
  readonly columns: readonly string[];
  /** In primary-key (or rowid) order, each row an object keyed by column name. */
  readonly rows: readonly Readonly<Record<string, ExportedValue>>[];
};

export type DatabaseExport = {
  readonly format: typeof databaseExportFormat;
  readonly formatVersion: typeof databaseExportFormatVersion;
  readonly appVersion: string;
  readonly schemaVersion: number;
  /** ISO 8601, UTC. */
  readonly exportedAt: string;
  readonly note: string;
  /** Every table holding clinic data, by name. */
  readonly tables: Readonly<Record<string, ExportedTable>>;
  /** Tables left out because they are rebuilt from the others (search indexes). */
  readonly derivedTablesLeftOut: readonly string[];
};

export type ExportOptions = {
  readonly appVersion: string;
  readonly exportedAt: Date;
  /** Called after each table with 0-100 %. */
  readonly onProgress?: (percent: number, table: string) => void;
};

type TableListRow = { schema: string; name: string; type: string; wr: number };
type ColumnRow = { name: string; pk: number };

function quoteIdentifier(name: string): string {
  return `"${name.replace(/"/g, '""')}"`;
}

function exportedValue(value: unknown): ExportedValue {
  if (value === null || typeof value === 'string' || typeof value === 'number') return value;
  if (typeof value === 'bigint')
    return Number.isSafeInteger(Number(value)) ? Number(value) : value.toString();
  if (Buffer.isBuffer(value)) return { base64: value.toString('base64') };
  return String(value);
}

/**
 * The whole database as one JSON-ready object: every table's rows with their column names,
 * the schema version, the app version and the time of export. Read inside one transaction, so
 * the tables agree with each other even while the app keeps writing. Search indexes (FTS
 * virtual tables and their shadow tables) are left out and named, since they are rebuilt from
 * the rows. Suitable for a clinic archive; not a backup (restore needs the .db backup).
 */
export function exportDatabaseJson(db: Database.Database, options: ExportOptions): DatabaseExport {
  if (Number.isNaN(options.exportedAt.getTime()))
    throw new BackupError('The export time is not a valid date.');
  const read = () => {
    const listed = db
      .prepare<[], TableListRow>('PRAGMA table_list')
      .all()
      .filter((row) => row.schema === 'main' && !row.name.startsWith('sqlite_'));
    const derived = listed
      .filter((row) => row.type === 'virtual' || row.type === 'shadow')
      .map((row) => row.name)
      .sort();
    const ordinary = listed
      .filter((row) => row.type === 'table')
      .map((row) => row.name)
      .sort();
    const tables: Record<string, ExportedTable> = {};
    ordinary.forEach((name, index) => {
      const columnRows = db.prepare<[], ColumnRow>(`PRAGMA table_info(${quoteIdentifier(name)})`).all();
      const columns = columnRows.map((column) => column.name);
      const keys = columnRows
        .filter((column) => column.pk > 0)
        .sort((a, b) => a.pk - b.pk)
        .map((column) => quoteIdentifier(column.name));
      const withoutRowId = listed.find((row) => row.name === name)?.wr === 1;
      const order =
        keys.length > 0 ? keys.join(', ') : withoutRowId ? columns.map(quoteIdentifier).join(', ') : 'rowid';
      const rows = db
        .prepare<[], Record<string, unknown>>(
          `SELECT ${columns.map(quoteIdentifier).join(', ')} FROM ${quoteIdentifier(name)} ORDER BY ${order}`,
        )
        .all()
        .map((row) => Object.fromEntries(columns.map((column) => [column, exportedValue(row[column])])));
      tables[name] = { columns, rows };
      options.onProgress?.(Math.floor((100 * (index + 1)) / ordinary.length), name);
    });
    return { tables, derived };
  };
  const { tables, derived } = db.inTransaction ? read() : db.transaction(read).deferred();
  return {
    format: databaseExportFormat,
    formatVersion: databaseExportFormatVersion,
    appVersion: options.appVersion,
    schemaVersion: db.pragma('user_version', { simple: true }) as number,
    exportedAt: options.exportedAt.toISOString(),
    note: 'Every row of every table of a Tidewing clinic database. Record rows are never changed: a correction is a later row whose corrects_id points at the row it replaces.',
    tables,
    derivedTablesLeftOut: derived,
  };
}

/**
 * Writes `exportDatabaseJson` to `outFile` (UTF-8, indented) under a temporary name first, so
 * that the final name only ever holds a whole export. Refuses to replace an existing file unless
 * `overwrite`. Returns the bytes written.
 */
export function writeDatabaseJson(
  db: Database.Database,
  outFile: string,
  options: ExportOptions & { readonly overwrite?: boolean },
): { file: string; sizeBytes: number; tableCount: number; rowCount: number } {
  const target = path.resolve(outFile);
  if (options.overwrite !== true && fs.existsSync(target))
    throw new BackupError(`${target} already exists; choose another file name. Nothing was written.`);
  const exported = exportDatabaseJson(db, options);
  fs.mkdirSync(path.dirname(target), { recursive: true });
  const temporary = temporaryNameBeside(target, 'partial');
  try {
    fs.writeFileSync(temporary, `${JSON.stringify(exported, null, 1)}\n`, { encoding: 'utf8', flag: 'wx' });
    flushToDisk(temporary);
    fs.renameSync(temporary, target);
    flushToDisk(path.dirname(target));
  } catch (error) {
    fs.rmSync(temporary, { force: true });
    throw new BackupError(
      `The export to ${target} failed: ${error instanceof Error ? error.message : String(error)}. Nothing was written under that name.`,
      { cause: error },
    );
  }
  const tables = Object.values(exported.tables);
  return {
    file: target,
    sizeBytes: fs.statSync(target).size,
    tableCount: tables.length,
    rowCount: tables.reduce((sum, table) => sum + table.rows.length, 0),
  };
}
