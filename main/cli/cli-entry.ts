import { runCli } from './cli.js';
import { endQuietlyOnClosedPipe } from './command-io.js';

let outputFailed = false;
endQuietlyOnClosedPipe(undefined, () => {
  outputFailed = true;
});
runCli(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = outputFailed ? 1 : code;
  },
  (error: unknown) => {
    process.stderr.write(`tidewing: ${error instanceof Error ? error.message : String(error)}\n`);
    process.exitCode = 1;
  },
);
