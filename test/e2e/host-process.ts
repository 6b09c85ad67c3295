import fs from 'node:fs';
import path from 'node:path';
import { chromium, type Browser } from 'playwright-core';
import { afterAll, beforeAll, beforeEach } from 'vitest';
import { chromiumArguments } from '../../main/cli/headless-pdf.js';
import { heronLaneSettings } from '../support/clinic-settings.js';
import { temporaryFolder } from '../support/temporary-folder.js';
import { chromiumOrReason, needChromium } from '../support/chromium.js';
import { root, startHostProcess, type RunningHost } from './support/host-spawn.js';

export { startHostProcess, type RunningHost };

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

/** A contract call through the bridge that must succeed; throws with the channel's error otherwise. */
export async function bridgeValue<T>(
  page: import('playwright-core').Page,
  channel: string,
  body: unknown,
): Promise<T> {
  const answer = await callBridge<T>(page, channel, body);
  if (!answer.ok) throw new Error(`${channel} failed: ${JSON.stringify(answer.error)}`);
  return answer.value as T;
}

/**
 * A patient and a mask procedure record for it that began `minutesAgo` whole minutes ago on the
 * page's clock, made through the bridge as the screens make them; for tests that then log rows.
 */
export async function startRecordFor(
  page: import('playwright-core').Page,
  patient: { readonly name: string; readonly speciesKey: string; readonly sex: string },
  options: { readonly minutesAgo: number; readonly procedureName: string },
): Promise<{ readonly patientId: number; readonly recordId: number; readonly startMs: number }> {
  const created = await bridgeValue<{ id: number }>(page, 'patients:create', {
    values: patient,
    meta: { enteredBy: 'RW' },
  });
  const startMs = await page.evaluate((minutesAgo) => {
    const start = new Date(Date.now() - minutesAgo * 60_000);
    start.setSeconds(0, 0);
    return start.getTime();
  }, options.minutesAgo);
  const record = await bridgeValue<{ id: number }>(page, 'procedures:create', {
    patientId: created.id,
    values: {
      startedAt: new Date(startMs).toISOString(),
      procedureName: options.procedureName,
      airway: 'mask',
      circuit: 'nonRebreathing',
      staffInitials: 'RW',
    },
    meta: { enteredBy: 'RW' },
  });
  return { patientId: created.id, recordId: record.id, startMs };
}
