import fs from 'node:fs';
import path from 'node:path';
import type { Locator, Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { checkScreen } from './accessibility.js';
import { procedureCsvHeaders } from '../../app/core/procedure-csv.js';
import { ensureScreenshotFolder, sharedBrowser, startHostProcess } from './host-process.js';

const session = sharedBrowser('tidewing-e2e-record-');
const shots = ensureScreenshotFolder();

async function shoot(page: Page, name: string) {
  await page.screenshot({ path: path.join(shots, `1x-record-${name}.png`), fullPage: true });
  await checkScreen(page, `1x-record-${name}`);
}

/** Calls a contract channel the way the bridge does, with the tab's token. */
async function callApi(
  page: Page,
  channel: string,
  request: unknown,
): Promise<{ ok: boolean; value?: { id: number }; error?: { message: string } }> {
  return page.evaluate(
    async ([name, body]) => {
      const response = await fetch(`/api/${name}`, {
        method: 'POST',
        headers: {
          'content-type': 'application/json',
          'x-tidewing-token': window.sessionStorage.getItem('tidewing.token') ?? '',
        },
        body: JSON.stringify(body),
      });
      return response.json();
    },
    [channel, request] as const,
  );
}

/** The clinic's clock in the page: a start 25 minutes ago and row times 0, 5, 10, 15 and 20 minutes after it. */
async function clockPlan(page: Page) {
  return page.evaluate(() => {
    const pad = (value: number) => String(value).padStart(2, '0');
    const start = new Date(Date.now() - 25 * 60_000);
    start.setSeconds(0, 0);
    const local = `${start.getFullYear()}-${pad(start.getMonth() + 1)}-${pad(start.getDate())}T${pad(start.getHours())}:${pad(start.getMinutes())}`;
    const rows = [0, 5, 10, 15, 20].map((offset) => {
      const at = new Date(start.getTime() + offset * 60_000);
      return `${pad(at.getHours())}:${pad(at.getMinutes())}`;
    });
    return {
      startLocal: local,
      rowTimes: rows,
      today: `${start.getFullYear()}-${pad(start.getMonth() + 1)}-${pad(start.getDate())}`,
    };
  });
}

/** Splits CSV text (RFC 4180: quoted cells may hold commas, quotes and line breaks) into rows of cells. */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = '';
  let quoted = false;
  for (let index = 0; index < text.length; index += 1) {
    const character = text[index];
    if (quoted) {
      if (character === '"' && text[index + 1] === '"') {
        cell += '"';
        index += 1;
      } else if (character === '"') quoted = false;
      else cell += character;
    } else if (character === '"') quoted = true;
    else if (character === ',') {
      row.push(cell);
      cell = '';
    } else if (character === '\r' && text[index + 1] === '\n') {
      row.push(cell);
      rows.push(row);
      row = [];
      cell = '';
      index += 1;
    } else cell += character;
  }
  if (cell !== '' || row.length > 0) rows.push([...row, cell]);
  return rows;
}

async function typeRow(page: Page, entryForm: Locator, time: string, readings: readonly string[]) {
  // Focus sits in the first reading after every save; the time box is one step back.
  await entryForm.getByLabel('Vaporiser').focus();
  await page.keyboard.press('Shift+Tab');
  await page.keyboard.type(time);
  for (const reading of readings) {
    await page.keyboard.press('Tab');
    if (reading !== '') await page.keyboard.type(reading);
  }
  await page.keyboard.press('Enter');
}

