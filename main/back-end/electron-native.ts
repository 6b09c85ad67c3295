import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

/**
 * Where a better-sqlite3 binary built for a given Electron version lives in a source checkout.
 * The Node build in node_modules stays as it is, so the tests keep working.
 */
export function electronSqliteBindingPath(root: string, electronVersion: string): string {
  return path.join(
    root,
    'build',
    'electron-native',
    electronVersion,
    'node_modules',
    'better-sqlite3',
    'build',
    'Release',
    'better_sqlite3.node',
  );
}

export type NativePreparation =
  { readonly ok: true; readonly binding: string } | { readonly ok: false; readonly reason: string };

/**
 * Builds better-sqlite3 for Electron's ABI into build/electron-native/<version> (once), with
 * @electron/rebuild on a copy of the module. Needs a compiler and Electron's headers, which
 * @electron/rebuild downloads; installers built by `npm run dist` do this themselves.
 */
export function prepareElectronSqlite(
  root: string,
  electronVersion: string,
  log: (message: string) => void,
): NativePreparation {
  const binding = electronSqliteBindingPath(root, electronVersion);
  if (fs.existsSync(binding)) return { ok: true, binding };
  const source = path.join(root, 'node_modules', 'better-sqlite3');
  const rebuildCli = path.join(root, 'node_modules', '@electron', 'rebuild', 'lib', 'cli.js');
  if (!fs.existsSync(source) || !fs.existsSync(rebuildCli))
    return { ok: false, reason: 'better-sqlite3 or @electron/rebuild is not installed' };
  const target = path.join(root, 'build', 'electron-native', electronVersion);
  const moduleCopy = path.join(target, 'node_modules', 'better-sqlite3');
  fs.rmSync(target, { recursive: true, force: true });
  fs.mkdirSync(path.dirname(moduleCopy), { recursive: true });
  fs.cpSync(source, moduleCopy, {
    recursive: true,
    filter: (file) => !file.startsWith(path.join(source, 'build')),
  });
  const moduleVersion = (
    JSON.parse(fs.readFileSync(path.join(source, 'package.json'), 'utf8')) as { version: string }
  ).version;
  fs.writeFileSync(
    path.join(target, 'package.json'),
    JSON.stringify(
      { name: 'tidewing-electron-native', private: true, dependencies: { 'better-sqlite3': moduleVersion } },
      null,
      2,
    ),
  );
  log(`Building the database driver for Electron ${electronVersion} (first desktop start only)…`);
  const result = spawnSync(
    process.execPath,
    [rebuildCli, '--version', electronVersion, '--module-dir', target, '--only', 'better-sqlite3', '--force'],
    { stdio: 'inherit', timeout: 15 * 60_000 },
  );
  if (result.status === 0 && fs.existsSync(binding)) return { ok: true, binding };
  return {
    ok: false,
    reason:
      'the database driver could not be built for Electron (a compiler and network access to Electron’s headers are needed)',
  };
}

/** The Electron version installed in node_modules. */
export function installedElectronVersion(root: string): string | null {
  const file = path.join(root, 'node_modules', 'electron', 'package.json');
  return fs.existsSync(file)
    ? (JSON.parse(fs.readFileSync(file, 'utf8')) as { version: string }).version
    : null;
}
