import fs from 'node:fs';
import path from 'node:path';
import type { BackupProgress } from '../../db/backup.js';
import { databaseFile, defaultDataDirectory } from '../back-end/data-directory.js';

/** Where a command writes: results on stdout, progress and errors on stderr. */
export type CommandIo = { readonly stdout: (text: string) => void; readonly stderr: (text: string) => void };

/** The running process's own streams. */
export const processIo: CommandIo = {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
};

/** Wrong arguments: the command prints the message and its usage and exits with code 2. */
export class UsageError extends Error {}

export type ParsedArguments = {
  readonly values: ReadonlyMap<string, string>;
  readonly flags: ReadonlySet<string>;
  readonly positionals: readonly string[];
};

/**
 * Parses `--name value`, `--name=value` and bare `--flag` options and positional arguments.
 * Each option may be given once; anything unknown is a UsageError.
 */
export function parseArguments(
  args: readonly string[],
  spec: {
    readonly valueOptions: readonly string[];
    readonly flagOptions?: readonly string[];
    readonly maxPositionals: number;
  },
): ParsedArguments {
  const values = new Map<string, string>();
  const flags = new Set<string>();
  const positionals: string[] = [];
  for (let index = 0; index < args.length; index += 1) {
    const argument = args[index] ?? '';
    if (argument.startsWith('--')) {
      const equals = argument.indexOf('=');
      const name = equals === -1 ? argument : argument.slice(0, equals);
      if (spec.flagOptions?.includes(name) === true) {
        if (equals !== -1) throw new UsageError(`${name} takes no value.`);
        flags.add(name);
        continue;
      }
      if (!spec.valueOptions.includes(name)) {
        const known = [...spec.valueOptions, ...(spec.flagOptions ?? [])].join(', ');
        throw new UsageError(`Unknown option "${name}"${known === '' ? '' : `; options: ${known}`}.`);
      }
      if (values.has(name)) throw new UsageError(`${name} is given twice.`);
      let value: string | undefined;
      if (equals !== -1) value = argument.slice(equals + 1);
      else {
        value = args[index + 1];
        index += 1;
      }
      if (value === undefined || value === '' || value.startsWith('--'))
        throw new UsageError(`${name} needs a value.`);
      values.set(name, value);
    } else {
      if (positionals.length >= spec.maxPositionals)
        throw new UsageError(`Unexpected argument "${argument}".`);
      positionals.push(argument);
    }
  }
  return { values, flags, positionals };
}

/**
 * Runs `parse`; a UsageError is printed as `tidewing COMMAND: message` with the usage, and gives
 * null (the command then exits with code 2). Other errors pass through.
 */
export function parseOrExplain<T>(io: CommandIo, command: string, usage: string, parse: () => T): T | null {
  try {
    return parse();
  } catch (error) {
    if (!(error instanceof UsageError)) throw error;
    io.stderr(`tidewing ${command}: ${error.message}\n${usage}\n`);
    return null;
  }
}

/** True when the data folder holds a database; otherwise says so (nothing written) and gives false. */
export function databaseExists(
  io: CommandIo,
  command: string,
  location: { readonly dataDirectory: string; readonly databaseFile: string },
): boolean {
  if (fs.existsSync(location.databaseFile)) return true;
  io.stderr(
    `tidewing ${command}: there is no Tidewing database in ${location.dataDirectory} (looked for ${location.databaseFile}). Nothing was written.\n`,
  );
  return false;
}

/** The data folder from `--data`, or the platform's usual one; and the database file in it. */
export function dataLocation(parsed: ParsedArguments): { dataDirectory: string; databaseFile: string } {
  const dataDirectory = path.resolve(parsed.values.get('--data') ?? defaultDataDirectory());
  return { dataDirectory, databaseFile: databaseFile(dataDirectory) };
}

/** Prints `label: NN%` on stderr at each new tenth and at 100 %, never the same percentage twice. */
export function progressPrinter(
  io: CommandIo,
  label: string,
): (progress: Pick<BackupProgress, 'percent'>) => void {
  let lastStep = -1;
  return ({ percent }) => {
    const step = percent >= 100 ? 10 : Math.floor(percent / 10);
    if (step <= lastStep) return;
    lastStep = step;
    io.stderr(`${label}: ${step * 10}%\n`);
  };
}

export function errorText(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}
