import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Readable, Writable } from 'node:stream';

/**
 * Prints one page to PDF with headless Chromium, spoken to directly over the DevTools protocol on
 * a pipe (`--remote-debugging-pipe`: commands on the child's fd 3, answers on fd 4, each message
 * JSON ended by a NUL byte). A browser-automation library would do the same but costs the
 * command line about 0.7 s just to load; this is the small part of it the worksheet needs.
 */

/** Flags for headless Chromium, the same as the project's end-to-end tests use. */
export const chromiumArguments = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--no-default-browser-check',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--disable-extensions',
  '--disable-default-apps',
  '--disable-breakpad',
  '--disable-dev-shm-usage',
  '--password-store=basic',
  '--use-mock-keychain',
  '--mute-audio',
  '--hide-scrollbars',
] as const;

export type PdfJob = {
  readonly executablePath: string;
  /** The page to print; loaded in the browser's first tab. */
  readonly url: string;
  /** CSS selector that appears when the page has finished drawing. */
  readonly readySelector: string;
  readonly timeoutMs: number;
  /** Viewport of the page while it draws (print layout comes from the page's own @page rules). */
  readonly viewport?: { readonly width: number; readonly height: number };
  /** Folder for Chromium's scratch profile, removed afterwards; the system's temporary folder by default. */
  readonly scratchDirectory?: string;
  /** Stops the job (and Chromium) early, for example when the data turns out to be unusable. */
  readonly signal?: AbortSignal;
};

/** The page did not finish drawing: what it showed in its alerts and the script errors it threw. */
export class PageNotReadyError extends Error {
  constructor(
    readonly alerts: readonly string[],
    readonly pageErrors: readonly string[],
  ) {
    super('the page did not finish drawing');
  }
}

type Message = {
  id?: number;
  method?: string;
  params?: Record<string, unknown>;
  result?: Record<string, unknown>;
  error?: { message: string };
  sessionId?: string;
};
type Pending = {
  resolve: (value: Record<string, unknown>) => void;
  reject: (error: Error) => void;
  method: string;
};

/** One DevTools-protocol connection over the pipe pair of a Chromium child. */
class PipeConnection {
  private nextId = 1;
  private readonly pending = new Map<number, Pending>();
  private readonly listeners = new Set<(message: Message) => void>();
  private partial: Buffer[] = [];
  private closedBecause: Error | null = null;

  constructor(
    private readonly output: Writable,
    input: Readable,
  ) {
    input.on('data', (chunk: Buffer) => this.receive(chunk));
    input.on('close', () => this.close(new Error('Chromium closed its DevTools pipe')));
    input.on('error', (error: Error) => this.close(error));
    output.on('error', (error: Error) => this.close(error));
  }

  private receive(chunk: Buffer): void {
    let start = 0;
    for (let end = chunk.indexOf(0); end !== -1; end = chunk.indexOf(0, start)) {
      this.partial.push(chunk.subarray(start, end));
      const text = Buffer.concat(this.partial).toString('utf8');
      this.partial = [];
      start = end + 1;
      this.dispatch(JSON.parse(text) as Message);
    }
    if (start < chunk.length) this.partial.push(chunk.subarray(start));
  }

  private dispatch(message: Message): void {
    if (message.id !== undefined) {
      const waiting = this.pending.get(message.id);
      if (waiting === undefined) return;
      this.pending.delete(message.id);
      if (message.error !== undefined)
        waiting.reject(new Error(`${waiting.method}: ${message.error.message}`));
      else waiting.resolve(message.result ?? {});
      return;
    }
    for (const listener of this.listeners) listener(message);
  }

  close(reason: Error): void {
    if (this.closedBecause !== null) return;
    this.closedBecause = reason;
    for (const waiting of this.pending.values()) waiting.reject(reason);
    this.pending.clear();
  }

  send(
    method: string,
    params: Record<string, unknown> = {},
    sessionId?: string,
  ): Promise<Record<string, unknown>> {
    if (this.closedBecause !== null) return Promise.reject(this.closedBecause);
    const id = this.nextId;
    this.nextId += 1;
    return new Promise((resolve, reject) => {
      this.pending.set(id, { resolve, reject, method });
      this.output.write(
        `${JSON.stringify(sessionId === undefined ? { id, method, params } : { id, method, params, sessionId })}\0`,
      );
    });
  }

  on(listener: (message: Message) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }
}

/** Time allowed for printing once the page is ready, on top of the job's own timeout. */
const printGraceMs = 30_000;

function delay(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms));
}

/**
 * Stops Chromium and its helper processes at once. The profile is a scratch folder deleted
 * afterwards, so there is nothing for a graceful shutdown to save, and a graceful one costs
 * about 0.15 s. On POSIX the browser leads its own process group (spawned detached), so the
 * whole group goes; elsewhere the browser process, whose helpers follow it.
 */
