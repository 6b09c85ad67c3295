import { sqliteClinicDb, type ClinicDb } from '../../db/clinic-db.js';
import { describeClinicTables, rowCount, schemaOfMigrations } from '../../db/clinic-tables.js';
import { openReadOnly } from '../../db/integrity.js';
import { moveClinic, MoveRefusedError, type MoveResult } from '../../db/move-to-postgresql.js';
import { openPostgresClinic, redactedUrl } from '../../db/postgres-connection.js';
import { connectPostgresForReading } from '../../db/postgres-reading.js';
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
import { databaseUrl, databaseUrlVariable } from './database-option.js';

export const moveToUsage =
  `Usage: tidewing move-to --database postgresql://USER@HOST:PORT/DBNAME [--data DIR]\n` +
  `  Copies the whole clinic in DIR (default: the usual data folder), every version and correction, into an empty\n` +
  `  PostgreSQL database, checks every table by row count and checksum, and leaves the clinic's file as it was.\n` +
  `  The address may instead come from ${databaseUrlVariable}; the password from PGPASSWORD or ~/.pgpass.`;

/** Shown digits of each SHA-256 in the table (all 64 are compared). */
const shownDigits = 16;

/** The per-table comparison as aligned text: counts and checksums on both sides. */
export function comparisonTable(result: Pick<MoveResult, 'tables'>): string {
  const header = ['Table', 'SQLite rows', 'PostgreSQL rows', 'SQLite SHA-256', 'PostgreSQL SHA-256', ''];
  const rows = result.tables.map((table) => [
    table.table,
    String(table.source.rows),
    String(table.target.rows),
    table.source.sha256.slice(0, shownDigits),
    table.target.sha256.slice(0, shownDigits),
    table.same ? 'same' : 'DIFFERENT',
  ]);
  const widths = header.map((title, column) =>
    Math.max(title.length, ...rows.map((row) => (row[column] ?? '').length)),
  );
  const line = (cells: readonly string[]) =>
    cells
      .map((cell, column) =>
        column === 1 || column === 2 ? cell.padStart(widths[column] ?? 0) : cell.padEnd(widths[column] ?? 0),
      )
      .join('  ')
      .trimEnd();
  return [line(header), ...rows.map(line)].join('\n');
}

/**
 * Refuses, before anything is created on the server, a database holding tables that are not
 * Tidewing's or Tidewing tables with rows; an empty database (or one holding only an empty
 * Tidewing schema) may be used. Returns the reason, or null.
 */
async function refusalBeforeMigrating(url: string): Promise<string | null> {
  const probe = await connectPostgresForReading(url);
  try {
    const known = await schemaOfMigrations();
    const names = new Set([...known.tables, ...known.searchIndexes].map((table) => table.name));
    const described = await describeClinicTables(probe);
    const present = [...described.tables, ...described.searchIndexes];
    const foreign = present.filter((table) => !names.has(table.name)).map((table) => table.name);
    if (foreign.length > 0)
      return `the database ${probe.location} holds tables that are not Tidewing's (${foreign.slice(0, 8).join(', ')}${foreign.length > 8 ? ', ...' : ''}). Move the clinic into a new, empty database (see docs/moving-to-postgresql.md). Nothing was copied.`;
    const holding: string[] = [];
    for (const table of present) {
      const count = await rowCount(probe, table.name);
      if (count > 0) holding.push(`${table.name} (${String(count)} row${count === 1 ? '' : 's'})`);
    }
    if (holding.length > 0)
      return `the database ${probe.location} already holds Tidewing data: ${holding.join(', ')}. A clinic is moved only into an empty database, so that nothing there is mixed with it or overwritten. Nothing was copied.`;
    return null;
  } finally {
    await probe.close();
  }
}

/**
 * `tidewing move-to --database URL [--data DIR]`: copies the SQLite clinic into an empty
 * PostgreSQL database and checks it (see `moveClinic`). The clinic's file is opened read-only.
 * Exit 0 moved and every table agrees, 1 refused, failed or a table differs (then nothing is
 * committed), 2 bad arguments.
 */
