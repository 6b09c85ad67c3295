import path from 'node:path';
import { RuleTester } from 'eslint';
import { describe, it } from 'vitest';
import { importBoundaries } from '../../eslint-rules/import-boundaries.js';

RuleTester.describe = describe;
RuleTester.it = it;
RuleTester.itOnly = it.only;

const root = path.resolve('/project');
const at = (file: string) => path.join(root, file);
const options = [{ root }];
const tester = new RuleTester({ languageOptions: { ecmaVersion: 'latest', sourceType: 'module' } });

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
        filename: at('main/electron-main.js'),
        options,
        code: "import { app } from 'electron'; import { openDatabase } from '../db/connection.js';",
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
    ],
  });
});
