import fs from 'node:fs';
import path from 'node:path';
import type { BackEnd } from '../back-end/back-end.js';
import type { Dispatcher } from '../back-end/handlers.js';
import { startLoopbackHost, type LoopbackHost } from '../host/loopback-host.js';
import { findProjectRoot, readAppVersion, rendererDirectory } from '../back-end/project-paths.js';
import { databaseExists, errorText, type CommandIo, type dataLocation } from './command-io.js';
import { PageNotReadyError, printPageToPdf } from './headless-pdf.js';

/** Options shared by the printing commands. */
export type PrintCommandOptions = {
  /** Environment to read CHROMIUM_PATH from; the process's own by default. */
  readonly env?: NodeJS.ProcessEnv;
  /** Milliseconds to wait for the page to finish drawing. */
  readonly readyTimeoutMs?: number;
};

/** What one printing command prints and how it checks that the thing exists. */
export type PrintJob = {
  /** The command's name, e.g. `worksheet`, for its messages. */
  readonly command: string;
  /** What is printed, for messages, e.g. `the worksheet of plan 12`. */
  readonly what: string;
  /** What is printed, short, for the "did not finish drawing" message, e.g. `worksheet`. */
  readonly noun: string;
  readonly outFile: string;
  readonly location: ReturnType<typeof dataLocation>;
  /** The address inside print.html, e.g. `#/worksheets/12`. */
  readonly hash: string;
  /** The page is ready to print when this selector matches. */
  readonly readySelector: string;
  /**
   * Throws a `Refusal` when the thing to print does not exist in the database; else gives words
   * that name it further in the closing line (" (chosen · alternative of plan 11)") or ''.
   */
  readonly findIt: (backEnd: BackEnd) => Promise<string>;
};

/** Refusal with a message and exit code 1. */
export class Refusal extends Error {}

/** A channel's answer, or a `Refusal` with its message. */
export async function check<T>(
  backEnd: BackEnd,
  channel: Parameters<BackEnd['dispatch']>[0],
  payload: unknown,
): Promise<T> {
  const answer = await backEnd.dispatch(channel, payload);
  if (!answer.ok) throw new Refusal(answer.error.message);
  return answer.value as T;
}

/**
 * Prints a page of print.html to FILE with headless Chromium, from an in-process loopback host on
 * a free port, written via a temporary file renamed into place (FILE is never half-written).
 * Exit 0 written, 1 refused or failed (nothing written under FILE).
 */
