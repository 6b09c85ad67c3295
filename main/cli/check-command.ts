import path from 'node:path';
import { listBackups } from '../../db/backup.js';
import { checkDatabaseFile } from '../../db/integrity.js';
import { backupFolder } from '../back-end/automatic-backup.js';
import { checkBeforeStart, restoreAdvice } from '../back-end/start-up-guard.js';
import { dataLocation, parseArguments, parseOrExplain, UsageError, type CommandIo } from './command-io.js';

export const checkUsage =
  'Usage: tidewing check [--data DIR] [--quick]\n       tidewing check FILE [--quick]\n  Reports the integrity and schema version of the clinic database in DIR (default: the usual data folder), or of a backup FILE.';

const shownLines = 20;

/**
 * `tidewing check --data DIR` or `tidewing check FILE`: integrity check, schema version, foreign keys;
 * reads only. Exit 0 sound, 1 a problem was found (or no database), 2 bad arguments.
 */
export async function runCheckCommand(args: string[], io: CommandIo): Promise<number> {
  const parsed = parseOrExplain(io, 'check', checkUsage, () => {
    const options = parseArguments(args, {
      valueOptions: ['--data'],
      flagOptions: ['--quick'],
      maxPositionals: 1,
    });
    const positional = options.positionals[0];
    if (positional !== undefined && options.values.has('--data'))
      throw new UsageError('give either a FILE or --data DIR, not both.');
    const quick = options.flags.has('--quick');
    if (positional !== undefined) return { file: path.resolve(positional), dataDirectory: null, quick };
    const location = dataLocation(options);
    return { file: location.databaseFile, dataDirectory: location.dataDirectory, quick };
  });
  if (parsed === null) return 2;
  const { file, dataDirectory, quick } = parsed;

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
