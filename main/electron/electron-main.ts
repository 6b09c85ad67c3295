import {
  app,
  BrowserWindow,
  dialog,
  ipcMain,
  protocol,
  safeStorage,
  session,
  type WebContents,
} from 'electron';
import fs from 'node:fs';
import path from 'node:path';
import { channelNames, type ParsedRequestOf, type ResponseOf } from '../../app/contract/channels.js';
import { restoreDatabase } from '../../db/restore.js';
import { startBackEndOn, type DatabaseChoice, type StartedBackEnd } from '../back-end/back-end.js';
import { createDatabaseHandlers, type PasswordKeeper } from '../back-end/database-handlers.js';
import { readSavedDatabase } from '../back-end/saved-database.js';
import { PostgresConnectionError } from '../../db/postgres-checks.js';
import type { DatabaseChoiceSource } from '../../app/contract/database-channels.js';
import { databaseFile } from '../back-end/data-directory.js';
import { createDispatcher, HandlerError } from '../back-end/handlers.js';
import { StartRefusedError } from '../back-end/start-up-guard.js';
import { electronSqliteBindingPath } from '../back-end/electron-native.js';
import { contentTypeFor, securityHeaders } from '../back-end/security-headers.js';
import { readRendererFile, withPageTheme } from '../back-end/static-files.js';
import { findProjectRoot, readAppVersion, rendererDirectory } from '../back-end/project-paths.js';

// Our own scheme instead of file://, so the page has a real origin and a strict CSP.
const scheme = 'app';
const appOrigin = `${scheme}://tidewing`;

protocol.registerSchemesAsPrivileged([
  { scheme, privileges: { standard: true, secure: true, supportFetchAPI: true } },
]);

function dataDirectoryFromArguments(argv: readonly string[]): string | null {
  const index = argv.indexOf('--data');
  const value = index >= 0 ? argv[index + 1] : undefined;
  return value === undefined ? null : path.resolve(value);
}

/** In a source checkout, `npm start` builds better-sqlite3 for Electron beside the build. */
function electronSqliteBinding(root: string): string | undefined {
  if (app.isPackaged) return undefined;
  const candidate = electronSqliteBindingPath(root, process.versions.electron);
  return fs.existsSync(candidate) ? candidate : undefined;
}

function isOwnFrame(url: string | undefined): boolean {
  if (url === undefined) return false;
  try {
    return new URL(url).origin === appOrigin;
  } catch {
    return false;
  }
}

function harden(): void {
  session.defaultSession.setPermissionRequestHandler((_contents, _permission, callback) => callback(false));
  session.defaultSession.setPermissionCheckHandler(() => false);
  app.on('web-contents-created', (_event, contents) => {
    contents.on('will-navigate', (event, url) => {
      if (!isOwnFrame(url)) event.preventDefault();
    });
    contents.on('will-redirect', (event) => event.preventDefault());
    contents.on('will-attach-webview', (event) => event.preventDefault());
    contents.setWindowOpenHandler(() => ({ action: 'deny' }));
  });
}

function registerProtocol(root: string, backEnd: StartedBackEnd): void {
  const folder = rendererDirectory(root);
  protocol.handle(scheme, async (request) => {
    const url = new URL(request.url);
    if (url.host !== 'tidewing') return new Response('Not found', { status: 404 });
    const file = await readRendererFile(folder, url.pathname);
    if (file === null) return new Response('Not found', { status: 404 });
    return new Response(new Uint8Array(withPageTheme(file, backEnd.workstationTheme())), {
      status: 200,
      headers: { ...securityHeaders, 'content-type': contentTypeFor(file.extension) },
    });
  });
}

/**
 * The system keychain behind Electron's safeStorage, when the operating system offers one: the
 * desktop may then keep a PostgreSQL password, sealed, in workstation.json.
 */
function keychain(): PasswordKeeper | undefined {
  if (!safeStorage.isEncryptionAvailable()) return undefined;
  return {
    seal: (password) => safeStorage.encryptString(password).toString('base64'),
    open: (sealed) => safeStorage.decryptString(Buffer.from(sealed, 'base64')),
  };
}

