import fs from 'node:fs/promises';

type Command = { readonly summary: string; run(args: string[]): Promise<number> };

const commands: Readonly<Record<string, Command>> = {};

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
