import fs from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { needBuilt } from '../support/chromium.js';
import { checkScreen } from './accessibility.js';
import {
  callBridge,
  completeFirstRun,
  ensureScreenshotFolder,
  sharedBrowser,
  startHostProcess,
} from './host-process.js';

const session = sharedBrowser('tidewing-e2e-evidence-');
const shots = ensureScreenshotFolder();

async function shoot(page: Page, name: string) {
  await page.screenshot({ path: path.join(shots, `1x-evidence-${name}.png`), fullPage: true });
  await checkScreen(page, `1x-evidence-${name}`);
}

describe('the clinic’s own evidence with the demo clinic (--demo)', () => {
  it('exports one CSV row per completed record, shows a cockatiel plan calibrated on the clinic’s records, and a running record’s forecast follows the dial', async (context) => {
    needBuilt(context, path.join(process.cwd(), 'build', 'renderer', 'index.html'));
    const host = await startHostProcess(session.dataFolder, ['--demo'], 30_000);
    const page = await session.browser.newPage({
      viewport: { width: 1366, height: 800 },
      acceptDownloads: true,
    });
    const pageErrors: string[] = [];
    page.on('pageerror', (error) => pageErrors.push(error.message));
    try {
      await completeFirstRun(page, host.url);

      // 1. Observed vs predicted: one CSV row per completed record.
      await page.evaluate(() => (window.location.hash = '#/evidence'));
      await page.getByRole('heading', { name: 'Observed vs predicted', level: 1 }).waitFor();
      await page.getByText(/^60 completed records; 60 compared/).waitFor();
      await shoot(page, '01-clinic-view');
      const [download] = await Promise.all([
        page.waitForEvent('download'),
        page.getByRole('button', { name: 'Export CSV' }).click(),
      ]);
      const csv = fs.readFileSync((await download.path()) ?? '', 'utf8');
      const lines = csv.trimEnd().split('\r\n');
      expect(lines).toHaveLength(1 + 60);
      expect(lines[0]).toMatch(/^record,patient,species/);

      // 2. A plan for a demo cockatiel: population and calibrated, with the records it rests on.
      const patients = await callBridge<{ patients: { id: number; name: string; speciesKey: string }[] }>(
        page,
        'patients:search',
        { query: 'Sunny' },
      );
      const sunny = patients.value?.patients.find((patient) => patient.speciesKey === 'cockatiel');
      expect(sunny).toBeDefined();
      await page.evaluate((id) => (window.location.hash = `#/plans/new/${id}`), sunny?.id ?? 0);
      await page.getByRole('heading', { name: 'Population model and your clinic’s calibration' }).waitFor();
      await page
        .getByTestId('calibrated-standing')
        .filter({ hasText: /min \(/ })
        .waitFor();
      const restsOn = await page.getByTestId('rests-on-standing').innerText();
      expect(restsOn).toMatch(
        /calibrated on 1[0-9] of your cockatiel records; your cockatiels stand \d\.\dx later/,
      );
      expect(await page.getByTestId('population-standing').innerText()).toMatch(/min/);
      await shoot(page, '02-plan-calibrated');

      // 3. A record in progress: "if the vaporiser goes off now" changes when a row with another dial is saved.
      const startedAt = new Date(Date.now() - 30 * 60_000);
      startedAt.setSeconds(0, 0);
      const record = await callBridge<{ id: number }>(page, 'procedures:create', {
        patientId: sunny?.id,
        values: {
          startedAt: startedAt.toISOString(),
          procedureName: 'Beak and nail trim',
          airway: 'mask',
          circuit: 'nonRebreathing',
          staffInitials: 'RW',
        },
        meta: { enteredBy: 'RW' },
      });
      expect(record.ok, JSON.stringify(record.error)).toBe(true);
      const recordId = record.value?.id ?? 0;
      const row = (minutes: number, vaporPct: number) =>
        callBridge(page, 'entries:add', {
          recordId,
          values: {
            at: new Date(startedAt.getTime() + minutes * 60_000).toISOString(),
            kind: 'vitals',
            vaporPct,
            oxygenLpm: 0.8,
            heartRatePerMin: 380,
          },
          meta: { enteredBy: 'RW' },
        });
      expect((await row(1, 4)).ok).toBe(true);
      expect((await row(6, 2)).ok).toBe(true);
      await page.evaluate((id) => (window.location.hash = `#/records/${id}`), recordId);
      await page.getByRole('heading', { name: 'Forecast that follows the log' }).waitFor();
      const standing = page.getByTestId('forecast-standing');
      await standing.waitFor();
      const before = await standing.innerText();
      const minutesBefore = Number(await standing.getAttribute('data-minutes-after-off'));
      expect(minutesBefore).toBeGreaterThan(0);
      // The band from the uncertainty samples (run in the workers) joins the quick answer.
      await page.waitForFunction(
        () =>
          document
            .querySelector('[data-testid="forecast-depth"]')
            ?.textContent?.includes('90 % of birds like this') === true,
        undefined,
        { timeout: 60_000 },
      );
      await shoot(page, '03-forecast');

      // A row at a higher dial, saved through the screen's entry row.
      const entryForm = page.getByRole('form', { name: 'New row of readings' });
      await entryForm.getByLabel('Vaporiser').fill('4');
      await entryForm.getByLabel('Vaporiser').press('Enter');
      await page.waitForFunction(
        (text) => document.querySelector('[data-testid="forecast-standing"]')?.textContent !== text,
        before,
        { timeout: 15_000 },
      );
      expect(await standing.innerText()).not.toBe(before);
      // 4 % from 2 %: the bird has taken up more agent, so it is predicted to stand later after off.
      await page.waitForFunction(
        (minutes) =>
          Number(
            document
              .querySelector('[data-testid="forecast-standing"]')
              ?.getAttribute('data-minutes-after-off'),
          ) > minutes,
        minutesBefore,
        { timeout: 15_000 },
      );
      await shoot(page, '04-forecast-after-row');
      expect(pageErrors).toEqual([]);
    } finally {
      await page.close();
      await host.stop();
    }
  }, 360_000);
});