export async function runPrintJob(
  job: PrintJob,
  io: CommandIo,
  options: PrintCommandOptions = {},
): Promise<number> {
  const { command, outFile, location } = job;
  if (!fs.existsSync(location.databaseFile)) {
    // A database gone from beside backups with records: say which backup to restore. (Loaded
    // here only, like the back end below, so that the database driver does not delay Chromium.)
    const { checkBeforeStart } = await import('../back-end/start-up-guard.js');
    const finding = checkBeforeStart({ dataDirectory: location.dataDirectory });
    if (!finding.ok) io.stderr(`tidewing ${command}: ${finding.message}\n`);
    else databaseExists(io, command, location);
    return 1;
  }
  if (!fs.existsSync(path.dirname(outFile))) {
    io.stderr(
      `tidewing ${command}: the folder ${path.dirname(outFile)} does not exist. Nothing was written.\n`,
    );
    return 1;
  }

  const root = findProjectRoot();
  const executablePath = (options.env ?? process.env)['CHROMIUM_PATH'] ?? '/usr/bin/chromium';
  if (!fs.existsSync(executablePath)) {
    io.stderr(
      `tidewing ${command}: no Chromium found at ${executablePath}. Install it (for example \`apt-get install chromium\`) or set CHROMIUM_PATH to its executable. Nothing was written.\n`,
    );
    return 1;
  }
  const renderer = rendererDirectory(root);
  if (!fs.existsSync(path.join(renderer, 'print.html'))) {
    io.stderr(
      `tidewing ${command}: the app's pages are not built (no ${path.join(renderer, 'print.html')}); run \`npm run build\` first. Nothing was written.\n`,
    );
    return 1;
  }

  const started = performance.now();
  let backEnd: BackEnd | null = null;
  let host: LoopbackHost | null = null;
  let printing: Promise<Buffer> | null = null;
  const stopPrinting = new AbortController();
  // The page's requests wait here until the database is open.
  let openBackEnd: (backEnd: BackEnd) => void = () => undefined;
  let backEndFailed: () => void = () => undefined;
  const backEndOpen = new Promise<BackEnd>((resolve, reject) => {
    openBackEnd = resolve;
    backEndFailed = () => reject(new Error('the database could not be opened'));
  });
  backEndOpen.catch(() => undefined);
  const dispatch: Dispatcher = async (channel, payload) => {
    try {
      return await (await backEndOpen).dispatch(channel, payload);
    } catch {
      return { ok: false, error: { code: 'internal', message: 'The clinic database could not be opened.' } };
    }
  };
  const temporary = path.join(path.dirname(outFile), `.${path.basename(outFile)}.${process.pid}.partial`);
  try {
    // Chromium takes about half a second to start: start it on the worksheet's address first,
    // and open the database (which takes a few hundred milliseconds to load) while it starts.
    host = await startLoopbackHost({ port: 0, rendererDirectory: renderer, dispatch });
    // The page alone (print.html), on the host's one-time start address: the host trades the
    // code for a session and redirects to /print.html (the browser keeps the hash), whose HTML
    // hands the page the bridge token. The code on Chromium's command line is spent then.
    const page = new URL(host.url);
    page.pathname = '/print.html';
    page.hash = job.hash;
    io.stderr(`${command}: rendering ${job.what} with ${executablePath}\n`);
    printing = printPageToPdf({
      executablePath,
      url: page.href,
      readySelector: job.readySelector,
      timeoutMs: options.readyTimeoutMs ?? 20_000,
      signal: stopPrinting.signal,
    });
    printing.catch(() => undefined);

    io.stderr(`${command}: opening ${location.databaseFile}\n`);
    const [{ startBackEnd }, { DatabaseTooNewError }, { StartRefusedError }] = await Promise.all([
      import('../back-end/back-end.js'),
      import('../../db/connection.js'),
      import('../back-end/start-up-guard.js'),
    ]);
    try {
      backEnd = startBackEnd({
        dataDirectory: location.dataDirectory,
        appVersion: readAppVersion(root),
        host: 'browser',
      });
      await backEnd.ready;
    } catch (error) {
      throw new Refusal(
        error instanceof DatabaseTooNewError || error instanceof StartRefusedError
          ? error.message
          : `the database could not be opened: ${errorText(error)}`,
      );
    }
    // The clinic's calibration printed on a worksheet rests on every completed record: the rows
    // not yet compared with the model (records that ended before rows were kept, or whose rows
    // went stale) are compared and stored now, before the page asks for them.
    const stored = await backEnd.evidenceBackfill.run();
    if (stored > 0) io.stderr(`${command}: compared ${stored} completed records with the model\n`);
    openBackEnd(backEnd);
    const foundAs = await job.findIt(backEnd);
    const safety = await check<{ acknowledged: boolean; appVersion: string }>(backEnd, 'safety:status', {});
    if (!safety.acknowledged) {
      throw new Refusal(
        `the cautions of Tidewing ${safety.appVersion} have not been acknowledged in this database yet. Open the app (npm start) with --data ${location.dataDirectory}, read and acknowledge them, then run this command again.`,
      );
    }
    const settings = await check<{ settings: unknown }>(backEnd, 'settings:get', {});
    if (settings.settings === null)
      throw new Refusal(
        'the clinic is not set up yet (name, address, paper size). Open the app first and save Settings, then run this command again.',
      );

    let pdf: Buffer;
    try {
      pdf = await printing;
    } catch (error) {
      if (!(error instanceof PageNotReadyError)) throw error;
      const shown = error.alerts.join(' ');
      throw new Refusal(
        `the ${job.noun} did not finish drawing${shown === '' ? '' : `: ${shown}`}${error.pageErrors.length === 0 ? '' : ` (page errors: ${error.pageErrors.join('; ')})`}. Nothing was written.`,
      );
    }
    io.stderr(`${command}: writing PDF\n`);
    fs.writeFileSync(temporary, pdf);
    fs.renameSync(temporary, outFile);
    const sizeBytes = fs.statSync(outFile).size;
    io.stdout(
      `Wrote ${job.what}${foundAs} to ${outFile} (${Math.max(1, Math.round(sizeBytes / 1024))} KiB) in ${Math.round(performance.now() - started)} ms.\n`,
    );
    return 0;
  } catch (error) {
    fs.rmSync(temporary, { force: true });
    if (error instanceof Refusal) {
      io.stderr(`tidewing ${command}: ${error.message}\n`);
      return 1;
    }
    io.stderr(
      `tidewing ${command}: the PDF could not be made: ${errorText(error)}. Nothing was written under ${outFile}.\n`,
    );
    return 1;
  } finally {
    backEndFailed();
    stopPrinting.abort();
    await printing?.catch(() => undefined);
    await host?.close();
    backEnd?.close();
  }
}
