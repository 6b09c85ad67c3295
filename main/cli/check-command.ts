import path from 'node:path';
import { listBackups } from '../../db/backup.js';
import { checkDatabaseFile } from '../../db/integrity.js';
import { backupFolder } from '../back-end/automatic-backup.js';
import { checkBeforeStart, restoreAdvice } from '../back-end/start-up-guard.js';
import { checkPostgresClinic } from '../../db/postgres-check.js';
import { redactedUrl } from '../../db/postgres-connection.js';
import { connectPostgresForReading } from '../../db/postgres-reading.js';
import {
  dataLocation,
  errorText,
  parseArguments,
  parseOrExplain,
  UsageError,
  type CommandIo,
} from './command-io.js';
import { databaseUrl } from './database-option.js';

export const checkUsage =
  'Usage: tidewing check [--data DIR] [--quick]\n       tidewing check FILE [--quick]\n       tidewing check --database postgresql://USER@HOST:PORT/DBNAME\n  Reports the integrity and schema version of the clinic database in DIR (default: the usual data folder), of a\n  backup FILE, or of a clinic on PostgreSQL (also from TIDEWING_DATABASE_URL).';

const shownLines = 20;

/**
 * `tidewing check --data DIR` or `tidewing check FILE`: integrity check, schema version, foreign keys;
 * reads only. Exit 0 sound, 1 a problem was found (or no database), 2 bad arguments.
 */
export async function runCheckCommand(
  args: string[],
  io: CommandIo,
  environment: NodeJS.ProcessEnv = process.env,
): Promise<number> {
  const parsed = parseOrExplain(io, 'check', checkUsage, () => {
    const options = parseArguments(args, {
      valueOptions: ['--data', '--database'],
      flagOptions: ['--quick'],
      maxPositionals: 1,
    });
    const positional = options.positionals[0];
    if (positional !== undefined && options.values.has('--data'))
      throw new UsageError('give either a FILE or --data DIR, not both.');
    // TIDEWING_DATABASE_URL applies when neither a FILE nor --data says to check an SQLite file.
    const url =
      options.values.has('--database') || (positional === undefined && !options.values.has('--data'))
        ? databaseUrl(options, environment)
        : null;
    if (url !== null && (positional !== undefined || options.values.has('--data')))
      throw new UsageError('give --database URL alone: it checks the clinic on the PostgreSQL server.');
    const quick = options.flags.has('--quick');
    if (url !== null) return { url, file: '', dataDirectory: null, quick };
    if (positional !== undefined) return { url, file: path.resolve(positional), dataDirectory: null, quick };
    const location = dataLocation(options);
    return { url, file: location.databaseFile, dataDirectory: location.dataDirectory, quick };
  });
  if (parsed === null) return 2;
  const { file, dataDirectory, quick, url } = parsed;
  if (url !== null) return checkPostgres(url, io);

  io.stderr(`check: reading ${file}\n`);
  const check = checkDatabaseFile(file, { quick });
  const lines = [
    `Database: ${check.file}`,
    `Result: ${check.ok ? 'OK' : 'PROBLEM'} (${check.status})`,
    check.message,
    `Schema version: ${check.schemaVersion ?? 'unknown'} (this version of Tidewing understands up to ${check.supportedSchemaVersion})`,
  ];
  if (check.integrity.length > 0) {
    lines.push(`${quick ? 'quick_check' : 'integrity_check'}:`);
    for (const line of check.integrity.slice(0, shownLines)) lines.push(`  ${line}`);
    if (check.integrity.length > shownLines)
      lines.push(`  ... and ${check.integrity.length - shownLines} more`);
  }
  if (check.foreignKeyProblems.length > 0) {
    lines.push(`Rows pointing at missing rows: ${check.foreignKeyProblems.length}`);
    for (const problem of check.foreignKeyProblems.slice(0, shownLines))
      lines.push(`  ${problem.table} row ${problem.rowId ?? '?'} -> ${problem.parentTable}`);
  }
  if (check.missingTables.length > 0) lines.push(`Missing tables: ${check.missingTables.join(', ')}`);
  if (dataDirectory !== null) {
    const backups = listBackups(backupFolder(dataDirectory));
    const newest = backups[0];
    lines.push(
      newest === undefined
        ? `Automatic backups: none in ${backupFolder(dataDirectory)}`
        : `Automatic backups: ${backups.length} in ${backupFolder(dataDirectory)}, newest taken ${newest.takenAt}`,
    );
  }
  if (dataDirectory !== null) {
    // What the app would do at start: the guard's finding, and for a database that cannot be
    // used, the backup to restore and the command. Reads only, like the check above.
    const finding = checkBeforeStart({ dataDirectory });
    if (!finding.ok && finding.problem !== 'tooNew') {
      lines.push('Tidewing will not start on this database.');
      lines.push(finding.advice);
    } else if (!check.ok && check.status !== 'tooNew' && check.status !== 'missing') {
      lines.push(restoreAdvice({ dataDirectory }).advice);
    }
  }
  io.stdout(`${lines.join('\n')}\n`);
  return check.ok ? 0 : 1;
}

/** `tidewing check --database URL`: the PostgreSQL clinic's schema, guards, links and counts; reads only. */
async function checkPostgres(url: string, io: CommandIo): Promise<number> {
  io.stderr(`check: reading ${redactedUrl(url)}\n`);
  let db;
  try {
    db = await connectPostgresForReading(url);
  } catch (error) {
    io.stdout(
      `Database: ${redactedUrl(url)}\nResult: PROBLEM (unreachable)\nThe server could not be reached or refused the login: ${errorText(error)}\n`,
    );
    return 1;
  }
  try {
    const check = await checkPostgresClinic(db);
    const guarded = check.appendOnly.filter((table) => table.update && table.delete).length;
    const width = Math.max(0, ...check.rowCounts.map((count) => count.table.length));
    const lines = [
      `Database: ${check.location}`,
      `Result: ${check.ok ? 'OK' : 'PROBLEM'}`,
      ...check.problems.map((problem) => `Problem: ${problem}`),
      `Schema version: ${String(check.schemaVersion)} (this version of Tidewing understands up to ${String(check.supportedSchemaVersion)})`,
      `Role: ${check.role} (${check.superuser ? 'a SUPERUSER' : 'not a superuser'})`,
      `Append-only triggers: ${String(guarded)} of ${String(check.appendOnly.length)} record tables refuse changes and deletions`,
      `Rows pointing at missing rows: ${check.orphans.length === 0 ? 'none' : String(check.orphans.reduce((sum, orphan) => sum + orphan.rows, 0))}`,
      ...check.orphans.map(
        (orphan) =>
          `  ${orphan.table} (${orphan.columns.join(', ')}) -> ${orphan.parentTable}: ${String(orphan.rows)}`,
      ),
      ...(check.missingTables.length > 0 ? [`Missing tables: ${check.missingTables.join(', ')}`] : []),
      'Rows per table:',
      ...check.rowCounts.map((count) => `  ${count.table.padEnd(width)}  ${String(count.rows).padStart(8)}`),
    ];
    io.stdout(`${lines.join('\n')}\n`);
    return check.ok ? 0 : 1;
  } catch (error) {
    io.stdout(`Database: ${db.location}\nResult: PROBLEM (unreadable)\n${errorText(error)}\n`);
    return 1;
  } finally {
    await db.close();
  }
}
