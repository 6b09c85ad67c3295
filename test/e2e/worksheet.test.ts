import { execFile } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import type { Page } from 'playwright-core';
import { afterAll, describe, expect, it } from 'vitest';
import { localDateOf } from '../../app/contract/input-rules.js';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import { temporaryFolder } from '../support/temporary-folder.js';
import { callBridge, completeFirstRun, ensureScreenshotFolder, sharedHost } from './host-process.js';
import { heronLaneSettings } from '../support/clinic-settings.js';
import { checkScreen } from './accessibility.js';

const run = promisify(execFile);

/**
 * A date this many days from today on this computer's clock, which the host shares: the records
 * refuse a weighing or planned date more than a year away, so the tests never use fixed dates.
 */
const daysFromToday = (days: number) => {
  const moment = new Date();
  moment.setDate(moment.getDate() + days);
  return localDateOf(moment);
};
const root = findProjectRoot();
const session = sharedHost('tidewing-e2e-worksheet-');
const shots = ensureScreenshotFolder();
const output = temporaryFolder('tidewing-e2e-worksheet-pdf-');
afterAll(() => output.remove());

/** Calls a contract channel through the loopback bridge, as the screens do; throws on refusal. */
async function bridge<T>(page: Page, channel: string, body: unknown): Promise<T> {
  const result = await callBridge<T>(page, channel, body);
  if (!result.ok) throw new Error(`${channel} failed: ${JSON.stringify(result.error)}`);
  return result.value as T;
}

const squash = (text: string) => text.replace(/\s+/g, ' ').trim();

/** Renders the worksheet PDF with the command line, against the running host's data folder. */
async function worksheetPdf(
  planId: number,
  name: string,
): Promise<{
  file: string;
  text: string;
  pages: string[];
  pageCount: number;
  pageWidthPt: number;
  pageHeightPt: number;
}> {
  const file = path.join(output.folder, `${name}.pdf`);
  await run(
    process.execPath,
    [
      path.join(root, 'build', 'main', 'cli', 'cli-entry.js'),
      'worksheet',
      '--plan',
      String(planId),
      '--data',
      session.dataFolder,
      '--out',
      file,
    ],
    { timeout: 60_000 },
  );
  const text = (await run('pdftotext', [file, '-'])).stdout;
  const info = (await run('pdfinfo', [file])).stdout;
  const size = /Page size:\s+([\d.]+) x ([\d.]+) pts/.exec(info);
  const pageCount = Number(/Pages:\s+(\d+)/.exec(info)?.[1] ?? 0);
  const pages: string[] = [];
  for (let number = 1; number <= pageCount; number += 1)
    pages.push(
      squash((await run('pdftotext', ['-f', String(number), '-l', String(number), file, '-'])).stdout),
    );
  return {
    file,
    text: squash(text),
    pages,
    pageCount,
    pageWidthPt: Number(size?.[1]),
    pageHeightPt: Number(size?.[2]),
  };
}

/** Page images at 60 dpi into the artefact folder; returns their paths. */
async function pageImages(file: string, prefix: string): Promise<string[]> {
  for (const old of fs.readdirSync(shots).filter((entry) => entry.startsWith(`${prefix}-`)))
    fs.rmSync(path.join(shots, old));
  const stem = path.join(output.folder, prefix);
  await run('pdftoppm', ['-png', '-r', '60', file, stem]);
  const images = fs
    .readdirSync(output.folder)
    .filter((entry) => entry.startsWith(`${prefix}-`) && entry.endsWith('.png'))
    .sort();
  return images.map((image) => {
    const number = Number(/-(\d+)\.png$/.exec(image)?.[1] ?? 0);
    const target = path.join(shots, `${prefix}-${number}.png`);
    fs.copyFileSync(path.join(output.folder, image), target);
    return target;
  });
}

