import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { localDateOf } from '../../app/contract/input-rules.js';
import { checkScreen } from './accessibility.js';
import {
  callBridge as bridge,
  completeFirstRun,
  ensureScreenshotFolder,
  sharedHost,
} from './host-process.js';

const session = sharedHost('tidewing-e2e-planning-');
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

async function shoot(page: Page, name: string) {
  await page.screenshot({ path: path.join(shots, `${name}.png`), fullPage: true });
  await checkScreen(page, name);
}

const inductionText = (page: Page) => page.getByTestId('induction-time').innerText();

describe('planning from a patient in headless Chromium', () => {
  it('plans, redraws on every change, compares two variants and saves to the patient', async () => {
    const { browser, host } = session;
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    const problems: string[] = [];
    page.on('pageerror', (error) => problems.push(error.message));
    await completeFirstRun(page, host.url);
    const meta = { enteredBy: 'RW', reason: '' };
    const created = await bridge(page, 'patients:create', {
      values: {
        name: 'Pip',
        speciesKey: 'budgerigar',
        sex: 'male',
        hatchDate: null,
        ageText: 'adult',
        ringId: 'HL-24-117',
        microchipId: '',
        ownerReference: 'Owner 5521',
        notes: '',
      },
      meta,
    });
    expect(created.ok).toBe(true);
    const patientId = (created.value as { id: number }).id;
    await bridge(page, 'weights:add', {
      patientId,
      values: { weighedOn: daysFromToday(-12), massG: 33, bodyCondition: 'ideal', weighedBy: 'RW' },
      meta,
    });
    await bridge(page, 'weights:add', {
      patientId,
      values: { weighedOn: daysFromToday(-1), massG: 32, bodyCondition: 'ideal', weighedBy: 'RW' },
      meta,
    });

    await page.goto(`${host.origin}/#/patients/${patientId}`);
    await page.getByRole('heading', { name: /Pip/ }).waitFor();
    await page.getByRole('link', { name: 'New plan' }).click();
    await page.getByRole('heading', { name: /New anaesthetic plan/ }).waitFor();
    await expect(page.getByLabel(/^Body mass/).inputValue()).resolves.toBe('32');
    await page.getByTestId('induction-time').waitFor();
    await page
      .getByText(/5th-95th percentile: \d/)
      .first()
      .waitFor({ timeout: 30_000 });
    // The four clinical milestones, each with its definition on tap (thresholds as the model
    // states them, app/core/model/parameters.ts).
    for (const id of ['loss-of-righting-time', 'induction-time', 'recovery-time', 'standing-time'])
      await expect(page.getByTestId(id).innerText()).resolves.toMatch(/^(\d+(\.\d+)? min|not reached)/);
    const standing = page.getByTestId('standing-time');
    await standing.getByText('What this milestone means').click();
    await expect(
      standing
        .getByText('Standing or perching: brain below 0.2 x MAC after the vaporiser is off (assumption)')
        .isVisible(),
    ).resolves.toBe(true);
    await expect(
      page
        .getByRole('term')
        .filter({ hasText: /^Loss of righting$/ })
        .getAttribute('title'),
    ).resolves.toBe('Loss of righting: brain reaches 0.6 x MAC (assumption)');
    const chart = page.locator('.plan-results .plan-chart .strip-chart-svg').first();
    await chart.waitFor();
    const before = await inductionText(page);
    const pixelsBefore = await chart.screenshot();
    await shoot(page, '40-planning');
    // Waste gas by source, in plain words (a face mask with a leak: leak and exhaust).
    const waste = page.getByRole('region', { name: 'Waste gas in the room' });
    await expect(waste.getByText(/^Mask leak: [\d.]+ mL of vapour/).count()).resolves.toBe(1);
    await expect(waste.getByText(/^Exhaust reaching the room: [\d.]+ mL of vapour/).count()).resolves.toBe(1);

    // Change the dial: the curve and the induction time change with no button pressed.
    await page.getByLabel(/^Induction dial/).fill('2.5');
    await expect.poll(() => inductionText(page), { timeout: 15_000 }).not.toBe(before);
    await expect
      .poll(async () => Buffer.compare(await chart.screenshot(), pixelsBefore) !== 0, { timeout: 15_000 })
      .toBe(true);
    await page.getByLabel(/^Induction dial/).fill('4');

    // Compare with a variant on sevoflurane.
    await page.getByRole('button', { name: 'Compare with a variant' }).click();
    await page.getByLabel('Sevoflurane').check();
    await page.getByLabel(/^Induction dial/).fill('6');
    await page.getByLabel(/^Maintenance dial/).fill('3');
    const table = page.getByRole('table', { name: 'Comparison of plan A and plan B' });
    await table.waitFor();
    await expect
      .poll(async () => table.locator('tr[data-differs="true"]').count(), { timeout: 15_000 })
      .toBeGreaterThan(2);
    expect(
      await table
        .locator('tr')
        .filter({ has: page.getByRole('rowheader', { name: 'Agent', exact: true }) })
        .getAttribute('data-differs'),
    ).toBe('true');
    const routeRow = table
      .locator('tr')
      .filter({ has: page.getByRole('rowheader', { name: 'Route', exact: true }) });
    await expect(routeRow.innerText()).resolves.toMatch(/Face mask\s+Face mask/);
    await shoot(page, '41-planning-compare');
    await page.getByRole('button', { name: 'Stop comparing' }).click();

    await page.getByLabel('ASA grade').selectOption('2');
    await page.getByLabel('Label').fill('crop biopsy');
    await page.getByRole('button', { name: 'Save plan' }).click();
    await page.getByText(/^Saved as plan \d+/).waitFor();
    const planId = Number(/plans\/(\d+)/.exec(page.url())?.[1]);
    expect(planId).toBeGreaterThan(0);
    const saved = await bridge(page, 'plans:get', { id: planId });
    const plan = (
      saved.value as {
        plan: {
          input: { bodyMassG: number; schedule: { vaporPct: number }[] };
          result: { modelVersion: string; milestones: { inductionMin: number } };
          checklist: { asaGrade: number };
        };
      }
    ).plan;
    expect(plan.input.bodyMassG).toBe(32);
    expect(plan.input.schedule[0]?.vaporPct).toBe(4);
    expect(plan.checklist.asaGrade).toBe(2);
    expect(plan.result.modelVersion).toMatch(/^\d+\.\d+\.\d+$/);
    const shownInduction = await inductionText(page);
    expect(shownInduction).toContain(
      `${String(Number(plan.result.milestones.inductionMin.toFixed(1)))}`.slice(0, 3),
    );

    // The worksheet of the saved plan, printed to PDF and read back.
    const inductionShown = (await inductionText(page)).split('\n')[0] ?? '';
    await page.getByRole('link', { name: 'Open worksheet' }).click();
    const sheet = page.locator('.worksheet[data-ready="true"]');
    await sheet.waitFor({ timeout: 30_000 });
    await page.emulateMedia({ media: 'print' });
    const pdfFile = path.join(session.dataFolder, 'planning-worksheet.pdf');
    await page.pdf({ path: pdfFile, preferCSSPageSize: true, printBackground: true });
    await page.emulateMedia({ media: 'screen' });
    const pdfText = execFileSync('pdftotext', ['-layout', pdfFile, '-'], { encoding: 'utf8' }).replace(
      /\s+/g,
      ' ',
    );
    expect(pdfText).toContain('Pip');
    expect(pdfText).toContain('32 g');
    expect(pdfText).toContain(inductionShown.replace(/\s+/g, ' ').trim());
    const savedResult = (saved.value as { plan: { result: { cautions: { message: string }[] } } }).plan
      .result;
    for (const caution of savedResult.cautions)
      expect(pdfText).toContain(caution.message.replace(/\s+/g, ' '));
    execFileSync('pdftoppm', ['-png', '-r', '60', pdfFile, path.join(shots, '43-planning-worksheet-page')]);
    expect(
      fs.readdirSync(shots).filter((name) => name.startsWith('43-planning-worksheet-page')).length,
    ).toBeGreaterThanOrEqual(2);

    // Reopen and edit: a new version.
    await page.goto(`${host.origin}/#/plans/${planId}`);
    await page.getByRole('heading', { name: `Anaesthetic plan ${planId}` }).waitFor();
    await expect(page.getByLabel(/^Induction dial/).inputValue()).resolves.toBe('4');
    await page.getByLabel(/^Fresh gas flow/).fill('1.5');
    await page.getByRole('button', { name: 'Save changes' }).click();
    await page.getByText(/^Saved as plan \d+/).waitFor();
    const newId = Number(/plans\/(\d+)/.exec(page.url())?.[1]);
    expect(newId).toBeGreaterThan(planId);

    await page.goto(`${host.origin}/#/plans`);
    await page.getByRole('heading', { name: 'Anaesthetic plans' }).waitFor();
    await page.getByRole('link', { name: new RegExp(`^${newId} · crop biopsy$`) }).waitFor();
    await expect(page.getByRole('status').filter({ hasText: 'Day total:' }).innerText()).resolves.toMatch(
      /Day total: [\d.]+ mL liquid isoflurane and [\d.]+ L oxygen/,
    );
    // The agent, then each phase with its route, breathing system, flow (edited to 1.5) and dials.
    await expect(page.getByRole('table').first().innerText()).resolves.toMatch(
      /Isoflurane\s+Face mask, Non-rebreathing system · 1\.5 L\/min \(recommended [\d.]+\) · 4 % from 0 min, 2 % from 5 min/,
    );
    await shoot(page, '42-day-list');

    // A procedure record that follows the plan shows the plan's predicted curve beside the log.
    await page.goto(`${host.origin}/#/records/new/${patientId}`);
    await page.getByRole('heading', { name: 'New procedure record' }).waitFor();
    await page.getByLabel('Linked plan').selectOption(String(newId));
    await expect(page.getByLabel('Procedure', { exact: true }).inputValue()).resolves.toBe('crop biopsy');
    // The ASA grade comes from the plan's checklist.
    await expect(page.getByRole('radio', { name: '2', exact: true }).isChecked()).resolves.toBe(true);
    await page.getByLabel('Non-rebreathing system').check();
    await page.getByLabel('Staff initials').fill('RW');
    await page.getByRole('button', { name: 'Start procedure record' }).click();
    await page.getByRole('region', { name: `Plan ${newId} beside the log` }).waitFor();
    await page
      .getByLabel(/^Vaporiser/)
      .first()
      .fill('3');
    await page
      .getByLabel(/^Vaporiser/)
      .first()
      .press('Enter');
    await page.getByRole('cell', { name: '3', exact: true }).first().waitFor();
    await shoot(page, '44-record-with-plan');

    // Correcting the record's details keeps the earlier version with who, when and why.
    await page.getByRole('button', { name: 'Correct details' }).click();
    const editor = page.getByRole('region', { name: 'Correct the record’s details' });
    await editor.getByRole('radio', { name: '3', exact: true }).check();
    await editor.getByRole('button', { name: 'Save correction' }).click();
    await editor.getByText('Say why the record is corrected; the reason is kept with the history.').waitFor();
    await editor.getByLabel('Reason for the correction').fill('Regraded after the crop examination');
    await editor.getByRole('button', { name: 'Save correction' }).click();
    await expect
      .poll(
        () => editor.getByRole('list', { name: "History of the record's details" }).locator('li').count(),
        { timeout: 10_000 },
      )
      .toBe(2);
    expect(
      await editor
        .getByRole('list', { name: "History of the record's details" })
        .locator('li')
        .first()
        .innerText(),
    ).toMatch(/why: Regraded after the crop examination · crop biopsy, ASA 3/);
    await expect
      .poll(() => page.locator('.record-facts').innerText(), { timeout: 10_000 })
      .toContain('ASA 3');
    expect(problems).toEqual([]);
    fs.writeFileSync(path.join(shots, 'planning-plan-id.txt'), String(newId));
    await page.close();
  });
  it('saves a comparison as two plans, lets the clinic choose one, and the day list marks it', async () => {
    const { browser, host } = session;
    const page = await browser.newPage({ viewport: { width: 1366, height: 800 } });
    const problems: string[] = [];
    page.on('pageerror', (error) => problems.push(error.message));
    // The first test used the host's opening address; a new page asks for the next one.
    await completeFirstRun(page, await host.nextUrl());
    const meta = { enteredBy: 'RW', reason: '' };
    const created = await bridge(page, 'patients:create', {
      values: {
        name: 'Wren',
        speciesKey: 'budgerigar',
        sex: 'female',
        hatchDate: null,
        ageText: 'adult',
        ringId: '',
        microchipId: '',
        ownerReference: 'Owner 7730',
        notes: '',
      },
      meta,
    });
    const patientId = (created.value as { id: number }).id;
    await bridge(page, 'weights:add', {
      patientId,
      values: { weighedOn: daysFromToday(-1), massG: 35, bodyCondition: 'ideal', weighedBy: 'RW' },
      meta,
    });
    const day = daysFromToday(2);
    await page.goto(`${host.origin}/#/patients/${patientId}`);
    await page.getByRole('link', { name: 'New plan' }).click();
    await page.getByRole('heading', { name: /New anaesthetic plan/ }).waitFor();
    await page.getByTestId('induction-time').waitFor();
    await page.getByLabel('Planned for').fill(day);
    await page.getByLabel('Label').fill('beak trim');
    await page.getByRole('button', { name: 'Compare with a variant' }).click();
    await page.getByLabel(/^Fresh gas flow/).fill('0.6');
    await page.getByRole('table', { name: 'Comparison of plan A and plan B' }).waitFor();
    await page.getByRole('button', { name: 'Save both plans' }).click();
    const savedText = await page
      .getByText(/^Saved plan A as plan \d+ \(the chosen plan\) and plan B as plan \d+/)
      .innerText();
    const [, aText, bText] = /plan A as plan (\d+).*plan B as plan (\d+)/.exec(savedText) ?? [];
    const planA = Number(aText);
    const planB = Number(bText);
    expect(planB).toBeGreaterThan(planA);
    const panel = page.getByRole('region', { name: 'Saved comparison' });
    await expect(panel.innerText()).resolves.toMatch(
      new RegExp(`This plan \\(${planA}\\) · beak trim · compared plan · chosen`),
    );
    await expect(panel.innerText()).resolves.toContain(`alternative of plan ${planA}`);

    // Open the alternative and make it the plan to use.
    await panel.getByRole('link', { name: `Open plan ${planB}` }).click();
    await page.getByRole('heading', { name: `Anaesthetic plan ${planB}` }).waitFor();
    await expect(page.getByLabel(/^Fresh gas flow/).inputValue()).resolves.toBe('0.6');
    await page
      .getByRole('region', { name: 'Saved comparison' })
      .getByRole('button', { name: 'Use this plan' })
      .click();
    await page.getByText(`Plan ${planB} is now the chosen plan.`).waitFor();
    await expect(page.getByRole('region', { name: 'Saved comparison' }).innerText()).resolves.toMatch(
      new RegExp(`This plan \\(${planB}\\) · beak trim · alternative of plan ${planA} · chosen`),
    );
    await shoot(page, '45-saved-comparison');
    const detail = await bridge(page, 'plans:get', { id: planA });
    expect((detail.value as { comparison: { chosenId: number } }).comparison.chosenId).toBe(planB);

    // The day list says in words which plan is chosen and which is the alternative.
    await page.goto(`${host.origin}/#/plans`);
    await page.getByRole('heading', { name: 'Anaesthetic plans' }).waitFor();
    await page.getByLabel('Day', { exact: true }).fill(day);
    const rowOf = (id: number) =>
      page
        .getByRole('row')
        .filter({ has: page.getByRole('link', { name: new RegExp(`^${id} · beak trim$`) }) });
    await rowOf(planB).waitFor();
    await expect(rowOf(planB).locator('td').first().innerText()).resolves.toMatch(
      new RegExp(`· chosen · alternative of plan ${planA}`),
    );
    await expect(rowOf(planA).locator('td').first().innerText()).resolves.toMatch(/compared, not chosen/);
    await expect(page.getByRole('status').filter({ hasText: 'Day total:' }).innerText()).resolves.toMatch(
      /Compared plans not chosen are left out\.$/,
    );
    await shoot(page, '44-day-list-chosen-plan');

    // The worksheet of each plan says the same in its title line.
    const worksheetTitle = (id: number) =>
      page.locator('.ws-title-block p').filter({ hasText: `Plan ${id} “beak trim” for ` });
    await page.goto(`${host.origin}/#/worksheets/${planA}`);
    await expect(worksheetTitle(planA).innerText()).resolves.toMatch(/ · compared, not chosen$/);
    await page.goto(`${host.origin}/#/worksheets/${planB}`);
    await expect(worksheetTitle(planB).innerText()).resolves.toMatch(
      new RegExp(` · chosen · alternative of plan ${planA}$`),
    );

    // So does the plan picker of a new procedure record.
    await page.goto(`${host.origin}/#/records/new/${patientId}`);
    const picker = page.getByLabel('Linked plan');
    await picker.locator(`option[value="${planB}"]`).waitFor({ state: 'attached' });
    await expect(picker.locator(`option[value="${planA}"]`).innerText()).resolves.toMatch(
      / \(beak trim\) · compared, not chosen$/,
    );
    await expect(picker.locator(`option[value="${planB}"]`).innerText()).resolves.toMatch(
      new RegExp(` \\(beak trim\\) · chosen · alternative of plan ${planA}$`),
    );
    expect(problems).toEqual([]);
    await page.close();
  });
});
