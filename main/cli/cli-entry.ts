import { runCli } from './cli.js';

runCli(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (error: unknown) => {
    process.stderr.write(`tidewing: ${error instanceof Error ? error.message : String(error)}\n`);
    process.exitCode = 1;
  },
);
