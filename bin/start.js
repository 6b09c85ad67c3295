#!/usr/bin/env node
// `npm start`: builds only when a source is newer than the last finished build (see
// bin/build-stamp.js), then runs the compiled start (build/main/host/start.js) in this process,
// with the same arguments (`npm start -- --port 8080 --no-open`).
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { decideBuild } from './build-stamp.js';

const root = path.dirname(path.dirname(fileURLToPath(import.meta.url)));

const decision = decideBuild(root);
if (decision.build) {
  process.stdout.write(`Building Tidewing first: ${decision.reason}.\n`);
  // npm sets npm_execpath when it runs this script; elsewhere the npm on the PATH builds.
  const npmCli = process.env['npm_execpath'];
  const build =
    npmCli !== undefined && npmCli.endsWith('.js')
      ? spawnSync(process.execPath, [npmCli, 'run', 'build'], { cwd: root, stdio: 'inherit' })
      : spawnSync('npm', ['run', 'build'], {
          cwd: root,
          stdio: 'inherit',
          shell: process.platform === 'win32',
        });
  if (build.status !== 0) {
    process.stderr.write('tidewing: the build failed (see above), so Tidewing was not started.\n');
    process.exit(build.status ?? 1);
  }
}

await import(pathToFileURL(path.join(root, 'build', 'main', 'host', 'start.js')).href);
