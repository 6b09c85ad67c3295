// Child process of the two-back-ends test: opens a data folder with the built back end (as a
// second Tidewing on the same folder would), waits for "go" on standard input, then saves
// patients and weight corrections as fast as it can and prints one JSON line with the results.
// Plain JavaScript importing the build, so that it runs under node without a TypeScript loader.
import path from 'node:path';
import readline from 'node:readline';
import { pathToFileURL } from 'node:url';

const [root, dataDirectory, writesText, label] = process.argv.slice(2);
if (root === undefined || dataDirectory === undefined || writesText === undefined || label === undefined) {
  process.stderr.write('usage: racing-writer.mjs PROJECT_ROOT DATA_DIR WRITES LABEL\n');
  process.exit(2);
}
const writes = Number(writesText);
const { startBackEnd } = await import(
  pathToFileURL(path.join(root, 'build', 'main', 'back-end', 'back-end.js')).href
);

let backEnd;
try {
  backEnd = startBackEnd({ dataDirectory, appVersion: '0.0.0-race', host: 'browser' });
} catch (error) {
  process.stdout.write(`${JSON.stringify({ started: false, error: String(error) })}\n`);
  process.exit(1);
}
process.stdout.write('ready\n');
const lines = readline.createInterface({ input: process.stdin });
await new Promise((resolve) => lines.once('line', resolve));
lines.close();

const meta = { enteredBy: 'RW', reason: '' };
const today = new Date().toISOString().slice(0, 10);
const failures = [];
let succeeded = 0;
let weightId = null;
for (let index = 0; index < writes; index += 1) {
  // Half new patients (a multi-statement transaction), half corrections of one weight (a
  // transaction that reads the chain before it writes: the case that failed without IMMEDIATE).
  const answer =
    index % 2 === 0 || weightId === null
      ? await backEnd.dispatch('patients:create', {
          values: { name: `${label} ${index}`, speciesKey: 'budgerigar', ringId: `${label}-${index}` },
          meta,
        })
      : await backEnd.dispatch('weights:correct', {
          id: weightId,
          values: { weighedOn: today, massG: 30 + (index % 10) },
          meta: { enteredBy: 'RW', reason: `Reweighed ${index}` },
        });
  if (!answer.ok) {
    failures.push(answer.error.message);
    continue;
  }
  succeeded += 1;
  // A correction is corrected in turn through its newest version.
  if (index % 2 === 1 && weightId !== null) weightId = answer.value.id;
  else if (weightId === null) {
    const weighed = await backEnd.dispatch('weights:add', {
      patientId: answer.value.id,
      values: { weighedOn: today, massG: 30 },
      meta,
    });
    if (weighed.ok) weightId = weighed.value.id;
    else failures.push(`setup weight: ${weighed.error.message}`);
  }
}
backEnd.close();
process.stdout.write(`${JSON.stringify({ started: true, succeeded, failures })}\n`);
