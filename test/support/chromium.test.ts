import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  ChromiumMissingError,
  chromiumMissingMessage,
  chromiumPath,
  needBuilt,
  needChromium,
  runningUnderCi,
} from './chromium.js';
import { temporaryFolder } from './temporary-folder.js';

class Skipped extends Error {}
const context = {
  skip: (note?: string): never => {
    throw new Skipped(note);
  },
};

describe('the Chromium check of tests that print or drive a page', () => {
  const missing = path.join('/nonexistent', 'chromium');

  it('uses CHROMIUM_PATH, else Debian’s /usr/bin/chromium', () => {
    expect(chromiumPath({ CHROMIUM_PATH: '/opt/chromium/chrome' })).toBe('/opt/chromium/chrome');
    expect(chromiumPath({})).toBe('/usr/bin/chromium');
    expect(chromiumPath({ CHROMIUM_PATH: '' })).toBe('/usr/bin/chromium');
  });

  it('reads CI as set unless it is empty, 0 or false', () => {
    expect(runningUnderCi({ CI: 'true' })).toBe(true);
    expect(runningUnderCi({ CI: '1' })).toBe(true);
    expect(runningUnderCi({})).toBe(false);
    expect(runningUnderCi({ CI: '' })).toBe(false);
    expect(runningUnderCi({ CI: '0' })).toBe(false);
    expect(runningUnderCi({ CI: 'false' })).toBe(false);
  });

  it('fails under CI when Chromium is missing, saying where it looked and how to install it', () => {
    const env = { CI: 'true', CHROMIUM_PATH: missing };
    expect(() => needChromium(context, env)).toThrow(ChromiumMissingError);
    expect(() => needChromium(context, env)).toThrow(
      `Chromium not found at ${missing}; apt-get install chromium or set CHROMIUM_PATH`,
    );
  });

  it('skips with the same message outside CI', () => {
    expect(() => needChromium(context, { CHROMIUM_PATH: missing })).toThrow(Skipped);
    expect(() => needChromium(context, { CHROMIUM_PATH: missing })).toThrow(chromiumMissingMessage(missing));
  });

  it('returns the path when the executable is there', () => {
    const folder = temporaryFolder('tidewing-chromium-check-');
    try {
      const present = path.join(folder.folder, 'chromium');
      fs.writeFileSync(present, '');
      expect(needChromium(context, { CI: 'true', CHROMIUM_PATH: present })).toBe(present);
    } finally {
      folder.remove();
    }
  });

  it('fails under CI and skips elsewhere when a built file is missing, saying to build', () => {
    const file = path.join('/nonexistent', 'build', 'renderer', 'print.html');
    expect(() => needBuilt(context, file, { CI: 'true' })).toThrow(
      `${file} is not built; run npm run build first`,
    );
    expect(() => needBuilt(context, file, {})).toThrow(Skipped);
  });
});
