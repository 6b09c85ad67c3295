import { benchFoundation } from './foundation-bench.js';
import { printFigures } from './figures.js';
import { benchRecords } from './records-bench.js';

/** `npm run bench`: prints figures; targets are read by people, never asserted in tests. */
async function main(): Promise<void> {
  printFigures('Foundation', await benchFoundation());
  printFigures('Records', await benchRecords());
}

main().catch((error: unknown) => {
  process.stderr.write(`bench failed: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`);
  process.exitCode = 1;
});
