/**
 * Coverage guard: every channel of the one contract table is exercised by at least one unit test
 * through the dispatcher. A channel counts as tested when its name appears as a quoted string in a
 * test file (outside test/e2e and test/bench) that drives the dispatcher. The channel list comes
 * from the contract itself, so a new channel fails here until it has a test, and a removed one
 * drops out by itself.
 */
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { channelNames } from '../../app/contract/channels.js';

const testRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const thisFile = fileURLToPath(import.meta.url);

/** What a test file must contain to count as going through the dispatcher. */
const drivesDispatcher = /\bdispatch\s*\(|\bcreateDispatcher\s*\(|\bopenChannelHarness\s*\(/;

function testFiles(folder: string): string[] {
  return fs.readdirSync(folder, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(folder, entry.name);
    if (entry.isDirectory()) return entry.name === 'e2e' || entry.name === 'bench' ? [] : testFiles(full);
    return entry.name.endsWith('.test.ts') && full !== thisFile ? [full] : [];
  });
}

/** Channel names that no text in `texts` names as a quoted string. */
export function untestedChannels(names: readonly string[], texts: readonly string[]): string[] {
  return names.filter(
    (name) =>
      !texts.some((text) => ['"', "'", '`'].some((quote) => text.includes(`${quote}${name}${quote}`))),
  );
}

describe('channel coverage guard', () => {
  const dispatcherTests = testFiles(testRoot)
    .map((file) => fs.readFileSync(file, 'utf8'))
    .filter((text) => drivesDispatcher.test(text));

  it('finds the contract’s channels and the dispatcher tests', () => {
    expect(channelNames.length).toBeGreaterThan(30);
    expect(dispatcherTests.length).toBeGreaterThan(3);
  });

  it('every channel of the contract has a test through the dispatcher', () => {
    expect(untestedChannels(channelNames, dispatcherTests)).toEqual([]);
  });

  it('reports a channel that no test names, and a name only inside a longer one does not count', () => {
    const texts = ["await dispatch('patients:get', { id: 1 })", "dispatch('weights:add-all', {})"];
    expect(untestedChannels(['patients:get', 'weights:add', 'plans:none'], texts)).toEqual([
      'weights:add',
      'plans:none',
    ]);
  });
});