describe('pre-procedure worksheet in headless Chromium', () => {
  it('shows a saved plan with the clinic’s emergency drugs, and prints the same page to PDF on A4 and US Letter', async () => {
    const { browser, host } = session;
    const page = await browser.newPage({ viewport: { width: 1366, height: 900 } });
    const problems: string[] = [];
    page.on('pageerror', (error) => problems.push(error.message));
    await completeFirstRun(page, host.url);
    await page.getByRole('heading', { name: 'Patients' }).waitFor();

    const patient = await bridge<{ id: number }>(page, 'patients:create', {
      values: { name: 'Pip', speciesKey: 'budgerigar', sex: 'male', ringId: 'HL-24-117' },
      meta: { enteredBy: 'RW' },
    });
    await bridge(page, 'weights:add', {
      patientId: patient.id,
      values: { weighedOn: daysFromToday(-31), massG: 34 },
      meta: { enteredBy: 'RW' },
    });
    await bridge(page, 'weights:add', {
      patientId: patient.id,
      values: { weighedOn: daysFromToday(-1), massG: 32 },
      meta: { enteredBy: 'RW' },
    });

    // The clinic's own drugs through the settings screen; neutral names, the clinic's numbers.
    await page.goto(`${host.origin}/#/settings`);
    await page.getByRole('heading', { name: 'Emergency drugs' }).waitFor();
    await page.getByText('No emergency drugs entered yet').waitFor();
    const addDrug = async (drug: {
      name: string;
      concentration: string;
      low: string;
      high: string;
      route: string;
      source: string;
    }) => {
      await page.getByRole('button', { name: 'Add emergency drug' }).click();
      await page.getByLabel('Drug name').fill(drug.name);
      await page.getByLabel('Concentration (mg/mL)').fill(drug.concentration);
      await page.getByLabel('Dose, low (mg/kg)').fill(drug.low);
      await page.getByLabel('Dose, high (mg/kg)').fill(drug.high);
      await page.getByLabel('Route').fill(drug.route);
      await page.getByLabel('Source of the dose').fill(drug.source);
      await page.getByRole('button', { name: 'Save drug' }).click();
      await page.getByRole('cell', { name: drug.name, exact: true }).waitFor();
    };
    await page.getByRole('button', { name: 'Add emergency drug' }).click();
    await page.getByLabel('Drug name').fill('Clinic drug A');
    await page.getByLabel('Concentration (mg/mL)').fill('1');
    await page.getByLabel('Dose, low (mg/kg)').fill('0.5');
    await page.getByRole('button', { name: 'Save drug' }).click();
    await page
      .getByText(
        'Enter the source of the dose (formulary, paper or clinic protocol); it is printed on the emergency card.',
      )
      .waitFor();
    await page.getByText('Enter the route, e.g. IV, IM, IO or intratracheal.').waitFor();
    await page.screenshot({ path: path.join(shots, '3x-worksheet-drug-validation.png'), fullPage: true });
    await checkScreen(page, '3x-worksheet-drug-validation');
    await page.getByRole('button', { name: 'Cancel' }).click();
    await addDrug({
      name: 'Clinic drug A',
      concentration: '1',
      low: '0.5',
      high: '1',
      route: 'IV or IO',
      source: 'Heron Lane emergency protocol 2026',
    });
    await addDrug({
      name: 'Clinic drug B',
      concentration: '50',
      low: '20',
      high: '',
      route: 'IM',
      source: 'Clinic formulary p. 12',
    });
    // A correction needs a reason; a removal keeps the row in the history but takes it off the card.
    await page
      .getByRole('row', { name: /Clinic drug B/ })
      .getByRole('button', { name: 'Correct' })
      .click();
    await page.getByLabel('Notes').fill('Draw up with a 1 mL syringe');
    await page.getByRole('button', { name: 'Save correction' }).click();
    await page.getByText('Say why; the reason is kept with the history.').waitFor();
    await page.getByLabel('Reason').fill('Added handling note');
    await page.getByRole('button', { name: 'Save correction' }).click();
    await page.getByRole('cell', { name: 'Draw up with a 1 mL syringe' }).waitFor();
    await addDrug({
      name: 'Clinic drug C',
      concentration: '10',
      low: '1',
      high: '',
      route: 'IV',
      source: 'Entered by mistake',
    });
    await page
      .getByRole('row', { name: /Clinic drug C/ })
      .getByRole('button', { name: 'Remove' })
      .click();
    await page.getByLabel('Reason').fill('Not stocked');
    await page.getByRole('button', { name: 'Remove from the card' }).click();
    await page.getByText('Removed Clinic drug C.').waitFor();
    // The list reloads after the confirmation appears.
    await expect
      .poll(() => page.getByRole('cell', { name: 'Clinic drug C', exact: true }).count(), { timeout: 10_000 })
      .toBe(0);
    await page.screenshot({ path: path.join(shots, '3x-worksheet-drugs-settings.png'), fullPage: true });
    await checkScreen(page, '3x-worksheet-drugs-settings');

    const input = JSON.parse(
      fs.readFileSync(path.join(root, 'examples', 'plans', 'pip-budgerigar-mask-isoflurane.json'), 'utf8'),
    ) as Record<string, unknown>;
    const checklist = {
      asaGrade: 2,
      items: {
        fastingAndCrop: 'done',
        hydration: 'done',
        bloods: 'not applicable',
        equipmentLeakCheck: 'done',
        oxygenSupply: 'done',
        scavenging: 'open',
        emergencyCard: 'open',
      },
    };
    const saved = await bridge<{ id: number; result: { cautions: { message: string; reason: string }[] } }>(
      page,
      'plans:save',
      {
        fields: { patientId: patient.id, plannedFor: daysFromToday(0), label: 'Beak trim', input, checklist },
        meta: { enteredBy: 'RW' },
      },
    );

    await page.goto(`${host.origin}/#/worksheets`);
    await page.getByRole('link', { name: 'Pip' }).click();
    const sheet = page.locator('.worksheet[data-ready="true"]');
    await sheet.waitFor();
    expect(await page.getByRole('button', { name: 'Print' }).isVisible()).toBe(true);
    // The browser host cannot save where the user chooses: no Save as PDF button, the Print path
    // instead, and the channel itself says so.
    expect(await page.getByRole('button', { name: 'Save as PDF' }).count()).toBe(0);
    expect(await page.getByText('press Print and choose Save as PDF as the printer').isVisible()).toBe(true);
    const pdfAnswer = await callBridge(page, 'worksheets:save-pdf', { suggestedName: 'pip.pdf' });
    expect(pdfAnswer).toMatchObject({
      ok: false,
      error: { code: 'unavailable', message: expect.stringMatching(/Print.*npx tidewing worksheet/) },
    });
    const shown = squash(await sheet.innerText());
    expect(shown).toContain('Heron Lane Bird Clinic');
    expect(shown).toContain(`latest 32 g on ${daysFromToday(-1)}`);
    // Hollwarth et al. 2022, J Exotic Pet Med 41:14-19: ASA 2 0.6 %
    expect(shown).toContain('ASA grade ASA 2 · 0.6 % died within 48 h');
    expect(shown).toContain('Still open: Scavenging connected, Emergency card ready.');
    // common practice arithmetic: 0.5-1 mg/kg x 0.032 kg / 1 mg/mL = 0.016-0.032 mL; 20 mg/kg x 0.032 kg / 50 mg/mL = 0.0128 mL, printed to 0.001 mL
    expect(shown).toContain('0.016-0.032 mL');
    expect(shown).toContain('0.013 mL');
    // The summary at the top of the sheet and the detail further down print the same times.
    const timeText = async (name: RegExp) =>
      squash(await page.getByRole('row', { name }).first().locator('td strong').innerText());
    const induction = await timeText(/Predicted induction/);
    const recovery = await timeText(/Predicted recovery/);
    expect(induction).toMatch(/^\d+(\.\d+)? min/);
    expect(recovery).toMatch(/^\d+(\.\d+)? min/);
    const surgicalDepth = squash(
      await page
        .getByRole('row', { name: /^Planned surgical depth/ })
        .locator('td')
        .innerText(),
    );
    const firstMovement = squash(
      await page
        .getByRole('row', { name: /^First movement or head lift/ })
        .locator('td')
        .innerText(),
    );
    expect(surgicalDepth).toMatch(/^\d+(\.\d+)? min from start/);
    expect(firstMovement).toMatch(/^\d+(\.\d+)? min after vaporiser off/);
    // The summary's times are the same milestones.
    expect(surgicalDepth.startsWith(induction.split(' ')[0] ?? '')).toBe(true);
    expect(firstMovement.startsWith(recovery.split(' ')[0] ?? '')).toBe(true);
    // All four clinical milestones are printed, each with a footnote giving its definition
    // (thresholds as the model states them, app/core/model/parameters.ts).
    for (const name of [/^Loss of righting/, /^Standing or perching/])
      await expect(page.getByRole('row', { name }).count()).resolves.toBe(1);
    const definitions = page.getByRole('list', { name: 'What each predicted milestone means' });
    await expect(definitions.getByRole('listitem').allInnerTexts()).resolves.toEqual([
      'Loss of righting: brain reaches 0.6 x MAC (assumption)',
      "Planned surgical depth: brain reaches 1.2 x MAC (the plan's depth)",
      'First movement or head lift: brain below 0.4 x MAC after the vaporiser is off (assumption)',
      'Standing or perching: brain below 0.2 x MAC after the vaporiser is off (assumption)',
    ]);
    await page.screenshot({ path: path.join(shots, '3x-worksheet-screen.png'), fullPage: true });
    await checkScreen(page, '3x-worksheet-screen');
    // Print media at about the printable width of A4 (186 mm): no shell, no buttons.
    await page.setViewportSize({ width: 720, height: 1000 });
    await page.emulateMedia({ media: 'print' });
    await page.screenshot({ path: path.join(shots, '3x-worksheet-print-media.png'), fullPage: true });
    expect(await page.locator('.sidebar').isVisible()).toBe(false);
    expect(await page.getByRole('button', { name: 'Print' }).isVisible()).toBe(false);
    await page.emulateMedia({ media: 'screen' });

    const a4 = await worksheetPdf(saved.id, 'a4');
    // ISO 216 A4 is 210 x 297 mm = 595.3 x 841.9 pt (common practice); Chromium rounds to whole CSS pixels
    expect(a4.pageWidthPt).toBeCloseTo(595.3, 0);
    expect(a4.pageHeightPt).toBeCloseTo(841.9, 0);
    for (const expected of [
      'Heron Lane Bird Clinic',
      'Pip',
      '32 g',
      induction,
      recovery,
      'Standing or perching: brain below 0.2 x MAC after the vaporiser is off (assumption)',
      'NIOSH 1977',
      'Clinic drug A',
      '0.016-0.032 mL',
      'Draw up with a 1 mL syringe',
    ])
      expect(a4.text, expected).toContain(expected);
    expect(a4.text).not.toContain('Clinic drug C');
    for (const caution of saved.result.cautions) {
      expect(a4.text).toContain(squash(caution.message));
      expect(a4.text).toContain(squash(caution.reason));
    }
    expect(a4.text).toContain('The responsible licensed veterinarian decides');
    // Page 1 stands alone in the prep room: the bird, the times, the flow and the emergency card.
    const [first] = a4.pages;
    for (const expected of [
      'Pip',
      'ring HL-24-117',
      '32 g',
      'ASA 2',
      induction,
      recovery,
      'Fresh gas (oxygen)',
      '1 L/min',
      'Emergency card for 32 g',
      'Clinic drug A',
      '0.016-0.032 mL',
      '0.013 mL',
    ])
      expect(first, `page 1: ${expected}`).toContain(expected);
    // Every page names the clinic, the bird and its ring, the date and the plan version, and counts itself.
    a4.pages.forEach((text, index) => {
      const where = `page ${String(index + 1)}`;
      expect(text, where).toContain(`page ${String(index + 1)} of ${String(a4.pageCount)}`);
      expect(text, where).toContain('Heron Lane Bird Clinic · Pip (ring HL-24-117)');
      expect(text, where).toContain(`${daysFromToday(0)} · plan ${String(saved.id)} version`);
    });
    // The monitoring grid comes last.
    expect(a4.pages.at(-1)).toContain('Time (min)');
    const a4Pages = await pageImages(a4.file, '3x-worksheet-page');
    expect(a4Pages.length).toBe(a4.pageCount);
    expect(a4.pageCount).toBeGreaterThanOrEqual(3);

    await bridge(page, 'settings:save', { ...heronLaneSettings, paperSize: 'Letter' });
    const letter = await worksheetPdf(saved.id, 'letter');
    // US Letter is 8.5 x 11 in = 612 x 792 pt (common practice)
    expect(letter.pageWidthPt).toBeCloseTo(612, 0);
    expect(letter.pageHeightPt).toBeCloseTo(792, 0);
    for (const expected of [
      'Pip',
      '32 g',
      induction,
      recovery,
      'The responsible licensed veterinarian decides',
    ])
      expect(letter.text, expected).toContain(expected);
    for (const expected of ['Pip', induction, recovery, '1 L/min', 'Emergency card for 32 g'])
      expect(letter.pages[0], `Letter page 1: ${expected}`).toContain(expected);
    letter.pages.forEach((text, index) => {
      expect(text).toContain(`page ${String(index + 1)} of ${String(letter.pageCount)}`);
      expect(text).toContain('Pip (ring HL-24-117)');
    });
    const letterPages = await pageImages(letter.file, '3x-worksheet-letter-page');
    expect(letterPages.length).toBe(letter.pageCount);
    expect(problems).toEqual([]);
  }, 120_000);
});
