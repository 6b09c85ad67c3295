import fs from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { localDateOf } from '../../app/contract/input-rules.js';
import { checkScreen } from './accessibility.js';
import { callBridge, completeFirstRun, ensureScreenshotFolder, sharedHost } from './host-process.js';

const session = sharedHost('tidewing-e2e-patients-');
const shots = ensureScreenshotFolder();

/**
 * A date this many days from today on this computer's clock, which the host shares: the records
 * refuse a weighing or planned date more than a year away, so the tests never use fixed dates.
 */
const daysFromToday = (days: number) => {
  const moment = new Date();
  moment.setDate(moment.getDate() + days);
  return localDateOf(moment);
};
const firstDay = daysFromToday(-31);
const secondDay = daysFromToday(-2);

async function shoot(page: Page, name: string) {
  await page.screenshot({ path: path.join(shots, `${name}.png`), fullPage: true });
  await checkScreen(page, name);
}

describe('patients, weights and species in headless Chromium', () => {
  it('creates a species-linked patient, adds two weights, sees the loss flag and corrects a weight with its history', async () => {
    const { browser, host } = session;
    const page = await browser.newPage({ viewport: { width: 1366, height: 900 } });
    const problems: string[] = [];
    page.on('pageerror', (error) => problems.push(error.message));
    await completeFirstRun(page, host.url);
    await page.getByRole('heading', { name: 'Patients' }).waitFor();
    await page.getByText('No patients yet').waitFor();
    await page.getByRole('link', { name: 'New patient' }).click();
    await page.getByRole('heading', { name: 'New patient' }).waitFor();
    await page.getByRole('button', { name: 'Save patient' }).click();
    await page.getByText('Enter the bird’s name or clinic ID.').waitFor();
    await page.getByText('Choose a species.').first().waitFor();
    await shoot(page, '20-patient-form-validation');

    await page.getByLabel('Name or clinic ID').fill('Pip');
    await page.getByLabel('Species').selectOption('budgerigar');
    await page.getByLabel('Sex').selectOption('male');
    await page.getByLabel('Ring ID').fill('HL-24-117');
    await page.getByLabel('Owner reference').fill('Owner 5521');
    await page.getByLabel('Name or clinic ID').press('Enter');
    await page.getByRole('heading', { name: /Pip/ }).waitFor();

    const addWeight = async (date: string, grams: string) => {
      await page.getByLabel('Date', { exact: true }).fill(date);
      await page.getByLabel('Weight (g)', { exact: true }).fill(grams);
      await page.getByLabel('Weight (g)', { exact: true }).press('Enter');
    };
    await addWeight(firstDay, '34');
    await page.getByRole('cell', { name: '34 g' }).waitFor();
    await addWeight(secondDay, '28');
    await page.getByRole('cell', { name: '28 g' }).waitFor();
    const alert = page.locator('.flag.danger');
    await alert.first().waitFor();
    expect(await alert.allTextContents()).toEqual(
      expect.arrayContaining([
        expect.stringMatching(/Lost 6\.0 g \(17\.6 %\) since the previous weight: band 15-20 %/),
      ]),
    );
    await expect(
      page
        .getByText('Basis: Weight-loss bands <5, <10, <15, <20, >20 % (IVAPM pain scale for birds)')
        .first()
        .isVisible(),
    ).resolves.toBe(true);
    await shoot(page, '21-patient-weights-flag');

    await page.getByRole('row', { name: /28 g/ }).getByRole('button', { name: 'Correct' }).click();
    await page.getByLabel('Weight (g)', { exact: true }).fill('31');
    await page.getByRole('button', { name: 'Save correction' }).click();
    await page.getByText('Say why; the reason is kept with the history.').waitFor();
    await page.getByLabel('Reason').fill('Read the scale before it settled');
    await page.getByRole('button', { name: 'Save correction' }).click();
    await page.getByRole('cell', { name: '31 g' }).waitFor();
    await page.getByRole('row', { name: /31 g/ }).getByRole('button', { name: 'History' }).click();
    const history = page.getByRole('region', { name: 'Weight history' });
    await history.waitFor();
    const lines = await history.locator('li').allTextContents();
    expect(lines[0]).toMatch(
      new RegExp(`^31 g on ${secondDay} · entered by RW.*why: Read the scale before it settled`),
    );
    expect(lines[1]).toMatch(new RegExp(`^28 g on ${secondDay} · entered by RW`));
    await shoot(page, '22-patient-weight-history');

    await page.goto(`${host.origin}/#/patients`);
    await page.getByLabel(/^Search/).fill('5521');
    await page.getByRole('link', { name: 'Pip' }).waitFor();
    await expect(
      page.getByRole('cell', { name: new RegExp(`31 g \\(${secondDay}\\)`) }).isVisible(),
    ).resolves.toBe(true);
    await shoot(page, '23-patient-search');

    // The whole database as JSON, from Settings.
    await page.keyboard.press('Alt+6');
    await page.getByRole('heading', { name: 'Data and backups' }).waitFor();
    await page.getByText(/Latest: /).waitFor();
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('button', { name: 'Export the whole database as JSON' }).click(),
    ]);
    const exported = JSON.parse(fs.readFileSync(await download.path(), 'utf8')) as {
      format: string;
      tables: Record<string, { rows: Record<string, unknown>[] }>;
    };
    expect(exported.format).toBe('tidewing-database-export');
    expect(exported.tables['patient_versions']?.rows.map((row) => row['name'])).toEqual(['Pip']);
    expect(exported.tables['weights']?.rows.map((row) => row['mass_g'])).toEqual([34, 28, 31]);
    await shoot(page, '26-settings-data');
    expect(problems).toEqual([]);
    await page.close();
  });

  it('shows species with their sources and keeps the earlier value when the clinic edits one', async () => {
    const { browser, host } = session;
    const page = await browser.newPage({ viewport: { width: 1366, height: 900 } });
    await page.goto(await host.nextUrl());
    await page.getByRole('heading', { name: 'Patients' }).waitFor();
    await page.getByLabel('Your initials').fill('MK');
    await page.keyboard.press('Alt+2');
    await page.getByRole('heading', { name: 'Species', exact: true }).waitFor();
    // Pekin duck isoflurane MAC 1.30 +/- 0.23 % (Ludders, Mitchell & Rode 1990, Vet Surg 19)
    const duckRow = page.getByRole('row', { name: /Pekin duck/ });
    const duckText = await duckRow.textContent();
    expect(duckText).toMatch(/1\.3 % ± 0\.23/);
    expect(duckText).toMatch(/Ludders, Mitchell & Rode 1990/);
    await shoot(page, '24-species-list');

    await page.getByRole('link', { name: 'Budgerigar' }).click();
    // The species opens read-only, every value with its whole source; editing is a deliberate step.
    await page.getByRole('heading', { name: 'Budgerigar', exact: true }).waitFor();
    expect(await page.locator('main input, main select, main textarea').count()).toBe(0);
    const sources = await page.locator('.species-source').allTextContents();
    expect(sources.length).toBeGreaterThan(1);
    for (const source of sources) {
      expect(source).toMatch(/^Source: /);
      expect(source).not.toMatch(/from memory|\[[a-z ]+\]$|…$/);
    }
    await shoot(page, '24-species-read-only');
    await page.getByRole('link', { name: 'Edit Budgerigar' }).click();
    await page.getByRole('heading', { name: 'Edit Budgerigar' }).waitFor();
    const highest = page.getByRole('group', { name: 'Typical adult mass' }).getByLabel('Highest');
    const before = await highest.inputValue();
    await highest.fill('60');
    await page
      .getByRole('group', { name: 'Typical adult mass' })
      .getByLabel('Source')
      .fill('Exhibition budgerigars seen at this clinic (common practice)');
    await page.getByRole('button', { name: 'Save changes' }).click();
    await page.getByText('Say why the value changes; the reason is kept with the history.').waitFor();
    await page.getByLabel('Reason for the change').fill('Many exhibition birds on our list');
    await page.getByRole('button', { name: 'Save changes' }).click();
    await page
      .getByText(/^Saved /)
      .waitFor({ timeout: 5000 })
      .catch(async (error: unknown) => {
        await shoot(page, '25-species-edit-failed');
        throw error;
      });
    const history = await page
      .locator('section[aria-labelledby="species-history-title"] li')
      .allTextContents();
    expect(history).toHaveLength(2);
    expect(history[0]).toMatch(
      /why: Many exhibition birds on our list · mass \d+-60 g \(Exhibition budgerigars seen at this clinic/,
    );
    expect(history[1]).toContain(`-${before} g`);
    await shoot(page, '25-species-edit-history');

    // Another workstation corrects the version this form shows first: this form's next save is
    // refused with who, when and why, and what is typed stays.
    const [shown] =
      (
        await callBridge<{ stamp: { versionId: number }; values: Record<string, unknown> }[]>(
          page,
          'species:history',
          { key: 'budgerigar' },
        )
      ).value ?? [];
    if (shown === undefined) return expect.fail('budgerigar has no history');
    const elsewhere = await callBridge(page, 'species:correct', {
      key: 'budgerigar',
      versionId: shown.stamp.versionId,
      values: {
        ...shown.values,
        massBasis: 'Exhibition budgerigars weighed at this clinic (common practice)',
      },
      meta: { enteredBy: 'RW', reason: 'Source worded' },
    });
    expect(elsewhere.ok, JSON.stringify(elsewhere)).toBe(true);
    await highest.fill('62');
    await page.getByLabel('Reason for the change').fill('Heavier hens this season');
    await page.getByRole('button', { name: 'Save changes' }).click();
    const refusal = page.getByRole('alert').filter({ hasText: 'already corrected' });
    await refusal.waitFor();
    expect(await refusal.textContent()).toMatch(
      /^Not saved: this species was already corrected by RW at \d\d:\d\d( on \d{4}-\d\d-\d\d)? \(reason: Source worded\)\. Your change was not applied; reload to see the current species\.$/,
    );
    expect(await highest.inputValue()).toBe('62');
    await page
      .locator('section[aria-labelledby="species-history-title"] li')
      .filter({ hasText: 'why: Source worded' })
      .waitFor();
    await shoot(page, '25-species-edit-refused');
    await page.close();
  });
});
