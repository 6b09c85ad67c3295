import Database from 'better-sqlite3';
import { spawnSync } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import { clinicWithBackups, damages, snapshot, type DamageName } from '../support/guarded-clinic.js';
import { temporaryFolder } from '../support/temporary-folder.js';
import { startHostProcess } from './host-process.js';

/** `node build/main/host/start.js --no-open --port 0 --data DIR ...`, as `npm start` runs it. */
function startOnce(dataDirectory: string, extra: string[] = []) {
  return spawnSync(
    process.execPath,
    [
      path.join(findProjectRoot(), 'build', 'main', 'host', 'start.js'),
      '--no-open',
      '--port',
      '0',
      '--data',
      dataDirectory,
      ...extra,
    ],
    // A generous limit: the refusal comes after one read of the folder; this only stops a hang.
    { env: { ...process.env, CI: 'true', DISPLAY: '' }, encoding: 'utf8', timeout: 60_000 },
  );
}

function status(url: string): Promise<number> {
  return new Promise((resolve, reject) => {
    http
      .get(url, (response) => {
        response.resume();
        resolve(response.statusCode ?? 0);
      })
      .on('error', reject);
  });
}

/** Local addresses of listening TCP sockets on a port, from /proc/net/tcp and tcp6 (Linux). */
function listeningAddresses(port: number): string[] {
  const hexPort = port.toString(16).toUpperCase().padStart(4, '0');
  const addresses: string[] = [];
  for (const table of ['/proc/net/tcp', '/proc/net/tcp6']) {
    if (!fs.existsSync(table)) continue;
    for (const line of fs.readFileSync(table, 'utf8').split('\n').slice(1)) {
      const fields = line.trim().split(/\s+/);
      const local = fields[1];
      if (local === undefined || fields[3] !== '0A') continue; // 0A = LISTEN
      const [address, portHex] = local.split(':');
      if (portHex === hexPort && address !== undefined) addresses.push(address);
    }
  }
  return addresses;
}

describe('npm start on a machine without a display', () => {
  // How soon the URL appears is a speed figure (`npm run bench`, "npm start to URL"); on a busy
  // shared machine the test only waits for it, generously.
  it('prints a one-time loopback URL, refuses it once used, listening on 127.0.0.1 alone', async () => {
    const data = temporaryFolder();
    const host = await startHostProcess(data.folder, [], 60_000);
    try {
      expect(host.output()).toMatch(/desktop window cannot open because there is no graphical display/);
      // The printed address works once: it redirects to the clean address with the file cookie.
      expect(await status(host.url)).toBe(303);
      expect(await status(host.url)).toBe(403);
      expect(await status(`${host.origin}/`)).toBe(403);
      // and the host prints the next one-time address for another tab or browser.
      const next = await host.nextUrl();
      expect(next).not.toBe(host.url);
      expect(await status(next)).toBe(303);
      expect(listeningAddresses(host.port)).toEqual(['0100007F']); // 127.0.0.1 in /proc's byte order
    } finally {
      await host.stop();
      data.remove();
    }
  });

  it('refuses a database from a newer schema with a clear message and leaves it untouched', () => {
    const data = temporaryFolder();
    try {
      const file = path.join(data.folder, 'tidewing.db');
      const writer = new Database(file);
      writer.exec("CREATE TABLE notes (body TEXT); INSERT INTO notes VALUES ('from the future');");
      writer.pragma('user_version = 42');
      writer.close();
      const before = crypto.createHash('sha256').update(fs.readFileSync(file)).digest('hex');
      const result = spawnSync(
        process.execPath,
        [
          path.join(findProjectRoot(), 'build', 'main', 'host', 'start.js'),
          '--no-open',
          '--data',
          data.folder,
        ],
        {
          env: { ...process.env, CI: 'true', DISPLAY: '' },
          encoding: 'utf8',
          timeout: 60_000,
        },
      );
      expect(result.status).toBe(1);
      expect(result.stderr).toMatch(
        /written by a newer version of Tidewing \(schema 42; this version understands up to \d+\)/,
      );
      expect(result.stdout).not.toMatch(/Open:/);
      expect(crypto.createHash('sha256').update(fs.readFileSync(file)).digest('hex')).toBe(before);
      expect(fs.readdirSync(data.folder)).toEqual(['tidewing.db']);
    } finally {
      data.remove();
    }
  });
});

describe('npm start on a data folder whose database went wrong (the start-up guard)', () => {
  const cases: [DamageName, RegExp][] = [
    ['emptied', /is empty \(0 bytes\)/],
    ['deleted', /There is no clinic database at/],
    ['damagedPage', /is damaged/],
    ['foreign', /not a Tidewing database/],
    ['missingTable', /lacks the table emergency_drugs/],
  ];
  it.each(cases)(
    'database %s: exits non-zero without a URL, names the newest backup and the restore command, and changes no file',
    async (damage, what) => {
      const data = await clinicWithBackups();
      try {
        damages[damage](data.databaseFile);
        const before = snapshot(data.folder);
        const result = startOnce(data.folder);
        expect(result.error).toBeUndefined();
        expect(result.status).toBe(1);
        expect(result.stdout).not.toMatch(/Open:|http:\/\//);
        expect(result.stderr).toMatch(/Tidewing did not start/);
        expect(result.stderr).toMatch(what);
        const newest = data.backups.at(-1) ?? '';
        expect(result.stderr).toContain(`The newest good backup is ${newest}`);
        expect(result.stderr).toContain(`npx tidewing restore ${newest} --data ${data.folder}`);
        // Every file byte for byte: the database as found, the backups, nothing added.
        expect(snapshot(data.folder)).toEqual(before);
      } finally {
        data.remove();
      }
    },
  );

  it('starts a new, empty clinic with --new-clinic, keeping the backups with records', async () => {
    const data = await clinicWithBackups();
    try {
      damages.emptied(data.databaseFile);
      const backupsBefore = data.backups.map((file) => snapshot(path.dirname(file))[path.basename(file)]);
      const host = await startHostProcess(data.folder, ['--new-clinic'], 60_000);
      await host.stop();
      expect(host.output()).toMatch(/Starting a new, empty clinic as asked \(--new-clinic\)/);
      expect(data.backups.map((file) => snapshot(path.dirname(file))[path.basename(file)])).toEqual(
        backupsBefore,
      );
    } finally {
      data.remove();
    }
  });
});
