import { execFile } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import { BackupError, flushToDisk, temporaryNameBeside } from './backup.js';

const run = promisify(execFile);

/** Where Debian and Ubuntu install each PostgreSQL version's programs (`<folder>/<major>/bin`). */
export const postgresVersionsFolder = '/usr/lib/postgresql';

/**
 * The path of a PostgreSQL client program (`pg_dump`, `pg_restore`): first on `PATH`, else in
 * the newest `/usr/lib/postgresql/<major>/bin`; null when neither has it.
 */
export function findPostgresProgram(
  name: string,
  options: { readonly searchPath?: string; readonly versionsFolder?: string } = {},
): string | null {
  const executable = process.platform === 'win32' ? `${name}.exe` : name;
  const folders = (options.searchPath ?? process.env['PATH'] ?? '')
    .split(path.delimiter)
    .filter((part) => part !== '');
  for (const folder of folders) {
    const candidate = path.join(folder, executable);
    if (isExecutable(candidate)) return candidate;
  }
  const versions = options.versionsFolder ?? postgresVersionsFolder;
  let majors: string[];
  try {
    majors = fs.readdirSync(versions).filter((entry) => /^\d+(\.\d+)?$/.test(entry));
  } catch {
    return null;
  }
  for (const major of majors.sort((a, b) => Number(b) - Number(a))) {
    const candidate = path.join(versions, major, 'bin', executable);
    if (isExecutable(candidate)) return candidate;
  }
  return null;
}

function isExecutable(file: string): boolean {
  try {
    fs.accessSync(file, fs.constants.X_OK);
    return fs.statSync(file).isFile();
  } catch {
    return false;
  }
}

/**
 * The address without its password, and the password apart: the password goes to the client
 * program in its environment (PGPASSWORD), never on its command line, where other users of the
 * computer could read it.
 */
function splitPassword(url: string): { address: string; environment: NodeJS.ProcessEnv } {
  const parsed = new URL(url);
  const password = decodeURIComponent(parsed.password);
  parsed.password = '';
  return {
    address: parsed.toString(),
    environment: password === '' ? { ...process.env } : { ...process.env, PGPASSWORD: password },
  };
}

export type PostgresDumpResult = {
  readonly file: string;
  readonly sizeBytes: number;
  /** Tables whose data `pg_restore --list` finds in the dump. */
  readonly tablesWithData: readonly string[];
};

/**
 * Backs up a PostgreSQL clinic database with `pg_dump --format=custom` into `outFile`, written
 * under a temporary name and given its final name only after `pg_restore --list` has read the
 * whole archive and found the data of every table in `expectTables`. Refuses to replace an
 * existing file. Restore with `pg_restore --dbname=... FILE` (see docs/moving-to-postgresql.md).
 */
export async function dumpPostgres(
  url: string,
  outFile: string,
  programs: { readonly pgDump: string; readonly pgRestore: string },
  expectTables: readonly string[],
): Promise<PostgresDumpResult> {
  const target = path.resolve(outFile);
  if (fs.existsSync(target))
    throw new BackupError(`${target} already exists; choose another file name. Nothing was written.`);
  fs.mkdirSync(path.dirname(target), { recursive: true });
  const temporary = temporaryNameBeside(target, 'partial');
  const { address, environment } = splitPassword(url);
  try {
    await run(programs.pgDump, ['--format=custom', `--file=${temporary}`, `--dbname=${address}`], {
      env: environment,
      maxBuffer: 16 * 1024 * 1024,
    });
    const listed = await run(programs.pgRestore, ['--list', temporary], { maxBuffer: 64 * 1024 * 1024 });
    const tablesWithData = [...listed.stdout.matchAll(/ TABLE DATA \S+ (\S+) /g)].map(
      (match) => match[1] ?? '',
    );
    const missing = expectTables.filter((table) => !tablesWithData.includes(table));
    if (missing.length > 0)
      throw new Error(`pg_restore --list does not find the data of ${missing.join(', ')} in the dump`);
    flushToDisk(temporary);
    fs.renameSync(temporary, target);
    flushToDisk(path.dirname(target));
    return { file: target, sizeBytes: fs.statSync(target).size, tablesWithData };
  } catch (error) {
    fs.rmSync(temporary, { force: true });
    const detail =
      typeof error === 'object' &&
      error !== null &&
      'stderr' in error &&
      typeof error.stderr === 'string' &&
      error.stderr.trim() !== ''
        ? error.stderr.trim()
        : error instanceof Error
          ? error.message
          : String(error);
    throw new BackupError(`The PostgreSQL backup failed: ${detail}. Nothing was written under ${target}.`, {
      cause: error,
    });
  }
}