async function stopBrowser(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return;
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  killGroup(child);
  await exited;
  await groupGone(child);
}

/**
 * Waits (at most `limitMs`) until no process of the browser's group is left: the browser's exit
 * can be seen before its helpers (the zygote) have gone on a busy machine, and the scratch
 * profile is removed only once nothing uses it.
 */
async function groupGone(child: ChildProcess, limitMs = 5_000): Promise<void> {
  if (process.platform === 'win32' || child.pid === undefined) return;
  const until = Date.now() + limitMs;
  for (;;) {
    try {
      process.kill(-child.pid, 0);
    } catch {
      return;
    }
    if (Date.now() >= until) return;
    await new Promise((resolve) => setTimeout(resolve, 20));
  }
}

function killGroup(child: ChildProcess): void {
  try {
    if (process.platform !== 'win32' && child.pid !== undefined) process.kill(-child.pid, 'SIGKILL');
    else child.kill('SIGKILL');
  } catch {
    child.kill('SIGKILL');
  }
}

/** Signals that end the command line while Chromium runs. */
const interruptions: readonly NodeJS.Signals[] = ['SIGINT', 'SIGTERM', 'SIGHUP'];

type Session = { readonly connection: PipeConnection; readonly sessionId: string };

/** Attaches to the browser's first tab, waiting for it to appear. */
async function firstTab(connection: PipeConnection, deadline: number): Promise<string> {
  for (;;) {
    const { targetInfos } = (await connection.send('Target.getTargets')) as {
      targetInfos: { targetId: string; type: string }[];
    };
    const page = targetInfos.find((target) => target.type === 'page');
    if (page !== undefined) {
      const attached = (await connection.send('Target.attachToTarget', {
        targetId: page.targetId,
        flatten: true,
      })) as { sessionId: string };
      return attached.sessionId;
    }
    if (Date.now() > deadline) throw new Error('Chromium opened no page');
    await delay(10);
  }
}

/** Resolves true once `selector` matches, false at the deadline; retries across navigations. */
async function waitForSelector(
  { connection, sessionId }: Session,
  selector: string,
  deadline: number,
): Promise<boolean> {
  const expression = (waitMs: number) => `new Promise((resolve) => {
    const look = () => document.querySelector(${JSON.stringify(selector)}) !== null;
    if (look()) { resolve(true); return; }
    const observer = new MutationObserver(() => { if (look()) { observer.disconnect(); resolve(true); } });
    observer.observe(document, { subtree: true, childList: true, attributes: true });
    setTimeout(() => { observer.disconnect(); resolve(look()); }, ${waitMs});
  })`;
  while (Date.now() < deadline) {
    const remaining = Math.max(1, deadline - Date.now());
    try {
      const answer = (await connection.send(
        'Runtime.evaluate',
        { expression: expression(remaining), awaitPromise: true, returnByValue: true },
        sessionId,
      )) as { result?: { value?: unknown } };
      if (answer.result?.value === true) return true;
    } catch (error) {
      // The first tab may still be changing documents (blank page to the worksheet): ask again.
      if (
        !/context|navigat|destroyed|Cannot find/i.test(error instanceof Error ? error.message : String(error))
      )
        throw error;
      await delay(10);
    }
  }
  return false;
}

async function alertTexts({ connection, sessionId }: Session): Promise<string[]> {
  try {
    const answer = (await connection.send(
      'Runtime.evaluate',
      {
        expression: `[...document.querySelectorAll('[role="alert"]')].map((element) => element.textContent ?? '').filter((text) => text.trim() !== '')`,
        returnByValue: true,
      },
      sessionId,
    )) as { result?: { value?: unknown } };
    return Array.isArray(answer.result?.value) ? (answer.result.value as string[]) : [];
  } catch {
    return [];
  }
}

/**
 * Starts Chromium on `job.url`, waits for `job.readySelector`, prints the page with its own CSS
 * page size and backgrounds, and returns the PDF bytes. Chromium and its scratch profile are
 * always removed, whatever happens.
 */
