import fs from 'node:fs';
import path from 'node:path';
import { BackupError, flushToDisk, temporaryNameBeside } from './backup.js';
import type { Sql } from './clinic-db.js';
import { describeClinicTables, readSnapshot, storedSchemaVersion, tableRows } from './clinic-tables.js';

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

function exportedValue(value: unknown): ExportedValue {
  if (value === null || typeof value === 'string' || typeof value === 'number') return value;
  if (typeof value === 'bigint')
    return Number.isSafeInteger(Number(value)) ? Number(value) : value.toString();
  if (Buffer.isBuffer(value)) return { base64: value.toString('base64') };
  if (value instanceof Uint8Array) return { base64: Buffer.from(value).toString('base64') };
  return String(value);
}

/**
 * The whole database as one JSON-ready object: every table's rows with their column names,
 * the schema version, the app version and the time of export, on either engine (the same
 * shape from SQLite and from PostgreSQL). Read inside one snapshot (`readSnapshot`), so the
 * tables agree with each other even while the app keeps writing. Search indexes (SQLite's FTS
 * virtual tables and their shadow tables, PostgreSQL's table of the same name) are left out and
 * named, since they are rebuilt from the rows. Suitable for a clinic archive; not a backup
 * (restore needs the .db backup).
 */
export async function exportDatabaseJson(sql: Sql, options: ExportOptions): Promise<DatabaseExport> {
  if (Number.isNaN(options.exportedAt.getTime()))
    throw new BackupError('The export time is not a valid date.');
  const { tables, derived, schemaVersion } = await readSnapshot(sql, async (snapshot) => {
    const described = await describeClinicTables(snapshot);
    const read: Record<string, ExportedTable> = {};
    for (const [index, table] of described.tables.entries()) {
      const rows: Record<string, ExportedValue>[] = [];
      for await (const batch of tableRows(snapshot, table, { batchRows: 5000 }))
        for (const row of batch)
          rows.push(Object.fromEntries(table.columns.map((column) => [column, exportedValue(row[column])])));
      read[table.name] = { columns: table.columns, rows };
      options.onProgress?.(Math.floor((100 * (index + 1)) / described.tables.length), table.name);
    }
    return {
      tables: read,
      derived: [...described.derivedNames],
      schemaVersion: await storedSchemaVersion(snapshot),
    };
  });
  return {
    format: databaseExportFormat,
    formatVersion: databaseExportFormatVersion,
    appVersion: options.appVersion,
    schemaVersion,
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
export async function writeDatabaseJson(
  sql: Sql,
  outFile: string,
  options: ExportOptions & { readonly overwrite?: boolean },
): Promise<{ file: string; sizeBytes: number; tableCount: number; rowCount: number }> {
  const target = path.resolve(outFile);
  if (options.overwrite !== true && fs.existsSync(target))
    throw new BackupError(`${target} already exists; choose another file name. Nothing was written.`);
  const exported = await exportDatabaseJson(sql, options);
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
