import path from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { checkScreen } from './accessibility.js';
import { ensureScreenshotFolder, sharedBrowser, startHostProcess } from './host-process.js';

const session = sharedBrowser('tidewing-e2e-');
const shots = ensureScreenshotFolder();

async function shoot(page: Page, name: string) {
  await page.screenshot({ path: path.join(shots, `${name}.png`), fullPage: true });
  await checkScreen(page, name);
}

describe('first run, settings and restart in headless Chromium', () => {
  it('walks a new clinic through the cautions and settings, and keeps them after a restart', async () => {
    const host = await startHostProcess(session.dataFolder);
    const page = await session.browser.newPage({ viewport: { width: 1280, height: 800 } });
    const pageErrors: string[] = [];
    page.on('pageerror', (error) => pageErrors.push(error.message));
    page.on('console', (message) => {
      if (message.type() === 'error') pageErrors.push(message.text());
    });
    try {
      await page.goto(host.url);
      await page.getByRole('heading', { name: 'Before you use Tidewing' }).waitFor();
      // The one-time code is gone from the address, the token from the page, and the file
      // cookie (named after the port) is not the bridge token.
      expect(new URL(page.url()).search).toBe('');
      expect(await page.locator('meta[name="tidewing-bridge-token"]').count()).toBe(0);
      const token = await page.evaluate(() => window.sessionStorage.getItem('tidewing.token'));
      expect(token).toMatch(/^[\w-]{20,}$/);
      const cookies = await page.context().cookies(host.origin);
      expect(cookies.map((cookie) => cookie.name)).toEqual([`tidewing_files_${host.port}`]);
      expect(cookies[0]?.value).not.toBe(token);
      expect(cookies[0]?.httpOnly).toBe(true);
      // What a process list showed is useless now: the same address is refused.
      const reuse = await session.browser.newPage();
      try {
        const refused = await reuse.goto(host.url);
        expect(refused?.status()).toBe(403);
        await reuse.getByText(/already been used/).waitFor();
      } finally {
        await reuse.close();
      }
      await shoot(page, '01-cautions');

      await page.getByRole('button', { name: 'Acknowledge and continue' }).click();
      await expect(
        page.getByText('Enter your name or initials so the acknowledgement is attributable.').isVisible(),
      ).resolves.toBe(true);
      await page.getByLabel('Your name or initials').fill('R.W.');
      await page.getByRole('button', { name: 'Acknowledge and continue' }).click();
      await expect(
        page.getByText('Tick the box to confirm you have read the cautions.').isVisible(),
      ).resolves.toBe(true);
      await page.getByLabel(/I have read these cautions/).check();
      await page.getByRole('button', { name: 'Acknowledge and continue' }).click();

      await page.getByRole('heading', { name: 'Set up your clinic' }).waitFor();
      await page.getByRole('button', { name: 'Save settings' }).click();
      await page.getByText('Enter the clinic name; it heads every printed worksheet.').waitFor();
      await shoot(page, '02-settings-validation');

      await page.getByLabel('Clinic name').fill('Heron Lane Bird Clinic');
      await page.getByLabel('Address line').fill('4 Heron Lane, Marshfield');
      await page.getByLabel('kilograms (kg)').check();
      await page.getByLabel('kPa').check();
      await page.getByLabel('US Letter').check();
      await page.getByLabel('Clinic name').press('Enter');
      await page.getByText(/^Saved /).waitFor();
      await expect(page.getByText('Cautions acknowledged by R.W.').isVisible()).resolves.toBe(true);
      await shoot(page, '03-settings-saved');

      // Every area is reachable from the keyboard and starts empty: no sample data.
      await page.keyboard.press('Alt+1');
      await page.getByRole('heading', { name: 'Patients' }).waitFor();
      await page.getByText('No patients yet. Add the first bird with New patient.').waitFor();
      await shoot(page, '04-patients-empty');
      await page.keyboard.press('Alt+3');
      await page.getByRole('heading', { name: 'Anaesthetic plans' }).waitFor();
      await page.getByText(/^No plans for \d{4}-\d{2}-\d{2}\.$/).waitFor();
      await page.keyboard.press('Alt+4');
      await page.getByRole('heading', { name: 'Procedure records' }).waitFor();
      await page.keyboard.press('Alt+5');
      await page.getByRole('heading', { name: 'Worksheets' }).waitFor();
      expect(await page.locator('.data-table tbody tr').count()).toBe(0);
      expect(pageErrors, pageErrors.join('\n')).toEqual([]);
    } finally {
      await page.close();
      await host.stop();
    }

    const again = await startHostProcess(session.dataFolder);
    const page2 = await session.browser.newPage({ viewport: { width: 1280, height: 800 } });
    try {
      await page2.goto(again.url);
      await page2.getByRole('heading', { name: 'Patients' }).waitFor();
      await page2.keyboard.press('Alt+6');
      await page2.getByRole('heading', { name: 'Settings' }).waitFor();
      await expect(page2.getByLabel('Clinic name').inputValue()).resolves.toBe('Heron Lane Bird Clinic');
      await expect(page2.getByLabel('Address line').inputValue()).resolves.toBe('4 Heron Lane, Marshfield');
      await expect(page2.getByLabel('kilograms (kg)').isChecked()).resolves.toBe(true);
      await expect(page2.getByLabel('kPa').isChecked()).resolves.toBe(true);
      await expect(page2.getByLabel('US Letter').isChecked()).resolves.toBe(true);
      await expect(
        page2.getByText('Heron Lane Bird Clinic', { exact: true }).first().isVisible(),
      ).resolves.toBe(true);
      await shoot(page2, '05-settings-after-restart');
    } finally {
      await page2.close();
      await again.stop();
    }
  });
});