export async function printPageToPdf(job: PdfJob): Promise<Buffer> {
  const profile = fs.mkdtempSync(path.join(job.scratchDirectory ?? os.tmpdir(), 'tidewing-chromium-'));
  const viewport = job.viewport ?? { width: 1280, height: 900 };
  const child = spawn(
    job.executablePath,
    [
      ...chromiumArguments,
      '--headless',
      '--remote-debugging-pipe',
      `--user-data-dir=${profile}`,
      `--window-size=${viewport.width},${viewport.height}`,
      job.url,
    ],
    { stdio: ['ignore', 'ignore', 'pipe', 'pipe', 'pipe'], detached: process.platform !== 'win32' },
  );
  let stderrTail = '';
  child.stderr?.on('data', (chunk: Buffer) => {
    stderrTail = (stderrTail + chunk.toString('utf8')).slice(-2000);
  });
  const [, , , toBrowser, fromBrowser] = child.stdio as [unknown, unknown, unknown, Writable, Readable];
  const connection = new PipeConnection(toBrowser, fromBrowser);
  const failedToStart = new Promise<never>((_, reject) => {
    child.once('error', (error) => reject(new Error(`Chromium could not be started: ${error.message}`)));
    child.once('exit', (code, signal) =>
      reject(
        new Error(
          `Chromium stopped (${signal ?? `exit code ${String(code)}`})${stderrTail.trim() === '' ? '' : `: ${stderrTail.trim().split('\n').slice(-3).join(' ')}`}`,
        ),
      ),
    );
  });
  failedToStart.catch(() => undefined);
  const aborted = new Promise<never>((_, reject) => {
    const signal = job.signal;
    if (signal === undefined) return;
    const stop = () =>
      reject(signal.reason instanceof Error ? signal.reason : new Error('the PDF was no longer wanted'));
    if (signal.aborted) stop();
    else signal.addEventListener('abort', stop, { once: true });
  });
  aborted.catch(() => undefined);
  const pageErrors: string[] = [];
  let overdueTimer: NodeJS.Timeout | undefined;
  // Interrupted (Ctrl+C, a closed terminal, a kill): Chromium leads its own process group, so
  // it does not get the signal; stop it and remove its profile, then let the signal take effect.
  let interrupted = false;
  const onSignal = (signal: NodeJS.Signals): void => {
    interrupted = true;
    for (const name of interruptions) process.removeListener(name, onSignal);
    void stopBrowser(child)
      .then(() => fs.rmSync(profile, { recursive: true, force: true, maxRetries: 3 }))
      .catch(() => undefined)
      .finally(() => process.kill(process.pid, signal));
  };
  for (const name of interruptions) process.on(name, onSignal);
  try {
    const work = async (): Promise<Buffer> => {
      const deadline = Date.now() + job.timeoutMs;
      const sessionId = await firstTab(connection, deadline);
      const session = { connection, sessionId };
      connection.on((message) => {
        if (message.sessionId !== sessionId || message.method !== 'Runtime.exceptionThrown') return;
        const details = (message.params?.['exceptionDetails'] ?? {}) as {
          text?: string;
          exception?: { description?: string };
        };
        pageErrors.push(
          (details.exception?.description ?? details.text ?? 'script error').split('\n')[0] ?? 'script error',
        );
      });
      await connection.send('Runtime.enable', {}, sessionId);
      if (!(await waitForSelector(session, job.readySelector, deadline)))
        throw new PageNotReadyError(await alertTexts(session), pageErrors);
      // Untagged, as the worksheet was printed before: tagging (this Chromium's default here) adds
      // about 40 ms and 70 KiB to the worksheet.
      const printed = (await connection.send(
        'Page.printToPDF',
        { preferCSSPageSize: true, printBackground: true, generateTaggedPDF: false },
        sessionId,
      )) as { data: string };
      return Buffer.from(printed.data, 'base64');
    };
    const working = work();
    working.catch(() => undefined);
    // The ready wait has its own deadline; this one also covers a print that never answers.
    const overdue = new Promise<never>((_, reject) => {
      overdueTimer = setTimeout(
        () =>
          reject(
            new Error(
              `Chromium did not finish within ${Math.round((job.timeoutMs + printGraceMs) / 1000)} s`,
            ),
          ),
        job.timeoutMs + printGraceMs,
      );
    });
    return await Promise.race([working, failedToStart, aborted, overdue]);
  } catch (error) {
    // Interrupted: the job fails because its browser was stopped, but the process is about to end
    // by the signal once the profile is removed; settling here would let the caller end it first,
    // with another exit.
    if (interrupted) return await new Promise<never>(() => undefined);
    // A broken pipe is usually Chromium exiting: name the exit, which says more, if it comes soon.
    if (!(error instanceof PageNotReadyError) && job.signal?.aborted !== true) {
      const exit = await Promise.race([
        failedToStart.catch((reason: unknown) => reason),
        delay(250).then(() => null),
      ]);
      if (exit instanceof Error) throw exit;
    }
    throw error;
  } finally {
    for (const name of interruptions) process.removeListener(name, onSignal);
    clearTimeout(overdueTimer);
    connection.close(new Error('the PDF job has ended'));
    await stopBrowser(child);
    fs.rmSync(profile, { recursive: true, force: true, maxRetries: 3 });
  }
}
