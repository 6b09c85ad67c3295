import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium, type Page } from 'playwright-core';
import { startBackEnd } from '../../main/back-end/back-end.js';
import { chromiumArguments } from '../../main/cli/headless-pdf.js';
import { startLoopbackHost } from '../../main/host/loopback-host.js';
import { findProjectRoot, readAppVersion, rendererDirectory } from '../../main/back-end/project-paths.js';
import { chromiumOrReason } from '../support/chromium.js';
import { median, type Figure } from './figures.js';
import { benchClinicSettings } from '../support/clinic-settings.js';

const runs = 5;
/** An older clinic PC: the CPU slowed fourfold (Chrome DevTools' own throttling). */
const cpuSlowdown = 4;

// Runs in the page before its scripts (kept as text: this file is compiled without the DOM
// library): notes the time since navigation when a screen's heading first appears.
const watchHeadings = `
  window.benchHeadings = {};
  new MutationObserver(() => {
    for (const heading of document.querySelectorAll('h1')) {
      const text = heading.textContent || '';
      if (!(text in window.benchHeadings)) window.benchHeadings[text] = performance.now();
    }
  }).observe(document, { childList: true, subtree: true, characterData: true });
`;

type Load = { readonly ms: number; readonly bytes: number };

/** Loads `url` in `page` with the CPU slowed; time from navigation to the heading, bytes over the wire. */
async function timedLoad(page: Page, url: string, heading: string): Promise<Load> {
  const session = await page.context().newCDPSession(page);
  await session.send('Network.enable');
  await session.send('Emulation.setCPUThrottlingRate', { rate: cpuSlowdown });
  let bytes = 0;
  session.on('Network.loadingFinished', (event: { encodedDataLength: number }) => {
    bytes += event.encodedDataLength;
  });
  await page.goto(url);
  await page.getByRole('heading', { name: heading, level: 1 }).waitFor({ timeout: 60_000 });
  const ms = await page.evaluate<number>(`window.benchHeadings[${JSON.stringify(heading)}] ?? Number.NaN`);
  await session.send('Emulation.setCPUThrottlingRate', { rate: 1 });
  await session.detach();
  return { ms, bytes };
}

/**
 * First-screen time in headless Chromium with the CPU slowed 4x, against the loopback host:
 * from navigation to the Patients heading, in a new browser profile (nothing cached: the first
 * start) and on a second start in the same profile (what the cache keeps); and the planning
 * screen opened directly, which loads its own part of the app. Median of 5 each.
 */
export async function benchFirstScreen(): Promise<Figure[]> {
  const root = findProjectRoot();
  const found = chromiumOrReason();
  if ('missing' in found)
    return [{ name: 'first screen', value: Number.NaN, unit: 'ms', note: found.missing }];
  const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'tidewing-bench-first-screen-'));
  const backEnd = startBackEnd({ dataDirectory: folder, appVersion: readAppVersion(root), host: 'browser' });
  const host = await startLoopbackHost({
    port: 0,
    rendererDirectory: rendererDirectory(root),
    dispatch: backEnd.dispatch,
  });
  const browser = await chromium.launch({
    executablePath: found.executablePath,
    headless: true,
    args: [...chromiumArguments],
  });
  let nextAddress = host.url;
  const startAddress = (hash = ''): string => {
    const address = `${nextAddress}${hash}`;
    nextAddress = host.newStartUrl();
    return address;
  };
  try {
    await backEnd.dispatch('safety:acknowledge', { acknowledgedBy: 'BE', accepted: true });
    await backEnd.dispatch('settings:save', benchClinicSettings);
    const cold: Load[] = [];
    const warm: Load[] = [];
    const planning: Load[] = [];
    for (let run = 0; run < runs; run += 1) {
      // A new context is a new profile: an empty cache.
      const context = await browser.newContext({ viewport: { width: 1366, height: 800 } });
      await context.addInitScript(watchHeadings);
      const page = await context.newPage();
      cold.push(await timedLoad(page, startAddress(), 'Patients'));
      await page.close();
      // The next start in the same profile: a new page, the cache as the first start left it.
      const again = await context.newPage();
      warm.push(await timedLoad(again, startAddress(), 'Patients'));
      await context.close();
      const planContext = await browser.newContext({ viewport: { width: 1366, height: 800 } });
      await planContext.addInitScript(watchHeadings);
      const planPage = await planContext.newPage();
      planning.push(await timedLoad(planPage, startAddress('#/plans/new'), 'New anaesthetic plan'));
      await planContext.close();
    }
    const note = `median of ${String(runs)}, CPU slowed ${String(cpuSlowdown)}x`;
    const kib = (loads: Load[]) => median(loads.map((load) => load.bytes)) / 1024;
    return [
      {
        name: 'first screen (Patients), first start',
        value: median(cold.map((l) => l.ms)),
        unit: 'ms',
        note,
      },
      { name: 'first screen, bytes over the wire, first start', value: kib(cold), unit: 'KiB' },
      { name: 'first screen (Patients), next start', value: median(warm.map((l) => l.ms)), unit: 'ms', note },
      { name: 'first screen, bytes over the wire, next start', value: kib(warm), unit: 'KiB' },
      {
        name: 'planning screen opened directly, first start',
        value: median(planning.map((l) => l.ms)),
        unit: 'ms',
        note,
      },
      { name: 'planning screen, bytes over the wire, first start', value: kib(planning), unit: 'KiB' },
    ];
  } finally {
    await browser.close();
    await host.close();
    backEnd.close();
    fs.rmSync(folder, { recursive: true, force: true });
  }
}
