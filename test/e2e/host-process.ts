import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { chromium, type Browser } from 'playwright-core';
import { afterAll, beforeAll, beforeEach } from 'vitest';
import { chromiumArguments } from '../../main/cli/headless-pdf.js';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import { heronLaneSettings } from '../support/clinic-settings.js';
import { temporaryFolder } from '../support/temporary-folder.js';
import { chromiumOrReason, needChromium } from '../support/chromium.js';

export type RunningHost = {
  /** The first one-time start address the host printed. */
  url: string;
  /**
   * The next one-time address the host printed (it prints one after each use of the previous
   * one), waiting for it to appear; for a second page on the same host.
   */
  nextUrl: () => Promise<string>;
  origin: string;
  port: number;
  process: ChildProcess;
  output: () => string;
  stop: () => Promise<number | null>;
};

const root = findProjectRoot();

/** Starts `node build/main/host/start.js` as `npm start` does and waits for the URL line. */
export function startHostProcess(
  dataDirectory: string,
  extraArguments: string[] = [],
  timeoutMs = 10_000,
): Promise<RunningHost> {
  const child = spawn(
    process.execPath,
    [
      path.join(root, 'build', 'main', 'host', 'start.js'),
      '--no-open',
      '--port',
      '0',
      '--data',
      dataDirectory,
      ...extraArguments,
    ],
    {
      env: { ...process.env, CI: 'true', DISPLAY: '' },
      stdio: ['ignore', 'pipe', 'pipe'],
    },
  );
  let output = '';
  child.stdout.on('data', (chunk: Buffer) => (output += chunk.toString()));
  child.stderr.on('data', (chunk: Buffer) => (output += chunk.toString()));
  const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      reject(new Error(`No URL within ${timeoutMs} ms. Output so far:\n${output}`));
    }, timeoutMs);
    const check = () => {
      const match = /Open: (http:\/\/127\.0\.0\.1:(\d+)\/\?start=[\w-]+)/.exec(output);
      if (match?.[1] === undefined || match[2] === undefined) return;
      clearTimeout(timer);
      const url = match[1];
      let handedOut = 1;
      resolve({
        url,
        nextUrl: () => nextStartAddress(child, () => output, handedOut++, timeoutMs),
        origin: new URL(url).origin,
        port: Number(match[2]),
        process: child,
        output: () => output,
        stop: async () => {
          child.kill('SIGTERM');
          return exited;
        },
      });
    };
    child.stdout.on('data', check);
    void exited.then((code) => {
      clearTimeout(timer);
      reject(new Error(`The host exited with code ${String(code)} before printing a URL:\n${output}`));
    });
  });
}

/** The start address number `index` (0 the first) in the host's output, once it is printed. */
function nextStartAddress(
  child: ChildProcess,
  output: () => string,
  index: number,
  timeoutMs: number,
): Promise<string> {
  return new Promise((resolve, reject) => {
    const find = () => {
      const all = [...output().matchAll(/(http:\/\/127\.0\.0\.1:\d+\/\?start=[\w-]+)/g)];
      const address = all[index]?.[1];
      if (address === undefined) return false;
      clearTimeout(timer);
      child.stdout?.off('data', find);
      resolve(address);
      return true;
    };
    const timer = setTimeout(() => {
      child.stdout?.off('data', find);
      reject(new Error(`The host printed no start address number ${index + 1}. Output:\n${output()}`));
    }, timeoutMs);
    if (!find()) child.stdout?.on('data', find);
  });
}

/**
 * Headless Debian Chromium, as the project's tests and benchmarks use it. Fails with the message
 * of test/support/chromium.ts (how to install it) when it is missing.
 */
export function launchChromium(): Promise<Browser> {
  const found = chromiumOrReason();
  if ('missing' in found) return Promise.reject(new Error(found.missing));
  return chromium.launch({
    executablePath: found.executablePath,
    headless: true,
    args: [...chromiumArguments],
  });
}

export const screenshotFolder = path.join(root, 'test-artifacts', 'screenshots');

export function ensureScreenshotFolder(): string {
  fs.mkdirSync(screenshotFolder, { recursive: true });
  return screenshotFolder;
}

/**
 * Acknowledges the cautions and saves clinic settings through the bridge, as a returning clinic
 * would have done, so a test can start at the screen it is about.
 */
export async function completeFirstRun(
  page: import('playwright-core').Page,
  url: string,
  initials = 'RW',
): Promise<void> {
  await page.goto(url);
  for (const [channel, body] of [
    ['safety:acknowledge', { acknowledgedBy: initials, accepted: true }],
    ['settings:save', heronLaneSettings],
    ['workstation:save', { initials }],
  ] as const) {
    const answer = await callBridge(page, channel, body);
    if (!answer.ok) throw new Error(`${channel} failed: ${JSON.stringify(answer)}`);
  }
  await page.reload();
}

/** A contract call through the loopback bridge, as the screens make it, answered as a Result. */
export async function callBridge<T = unknown>(
  page: import('playwright-core').Page,
  channel: string,
  body: unknown,
): Promise<{ ok: boolean; value?: T; error?: unknown }> {
  return page.evaluate(
    async ({ channel: name, body: payload }) => {
      const token = window.sessionStorage.getItem('tidewing.token') ?? '';
      const response = await fetch(`/api/${name}`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', 'x-tidewing-token': token },
        body: JSON.stringify(payload),
      });
      return (await response.json()) as { ok: boolean; value?: T; error?: unknown };
    },
    { channel, body },
  );
}

/**
 * One headless Chromium and a fresh data folder for a test file, started before its tests and
 * removed after them; for files that start (and restart) their own host. Without Chromium the
 * file's tests fail under CI and are skipped elsewhere, saying how to install it.
 */
export function sharedBrowser(prefix: string): { readonly browser: Browser; readonly dataFolder: string } {
  const data = temporaryFolder(prefix);
  let browser: Browser | null = null;
  beforeAll(async () => {
    // Under CI a missing Chromium throws here and fails every test of the file with the message.
    if ('missing' in chromiumOrReason()) return;
    browser = await launchChromium();
  });
  beforeEach((context) => void needChromium(context));
  afterAll(async () => {
    await browser?.close();
    data.remove();
  });
  return {
    get browser() {
      if (browser === null) throw new Error('Chromium is not started yet');
      return browser;
    },
    dataFolder: data.folder,
  };
}

/**
 * One headless Chromium and one loopback host on a fresh data folder for a test file, started
 * before its tests and stopped after them.
 */
export function sharedHost(prefix: string): {
  readonly browser: Browser;
  readonly host: RunningHost;
  readonly dataFolder: string;
} {
  const session = sharedBrowser(prefix);
  let host: RunningHost | null = null;
  beforeAll(async () => {
    host = await startHostProcess(session.dataFolder);
  });
  afterAll(async () => {
    await host?.stop();
  });
  return {
    get browser() {
      return session.browser;
    },
    get host() {
      if (host === null) throw new Error('The host is not started yet');
      return host;
    },
    dataFolder: session.dataFolder,
  };
}
