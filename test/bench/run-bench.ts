import { benchFoundation } from './foundation-bench.js';
import { printFigures } from './figures.js';
import { benchModel } from './model-bench.js';
import { benchRecords } from './records-bench.js';
import { benchWorksheet } from './worksheet-bench.js';
import { benchPlanningScreen } from './planning-bench.js';
import { benchEvidence } from './evidence-bench.js';

/** `npm run bench`: prints figures; targets are read by people, never asserted in tests. */
async function main(): Promise<void> {
  printFigures('Foundation', await benchFoundation());
  const model = await benchModel();
  printFigures(
    'Model (targets: 2-h plan <= 1 ms, 500-sample uncertainty <= 50 ms)',
    Object.entries(model)
      .filter(([name]) => name !== 'analyticChecksum')
      .map(([name, value]) => ({
        name,
        value,
        unit: /Ms$/.test(name) ? 'ms' : /Ratio$/.test(name) ? 'x' : '',
      })),
  );
  printFigures('Records', await benchRecords());
  printFigures(
    'Planning screen (target: keystroke to redrawn chart within one 16.7 ms frame)',
    await benchPlanningScreen(),
  );
  printFigures('Worksheet (target: PDF under 2 s)', await benchWorksheet());
  printFigures('Clinic evidence', await benchEvidence());
}

main().catch((error: unknown) => {
  process.stderr.write(
    `bench failed: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`,
  );
  process.exitCode = 1;
});
