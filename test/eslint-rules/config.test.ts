import path from 'node:path';
import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';
import { findProjectRoot } from '../../main/back-end/project-paths.js';

// The project's own eslint.config.js, on lines as `npm run lint` would see them in these files
// (the files need not exist: the text is linted as if it were theirs).
const root = findProjectRoot();
const eslint = new ESLint({ cwd: root });

async function problems(file: string, code: string): Promise<{ ruleId: string | null; message: string }[]> {
  const [result] = await eslint.lintText(code, { filePath: path.join(root, file) });
  return (result?.messages ?? []).map(({ ruleId, message }) => ({ ruleId, message }));
}

describe('eslint.config.js wires the house rules to the right folders', () => {
  it('refuses the clock in app/core, naming tidewing/pure-core', async () => {
    const found = await problems('app/core/units.ts', 'export const t = Date.now();\n');
    expect(found).toHaveLength(1);
    expect(found[0]?.ruleId).toBe('tidewing/pure-core');
    expect(found[0]?.message).toMatch(/^tidewing\/pure-core: /);
  });

  it('gives app/core no Node or browser globals', async () => {
    for (const name of ['process', 'Buffer', 'window', 'document']) {
      const found = await problems('app/core/units.ts', `export const host = ${name};\n`);
      expect(
        found.map((problem) => problem.ruleId),
        name,
      ).toEqual(['tidewing/pure-core']);
    }
  });

  it('allows the clock outside app/core', async () => {
    expect(await problems('main/back-end/automatic-backup.ts', 'export const t = Date.now();\n')).toEqual([]);
  });

  it('refuses electron in the command line, naming tidewing/import-boundaries', async () => {
    const found = await problems('main/cli/cli.ts', "import 'electron';\n");
    expect(found).toHaveLength(1);
    expect(found[0]?.ruleId).toBe('tidewing/import-boundaries');
    expect(found[0]?.message).toMatch(
      /^tidewing\/import-boundaries: .*only main\/electron\/ may import electron/,
    );
  });

  it('allows electron in the Electron folder', async () => {
    expect(await problems('main/electron/electron-main.ts', "import 'electron';\n")).toEqual([]);
  });
});
