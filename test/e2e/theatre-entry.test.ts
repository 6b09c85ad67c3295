import path from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { checkScreen } from './accessibility.js';
import {
  completeFirstRun,
  ensureScreenshotFolder,
  sharedHost,
  bridgeValue as bridge,
  startRecordFor,
} from './host-process.js';

const session = sharedHost('tidewing-e2e-theatre-');
const shots = ensureScreenshotFolder();

async function shoot(page: Page, name: string, accessibility = true) {
  await page.screenshot({ path: path.join(shots, `4x-theatre-${name}.png`), fullPage: true });
  // axe-core in light and dim, and no sideways scroll at 200 % zoom, as on every other screen.
  if (accessibility) await checkScreen(page, `theatre-${name}`);
}

/** HH:MM on the page's clock, `offsetMin` minutes from `baseMs`. */
async function clockAt(page: Page, baseMs: number, offsetMin: number): Promise<string> {
  return page.evaluate(
    ([base, offset]) => {
      const at = new Date(base + offset * 60_000);
      return `${String(at.getHours()).padStart(2, '0')}:${String(at.getMinutes()).padStart(2, '0')}`;
    },
    [baseMs, offsetMin] as const,
  );
}

describe('entry that catches slips, in headless Chromium', () => {
  it('asks before saving a weight far from the last one, with the reason; Esc fixes, Enter again saves', async () => {
    const page = await session.browser.newPage({ viewport: { width: 1366, height: 800 } });
    try {
      await completeFirstRun(page, session.host.url);
      const kiwi = await bridge<{ id: number }>(page, 'patients:create', {
        values: { name: 'Kiwi', speciesKey: 'cockatiel', sex: 'female' },
        meta: { enteredBy: 'RW' },
      });
      await bridge(page, 'weights:add', {
        patientId: kiwi.id,
        values: { weighedOn: '2026-11-20', massG: 95 },
        meta: { enteredBy: 'RW' },
      });
      await page.goto(`${session.host.origin}/#/patients/${kiwi.id}`);
      const mass = page.locator('.weights-form [name="massG"]');
      await mass.waitFor();
      // 950 g for a 95 g cockatiel: a slip of one digit.
      await mass.fill('950');
      await mass.press('Enter');
      const check = page.locator('.weight-confirm');
      await check.waitFor();
      // (950 - 95) / 95 = 900 % more (arithmetic)
      await expect(check.innerText()).resolves.toContain('950 g is 900 % more than the last weight, 95 g');
      await expect(check.innerText()).resolves.toContain(
        'Press Enter again to save it as it is, or Esc to fix it.',
      );
      await shoot(page, 'weight-slip-asks');
      await expect(page.evaluate(() => document.activeElement?.getAttribute('name'))).resolves.toBe('massG');
      await page.keyboard.press('Escape');
      await expect(check.count()).resolves.toBe(0);
      // Nothing was saved by the first Enter.
      const before = await bridge<{ weights: unknown[] }>(page, 'patients:get', { id: kiwi.id });
      expect(before.weights).toHaveLength(1);
      await mass.fill('96');
      await mass.press('Enter');
      await expect
        .poll(
          async () =>
            (await bridge<{ weights: unknown[] }>(page, 'patients:get', { id: kiwi.id })).weights.length,
        )
        .toBe(2);
      // A real loss of more than a fifth is asked about too, and saved on the second Enter.
      await mass.fill('70');
      await mass.press('Enter');
      await check.waitFor();
      await expect(check.innerText()).resolves.toContain('less than the last weight, 96 g');
      await mass.press('Enter');
      await expect
        .poll(
          async () =>
            (await bridge<{ weights: unknown[] }>(page, 'patients:get', { id: kiwi.id })).weights.length,
        )
        .toBe(3);
      await shoot(page, 'weight-slip-saved');
    } finally {
      await page.close();
    }
  }, 90_000);

  it('logs events at the typed time, repeats the last row on F4, and ends the procedure at the time asked for', async () => {
    const page = await session.browser.newPage({ viewport: { width: 1366, height: 800 } });
    try {
      await completeFirstRun(page, await session.host.nextUrl());
      const { recordId, startMs } = await startRecordFor(
        page,
        { name: 'Pip', speciesKey: 'budgerigar', sex: 'male' },
        { minutesAgo: 25, procedureName: 'Wing radiograph' },
      );
      const record = { id: recordId };
      await page.goto(`${session.host.origin}/#/records/${record.id}`);
      const row = page.getByRole('form', { name: 'New row of readings' });
      await row.waitFor();

      // The event buttons use the time typed in the Time box.
      const inductionTime = await clockAt(page, startMs, 3);
      await row.getByLabel('Time').fill(inductionTime);
      await page.getByRole('group', { name: 'Events' }).getByRole('button', { name: 'Induction' }).click();
      await page.getByText(`Induction logged at ${inductionTime} (the time typed).`).waitFor();
      await expect(row.getByLabel('Time').inputValue()).resolves.toBe('');
      const afterEvent = await bridge<{ entries: { values: { eventType: string | null; at: string } }[] }>(
        page,
        'procedures:get',
        { id: record.id },
      );
      const induction = afterEvent.entries.find((entry) => entry.values.eventType === 'induction');
      expect(induction?.values.at).toBe(new Date(startMs + 3 * 60_000).toISOString());
      await shoot(page, 'event-typed-time');

      // A row of readings, then the same again with F4 for the 5-minute round.
      await row.getByLabel('Vaporiser').fill('2');
      await row.getByLabel('HR').fill('300');
      await row.getByLabel('RR').fill('40');
      await row.getByLabel('HR').press('Enter');
      await expect
        .poll(
          async () =>
            (await row.getByLabel('HR').inputValue()) === '' &&
            (await row.getByLabel('HR').getAttribute('placeholder')),
        )
        .toBe('300');
      await page.keyboard.press('F4');
      await expect(row.getByLabel('HR').inputValue()).resolves.toBe('300');
      await expect(row.getByLabel('Vaporiser').inputValue()).resolves.toBe('2');
      await expect(row.getByLabel('RR').inputValue()).resolves.toBe('40');
      await page.getByText('The last row’s readings are in the boxes').waitFor();
      await shoot(page, 'same-as-last-row');
      await row.getByLabel('HR').press('Enter');
      await expect
        .poll(async () => {
          const detail = await bridge<{
            entries: { values: { kind: string; heartRatePerMin: number | null } }[];
          }>(page, 'procedures:get', { id: record.id });
          return detail.entries.filter(
            (entry) => entry.values.kind === 'vitals' && entry.values.heartRatePerMin === 300,
          ).length;
        })
        .toBe(2);
      // The button does the same as the key.
      await row.getByRole('button', { name: /Same as last row/ }).click();
      await expect(row.getByLabel('HR').inputValue()).resolves.toBe('300');

      // End procedure asks for the time and a confirmation; Esc keeps it running.
      await page.getByRole('button', { name: 'End procedure…' }).click();
      const end = page.getByRole('form', { name: 'End the procedure' });
      await end.getByLabel('End time').waitFor();
      await page.keyboard.press('Escape');
      await expect(end.count()).resolves.toBe(0);
      const stillRunning = await bridge<{ record: { values: { endedAt: string | null } } }>(
        page,
        'procedures:get',
        {
          id: record.id,
        },
      );
      expect(stillRunning.record.values.endedAt).toBeNull();
      await page.getByRole('button', { name: 'End procedure…' }).click();
      const endTime = await clockAt(page, startMs, 20);
      await end.getByLabel('End time').fill(endTime);
      await end.getByRole('button', { name: `End procedure at ${endTime}` }).waitFor();
      await shoot(page, 'end-procedure-asks');
      await end.getByRole('button', { name: `End procedure at ${endTime}` }).click();
      await page.getByText(`ended ${endTime}:00`).waitFor();
      const ended = await bridge<{ record: { values: { endedAt: string | null } } }>(page, 'procedures:get', {
        id: record.id,
      });
      expect(ended.record.values.endedAt).toBe(new Date(startMs + 20 * 60_000).toISOString());
      await shoot(page, 'end-procedure-done');

      // The browser's Print shows the printed record in place of the screen.
      await page.emulateMedia({ media: 'print' });
      await expect(page.locator('.printed-record').isVisible()).resolves.toBe(true);
      await expect(page.locator('.record-header').isVisible()).resolves.toBe(false);
      await shoot(page, 'printed-record-in-window', false);
      await page.emulateMedia({ media: 'screen' });
    } finally {
      await page.close();
    }
  }, 90_000);

  it('shows the workstation beside each row, and a correction or void another workstation saved first refuses this one in its form, what was typed kept', async () => {
    const page = await session.browser.newPage({ viewport: { width: 1366, height: 800 } });
    try {
      await completeFirstRun(page, await session.host.nextUrl());
      await bridge(page, 'workstation:save', { name: 'Theatre 1' });
      const { recordId, startMs } = await startRecordFor(
        page,
        { name: 'Tui', speciesKey: 'budgerigar', sex: 'female' },
        { minutesAgo: 30, procedureName: 'Beak trim' },
      );
      const record = { id: recordId };
      type Entry = { id: number; values: Record<string, unknown> };
      const logRow = (offsetMin: number, heartRatePerMin: number) =>
        bridge<Entry>(page, 'entries:add', {
          recordId: record.id,
          values: {
            at: new Date(startMs + offsetMin * 60_000).toISOString(),
            kind: 'vitals',
            heartRatePerMin,
          },
          meta: { enteredBy: 'RW' },
        });
      const early = await logRow(5, 310);
      const later = await logRow(10, 42);
      await page.goto(`${session.host.origin}/#/records/${record.id}`);
      const log = page.getByRole('region', { name: 'Procedure log' });
      await log.getByRole('cell', { name: 'RW Theatre 1' }).first().waitFor();
      await expect(log.locator('.record-workstation').allInnerTexts()).resolves.toEqual([
        'Theatre 1',
        'Theatre 1',
      ]);

      // This screen opens Correct on the 10-minute row and types; another workstation corrects
      // that row first.
      const laterTime = `${await clockAt(page, startMs, 10)}:00`;
      await log.getByRole('button', { name: `Correct the row at ${laterTime}` }).click();
      const form = page.getByRole('form', { name: `Correct the row at ${laterTime}` });
      await form.getByLabel('HR').fill('240');
      await form.getByLabel('Reason (kept with the history)').fill('Counted for 15 s');
      const elsewhere = await bridge<{ stamp: { enteredAt: string } }>(page, 'entries:correct', {
        id: later.id,
        values: { ...later.values, heartRatePerMin: 420 },
        meta: { enteredBy: 'MK', reason: 'Heart rate missed a digit' },
      });
      const elsewhereClock = await page.evaluate((iso) => {
        const at = new Date(iso);
        return `${String(at.getHours()).padStart(2, '0')}:${String(at.getMinutes()).padStart(2, '0')}`;
      }, elsewhere.stamp.enteredAt);
      await form.getByRole('button', { name: 'Save correction' }).click();
      await form
        .getByRole('alert')
        .filter({
          hasText: `Not saved: this entry was already corrected by MK on Theatre 1 at ${elsewhereClock} (reason: Heart rate missed a digit). Your change was not applied; reload to see the current entry.`,
        })
        .waitFor();
      // The log shows the other correction; the form stays open on that row with what was typed.
      await log.getByRole('cell', { name: '420' }).waitFor();
      await expect(form.getByLabel('HR').inputValue()).resolves.toBe('240');
      await expect(form.getByLabel('Reason (kept with the history)').inputValue()).resolves.toBe(
        'Counted for 15 s',
      );
      await shoot(page, 'correction-conflict');

      // Saving again, now knowing, corrects the version on screen.
      await form.getByRole('button', { name: 'Save correction' }).click();
      await log.getByRole('cell', { name: '240' }).waitFor();
      await expect(form.count()).resolves.toBe(0);
      const afterResave = await bridge<{ entries: { values: { heartRatePerMin: number | null } }[] }>(
        page,
        'procedures:get',
        { id: record.id },
      );
      expect(afterResave.entries.map((entry) => entry.values.heartRatePerMin)).toEqual([310, 240]);

      // Void: the row was voided elsewhere first; the form stays with its reason and says so.
      const earlyTime = `${await clockAt(page, startMs, 5)}:00`;
      await log.getByRole('button', { name: `Void the row at ${earlyTime}` }).click();
      const voidForm = page.getByRole('form', { name: `Void the row at ${earlyTime}` });
      await voidForm.getByLabel('Reason (kept with the history)').fill('Wrong bird');
      await bridge(page, 'entries:void', {
        id: early.id,
        meta: { enteredBy: 'JS', reason: 'Probe off the bird' },
      });
      await voidForm.getByRole('button', { name: 'Void row' }).click();
      await voidForm
        .getByRole('alert')
        .filter({ hasText: 'Not saved: this entry was already voided by JS on Theatre 1' })
        .waitFor();
      await page.getByText(`The row at ${earlyTime} is no longer in the log as you opened it.`).waitFor();
      await expect(voidForm.getByLabel('Reason (kept with the history)').inputValue()).resolves.toBe(
        'Wrong bird',
      );
      await shoot(page, 'void-conflict');
      await voidForm.getByRole('button', { name: 'Cancel' }).click();
      await expect(voidForm.count()).resolves.toBe(0);

      // The printed record names the workstation beside the initials.
      await page.emulateMedia({ media: 'print' });
      await expect(page.locator('.printed-record').innerText()).resolves.toContain('MK (Theatre 1)');
      await page.emulateMedia({ media: 'screen' });
    } finally {
      await page.close();
    }
  }, 90_000);
});
