import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium } from 'playwright-core';
import { startBackEnd } from '../../main/back-end/back-end.js';
import { chromiumArguments } from '../../main/cli/headless-pdf.js';
import { startLoopbackHost } from '../../main/host/loopback-host.js';
import { findProjectRoot, readAppVersion, rendererDirectory } from '../../main/back-end/project-paths.js';
import { chromiumOrReason } from '../support/chromium.js';
import { median, quantile, type Figure } from './figures.js';
import { benchClinicSettings } from '../support/clinic-settings.js';

const keystrokes = 40;

// Runs in the page (kept as text: this file is compiled without the DOM library). Arms a timer
// that starts at the next keydown and stops at the next draw of the plan chart.
const armRedrawTimer = `
  window.benchRedraw = new Promise((resolve) => {
    const chart = document.querySelector('.plan-results .chart [data-drawn]');
    if (chart === null) return resolve(Number.NaN);
    let started = 0;
    let before = '';
    const observer = new MutationObserver(() => {
      if (started > 0 && chart.dataset.drawn !== before) {
        observer.disconnect();
        resolve(performance.now() - started);
      }
    });
    observer.observe(chart, { attributes: true, attributeFilter: ['data-drawn'] });
    window.addEventListener('keydown', () => { started = performance.now(); before = chart.dataset.drawn || ''; }, { once: true, capture: true });
    window.setTimeout(() => resolve(Number.NaN), 5000);
  });
  undefined;
`;

/**
 * Keystroke to redrawn chart on the planning screen, in headless Chromium against the loopback
 * host: the time from a keydown in the induction dial box to the next draw of the predicted
 * curves (the chart counts its draws in `data-drawn`).
 */
export async function benchPlanningScreen(): Promise<Figure[]> {
  const root = findProjectRoot();
  // Under CI a missing Chromium fails the run; elsewhere the figure says what is missing.
  const found = chromiumOrReason();
  if ('missing' in found)
    return [{ name: 'keystroke to redrawn chart', value: Number.NaN, unit: 'ms', note: found.missing }];
  const { executablePath } = found;
  const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'tidewing-bench-planning-'));
  const backEnd = startBackEnd({ dataDirectory: folder, appVersion: readAppVersion(root), host: 'browser' });
  const host = await startLoopbackHost({
    port: 0,
    rendererDirectory: rendererDirectory(root),
    dispatch: backEnd.dispatch,
  });
  const browser = await chromium.launch({ executablePath, headless: true, args: [...chromiumArguments] });
  try {
    await backEnd.dispatch('safety:acknowledge', { acknowledgedBy: 'BE', accepted: true });
    await backEnd.dispatch('settings:save', benchClinicSettings);
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    await page.goto(host.url);
    await page.getByRole('heading', { name: 'Patients' }).waitFor();
    await page.goto(`${host.origin}/#/plans/new`);
    await page.getByLabel(/^Body mass/).fill('32');
    await page.getByLabel('Species').selectOption('budgerigar');
    await page
      .getByText(/5th-95th percentile: \d/)
      .first()
      .waitFor({ timeout: 60_000 });
    const dial = page.getByLabel(/^Induction dial/);
    const timings: number[] = [];
    for (let index = 0; index < keystrokes; index += 1) {
      await dial.fill('1');
      await page.waitForTimeout(250);
      await dial.press('End');
      await page.evaluate(armRedrawTimer);
      await page.keyboard.press('2');
      const elapsed = await page.evaluate<number>('window.benchRedraw');
      if (Number.isFinite(elapsed)) timings.push(elapsed);
    }
    return [
      {
        name: `keystroke to redrawn chart, median of ${timings.length}`,
        value: median(timings),
        unit: 'ms',
        note: 'quick breath-resolved run during the render; the uncertainty run in a Web Worker after typing pauses',
      },
      { name: 'keystroke to redrawn chart, 90th percentile', value: quantile(timings, 0.9), unit: 'ms' },
      { name: 'keystrokes without a redraw within 5 s', value: keystrokes - timings.length, unit: '' },
    ];
  } finally {
    await browser.close();
    await host.close();
    backEnd.close();
    fs.rmSync(folder, { recursive: true, force: true });
  }
}
