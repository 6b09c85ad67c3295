import { spawn } from 'node:child_process';
import path from 'node:path';
import { ArgumentError, parseStartArguments } from './arguments.js';
import { startBackEndOn, type DatabaseChoice } from '../back-end/back-end.js';
import { readSavedDatabase } from '../back-end/saved-database.js';
import { PostgresConnectionError } from '../../db/postgres-checks.js';
import { StartRefusedError } from '../back-end/start-up-guard.js';
import { defaultDataDirectory } from '../back-end/data-directory.js';
import { electronAvailability } from './electron-availability.js';
import { installedElectronVersion, prepareElectronSqlite } from '../back-end/electron-native.js';
import { startLoopbackHost, type LoopbackHost } from './loopback-host.js';
import { openInSystemBrowser } from './open-browser.js';
import { findProjectRoot, readAppVersion, rendererDirectory } from '../back-end/project-paths.js';

/**
 * `npm start`: the desktop window where Electron can run, otherwise the loopback browser host.
 */
async function main(): Promise<number> {
  const startedAt = performance.now();
  let args;
  try {
    args = parseStartArguments(process.argv.slice(2), process.env);
  } catch (error) {
    if (error instanceof ArgumentError) {
      process.stderr.write(`tidewing: ${error.message}\n`);
      return 2;
    }
    throw error;
  }
  const root = findProjectRoot();
  let availability = electronAvailability(root, process.env, process.platform, args.forceBrowser);
  if (availability.ok) {
    const electronVersion = installedElectronVersion(root);
    const native =
      electronVersion === null
        ? { ok: false as const, reason: 'the electron package has no version' }
        : prepareElectronSqlite(root, electronVersion, (message) => process.stdout.write(`${message}\n`));
    if (!native.ok) availability = { ok: false, reason: native.reason };
  }
  if (availability.ok) {
    const electronArgs = [path.join(root, 'build', 'main', 'electron', 'electron-main.js')];
    if (args.dataDirectory !== null) electronArgs.push('--data', path.resolve(args.dataDirectory));
    if (args.newClinic) electronArgs.push('--new-clinic');
    if (args.demo) electronArgs.push('--demo');
    // The address goes to the window's process in its environment, not its command line, which
    // other users of the computer can read.
    const childEnv =
      args.database === null ? process.env : { ...process.env, TIDEWING_DATABASE_URL: args.database.url };
    const child = spawn(availability.binary, electronArgs, { stdio: 'inherit', env: childEnv });
    return new Promise((resolve) => child.on('close', (code) => resolve(code ?? 1)));
  }

  const dataDirectory = path.resolve(args.dataDirectory ?? defaultDataDirectory());
  const appVersion = readAppVersion(root);
  let backEnd;
  try {
    backEnd = await startBackEndOn({
      dataDirectory,
      appVersion,
      host: 'browser',
      automaticBackup: true,
      newClinic: args.newClinic,
      demoClinic: args.demo,
      evidenceBackfill: 'automatic',
      database: chosenDatabase(args.database, dataDirectory),
      log: (message) => process.stderr.write(`${message}\n`),
    });
  } catch (error) {
    if (error instanceof StartRefusedError || error instanceof PostgresConnectionError) {
      process.stderr.write(`tidewing: Tidewing did not start.\n${error.message}\n`);
      return 1;
    }
    process.stderr.write(`tidewing: ${error instanceof Error ? error.message : String(error)}\n`);
    return 1;
  }
  try {
    // The start-up writes (species reference, demo clinic) and the workstation's theme.
    await backEnd.ready;
  } catch (error) {
    process.stderr.write(`tidewing: ${error instanceof Error ? error.message : String(error)}\n`);
    backEnd.close();
    return 1;
  }
  // Each printed address works once (the browser's command line and the process list show it):
  // after each use, print the next one for another tab or browser.
  const host: LoopbackHost = await startLoopbackHost({
    port: args.port,
    rendererDirectory: rendererDirectory(root),
    dispatch: backEnd.dispatch,
    changes: backEnd.changes,
    pageTheme: backEnd.workstationTheme,
    log: (message) => process.stderr.write(`${message}\n`),
    onStartAddressUsed: () =>
      process.stdout.write(
        `Opened in a browser. For another tab or browser, open this one-time address: ${host.newStartUrl()}\n`,
      ),
  });
  process.stdout.write(
    `Tidewing ${appVersion}: the desktop window cannot open because ${availability.reason}; serving the app to a browser on this computer instead.\n`,
  );
  process.stdout.write(`Data folder: ${dataDirectory}\n`);
  process.stdout.write(`Clinic database: ${backEnd.location}\n`);
  process.stdout.write(`Open: ${host.url}\n`);
  process.stdout.write(
    `(ready in ${Math.round(performance.now() - startedAt)} ms; the address works once; press Ctrl+C to stop)\n`,
  );
  if (args.open) openInSystemBrowser(host.url);

  return new Promise((resolve) => {
    const stop = () => {
      void host
        .close()
        .then(() => backEnd.backupSettled)
        .then(() => backEnd.close())
        .then(() => resolve(0));
    };
    process.once('SIGINT', stop);
    process.once('SIGTERM', stop);
  });
}

/**
 * The database to start on: `--database` or TIDEWING_DATABASE_URL, else the address saved in
 * Settings on this workstation (its password from PGPASSWORD or the password file: a password
 * the desktop keeps sealed cannot be opened here), else the file in the data folder.
 */
function chosenDatabase(
  given: { readonly url: string; readonly source: 'command line' | 'environment' } | null,
  dataDirectory: string,
): DatabaseChoice | null {
  if (given !== null) return given;
  const saved = readSavedDatabase(dataDirectory);
  return saved.address === null ? null : { url: saved.address, source: 'saved' };
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    process.stderr.write(
      `tidewing: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`,
    );
    process.exit(1);
  },
);
