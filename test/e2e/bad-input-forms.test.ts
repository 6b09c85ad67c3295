import path from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { localDateOf } from '../../app/contract/input-rules.js';
import { completeFirstRun, ensureScreenshotFolder, sharedHost } from './host-process.js';

const session = sharedHost('tidewing-e2e-bad-input-');
const shots = ensureScreenshotFolder();

/** A date this many days from today on this computer's clock, which the host shares. */
const daysFromToday = (days: number) => {
  const moment = new Date();
  moment.setDate(moment.getDate() + days);
  return localDateOf(moment);
};

/** The message a field's input points at with aria-describedby: the one shown beside it. */
async function messageBeside(page: Page, label: string): Promise<string> {
  const field = page.getByLabel(label, { exact: true });
  await expect.poll(() => field.getAttribute('aria-describedby')).not.toBeNull();
  const id = (await field.getAttribute('aria-describedby')) ?? '';
  return page.locator(`[id="${id}"]`).innerText();
}

describe('bad input in the forms is refused beside the field', () => {
  it('shows the hatch date, name and weighing date messages beside their fields', async () => {
    const { browser, host } = session;
    const page = await browser.newPage({ viewport: { width: 1366, height: 900 } });
    const problems: string[] = [];
    page.on('pageerror', (error) => problems.push(error.message));
    await completeFirstRun(page, host.url);
    await page.getByRole('link', { name: 'New patient' }).click();
    await page.getByRole('heading', { name: 'New patient' }).waitFor();

    // A zero width space only, and a hatch date tomorrow.
    await page.getByLabel('Name or clinic ID', { exact: true }).fill('\u200b');
    await page.getByLabel('Species').selectOption('budgerigar');
    await page.getByLabel('Hatch date', { exact: true }).fill(daysFromToday(1));
    await page.getByRole('button', { name: 'Save patient' }).click();
    expect(await messageBeside(page, 'Name or clinic ID')).toBe(
      'Name or ID must contain at least one letter or digit; spaces and invisible characters alone do not identify anything.',
    );
    expect(await messageBeside(page, 'Hatch date')).toContain(
      `Hatch date ${daysFromToday(1)} is after today`,
    );
    await page.screenshot({ path: path.join(shots, '24-patient-form-bad-input.png'), fullPage: true });

    await page.getByLabel('Name or clinic ID', { exact: true }).fill('Pip');
    await page.getByLabel('Hatch date', { exact: true }).fill(daysFromToday(-400));
    await page.getByRole('button', { name: 'Save patient' }).click();
    await page.getByRole('heading', { name: /Pip/ }).waitFor();

    // A weighing more than a year ago needs a reason; the box for it appears with the date.
    await page.getByLabel('Date', { exact: true }).fill(daysFromToday(-400));
    await page.getByLabel('Weight (g)', { exact: true }).fill('33');
    const reason = page.getByLabel('Reason (for a date more than a year ago)');
    await reason.waitFor();
    await page.getByRole('button', { name: 'Add weight' }).click();
    expect(await messageBeside(page, 'Date')).toContain('more than a year ago');
    await reason.fill('Copied from the paper record');
    await page.getByRole('button', { name: 'Add weight' }).click();
    await page.getByRole('cell', { name: '33 g' }).waitFor();

    // A weight below 0.5 g, beside the weight.
    await page.getByLabel('Date', { exact: true }).fill(daysFromToday(0));
    await page.getByLabel('Weight (g)', { exact: true }).fill('0.2');
    await page.getByRole('button', { name: 'Add weight' }).click();
    expect(await messageBeside(page, 'Weight (g)')).toBe(
      'Weight must be between 0.5 g and 200000 g (200 kg); check the scale and the unit.',
    );
    await page.screenshot({ path: path.join(shots, '25-weights-bad-input.png'), fullPage: true });
    expect(problems).toEqual([]);
    await page.close();
  });
});
