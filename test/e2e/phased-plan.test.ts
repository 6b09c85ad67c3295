import { execFile } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import type { Page } from 'playwright-core';
import { afterAll, describe, expect, it } from 'vitest';
import { localDateOf } from '../../app/contract/input-rules.js';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import { needBuilt } from '../support/chromium.js';
import { temporaryFolder } from '../support/temporary-folder.js';
import { checkScreen } from './accessibility.js';
import { callBridge, completeFirstRun, ensureScreenshotFolder, sharedHost } from './host-process.js';

const run = promisify(execFile);
const root = findProjectRoot();
const session = sharedHost('tidewing-e2e-phased-');
const shots = ensureScreenshotFolder();
const output = temporaryFolder('tidewing-e2e-phased-pdf-');
afterAll(() => output.remove());

const squash = (text: string) => text.replace(/\s+/g, ' ').trim();

/** A date this many days from today on this computer's clock, which the host shares. */
const daysFromToday = (days: number) => {
  const moment = new Date();
  moment.setDate(moment.getDate() + days);
  return localDateOf(moment);
};

/** The name attribute of the element that has focus. */
const focusedName = (page: Page) => page.evaluate(() => document.activeElement?.getAttribute('name') ?? '');

/** Replaces the focused box's text from the keyboard. */
async function typeInFocused(page: Page, text: string) {
  await page.keyboard.press('Control+A');
  await page.keyboard.type(text);
}

