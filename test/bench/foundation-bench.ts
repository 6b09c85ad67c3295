import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { startBackEnd } from '../../main/back-end/back-end.js';
import { startLoopbackHost } from '../../main/host/loopback-host.js';
import { findProjectRoot, rendererDirectory } from '../../main/back-end/project-paths.js';
import { median, type Figure } from './figures.js';
import { benchClinicSettings } from '../support/clinic-settings.js';

/**
 * Milliseconds from spawning `command` to the printed URL; the command and its children are then
 * stopped (a process group of their own, so `npm` takes its shell and node with it).
 */
function timeToUrl(command: string, args: readonly string[]): Promise<number> {
  return new Promise((resolve, reject) => {
    const startedAt = performance.now();
    const child = spawn(command, args, {
      env: { ...process.env, CI: 'true', DISPLAY: '' },
      stdio: ['ignore', 'pipe', 'inherit'],
      detached: process.platform !== 'win32',
    });
    const stop = (signal: NodeJS.Signals) => {
      if (child.pid === undefined) return;
      try {
        if (process.platform === 'win32') child.kill(signal);
        else process.kill(-child.pid, signal);
      } catch {
        // Already gone.
      }
    };
    let output = '';
    let elapsed: number | null = null;
    child.stdout.on('data', (chunk: Buffer) => {
      output += chunk.toString();
      if (elapsed === null && /Open: http/.test(output)) {
        elapsed = performance.now() - startedAt;
        const measured = elapsed;
        const hardStop = setTimeout(() => stop('SIGKILL'), 10_000);
        child.once('exit', () => {
          clearTimeout(hardStop);
          resolve(measured);
        });
        stop('SIGTERM');
      }
    });
    child.once('exit', (code) => {
      if (elapsed === null)
        reject(new Error(`${command} exited with ${String(code)} before a URL:\n${output}`));
    });
    child.once('error', reject);
  });
}

/** `npm start -- --no-open --port 0 --data <folder>` as a user types it: npm, the build check, node. */
function npmStartToUrl(dataDirectory: string): Promise<number> {
  const startArgs = ['start', '--', '--no-open', '--port', '0', '--data', dataDirectory];
  // Under `npm run bench`, npm names its own entry point; elsewhere the npm on the PATH runs.
  const npmCli = process.env['npm_execpath'];
  return npmCli !== undefined && npmCli.endsWith('.js')
    ? timeToUrl(process.execPath, [npmCli, ...startArgs])
    : timeToUrl('npm', startArgs);
}

/** Start-to-URL of `npm start` (process spawn included) and a settings round trip through the bridge. */
export async function benchFoundation(): Promise<Figure[]> {
  const root = findProjectRoot();
  const data = fs.mkdtempSync(path.join(os.tmpdir(), 'tidewing-bench-'));
  try {
    const starts: number[] = [];
    const startScript = path.join(root, 'build', 'main', 'host', 'start.js');
    for (let run = 0; run < 7; run += 1)
      starts.push(
        await timeToUrl(process.execPath, [startScript, '--no-open', '--port', '0', '--data', data]),
      );
    // The whole command twice: the first may build (when a source changed), the second finds
    // nothing changed and is the figure.
    const firstNpmStart = await npmStartToUrl(data);
    const npmStart = await npmStartToUrl(data);

    const backEnd = startBackEnd({ dataDirectory: data, appVersion: 'bench', host: 'browser' });
    const host = await startLoopbackHost({
      port: 0,
      rendererDirectory: rendererDirectory(root),
      dispatch: backEnd.dispatch,
    });
    const call = async (channel: string, body: unknown) => {
      const response = await fetch(`${host.origin}/api/${channel}`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', 'x-tidewing-token': host.token },
        body: JSON.stringify(body),
      });
      const parsed = (await response.json()) as { ok: boolean };
      if (!parsed.ok) throw new Error(`${channel} failed during the benchmark`);
    };
    const settings = benchClinicSettings;
    const roundTrips: number[] = [];
    for (let run = 0; run < 220; run += 1) {
      const startedAt = performance.now();
      await call('settings:save', { ...settings, clinicName: `Bench Clinic ${run}` });
      await call('settings:get', {});
      if (run >= 20) roundTrips.push(performance.now() - startedAt);
    }
    await host.close();
    backEnd.close();
    return [
      {
        name: 'start to URL (median of 7)',
        value: median(starts),
        unit: 'ms',
        note: 'node process spawn to the printed URL',
      },
      {
        name: 'npm start to URL, nothing changed',
        value: npmStart,
        unit: 'ms',
        note: `the whole command (npm, build check, node), second of two runs; the first took ${Math.round(firstNpmStart)} ms`,
      },
      {
        name: 'settings save + get round trip (median of 200)',
        value: median(roundTrips),
        unit: 'ms',
        note: 'HTTP bridge, validation, SQLite with synchronous FULL',
      },
    ];
  } finally {
    fs.rmSync(data, { recursive: true, force: true });
  }
}