function registerChannels(
  backEnd: StartedBackEnd,
  dataDirectory: string,
  chosenBy: DatabaseChoiceSource,
): void {
  // The desktop answers the database channels with the keychain, so a password typed in
  // Settings is kept sealed instead of being refused.
  const keeper = keychain();
  const handlers = {
    ...backEnd.handlers,
    ...createDatabaseHandlers({
      clinic: backEnd.clinic,
      dataDirectory,
      host: 'desktop',
      chosenBy,
      ...(keeper === undefined ? {} : { keeper }),
    }),
  };
  const dispatch = createDispatcher(handlers);
  ipcMain.on('tidewing:channel-list', (event) => {
    event.returnValue = isOwnFrame(event.senderFrame?.url) ? channelNames : [];
  });
  for (const channel of channelNames) {
    ipcMain.handle(channel, async (event, payload: unknown) => {
      if (!isOwnFrame(event.senderFrame?.url)) {
        return {
          ok: false,
          error: {
            code: 'invalid-request',
            message: 'Refused: the request did not come from the Tidewing window.',
          },
        };
      }
      if (channel === 'worksheets:save-pdf') {
        // The one channel the desktop answers itself: it needs the asking window. The request and
        // the answer still pass the contract's schemas in the shared dispatcher.
        const desktop = createDispatcher({
          ...handlers,
          'worksheets:save-pdf': (request) => saveWorksheetPdf(event.sender, request),
        });
        return desktop(channel, payload);
      }
      return dispatch(channel, payload);
    });
  }
}

/** The IPC message that carries a change notice to the window (see preload.cts `onChange`). */
const changeMessage = 'tidewing:change';

/** Forwards every change notice of the back end to each Tidewing window. */
function forwardChanges(backEnd: StartedBackEnd): void {
  backEnd.changes.subscribe((notice) => {
    for (const window of BrowserWindow.getAllWindows()) {
      const contents = window.webContents;
      if (!contents.isDestroyed() && isOwnFrame(contents.getURL())) contents.send(changeMessage, notice);
    }
  });
}

/** File name for the save dialog: letters, digits and hyphens only, ending in .pdf. */
function safePdfName(suggested: unknown): string {
  const stem =
    typeof suggested === 'string'
      ? suggested
          .replace(/\.pdf$/i, '')
          .replace(/[^A-Za-z0-9-]+/g, '-')
          .slice(0, 80)
      : '';
  return `${stem === '' ? 'tidewing-worksheet' : stem}.pdf`;
}

/**
 * The desktop's 'worksheets:save-pdf': the asking window's own page printed by Chromium with the
 * page size the worksheet's CSS names (A4 or US Letter), written where the user chooses.
 */
async function saveWorksheetPdf(
  sender: WebContents,
  request: ParsedRequestOf<'worksheets:save-pdf'>,
): Promise<ResponseOf<'worksheets:save-pdf'>> {
  const window = BrowserWindow.fromWebContents(sender);
  const options = {
    title: 'Save worksheet as PDF',
    defaultPath: path.join(app.getPath('documents'), safePdfName(request.suggestedName)),
    filters: [{ name: 'PDF', extensions: ['pdf'] }],
  };
  const choice =
    window === null ? await dialog.showSaveDialog(options) : await dialog.showSaveDialog(window, options);
  if (choice.canceled || choice.filePath === undefined) return { saved: false };
  try {
    const pdf = await sender.printToPDF({ preferCSSPageSize: true, printBackground: true });
    // Written beside the target and renamed, so a failed write never leaves half a file under the chosen name.
    const partial = `${choice.filePath}.partial`;
    await fs.promises.writeFile(partial, pdf);
    await fs.promises.rename(partial, choice.filePath);
    return { saved: true, file: choice.filePath };
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    throw new HandlerError(
      'internal',
      `The PDF could not be written to ${choice.filePath}: ${reason}. Choose another folder or use Print.`,
    );
  }
}

async function createWindow(root: string): Promise<void> {
  const window = new BrowserWindow({
    width: 1280,
    height: 860,
    minWidth: 960,
    minHeight: 600,
    title: 'Tidewing',
    show: false,
    webPreferences: {
      preload: path.join(root, 'build', 'main', 'electron', 'preload.cjs'),
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      webSecurity: true,
      allowRunningInsecureContent: false,
      spellcheck: false,
    },
  });
  window.once('ready-to-show', () => window.show());
  await window.loadURL(`${appOrigin}/index.html`);
}

/**
 * The start-up guard's screen: what was found, that nothing was changed, the newest good
 * backup and the restore command, with a button that runs that restore. Resolves true when
 * the backup was restored (the start is then tried again), false to quit.
 */
