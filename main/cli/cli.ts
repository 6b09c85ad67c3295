import fs from 'node:fs/promises';
import { escapeForTerminal, processIo } from './command-io.js';

// Each command loads its own modules when it runs, so that a quick command does not wait for
// the database driver or the model it does not use.
type Command = { readonly summary: string; run(args: string[]): Promise<number> };

const commands: Readonly<Record<string, Command>> = {
  plan: {
    summary:
      'predictions for a plan file as JSON: FILE or - for standard input [--summary] [--allow-unknown-species]',
    run: async (args) =>
      (await import('./plan-command.js')).runPlanCommand(args, {
        stdin: process.stdin,
        stdout: (text) => process.stdout.write(text),
        stderr: (text) => process.stderr.write(text),
        readFile: readTextFile,
      }),
  },
  backup: {
    summary: 'copy the clinic database to a file: --out FILE [--data DIR], or --database URL [--out FILE]',
    run: async (args) => (await import('./backup-command.js')).runBackupCommand(args, processIo),
  },
  restore: {
    summary: 'put a backup in place of the clinic database: FILE [--data DIR]',
    run: async (args) => (await import('./restore-command.js')).runRestoreCommand(args, processIo),
  },
  check: {
    summary: 'integrity and schema version of the database: [--data DIR] or FILE or --database URL',
    run: async (args) => (await import('./check-command.js')).runCheckCommand(args, processIo),
  },
  export: {
    summary: 'the whole database as JSON: --out FILE.json [--data DIR | --database URL]',
    run: async (args) => (await import('./export-command.js')).runExportCommand(args, processIo),
  },
  'move-to': {
    summary:
      'copy the whole clinic into an empty PostgreSQL database and check it: --database URL [--data DIR]',
    run: async (args) => (await import('./move-to-command.js')).runMoveToCommand(args, processIo),
  },
  worksheet: {
    summary: 'the printable worksheet of a saved plan as PDF: --plan ID --out FILE.pdf [--data DIR]',
    run: async (args) => (await import('./worksheet-command.js')).runWorksheetCommand(args, processIo),
  },
  record: {
    summary: 'a procedure record for the patient file as PDF: --id N --out FILE.pdf [--data DIR]',
    run: async (args) => (await import('./record-command.js')).runRecordCommand(args, processIo),
  },
};

function usage(): string {
  const lines = Object.entries(commands).map(
    ([name, command]) => `  tidewing ${name.padEnd(10)} ${command.summary}`,
  );
  return ['Usage:', ...lines, '', 'Run `npm start` to open the app.'].join('\n');
}

/** Entry point of the `tidewing` command line. Returns the process exit code. */
export async function runCli(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === '--help' || name === '-h') {
    process.stdout.write(`${usage()}\n`);
    return name === undefined ? 2 : 0;
  }
  const command = commands[name];
  if (command === undefined) {
    process.stderr.write(`tidewing: unknown command "${escapeForTerminal(name)}".\n${usage()}\n`);
    return 2;
  }
  return command.run(rest);
}

export const readTextFile = (file: string) => fs.readFile(file, 'utf8');