describe('procedure record screens in headless Chromium', () => {
  it('starts a record, logs rows and events by keyboard, corrects and voids rows, and exports the CSV', async () => {
    const host = await startHostProcess(session.dataFolder);
    const page = await session.browser.newPage({
      viewport: { width: 1366, height: 768 },
      acceptDownloads: true,
    });
    const pageErrors: string[] = [];
    page.on('pageerror', (error) => pageErrors.push(error.message));
    page.on('console', (message) => {
      if (message.type() === 'error') pageErrors.push(message.text());
    });
    try {
      await page.goto(host.url);
      await page.getByRole('heading', { name: 'Before you use Tidewing' }).waitFor();
      await page.getByLabel('Your name or initials').fill('R.W.');
      await page.getByLabel(/I have read these cautions/).check();
      await page.getByRole('button', { name: 'Acknowledge and continue' }).click();
      await page.getByRole('heading', { name: 'Set up your clinic' }).waitFor();
      await page.getByLabel('Clinic name').fill('Heron Lane Bird Clinic');
      // Fahrenheit and kPa: entry in display units must be stored in °C and mmHg.
      await page.getByLabel('°F').check();
      await page.getByLabel('kPa').check();
      await page.getByRole('button', { name: 'Save settings' }).click();
      await page.getByText(/^Saved /).waitFor();

      const clock = await clockPlan(page);
      const created = await callApi(page, 'patients:create', {
        values: { name: 'Kiwi', speciesKey: 'cockatiel', ringId: 'HL-2041' },
        meta: { enteredBy: 'RW' },
      });
      expect(created.ok, JSON.stringify(created.error)).toBe(true);
      const patientId = created.value?.id ?? 0;
      const weighed = await callApi(page, 'weights:add', {
        patientId,
        values: { weighedOn: clock.today, massG: 92 },
        meta: { enteredBy: 'RW' },
      });
      expect(weighed.ok, JSON.stringify(weighed.error)).toBe(true);

      // New record: validation beside the fields first.
      await page.evaluate((id) => (window.location.hash = `#/records/new/${id}`), patientId);
      await page.getByRole('heading', { name: 'New procedure record' }).waitFor();
      await expect(page.getByText('Kiwi, Cockatiel, 92 g').isVisible()).resolves.toBe(true);
      await page.getByRole('button', { name: 'Start procedure record' }).click();
      await page.getByText('Enter the procedure.').waitFor();
      await expect(
        page.getByText('Choose mask, chamber, endotracheal tube or air-sac tube.').isVisible(),
      ).resolves.toBe(true);
      await expect(page.getByText('Choose non-rebreathing system or circle.').isVisible()).resolves.toBe(
        true,
      );
      await shoot(page, '01-new-validation');

      await page.getByLabel('Procedure', { exact: true }).fill('Beak and nail trim');
      await page.getByLabel('Start', { exact: true }).fill(clock.startLocal);
      await page.getByRole('radio', { name: '2', exact: true }).check();
      await page.getByRole('radio', { name: 'empty', exact: true }).check();
      await page.getByLabel('Endotracheal tube').check();
      await page.getByLabel('Tube size (mm)').fill('2.5');
      await page.getByLabel('Uncuffed').check();
      await page.getByLabel('Non-rebreathing system').check();
      await page.getByLabel('Staff initials').fill('RW');
      await expect(page.getByLabel('Prompt interval (min)').inputValue()).resolves.toBe('5');
      await shoot(page, '02-new-filled');
      // Nobody has put initials in the top bar yet: the write waits and asks for them.
      await page.getByRole('button', { name: 'Start procedure record' }).click();
      const askInitials = page.getByRole('alertdialog', { name: /Who is entering this/ });
      await askInitials.waitFor();
      await askInitials.getByLabel('Your initials').press('Enter');
      await askInitials.getByText('Enter your initials; every record keeps who wrote it.').waitFor();
      await shoot(page, '02b-ask-initials');
      await askInitials.getByLabel('Your initials').fill('RW');
      await askInitials.getByLabel('Your initials').press('Enter');

      await page.getByRole('heading', { name: /Kiwi/ }).waitFor();
      expect(page.url()).toMatch(/#\/records\/\d+$/);
      const header = page.locator('.record-header');
      await expect(header.getByText('ASA 2', { exact: true }).isVisible()).resolves.toBe(true);
      await expect(header.getByText('Endotracheal tube 2.5 mm, uncuffed').isVisible()).resolves.toBe(true);
      await expect(header.getByText('latest weight 92 g').isVisible()).resolves.toBe(true);
      await expect(page.getByText('No plan linked.').isVisible()).resolves.toBe(true);
      // Started 25 minutes ago with no vitals: the reminder is showing.
      await expect(
        page.getByRole('alert').filter({ hasText: 'Time to log vitals' }).isVisible(),
      ).resolves.toBe(true);
      await shoot(page, '03-live-empty');

      const entryForm = page.getByRole('form', { name: 'New row of readings' });
      await expect(
        entryForm
          .getByLabel('SpO2')
          .getAttribute('aria-describedby')
          .then((id) => page.locator(`[id="${id ?? ''}"]`).innerText()),
      ).resolves.toBe('trend only in birds');
      const rows: readonly (readonly string[])[] = [
        ['4', '1', '280', '20', '104', '5.3', ''],
        ['2.5', '1', '300', '18', '103.5', '5.6', '96'],
        ['2', '0.8', '310', '16', '103.1', '5.9', ''],
        ['2', '0.8', '320', '15', '102.7', '6', ''],
        ['2', '0.8', '330', '14', '', '6.1', ''],
      ];
      const entryRows = page.locator('.record-entries tbody tr:not(.record-detail-row)');
      for (const [index, readings] of rows.entries()) {
        await typeRow(page, entryForm, clock.rowTimes[index] ?? '', readings);
        await expect.poll(() => entryRows.count()).toBe(index + 1);
      }
      // Enter put focus back in the first reading.
      await expect(page.evaluate(() => document.activeElement?.getAttribute('id') ?? '')).resolves.toMatch(
        /vaporPct$/,
      );
      // The last row is five minutes old: with a 5-minute interval the reminder stays.
      await expect(
        page.getByRole('alert').filter({ hasText: 'Time to log vitals' }).isVisible(),
      ).resolves.toBe(true);

      // A row with nothing in it is refused beside the row.
      await entryForm.getByLabel('Vaporiser').focus();
      await page.keyboard.press('Enter');
      await entryForm.getByText('Enter at least one reading in the row.').waitFor();

      // Two events from the keyboard: induction by its button, apnoea by the stopwatch key.
      await page.getByRole('button', { name: 'Induction', exact: true }).focus();
      await page.keyboard.press('Enter');
      await expect.poll(() => entryRows.count()).toBe(6);
      await page.keyboard.press('F2');
      await page.getByRole('button', { name: /Apnoea \d+ s: stop and log/ }).waitFor();
      await page.locator('.record-apnoea-danger').waitFor({ timeout: 15_000 });
      await expect(page.getByText('Apnoea over 10 s: act now.').isVisible()).resolves.toBe(true);
      await shoot(page, '04-apnoea-danger');
      await page.keyboard.press('F2');
      await expect.poll(() => entryRows.count()).toBe(7);
      // The logged length is at least the 10 s the danger state waited for; how much longer depends
      // on how busy the machine is, so only the lower bound is checked.
      const apnoeaText = await page
        .locator('.record-entries')
        .getByText(/Apnoea: lasted \d+ s \(stopwatch\)/)
        .innerText();
      expect(Number(/lasted (\d+) s/.exec(apnoeaText)?.[1])).toBeGreaterThanOrEqual(10);
      await shoot(page, '05-rows-and-events');

      // A sixth row at the current time clears the reminder; voiding it brings the reminder back.
      await entryForm.getByLabel('Vaporiser').focus();
      await page.keyboard.type('2');
      await page.keyboard.press('Tab');
      await page.keyboard.type('0.8');
      await page.keyboard.press('Enter');
      await expect.poll(() => entryRows.count()).toBe(8);
      await expect.poll(() => page.getByText('Time to log vitals').count()).toBe(0);
      const newestTime = (await entryRows.first().locator('td').first().innerText()).trim();
      await page.getByRole('button', { name: `Void the row at ${newestTime}` }).click();
      await page.getByRole('button', { name: 'Void row' }).click();
      await page.getByText('Say why the record is corrected; the reason is kept with the history.').waitFor();
      await page.getByLabel('Reason (kept with the history)').fill('Entered for the wrong bird');
      await page.getByRole('button', { name: 'Void row' }).click();
      await expect.poll(() => entryRows.count()).toBe(7);
      await page.getByText('Time to log vitals').waitFor();

      // Correct the third row (heart rate misread), reason required, then see its history.
      const third = `${clock.rowTimes[2]}:00`;
      await page.getByRole('button', { name: `Correct the row at ${third}` }).click();
      const correction = page.getByRole('form', { name: `Correct the row at ${third}` });
      await expect(correction.getByLabel('HR').inputValue()).resolves.toBe('310');
      await expect(correction.getByLabel('Temp').inputValue()).resolves.toBe('103.1');
      await correction.getByLabel('HR').fill('312');
      await correction.getByRole('button', { name: 'Save correction' }).click();
      await correction
        .getByText('Say why the record is corrected; the reason is kept with the history.')
        .waitFor();
      await correction.getByLabel('Reason (kept with the history)').fill('Misread the monitor');
      await correction.getByLabel('Reason (kept with the history)').press('Enter');
      await page.locator('.record-corrected').waitFor();
      await page.getByRole('button', { name: `History of the row at ${third}` }).click();
      const history = page.getByRole('table', { name: `History of the row at ${third}` });
      await history.waitFor();
      await expect(history.locator('tbody tr').count()).resolves.toBe(2);
      await expect(history.getByText(/HR 312 \/min/).isVisible()).resolves.toBe(true);
      await expect(history.getByText(/HR 310 \/min/).isVisible()).resolves.toBe(true);
      await expect(history.getByText('Misread the monitor').isVisible()).resolves.toBe(true);
      // Who: the initials, with the workstation that wrote each version (this one, by its default name).
      await expect(history.getByRole('cell', { name: /^RW( |$)/ }).count()).resolves.toBe(2);
      await shoot(page, '06-corrected-history');

      // The reminder interval is editable on the live screen; the change is kept as a correction of the record.
      await page.getByLabel('Remind me to log vitals every').fill('30');
      await page.getByLabel('Remind me to log vitals every').press('Enter');
      await expect.poll(() => page.getByText('Time to log vitals').count()).toBe(0);
      const recordId = Number(/#\/records\/(\d+)$/.exec(page.url())?.[1]);
      const recordHistory = await callApi(page, 'procedures:history', { id: recordId });
      expect(JSON.stringify(recordHistory)).toContain('Prompt interval changed from 5 to 30 min');

      // The drug form takes the drug and dose as the clinic writes them; nothing is suggested.
      await page.getByRole('button', { name: 'Drug given…' }).click();
      await expect(
        page.getByText('Entered by the clinic; Tidewing suggests no dose.').isVisible(),
      ).resolves.toBe(true);
      await page.getByRole('button', { name: 'Log drug' }).click();
      await page.locator('.record-events').getByText('Name the drug given.').waitFor();
      await shoot(page, '06b-drug-form');
      await page.getByRole('button', { name: 'Drug given…' }).click();

      // Milestones, chart and layout on a 1366 x 768 screen.
      await expect(page.getByLabel('Recovery milestones').getByText('Gas off').isVisible()).resolves.toBe(
        true,
      );
      await expect(page.getByRole('group', { name: 'The log over time' }).count()).resolves.toBe(1);
      const widths = await page.evaluate(() => ({
        scroll: document.documentElement.scrollWidth,
        client: document.documentElement.clientWidth,
      }));
      expect(widths.scroll).toBeLessThanOrEqual(widths.client);

      // CSV export through the browser download.
      const [download] = await Promise.all([
        page.waitForEvent('download'),
        page.getByRole('button', { name: 'Download CSV' }).click(),
      ]);
      expect(download.suggestedFilename()).toMatch(/^tidewing-procedure-\d+-Kiwi-\d{4}-\d{2}-\d{2}\.csv$/);
      const csvPath = await download.path();
      const csv = fs.readFileSync(csvPath, 'utf8');
      const table = parseCsv(csv);
      const titles = table.map((row) => row.join('|'));
      expect(titles).toContain('patient|Kiwi');
      expect(titles).toContain('species|Cockatiel');
      expect(titles).toContain('procedure|Beak and nail trim');
      expect(titles).toContain('ASA grade|2');
      const headerIndex = titles.indexOf(procedureCsvHeaders.join('|'));
      expect(headerIndex).toBeGreaterThan(0);
      const cells = table.slice(headerIndex + 1).filter((row) => row.length > 1);
      const column = (name: (typeof procedureCsvHeaders)[number]) => procedureCsvHeaders.indexOf(name);
      expect(cells.filter((row) => row[column('kind')] === 'vitals')).toHaveLength(5);
      expect(
        cells
          .filter((row) => row[column('kind')] === 'event')
          .map((row) => row[column('event')])
          .sort(),
      ).toEqual(['Apnoea', 'Induction']);
      const first = cells.find((row) => row[column('minutes from start')] === '0');
      // 104 °F is 40 °C and 5.3 kPa is 39.75 mmHg (760/101.325 mmHg per kPa, units.ts).
      expect(first?.[column('temperature (C)')]).toBe('40');
      expect(first?.[column('EtCO2 (mmHg)')]).toBe('39.75');
      expect(first?.[column('heart rate (/min)')]).toBe('280');
      const corrected = cells.filter((row) => row[column('corrected')] === 'yes');
      expect(corrected).toHaveLength(1);
      expect(corrected[0]?.[column('heart rate (/min)')]).toBe('312');
      expect(corrected[0]?.[column('minutes from start')]).toBe('10');
      expect(cells.every((row) => row[column('entered by')] === 'RW')).toBe(true);

      // The record is listed with a link.
      await page.keyboard.press('Alt+4');
      await page.getByRole('heading', { name: 'Procedure records' }).waitFor();
      await page.getByRole('link', { name: 'Kiwi' }).waitFor();
      await expect(page.getByRole('cell', { name: 'Beak and nail trim' }).isVisible()).resolves.toBe(true);
      await shoot(page, '07-recent-list');

      // A new record can also start from a patient search.
      await page.getByRole('link', { name: 'choose a patient for a new procedure record' }).click();
      await page.getByLabel(/Find a patient/).fill('HL-2041');
      await page.getByRole('link', { name: 'Kiwi (Cockatiel)' }).click();
      await page.getByRole('button', { name: 'Start procedure record' }).waitFor();
      expect(page.url()).toMatch(new RegExp(`#/records/new/${patientId}$`));
      expect(pageErrors, pageErrors.join('\n')).toEqual([]);
    } finally {
      await page.close();
      await host.stop();
    }
  });
});
