import path from 'node:path';
import { Linter, RuleTester } from 'eslint';
import tseslint from 'typescript-eslint';
import { describe, expect, it } from 'vitest';
import { importBoundaries } from '../../eslint-rules/import-boundaries.js';

RuleTester.describe = describe;
RuleTester.it = it;
RuleTester.itOnly = it.only;

const root = path.resolve('/project');
const at = (file: string) => path.join(root, file);
const options = [{ root }];
const tester = new RuleTester({ languageOptions: { ecmaVersion: 'latest', sourceType: 'module' } });
const typeScriptTester = new RuleTester({ languageOptions: { parser: tseslint.parser } });

describe('import-boundaries keeps each layer to its allowed imports', () => {
  tester.run('import-boundaries', importBoundaries, {
    valid: [
      { filename: at('app/core/model/sim.js'), options, code: "import { agents } from '../agents.js';" },
      {
        filename: at('app/contract/plan.js'),
        options,
        code: "import { z } from 'zod'; import { agents } from '../core/agents.js';",
      },
      {
        filename: at('app/ui/app.js'),
        options,
        code: "import { channels } from '../contract/channels.js'; import { useState } from 'react';",
      },
      { filename: at('app/ui/app.js'), options, code: "import { agents } from '../core/agents.js';" },
      {
        filename: at('db/connection.js'),
        options,
        code: "import Database from 'better-sqlite3'; import fs from 'node:fs'; import { x } from '../app/contract/settings.js';",
      },
      {
        filename: at('main/electron/electron-main.js'),
        options,
        code: "import { app } from 'electron'; import { openDatabase } from '../../db/connection.js';",
      },
      {
        filename: at('main/electron/electron-main.js'),
        options,
        code: "import { startBackEnd } from '../back-end/back-end.js';",
      },
      {
        filename: at('main/electron/preload.cjs'),
        options,
        code: "const electron = require('electron');",
      },
      {
        filename: at('main/host/start.js'),
        options,
        code: "import { startBackEnd } from '../back-end/back-end.js'; import { spawn } from 'node:child_process';",
      },
      {
        filename: at('main/cli/cli.js'),
        options,
        code: "import { printPageToPdf } from './headless-pdf.js'; import { runBackup } from '../back-end/automatic-backup.js';",
      },
      {
        filename: at('test/db/a.test.js'),
        options,
        code: "import { openDatabase } from '../../db/connection.js';",
      },
    ],
    invalid: [
      {
        filename: at('app/core/units.js'),
        options,
        code: "import { z } from 'zod';",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('app/core/units.js'),
        options,
        code: "import fs from 'node:fs';",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('app/core/units.js'),
        options,
        code: "import { channels } from '../contract/channels.js';",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('app/contract/plan.js'),
        options,
        code: "import React from 'react';",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('app/contract/plan.js'),
        options,
        code: "import { openDatabase } from '../../db/connection.js';",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('app/ui/app.js'),
        options,
        code: "import { openDatabase } from '../../db/connection.js';",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('app/ui/app.js'),
        options,
        code: "import { startBackEnd } from '../../main/back-end/back-end.js';",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('app/ui/app.js'),
        options,
        code: "export { x } from '../../main/back-end/back-end.js';",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('app/ui/app.js'),
        options,
        code: "const m = import('../../db/connection.js');",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('app/ui/app.js'),
        options,
        code: "import { ipcRenderer } from 'electron';",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('app/ui/app.js'),
        options,
        code: "import fs from 'node:fs';",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('db/connection.js'),
        options,
        code: "import { App } from '../app/ui/app.js';",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('db/connection.js'),
        options,
        code: "import { startBackEnd } from '../main/back-end.js';",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('db/connection.js'),
        options,
        code: "import { app } from 'electron';",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('db/connection.js'),
        options,
        code: "const electron = require('electron');",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('test/e2e/a.test.js'),
        options,
        code: "import { app } from 'electron';",
        errors: [{ messageId: 'refused' }],
      },
      ...(['main/cli/cli.js', 'main/host/start.js', 'main/back-end/back-end.js'] as const).flatMap((file) => [
        { filename: at(file), options, code: "import 'electron';", errors: [{ messageId: 'refused' }] },
        {
          filename: at(file),
          options,
          code: "import { app } from 'electron';",
          errors: [{ messageId: 'refused' }],
        },
        {
          filename: at(file),
          options,
          code: "const electron = await import('electron');",
          errors: [{ messageId: 'refused' }],
        },
        {
          filename: at(file),
          options,
          code: "import { main } from '../electron/electron-main.js';",
          errors: [{ messageId: 'refused' }],
        },
        {
          filename: at(file),
          options,
          code: "export * from '../electron/electron-main.js';",
          errors: [{ messageId: 'refused' }],
        },
      ]),
      {
        filename: at('main/back-end/back-end.js'),
        options,
        code: "import { fixture } from '../../test/support/clinic-settings.js';",
        errors: [{ messageId: 'refused' }],
      },
    ],
  });

  typeScriptTester.run('import-boundaries in TypeScript', importBoundaries, {
    valid: [
      { filename: at('main/electron/preload.cts'), options, code: "import electron = require('electron');" },
    ],
    invalid: [
      {
        filename: at('main/cli/cli.ts'),
        options,
        code: "import electron = require('electron');",
        errors: [{ messageId: 'refused' }],
      },
      {
        filename: at('main/host/start.ts'),
        options,
        code: "import type { BrowserWindow } from 'electron';",
        errors: [{ messageId: 'refused' }],
      },
    ],
  });
});

describe('import-boundaries messages', () => {
  it('name the rule and the folder that may import electron', () => {
    const linter = new Linter({ cwd: root });
    const messages = linter.verify(
      "import 'electron';",
      {
        languageOptions: { ecmaVersion: 'latest', sourceType: 'module' },
        plugins: { tidewing: { rules: { 'import-boundaries': importBoundaries } } },
        rules: { 'tidewing/import-boundaries': ['error', { root }] },
      },
      at('main/cli/cli.js'),
    );
    expect(messages.map((message) => message.message)).toEqual([
      'tidewing/import-boundaries: import of "electron" is not allowed here: only main/electron/ may import electron (the host, command line and back end run in plain Node).',
    ]);
  });
});
