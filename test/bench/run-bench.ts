import { benchFirstScreen } from './first-screen-bench.js';
import { benchFoundation } from './foundation-bench.js';
import { printFigures } from './figures.js';
import { benchModel } from './model-bench.js';
import { benchRecords } from './records-bench.js';
import { benchWorksheet } from './worksheet-bench.js';
import { benchPlanningScreen } from './planning-bench.js';
import { benchEvidence } from './evidence-bench.js';
import { benchWorkstationLoad } from './workstations-bench.js';
import { benchEngines } from './engines-bench.js';

const sections: Readonly<Record<string, () => Promise<void>>> = {
  foundation: async () => printFigures('Foundation', await benchFoundation()),
  model: async () => {
    const model = await benchModel();
    printFigures(
      'Model (targets: 2-h plan <= 1 ms, 500-sample band from the full engine <= 100 ms with the pool)',
      Object.entries(model)
        .filter(([name]) => name !== 'analyticChecksum')
        .map(([name, value]) => ({
          name,
          value,
          unit: /Ms$/.test(name) ? 'ms' : /Ratio$/.test(name) ? 'x' : '',
        })),
    );
  },
  records: async () => printFigures('Records', await benchRecords()),
  'first-screen': async () =>
    printFigures('First screen (an older clinic PC: CPU slowed 4x)', await benchFirstScreen()),
  planning: async () =>
    printFigures(
      'Planning screen (target: keystroke to redrawn chart within one 16.7 ms frame)',
      await benchPlanningScreen(),
    ),
  worksheet: async () => printFigures('Worksheet (target: PDF under 2 s)', await benchWorksheet()),
  evidence: async () => printFigures('Clinic evidence', await benchEvidence()),
  engines: async () =>
    printFigures('SQLite and PostgreSQL through the same repositories', await benchEngines()),
  workstations: async () =>
    printFigures(
      'Five workstations on one PostgreSQL database, 1 row/s each for 2 min, one host SIGKILLed and restarted',
      await benchWorkstationLoad(),
    ),
};

/**
 * `npm run bench`: prints figures; targets are read by people, never asserted in tests.
 * `npm run bench -- model first-screen` runs only the sections named.
 */
async function main(): Promise<void> {
  const asked = process.argv.slice(2);
  const unknown = asked.filter((name) => !(name in sections));
  if (unknown.length > 0)
    throw new Error(`unknown section ${unknown.join(', ')}; sections: ${Object.keys(sections).join(', ')}`);
  for (const [name, run] of Object.entries(sections))
    if (asked.length === 0 || asked.includes(name)) await run();
}

main().catch((error: unknown) => {
  process.stderr.write(
    `bench failed: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`,
  );
  process.exitCode = 1;
});
