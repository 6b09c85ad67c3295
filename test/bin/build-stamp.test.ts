import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import {
  beginBuild,
  buildDecision,
  decideBuild,
  endBuild,
  requiredOutputs,
  stampPath,
} from '../../bin/build-stamp.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

// Fixed times in the past, so no check depends on the clock or on how fast the machine is.
const longAgo = new Date('2026-01-05T08:00:00Z');
const later = new Date('2026-01-05T09:00:00Z');

/** A project folder with sources and a complete build, every file and folder dated `longAgo`. */
function project(): string {
  const temp = temporaryFolder('tidewing-build-stamp-');
  cleanups.push(temp.remove);
  const root = temp.folder;
  const files = [
    'package.json',
    'vite.config.ts',
    'app/core/units.ts',
    'app/ui/index.html',
    'app/ui/print.html',
    'main/host/start.ts',
    'db/connection.ts',
    ...requiredOutputs,
  ];
  for (const file of files) {
    fs.mkdirSync(path.dirname(path.join(root, file)), { recursive: true });
    fs.writeFileSync(path.join(root, file), '');
  }
  const age = (entry: string) => {
    const stat = fs.statSync(entry);
    if (stat.isDirectory()) for (const child of fs.readdirSync(entry)) age(path.join(entry, child));
    fs.utimesSync(entry, longAgo, longAgo);
  };
  age(root);
  return root;
}

function finishedBuild(root: string): void {
  beginBuild(root);
  endBuild(root);
}

describe('the build decision of npm start', () => {
  const built = { sourcesNewestMs: longAgo.getTime() };

  it('builds when there is no finished build', () => {
    expect(buildDecision({ stamp: null, newestMs: 0, newestFile: null, missingOutputs: [] })).toEqual({
      build: true,
      reason: 'there is no finished build yet',
    });
  });

  it('builds when a required output is missing, naming it', () => {
    const decision = buildDecision({
      stamp: built,
      newestMs: longAgo.getTime(),
      newestFile: 'app/core/units.ts',
      missingOutputs: ['build/renderer/index.html'],
    });
    expect(decision.build).toBe(true);
    expect(decision.reason).toContain('build/renderer/index.html');
  });

  it('builds when a source is newer than the build, naming the source', () => {
    expect(
      buildDecision({
        stamp: built,
        newestMs: later.getTime(),
        newestFile: 'main/cli/cli.ts',
        missingOutputs: [],
      }),
    ).toEqual({ build: true, reason: 'main/cli/cli.ts changed since the last build' });
  });

  it('does not build when nothing is newer than the build', () => {
    for (const newestMs of [longAgo.getTime(), longAgo.getTime() - 1]) {
      expect(
        buildDecision({ stamp: built, newestMs, newestFile: 'app/core/units.ts', missingOutputs: [] }).build,
      ).toBe(false);
    }
  });
});

describe('the build stamp on disk', () => {
  it('is up to date right after a finished build', () => {
    const root = project();
    expect(decideBuild(root).build).toBe(true);
    finishedBuild(root);
    expect(decideBuild(root)).toEqual({ build: false, reason: 'the build is up to date' });
  });

  it('sees an edited source, a configuration file and the worksheet page', () => {
    for (const file of ['app/core/units.ts', 'vite.config.ts', 'package.json', 'app/ui/print.html']) {
      const root = project();
      finishedBuild(root);
      fs.utimesSync(path.join(root, file), later, later);
      expect(decideBuild(root), file).toEqual({
        build: true,
        reason: `${file} changed since the last build`,
      });
    }
  });

  it('sees a deleted source through its folder', () => {
    const root = project();
    finishedBuild(root);
    fs.rmSync(path.join(root, 'db', 'connection.ts'));
    expect(decideBuild(root).build).toBe(true);
  });

  it('ignores files outside the sources, such as the tests', () => {
    const root = project();
    finishedBuild(root);
    fs.mkdirSync(path.join(root, 'test'));
    fs.writeFileSync(path.join(root, 'test', 'a.test.ts'), '');
    expect(decideBuild(root).build).toBe(false);
  });

  it('never looks finished while a build runs or after one was interrupted', () => {
    const root = project();
    finishedBuild(root);
    beginBuild(root); // the build starts and is then interrupted: no `end`
    expect(fs.existsSync(path.join(root, stampPath))).toBe(false);
    expect(decideBuild(root)).toEqual({ build: true, reason: 'there is no finished build yet' });
  });

  it('builds again when the output is deleted', () => {
    const root = project();
    finishedBuild(root);
    fs.rmSync(path.join(root, 'build', 'renderer'), { recursive: true });
    expect(decideBuild(root).build).toBe(true);
  });
});
