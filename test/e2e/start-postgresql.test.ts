/**
 * `npm start -- --database postgresql://...` (and TIDEWING_DATABASE_URL): the host starts on the
 * server, says which one without its password, keeps only the workstation's identity in the data
 * folder and makes no file backup; a refused connection stops it with the plain message.
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it, onTestFinished } from 'vitest';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import { needBuilt } from '../support/chromium.js';
import { needPostgres, scratchPostgresDatabase } from '../support/postgres-database.js';
import { temporaryFolder } from '../support/temporary-folder.js';
import { startHostProcess } from './host-process.js';

const root = findProjectRoot();
const startScript = path.join(root, 'build', 'main', 'host', 'start.js');

function dataFolder(): string {
  const made = temporaryFolder('tidewing-e2e-start-pg-');
  onTestFinished(made.remove);
  return made.folder;
}

/** Runs the start command to its end; for starts that must be refused. */
function runStart(args: string[], env: NodeJS.ProcessEnv): Promise<{ code: number | null; output: string }> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, [startScript, ...args], {
      env: { ...process.env, CI: 'true', DISPLAY: '', ...env },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let output = '';
    child.stdout.on('data', (chunk: Buffer) => (output += chunk.toString()));
    child.stderr.on('data', (chunk: Buffer) => (output += chunk.toString()));
    child.once('exit', (code) => resolve({ code, output }));
  });
}

describe('npm start on a PostgreSQL clinic database', () => {
  it('--database: serves the app on the server, names it without the password, and makes no file backup', async (context) => {
    needBuilt(context, startScript);
    const { appUrl } = needPostgres(context);
    const scratch = await scratchPostgresDatabase(appUrl);
    onTestFinished(scratch.drop);
    const folder = dataFolder();
    const host = await startHostProcess(folder, ['--database', scratch.url], 60_000);
    let stopped = false;
    onTestFinished(async () => {
      if (!stopped) await host.stop();
    });
    const output = host.output();
    expect(output).toMatch(
      /Clinic database: PostgreSQL \d+.* at postgresql:\/\/tidewing_test@127\.0\.0\.1:\d+\/tw_[0-9a-f]+ \(named by --database\)/,
    );
    expect(output).toMatch(
      /Warning: The database address holds a password\. Other users of this computer can see it/,
    );
    expect(output).toMatch(
      /No file backup at start: the clinic database is on the server .*docs\/postgresql\.md/,
    );
    expect(output).not.toContain('tidewing-test-password');
    expect(fs.existsSync(path.join(folder, 'tidewing.db'))).toBe(false);
    expect(fs.existsSync(path.join(folder, 'backups'))).toBe(false);
    expect(fs.existsSync(path.join(folder, 'workstation.json'))).toBe(true);
    stopped = true;
    await expect(host.stop()).resolves.toBe(0);
  });

  it.for([
    ['a superuser role', 'admin', /refuses to run as a superuser/],
    ['a missing database', 'missing', /has no database named "no_such_clinic"/],
  ] as const)(
    'TIDEWING_DATABASE_URL naming %s: does not start, and says why',
    async ([, which, message], context) => {
      needBuilt(context, startScript);
      const { adminUrl, appUrl } = needPostgres(context);
      const url = which === 'admin' ? adminUrl : appUrl.replace(/\/postgres$/, '/no_such_clinic');
      const folder = dataFolder();
      const ran = await runStart(['--no-open', '--port', '0', '--data', folder], {
        TIDEWING_DATABASE_URL: url,
      });
      expect(ran.code).toBe(1);
      expect(ran.output).toMatch(/tidewing: Tidewing did not start\./);
      expect(ran.output).toMatch(message);
      expect(ran.output).not.toMatch(/Open: http/);
      expect(ran.output).not.toContain('tidewing-test-admin');
      expect(fs.existsSync(path.join(folder, 'tidewing.db'))).toBe(false);
    },
  );
});
