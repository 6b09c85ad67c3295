#!/usr/bin/env node
// The `tidewing` command: runs the compiled command line from build/ (made by `npm run build`,
// which `npm install` runs through the prepare script).
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const compiled = new URL('../build/main/cli/cli-entry.js', import.meta.url);
if (!existsSync(fileURLToPath(compiled))) {
  process.stderr.write(
    'tidewing: the program is not built yet; run `npm run build` in the Tidewing folder first.\n',
  );
  process.exit(1);
}
await import(compiled.href);