describe('a mask induction then a tube, entered with the keyboard', () => {
  it('plans both phases, shows them in the results and on the worksheet page 1, and in the day list', async (context) => {
    const cli = path.join(root, 'build', 'main', 'cli', 'cli-entry.js');
    needBuilt(context, cli);
    const { browser, host } = session;
    const page = await browser.newPage({ viewport: { width: 1366, height: 800 } });
    const problems: string[] = [];
    page.on('pageerror', (error) => problems.push(error.message));
    await completeFirstRun(page, host.url);
    const meta = { enteredBy: 'RW', reason: '' };
    const created = await callBridge<{ id: number }>(page, 'patients:create', {
      values: { name: 'Kiwi', speciesKey: 'cockatiel', sex: 'female', ringId: 'HL-25-031' },
      meta,
    });
    expect(created.ok).toBe(true);
    const patientId = created.value?.id ?? 0;
    await callBridge(page, 'weights:add', {
      patientId,
      values: { weighedOn: daysFromToday(-1), massG: 95 },
      meta,
    });

    await page.goto(`${host.origin}/#/plans/new/${patientId}`);
    await page.getByRole('heading', { name: /New anaesthetic plan/ }).waitFor();
    await page.getByTestId('induction-time').waitFor();

    // The first phase is the plan's own route block: a face mask. Then the keyboard adds a phase.
    const add = page.getByRole('button', { name: 'Add a later phase' });
    await add.focus();
    await page.keyboard.press('Enter');
    // Focus moves to the new phase's first box, its start minute (the maintenance minute, 5).
    await expect.poll(() => focusedName(page)).toBe('phase2Start');
    const phase2 = page.getByRole('group', { name: /^Phase 2/ });
    await expect(phase2.getByLabel(/^Starts at/).inputValue()).resolves.toBe('5');
    await typeInFocused(page, '6');
    await page.keyboard.press('Tab');
    expect(await focusedName(page)).toBe('phase2Gap');
    // The gap on room air shows the default, said to be an assumption.
    await expect(phase2.getByLabel(/^Gap on room air/).inputValue()).resolves.toBe('0.5');
    await expect(phase2.getByText(/0\.5 min is an assumption/).isVisible()).resolves.toBe(true);
    await page.keyboard.press('Tab');
    expect(await focusedName(page)).toBe('phase2Route');
    await expect(phase2.getByLabel('Route').inputValue()).resolves.toBe('endotracheal');
    await page.keyboard.press('Tab');
    expect(await focusedName(page)).toBe('phase2Circuit');
    await page.keyboard.press('Tab');
    expect(await focusedName(page)).toBe('phase2FreshGas');
    await typeInFocused(page, '0.5');

    // A start before the first phase is refused on the phase's own box.
    await phase2.getByLabel(/^Starts at/).fill('0');
    await phase2.getByText(/phase start must be between/i).waitFor();
    await phase2.getByLabel(/^Starts at/).fill('6');
    await expect.poll(() => phase2.getByText(/phase start must be between/i).count()).toBe(0);

    // IPPV from the start of a mask induction: the message stands by the ventilation fields.
    await page.getByLabel('IPPV').check();
    await page.getByLabel(/^Ventilator rate/).fill('12');
    await page.getByLabel(/^Ventilator tidal volume/).fill('2');
    const ventilation = page.getByRole('group', { name: 'Ventilation' });
    await ventilation
      .getByText(/IPPV needs an endotracheal tube or an air-sac tube: start it once/)
      .waitFor();
    await page.getByLabel('spontaneous').check();

    // The results lead with the phases: a mask, then the tube from 6 min.
    const list = page.getByRole('list', { name: 'Phases of the plan' });
    const items = list.locator(':scope > li');
    await expect.poll(() => items.count(), { timeout: 15_000 }).toBe(2);
    const texts = (await items.allInnerTexts()).map(squash);
    expect(texts[0]).toMatch(
      /^Phase 1, 0-6 min: Face mask Breathing system Non-rebreathing system Fresh gas set 1 L\/min/,
    );
    expect(texts[1]).toMatch(
      /^Phase 2, 6-\d+ min: Endotracheal tube · intubate after 0\.5 min on room air \(assumption\) Breathing system Non-rebreathing system Fresh gas set 0\.5 L\/min/,
    );
    expect(texts[1]).toMatch(/Uses [\d.]+ L oxygen, [\d.]+ mL liquid isoflurane$/);
    await page.screenshot({ path: path.join(shots, '60-phased-planning.png') });
    await list.scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(shots, '60-phased-planning-results.png') });
    await page
      .getByRole('group', { name: /^Phase 2/ })
      .scrollIntoViewIfNeeded()
      .then(() => page.screenshot({ path: path.join(shots, '60-phased-planning-form.png') }));
    await checkScreen(page, '60-phased-planning');

    await page.getByLabel('Label').fill('crop biopsy');
    const save = page.getByRole('button', { name: 'Save plan' });
    await save.focus();
    await page.keyboard.press('Enter');
    await page.getByText(/^Saved as plan \d+/).waitFor();
    const planId = Number(/plans\/(\d+)/.exec(page.url())?.[1]);
    const saved = await callBridge<{
      plan: { input: { laterPhases?: unknown[] }; result: { phases: { route: string }[] } };
    }>(page, 'plans:get', { id: planId });
    expect(saved.value?.plan.input.laterPhases).toEqual([
      { startMin: 6, gapMin: 0.5, route: 'endotracheal', circuit: 'nonRebreathing', freshGasLpm: 0.5 },
    ]);
    expect(saved.value?.plan.result.phases.map((phase) => phase.route)).toEqual(['mask', 'endotracheal']);

    // Reopened, the form shows the phase again.
    await page.goto(`${host.origin}/#/plans/${planId}`);
    await page.getByRole('heading', { name: `Anaesthetic plan ${planId}` }).waitFor();
    await expect(
      page
        .getByRole('group', { name: /^Phase 2/ })
        .getByLabel(/^Fresh gas flow/)
        .inputValue(),
    ).resolves.toBe('0.5');

    // The worksheet on screen: page 1's table has a row per phase.
    await page.goto(`${host.origin}/#/worksheets/${planId}`);
    await page.locator('.worksheet[data-ready="true"]').waitFor({ timeout: 30_000 });
    const steps = page.locator('table.ws-steps tbody tr');
    await expect(steps.count()).resolves.toBe(2);
    expect(squash(await steps.nth(1).innerText())).toMatch(
      /intubate, 0\.5 min on room air\s*Endotracheal tube/,
    );
    await page.screenshot({ path: path.join(shots, '61-phased-worksheet.png') });
    await checkScreen(page, '61-phased-worksheet');

    // The printed worksheet: page 1 still stands alone with both phases and the emergency card.
    const file = path.join(output.folder, 'phased.pdf');
    await run(
      process.execPath,
      [cli, 'worksheet', '--plan', String(planId), '--data', session.dataFolder, '--out', file],
      { timeout: 60_000 },
    );
    const first = squash((await run('pdftotext', ['-f', '1', '-l', '1', file, '-'])).stdout);
    for (const expected of [
      'Kiwi',
      'Face mask',
      'Endotracheal tube',
      'intubate, 0.5 min on room air',
      '0.5 L/min',
      'Emergency card for 95 g',
    ])
      expect(first, `page 1: ${expected}`).toContain(expected);
    // The detail pages list the phases with each one's flow.
    const all = squash((await run('pdftotext', [file, '-'])).stdout);
    expect(all).toMatch(/Phases 1\. 0-6 min: Face mask, Non-rebreathing system; fresh gas 1 L\/min oxygen/);
    expect(all).toMatch(
      /2\. 6-\d+ min, intubate after 0\.5 min on room air \(assumption\): Endotracheal tube, Non-rebreathing system; fresh gas 0\.5 L\/min oxygen/,
    );
    expect(all).toContain('Fresh gas, phase 2');
    const stem = path.join(output.folder, 'phased-page');
    await run('pdftoppm', ['-png', '-r', '80', '-f', '1', '-l', '3', file, stem]);
    for (const image of fs.readdirSync(output.folder).filter((name) => name.startsWith('phased-page'))) {
      const number = Number(/-(\d+)\.png$/.exec(image)?.[1] ?? 0);
      fs.copyFileSync(
        path.join(output.folder, image),
        path.join(shots, `62-phased-worksheet-page-${number}.png`),
      );
    }
    expect(fs.existsSync(path.join(shots, '62-phased-worksheet-page-1.png'))).toBe(true);

    // The day list names both phases with their flows.
    await page.goto(`${host.origin}/#/plans`);
    await page.getByRole('heading', { name: 'Anaesthetic plans' }).waitFor();
    const line = page.getByRole('row', { name: /crop biopsy/ });
    await expect(line.innerText().then(squash)).resolves.toMatch(
      /Face mask, Non-rebreathing system · 1 L\/min .* from 6 min: Endotracheal tube, Non-rebreathing system · 0\.5 L\/min/,
    );
    await checkScreen(page, '63-phased-day-list');

    // A new record from the plan starts on the mask and says when to intubate.
    await page.goto(`${host.origin}/#/records/new/${patientId}`);
    await page.getByLabel('Linked plan').selectOption(String(planId));
    await page.getByText('Planned: intubate at 6 min.').waitFor();
    const airway = page.getByRole('group', { name: 'Airway' });
    await expect(airway.getByLabel('Face mask').isChecked()).resolves.toBe(true);
    await checkScreen(page, '64-phased-new-record');
    // Unlinked, the plan's airway does not stay behind.
    await page.getByLabel('Linked plan').selectOption('');
    await expect.poll(() => airway.locator('input:checked').count()).toBe(0);
    expect(problems).toEqual([]);
  }, 180_000);
});
