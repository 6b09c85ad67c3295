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

function timeToUrl(root: string, dataDirectory: string): Promise<number> {
  return new Promise((resolve, reject) => {
    const startedAt = performance.now();
    const child = spawn(
      process.execPath,
      [
        path.join(root, 'build', 'main', 'host', 'start.js'),
        '--no-open',
        '--port',
        '0',
        '--data',
        dataDirectory,
      ],
      {
        env: { ...process.env, CI: 'true', DISPLAY: '' },
        stdio: ['ignore', 'pipe', 'inherit'],
      },
    );
    let output = '';
    child.stdout.on('data', (chunk: Buffer) => {
      output += chunk.toString();
      if (/Open: http/.test(output)) {
        const elapsed = performance.now() - startedAt;
        child.kill('SIGTERM');
        child.once('exit', () => resolve(elapsed));
      }
    });
    child.once('error', reject);
  });
}

/** Start-to-URL of `npm start` (process spawn included) and a settings round trip through the bridge. */
export async function benchFoundation(): Promise<Figure[]> {
  const root = findProjectRoot();
  const data = fs.mkdtempSync(path.join(os.tmpdir(), 'tidewing-bench-'));
  try {
    const starts: number[] = [];
    for (let run = 0; run < 7; run += 1) starts.push(await timeToUrl(root, data));

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