export async function runMoveToCommand(
  args: string[],
  io: CommandIo,
  environment: NodeJS.ProcessEnv = process.env,
): Promise<number> {
  const parsed = parseOrExplain(io, 'move-to', moveToUsage, () => {
    const options = parseArguments(args, { valueOptions: ['--data', '--database'], maxPositionals: 0 });
    const url = databaseUrl(options, environment);
    if (url === null)
      throw new UsageError('--database postgresql://... is required: where to move the clinic.');
    return { url, location: dataLocation(options) };
  });
  if (parsed === null) return 2;
  const { url, location } = parsed;
  const where = redactedUrl(url);
  if (!databaseReadyForReading(io, 'move-to', location)) return 1;

  let refusal: string | null;
  try {
    io.stderr(`move-to: looking at ${where}\n`);
    refusal = await refusalBeforeMigrating(url);
  } catch (error) {
    io.stderr(`tidewing move-to: ${where} could not be reached: ${errorText(error)}. Nothing was copied.\n`);
    return 1;
  }
  if (refusal !== null) {
    io.stderr(`tidewing move-to: ${refusal}\n`);
    return 1;
  }

  let opened;
  try {
    opened = openReadOnly(location.databaseFile);
  } catch (error) {
    io.stderr(
      `tidewing move-to: the clinic's file could not be opened: ${errorText(error)}. Nothing was copied.\n`,
    );
    return 1;
  }
  const source = sqliteClinicDb(opened.db);
  let target: ClinicDb | null = null;
  try {
    io.stderr(`move-to: making the Tidewing tables in ${where}\n`);
    target = await openPostgresClinic(url);
    const copied = progressPrinter(io, 'move-to: rows copied');
    let verifying = false;
    const result = await moveClinic(source, target, {
      onProgress: (progress) => {
        if (progress.step === 'copy')
          copied({
            percent: progress.rowsTotal === 0 ? 100 : (100 * progress.rowsDone) / progress.rowsTotal,
          });
        else if (!verifying) {
          verifying = true;
          io.stderr(`move-to: comparing ${String(progress.tablesTotal)} tables by row count and checksum\n`);
        }
      },
    });
    const lines = [
      `Clinic: ${location.databaseFile} (left unchanged)`,
      `PostgreSQL: ${target.location}`,
      `Schema version: ${String(result.schemaVersion)}`,
      '',
      comparisonTable(result),
      '',
      `Checksums: SHA-256 of every row in key order, the first ${String(shownDigits)} of 64 hex digits shown (all compared).`,
      ...result.searchIndexes.map((note) => `Search index ${note}.`),
      ...(result.targetOnly.length > 0
        ? [`Only on PostgreSQL, left empty: ${result.targetOnly.join(', ')}.`]
        : []),
    ];
    if (result.ok) {
      lines.push(
        `Moved: ${String(result.rowsCopied)} rows in ${String(result.tables.length)} tables; every table agrees. Start Tidewing with --database to use the clinic on PostgreSQL.`,
      );
      io.stdout(`${lines.join('\n')}\n`);
      return 0;
    }
    const differing = result.tables.filter((table) => !table.same).map((table) => table.table);
    lines.push(
      `NOT MOVED: ${differing.join(', ')} differ${differing.length === 1 ? 's' : ''} after copying, so the copy was rolled back; the PostgreSQL database holds only the empty Tidewing tables. The clinic's file is unchanged.`,
    );
    io.stdout(`${lines.join('\n')}\n`);
    return 1;
  } catch (error) {
    io.stderr(
      `tidewing move-to: ${error instanceof MoveRefusedError ? error.message : `the move failed: ${errorText(error)}. Nothing was copied (the PostgreSQL database may hold the empty Tidewing tables); the clinic's file is unchanged.`}\n`,
    );
    return 1;
  } finally {
    await target?.close();
    await source.close();
  }
}
