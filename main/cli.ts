import fs from 'node:fs/promises';
import { runBackupCommand } from './cli/backup-command.js';
import { runCheckCommand } from './cli/check-command.js';
import { processIo } from './cli/command-io.js';
import { runExportCommand } from './cli/export-command.js';
import { runPlanCommand } from './cli/plan-command.js';
import { runRestoreCommand } from './cli/restore-command.js';
import { runWorksheetCommand } from './cli/worksheet-command.js';

type Command = { readonly summary: string; run(args: string[]): Promise<number> };

const commands: Readonly<Record<string, Command>> = {
  plan: {
    summary: 'predictions for a plan file as JSON: FILE or - for standard input [--summary]',
    run: (args) => runPlanCommand(args, { stdin: process.stdin, stdout: (text) => process.stdout.write(text), stderr: (text) => process.stderr.write(text), readFile: readTextFile }),
  },
  backup: { summary: 'copy the clinic database to a file: --out FILE [--data DIR]', run: (args) => runBackupCommand(args, processIo) },
  restore: { summary: 'put a backup in place of the clinic database: FILE [--data DIR]', run: (args) => runRestoreCommand(args, processIo) },
  check: { summary: 'integrity and schema version of the database: [--data DIR] or FILE', run: (args) => runCheckCommand(args, processIo) },
  export: { summary: 'the whole database as JSON: --out FILE.json [--data DIR]', run: (args) => runExportCommand(args, processIo) },
  worksheet: { summary: 'the printable worksheet of a saved plan as PDF: --plan ID --out FILE.pdf [--data DIR]', run: (args) => runWorksheetCommand(args, processIo) },
};

function usage(): string {
  const lines = Object.entries(commands).map(([name, command]) => `  syrinx ${name.padEnd(10)} ${command.summary}`);
  return ['Usage:', ...lines, '', 'Run `npm start` to open the app.'].join('\n');
}

/** Entry point of the `syrinx` command line. Returns the process exit code. */
export async function runCli(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === '--help' || name === '-h') {
    process.stdout.write(`${usage()}\n`);
    return name === undefined ? 2 : 0;
  }
  const command = commands[name];
  if (command === undefined) {
    process.stderr.write(`syrinx: unknown command "${name}".\n${usage()}\n`);
    return 2;
  }
  return command.run(rest);
}

export const readTextFile = (file: string) => fs.readFile(file, 'utf8');