async function offerRestore(
  refusal: StartRefusedError,
  dataDirectory: string,
  binding: string | undefined,
): Promise<boolean> {
  const { finding } = refusal;
  const buttons = finding.goodBackup === null ? ['Quit'] : ['Restore this backup', 'Quit'];
  const choice = await dialog.showMessageBox({
    type: 'error',
    title: 'Tidewing did not open the clinic database',
    message: 'Tidewing did not open the clinic database. Nothing was changed.',
    detail: finding.message,
    buttons,
    defaultId: buttons.length - 1,
    cancelId: buttons.length - 1,
    noLink: true,
  });
  if (finding.goodBackup === null || choice.response !== 0) return false;
  try {
    const restored = await restoreDatabase({
      from: finding.goodBackup.file,
      databaseFile: databaseFile(dataDirectory),
      now: new Date(),
      ...(binding === undefined ? {} : { nativeBinding: binding }),
    });
    await dialog.showMessageBox({
      type: 'info',
      title: 'Backup restored',
      message: `Restored ${finding.goodBackup.file}.`,
      detail:
        restored.replacedFile === null
          ? 'Tidewing will now open it.'
          : `The file it replaced is kept at ${restored.replacedFile}. Tidewing will now open the restored database.`,
      buttons: ['Open Tidewing'],
    });
    return true;
  } catch (error) {
    dialog.showErrorBox(
      'The restore did not happen',
      `${error instanceof Error ? error.message : String(error)}\n\nYou can run it yourself: ${finding.restoreCommand ?? ''}`,
    );
    return false;
  }
}

async function main(): Promise<void> {
  await app.whenReady();
  const root = findProjectRoot();
  const dataDirectory = dataDirectoryFromArguments(process.argv) ?? app.getPath('userData');
  const binding = electronSqliteBinding(root);
  const database = desktopDatabase(dataDirectory);
  let backEnd: StartedBackEnd | null = null;
  // A second try only after the guard's screen restored a backup.
  for (let attempt = 0; backEnd === null && attempt < 2; attempt += 1) {
    try {
      backEnd = await startBackEndOn({
        database,
        dataDirectory,
        appVersion: readAppVersion(root),
        host: 'desktop',
        automaticBackup: true,
        newClinic: process.argv.includes('--new-clinic'),
        demoClinic: process.argv.includes('--demo'),
        evidenceBackfill: 'automatic',
        ...(binding === undefined ? {} : { openOptions: { nativeBinding: binding } }),
      });
    } catch (error) {
      if (error instanceof StartRefusedError && (await offerRestore(error, dataDirectory, binding))) continue;
      if (error instanceof PostgresConnectionError)
        dialog.showErrorBox('Tidewing cannot reach the clinic database', error.message);
      else if (!(error instanceof StartRefusedError))
        dialog.showErrorBox(
          'Tidewing cannot open its database',
          error instanceof Error ? error.message : String(error),
        );
      app.exit(1);
      return;
    }
  }
  if (backEnd === null) {
    app.exit(1);
    return;
  }
  try {
    // The start-up writes (species reference, demo clinic) and the workstation's theme.
    await backEnd.ready;
  } catch (error) {
    dialog.showErrorBox(
      'Tidewing cannot open its database',
      error instanceof Error ? error.message : String(error),
    );
    backEnd.close();
    app.exit(1);
    return;
  }
  harden();
  registerProtocol(root, backEnd);
  registerChannels(backEnd, dataDirectory, database?.source ?? 'default');
  forwardChanges(backEnd);
  app.on('window-all-closed', () => {
    void backEnd.close().finally(() => app.quit());
  });
  await createWindow(root);
}

/**
 * The database the window starts on: TIDEWING_DATABASE_URL (npm start passes --database this
 * way), else the address saved in Settings with the password the keychain keeps for it, else
 * the file in the data folder.
 */
function desktopDatabase(dataDirectory: string): DatabaseChoice | null {
  const fromEnvironment = process.env['TIDEWING_DATABASE_URL'];
  if (fromEnvironment !== undefined && fromEnvironment.trim() !== '')
    return { url: fromEnvironment.trim(), source: 'environment' };
  const saved = readSavedDatabase(dataDirectory);
  if (saved.address === null) return null;
  const keeper = keychain();
  const keptPassword =
    saved.sealedPassword === null || keeper === undefined ? null : keeper.open(saved.sealedPassword);
  return { url: saved.address, source: 'saved', keptPassword };
}

void main();
