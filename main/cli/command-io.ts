import fs from 'node:fs';
import path from 'node:path';
import type { BackupProgress } from '../../db/backup.js';
import { databaseFile, defaultDataDirectory } from '../back-end/data-directory.js';

/** Where a command writes: results on stdout, progress and errors on stderr. */
export type CommandIo = { readonly stdout: (text: string) => void; readonly stderr: (text: string) => void };

function hex(code: number, digits: number): string {
  return code.toString(16).toUpperCase().padStart(digits, '0');
}

/**
 * C0 controls (ESC starts the sequences that move the cursor, recolour or retitle a terminal),
 * DEL and C1 controls, the bidirectional marks, embeddings, overrides and isolates that reorder
 * what is shown (Unicode UAX #9), the line and paragraph separators, and lone surrogates.
 */
function unsafeForTerminal(code: number): boolean {
  return (
    code <= 0x1f ||
    (code >= 0x7f && code <= 0x9f) ||
    code === 0x61c ||
    code === 0x200e ||
    code === 0x200f ||
    (code >= 0x202a && code <= 0x202e) ||
    (code >= 0x2066 && code <= 0x2069) ||
    code === 0x2028 ||
    code === 0x2029 ||
    (code >= 0xd800 && code <= 0xdfff)
  );
}

/** Applies `escape` to each unsafe code point (a lone surrogate is one element of Array.from). */
function replaceUnsafe(text: string, escape: (character: string, code: number) => string): string {
  let out = '';
  for (const character of text) {
    const code = character.codePointAt(0) ?? 0;
    out += unsafeForTerminal(code) ? escape(character, code) : character;
  }
  return out;
}

/**
 * Text that came from input (a file, a name, an error message quoting the input), made safe to
 * print on a terminal: control characters, escape sequences, bidirectional overrides and lone
 * surrogates are shown as visible escapes (`\x1B`, `\u{202E}`), so a plan file cannot move the
 * cursor, recolour, rewrite or reorder what the terminal shows.
 * @param options.keepLineBreaks keep `\n` and `\t` (for whole messages of our own); off by default,
 *   so a value cannot start a line that looks like one of ours
 */
export function escapeForTerminal(text: string, options: { readonly keepLineBreaks?: boolean } = {}): string {
  return replaceUnsafe(text, (character, code) => {
    if (options.keepLineBreaks === true && (character === '\n' || character === '\t')) return character;
    return code <= 0xff ? `\\x${hex(code, 2)}` : `\\u{${hex(code, 4)}}`;
  });
}

/**
 * JSON for a terminal: `JSON.stringify` output with the characters it leaves raw but a terminal
 * acts on (DEL, C1 controls, bidirectional controls, line separators) written as `\uXXXX`
 * escapes. The text parses back to the same value.
 */
export function jsonForTerminal(value: unknown, indent = 2): string {
  // JSON.stringify has already escaped C0 controls and lone surrogates inside strings, and the
  // rest of the unsafe characters can only stand inside strings, where a \u escape means the same.
  // The only raw control left is the line feed of the indentation.
  return replaceUnsafe(JSON.stringify(value, null, indent), (character, code) =>
    character === '\n' ? character : `\\u${hex(code, 4)}`,
  );
}

/** The running process's own streams; what reaches the terminal is escaped as a last guard. */
export const processIo: CommandIo = {
  stdout: (text) => process.stdout.write(escapeForTerminal(text, { keepLineBreaks: true })),
  stderr: (text) => process.stderr.write(escapeForTerminal(text, { keepLineBreaks: true })),
};

const closedPipeCodes = new Set(['EPIPE', 'ERR_STREAM_DESTROYED']);

/**
 * Lets a command end quietly when the reader of its output goes away (`tidewing plan FILE |
 * head -1`): the rest of the output is dropped and the command finishes with its own exit code,
 * instead of dying with an EPIPE stack trace. Anything in progress (a backup, say) completes.
 * Any other output failure sets exit code 1.
 * @param streams the process's output streams (stdout and stderr by default)
 */
export function endQuietlyOnClosedPipe(
  streams: readonly Pick<NodeJS.WritableStream, 'on'>[] = [process.stdout, process.stderr],
  onOtherError: (error: Error) => void = () => {
    process.exitCode = 1;
  },
): void {
  for (const stream of streams)
    stream.on('error', (error: NodeJS.ErrnoException) => {
      if (error.code !== undefined && closedPipeCodes.has(error.code)) return;
      onOtherError(error);
    });
}

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
        throw new UsageError(
          `Unknown option "${escapeForTerminal(name)}"${known === '' ? '' : `; options: ${known}`}.`,
        );
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
        throw new UsageError(`Unexpected argument "${escapeForTerminal(argument)}".`);
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
