/**
 * A new clinic chooses the invented demo clinic on its first start (no `--demo`), from the
 * keyboard, and sees what it is for: the clinic's records beside the model's predictions, and a
 * demo cockatiel's plan calibrated on them; every screen then says the birds are invented.
 */
import path from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { needBuilt } from '../support/chromium.js';
import { checkScreen } from './accessibility.js';
import {
  bridgeValue,
  callBridge,
  ensureScreenshotFolder,
  sharedBrowser,
  startHostProcess,
} from './host-process.js';

const session = sharedBrowser('tidewing-e2e-demo-choice-');
const shots = ensureScreenshotFolder();

async function shoot(page: Page, name: string) {
  await page.screenshot({ path: path.join(shots, `1x-demo-choice-${name}.png`), fullPage: true });
  await checkScreen(page, `1x-demo-choice-${name}`);
}

describe('the demo clinic chosen on the first start', () => {
  it('offers an empty clinic or the demo, writes the demo from the keyboard, and opens its evidence with the demo marked invented', async (context) => {
    needBuilt(context, path.join(process.cwd(), 'build', 'renderer', 'index.html'));
    const host = await startHostProcess(session.dataFolder, [], 30_000);
    const page = await session.browser.newPage({ viewport: { width: 1366, height: 800 } });
    const pageErrors: string[] = [];
    page.on('pageerror', (error) => pageErrors.push(error.message));
    try {
      await page.goto(host.url);
      await page.getByRole('heading', { name: 'Before you use Tidewing' }).waitFor();
      await page.getByLabel('Your name or initials').fill('RW');
      await page.getByLabel(/I have read these cautions/).check();
      await page.getByRole('button', { name: 'Acknowledge and continue' }).click();

      // 1. The choice: an empty clinic first and chosen, with focus on it.
      await page.getByRole('heading', { name: 'Set up your clinic' }).waitFor();
      const choice = page.getByRole('group', { name: 'How do you want to start?' });
      const empty = choice.getByRole('radio', { name: /^Start an empty clinic/ });
      const demo = choice.getByRole('radio', {
        name: /^Explore the demo clinic, with invented birds and records/,
      });
      await expect(empty.isChecked()).resolves.toBe(true);
      await expect(empty.evaluate((element) => element === document.activeElement)).resolves.toBe(true);
      await expect(page.getByLabel('Clinic name').isVisible()).resolves.toBe(true);
      expect(await demo.getAttribute('aria-describedby')).not.toBeNull();
      await page
        .getByText('28 invented birds of 6 species and 60 finished procedures over the last 180 days')
        .waitFor();
      await expect(page.getByText('Demo clinic: invented birds').count()).resolves.toBe(0);
      await shoot(page, '01-first-start-choice');

      // 2. The demo, chosen with an arrow key: what it is, that it is invented, how to start for real.
      await page.keyboard.press('ArrowDown');
      await expect(demo.isChecked()).resolves.toBe(true);
      await page.getByRole('heading', { name: 'The demo clinic', level: 2 }).waitFor();
      await expect(page.getByLabel('Clinic name').isVisible()).resolves.toBe(false);
      await page.getByText('Every bird, owner, weight and time in the demo clinic is invented.').waitFor();
      await page.getByText('Do not enter real patients into the demo clinic', { exact: false }).waitFor();
      const later = await page.locator('.demo-start').innerText();
      expect(later).toContain(`The demo stays in this data folder: ${session.dataFolder}.`);
      expect(later).toContain('npm start -- --data FOLDER');
      expect(later).toContain('--new-clinic does not clear the demo');
      await shoot(page, '02-first-start-demo');

      // 3. Tab to the button, Enter: the demo is written and its evidence opens.
      await page.keyboard.press('Tab');
      await expect(page.evaluate(() => document.activeElement?.textContent ?? '')).resolves.toBe(
        'Open the demo clinic',
      );
      await page.keyboard.press('Enter');
      await page
        .getByRole('heading', { name: 'Observed vs predicted', level: 1 })
        .waitFor({ timeout: 60_000 });
      await page.getByText(/^60 completed records; 60 compared/).waitFor();
      const marker = page
        .getByRole('note')
        .filter({ hasText: 'Demo clinic: invented birds, not real patients.' });
      await marker.waitFor();
      await expect(page.locator('.brand-clinic').innerText()).resolves.toBe(
        'Fernbrook Avian Practice (demo, invented)',
      );
      await shoot(page, '03-evidence');

      // 4. A demo cockatiel's plan: the population figure and the one calibrated on the clinic's records.
      const found = await bridgeValue<{ patients: { id: number; speciesKey: string }[] }>(
        page,
        'patients:search',
        {
          query: 'Sunny',
        },
      );
      const sunny = found.patients.find((patient) => patient.speciesKey === 'cockatiel');
      expect(sunny).toBeDefined();
      await page.evaluate((id) => (window.location.hash = `#/plans/new/${id}`), sunny?.id ?? 0);
      await page.getByRole('heading', { name: 'Population model and your clinic’s calibration' }).waitFor();
      await page
        .getByTestId('calibrated-standing')
        .filter({ hasText: /min \(/ })
        .waitFor();
      expect(await page.getByTestId('rests-on-standing').innerText()).toMatch(
        /calibrated on 1[0-9] of your cockatiel records; your cockatiels stand \d\.\dx later/,
      );
      await marker.waitFor();

      // 5. Once the clinic holds birds, the choice is gone and the demo is not written again.
      await page.evaluate(() => (window.location.hash = '#/settings'));
      await page.getByRole('heading', { name: 'Settings', level: 1 }).waitFor();
      await expect(page.getByRole('group', { name: 'How do you want to start?' }).count()).resolves.toBe(0);
      await expect(page.getByLabel('Clinic name').inputValue()).resolves.toBe(
        'Fernbrook Avian Practice (demo, invented)',
      );
      const again = await callBridge(page, 'demo-clinic:create', {});
      expect(again.ok).toBe(false);
      expect(JSON.stringify(again.error)).toContain('this clinic already holds 28 patients');
      expect(pageErrors).toEqual([]);
    } finally {
      await page.close();
      await host.stop();
    }
  }, 360_000);
});
