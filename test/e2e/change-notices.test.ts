import fs from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { localDateOf } from '../../app/contract/input-rules.js';
import { checkScreen } from './accessibility.js';
import { callBridge, completeFirstRun, ensureScreenshotFolder, sharedHost } from './host-process.js';

const session = sharedHost('tidewing-e2e-changes-');
const shots = ensureScreenshotFolder();

/** Resolves once the page's change stream has its answer (the host has subscribed it). */
function changeStreamOpened(page: Page): Promise<unknown> {
  return page.waitForResponse((response) => new URL(response.url()).pathname === '/changes');
}

describe('screens follow changes made in another window', () => {
  it('a weight added on one page appears on another showing the same patient, without a reload and without losing what is typed there', async () => {
    const { browser, host } = session;
    const contextA = await browser.newContext({ viewport: { width: 1366, height: 800 } });
    const contextB = await browser.newContext({ viewport: { width: 1366, height: 800 } });
    try {
      const pageA = await contextA.newPage();
      const pageB = await contextB.newPage();
      const problems: string[] = [];
      for (const page of [pageA, pageB]) page.on('pageerror', (error) => problems.push(error.message));

      await completeFirstRun(pageA, host.url);
      const created = await callBridge<{ id: number }>(pageA, 'patients:create', {
        values: { name: 'Juniper', speciesKey: 'budgerigar', sex: 'female' },
        meta: { enteredBy: 'RW', reason: '' },
      });
      expect(created.ok, JSON.stringify(created)).toBe(true);
      const patientId = created.value?.id ?? 0;

      const opened = changeStreamOpened(pageB);
      await pageB.goto(await host.nextUrl());
      await pageB.getByRole('heading', { name: 'Patients' }).waitFor();
      await opened;
      // The patient list follows a new patient too: a second bird created on page A appears.
      const second = await callBridge(pageA, 'patients:create', {
        values: { name: 'Quill', speciesKey: 'budgerigar', sex: 'male' },
        meta: { enteredBy: 'RW', reason: '' },
      });
      expect(second.ok, JSON.stringify(second)).toBe(true);
      await pageB.getByRole('link', { name: /Quill/ }).waitFor();

      for (const page of [pageA, pageB]) {
        await page.evaluate((id) => {
          window.location.hash = `#/patients/${String(id)}`;
        }, patientId);
        await page.getByRole('heading', { name: /Juniper/ }).waitFor();
      }
      // Marks page B: a reload would lose it.
      await pageB.evaluate(() => {
        (window as unknown as { notReloaded: boolean }).notReloaded = true;
      });
      // Someone is typing a weight on page B and has not saved it.
      await pageB.getByLabel('Weight (g)', { exact: true }).fill('39');

      const today = localDateOf(new Date());
      await pageA.getByLabel('Date', { exact: true }).fill(today);
      await pageA.getByLabel('Weight (g)', { exact: true }).fill('41.5');
      await pageA.getByLabel('Weight (g)', { exact: true }).press('Enter');
      await pageA.getByRole('cell', { name: '41.5 g' }).waitFor();

      await pageB.getByRole('cell', { name: '41.5 g' }).waitFor();
      expect(await pageB.evaluate(() => (window as unknown as { notReloaded?: boolean }).notReloaded)).toBe(
        true,
      );
      expect(await pageB.getByLabel('Weight (g)', { exact: true }).inputValue()).toBe('39');
      await pageB.screenshot({ path: path.join(shots, '90-weight-from-another-window.png'), fullPage: true });
      await checkScreen(pageB, '90-weight-from-another-window');

      // Page B is hidden (another tab in front): its stream closes. Shown again, it reopens the
      // stream and refreshes, so a weight added meanwhile appears.
      const setHidden = (page: Page, hidden: boolean) =>
        page.evaluate((value) => {
          Object.defineProperty(document, 'hidden', { configurable: true, get: () => value });
          document.dispatchEvent(new Event('visibilitychange'));
        }, hidden);
      await setHidden(pageB, true);
      await pageA.getByLabel('Weight (g)', { exact: true }).fill('42.5');
      await pageA.getByLabel('Weight (g)', { exact: true }).press('Enter');
      await pageA.getByRole('cell', { name: '42.5 g' }).waitFor();
      const reopened = changeStreamOpened(pageB);
      await setHidden(pageB, false);
      await reopened;
      await pageB.getByRole('cell', { name: '42.5 g' }).waitFor();
      expect(await pageB.evaluate(() => (window as unknown as { notReloaded?: boolean }).notReloaded)).toBe(
        true,
      );
      expect(await pageB.getByLabel('Weight (g)', { exact: true }).inputValue()).toBe('39');
      expect(problems).toEqual([]);
    } finally {
      await contextA.close();
      await contextB.close();
    }
  });

  it('a log row and a details correction made on one page reach the procedure record open on another; an open details form is kept, with an offer to show the new details', async () => {
    const { browser, host } = session;
    const contextA = await browser.newContext({ viewport: { width: 1366, height: 800 } });
    const contextB = await browser.newContext({ viewport: { width: 1366, height: 800 } });
    try {
      const pageA = await contextA.newPage();
      const pageB = await contextB.newPage();
      const problems: string[] = [];
      for (const page of [pageA, pageB]) page.on('pageerror', (error) => problems.push(error.message));
      await completeFirstRun(pageA, await host.nextUrl());
      const patient = await callBridge<{ id: number }>(pageA, 'patients:create', {
        values: { name: 'Saffron', speciesKey: 'budgerigar', sex: 'female' },
        meta: { enteredBy: 'RW', reason: '' },
      });
      expect(patient.ok, JSON.stringify(patient)).toBe(true);
      const startedAt = new Date(Date.now() - 10 * 60_000).toISOString();
      const details = {
        planId: null,
        startedAt,
        endedAt: null,
        asaGrade: 2,
        emergency: false,
        procedureName: 'Wing radiograph',
        fasting: '1 h, crop empty',
        cropChecked: 'empty',
        airway: 'mask',
        tubeSizeMm: null,
        tubeType: '',
        circuit: 'nonRebreathing',
        staffInitials: 'RW',
        promptIntervalMin: 5,
      };
      const record = await callBridge<{ id: number }>(pageA, 'procedures:create', {
        patientId: patient.value?.id,
        values: details,
        meta: { enteredBy: 'RW', reason: '' },
      });
      expect(record.ok, JSON.stringify(record)).toBe(true);
      const recordId = record.value?.id ?? 0;

      const opened = changeStreamOpened(pageB);
      await pageB.goto(await host.nextUrl());
      await opened;
      await pageB.evaluate((id) => {
        window.location.hash = `#/records/${String(id)}`;
      }, recordId);
      await pageB.getByRole('button', { name: 'Correct details' }).waitFor();
      await pageB.evaluate(() => {
        (window as unknown as { notReloaded: boolean }).notReloaded = true;
      });

      const row = await callBridge(pageA, 'entries:add', {
        recordId,
        values: {
          at: new Date(Date.now() - 5 * 60_000).toISOString(),
          kind: 'event',
          eventType: 'note',
          eventNote: 'Left wing extended for the view',
        },
        meta: { enteredBy: 'RW', reason: '' },
      });
      expect(row.ok, JSON.stringify(row)).toBe(true);
      await pageB.getByRole('cell', { name: /Left wing extended for the view/ }).waitFor();

      // Page B starts a correction of the details and types in it; page A corrects them first.
      await pageB.getByRole('button', { name: 'Correct details' }).click();
      await pageB.getByLabel('Procedure', { exact: true }).fill('Wing and leg radiographs');
      const corrected = await callBridge(pageA, 'procedures:correct', {
        id: recordId,
        values: { ...details, procedureName: 'Wing radiograph, two views' },
        meta: { enteredBy: 'RW', reason: 'Second view taken' },
      });
      expect(corrected.ok, JSON.stringify(corrected)).toBe(true);
      const offer = pageB.getByRole('button', { name: 'Show the new details' });
      await offer.waitFor();
      expect(await pageB.getByLabel('Procedure', { exact: true }).inputValue()).toBe(
        'Wing and leg radiographs',
      );
      await pageB.screenshot({
        path: path.join(shots, '91-record-details-changed-elsewhere.png'),
        fullPage: true,
      });
      await checkScreen(pageB, '91-record-details-changed-elsewhere');
      await offer.click();
      expect(await pageB.getByLabel('Procedure', { exact: true }).inputValue()).toBe(
        'Wing radiograph, two views',
      );
      expect(await pageB.evaluate(() => (window as unknown as { notReloaded?: boolean }).notReloaded)).toBe(
        true,
      );
      expect(problems).toEqual([]);
    } finally {
      await contextA.close();
      await contextB.close();
    }
  });

  it('a saved plan open on one page follows a correction made on another while untouched, and keeps an edited form with an offer to show the new plan; the saved plans list follows too', async () => {
    const { browser, host } = session;
    const contextA = await browser.newContext({ viewport: { width: 1366, height: 800 } });
    const contextB = await browser.newContext({ viewport: { width: 1366, height: 800 } });
    try {
      const pageA = await contextA.newPage();
      const pageB = await contextB.newPage();
      const problems: string[] = [];
      for (const page of [pageA, pageB]) page.on('pageerror', (error) => problems.push(error.message));
      await completeFirstRun(pageA, await host.nextUrl());
      const input: unknown = JSON.parse(
        fs.readFileSync(
          path.join(import.meta.dirname, '../../examples/plans/pip-budgerigar-mask-isoflurane.json'),
          'utf8',
        ),
      );
      const today = localDateOf(new Date());
      const fields = (label: string) => ({ patientId: null, plannedFor: today, label, input, checklist: {} });
      const meta = { enteredBy: 'RW', reason: '' };
      const first = await callBridge<{ id: number }>(pageA, 'plans:save', {
        fields: fields('Crop biopsy'),
        meta,
      });
      expect(first.ok, JSON.stringify(first)).toBe(true);
      const firstId = first.value?.id ?? 0;

      // The saved plans list (Worksheets) on page B gains a plan saved on page A.
      const opened = changeStreamOpened(pageB);
      await pageB.goto(await host.nextUrl());
      await opened;
      await pageB.evaluate(() => {
        window.location.hash = '#/worksheets';
      });
      await pageB.getByRole('cell', { name: /Crop biopsy/ }).waitFor();
      await pageB.evaluate(() => {
        (window as unknown as { notReloaded: boolean }).notReloaded = true;
      });
      const second = await callBridge(pageA, 'plans:save', { fields: fields('Beak trim'), meta });
      expect(second.ok, JSON.stringify(second)).toBe(true);
      await pageB.getByRole('cell', { name: /Beak trim/ }).waitFor();

      // The plan open, untouched, on page B shows the version saved on page A.
      await pageB.evaluate((id) => {
        window.location.hash = `#/plans/${String(id)}`;
      }, firstId);
      await pageB.getByRole('heading', { name: `Anaesthetic plan ${String(firstId)}` }).waitFor();
      const label = pageB.getByLabel('Label', { exact: true });
      expect(await label.inputValue()).toBe('Crop biopsy');
      const corrected = await callBridge<{ id: number }>(pageA, 'plans:correct', {
        id: firstId,
        fields: fields('Crop biopsy, left side'),
        meta: { enteredBy: 'RW', reason: 'Side named' },
      });
      expect(corrected.ok, JSON.stringify(corrected)).toBe(true);
      const correctedId = corrected.value?.id ?? 0;
      await pageB.getByRole('heading', { name: `Anaesthetic plan ${String(correctedId)}` }).waitFor();
      expect(await label.inputValue()).toBe('Crop biopsy, left side');

      // Someone edits the plan on page B; page A corrects it first: page B keeps what is typed.
      await label.fill('Crop biopsy and swab');
      const again = await callBridge<{ id: number }>(pageA, 'plans:correct', {
        id: correctedId,
        fields: fields('Crop biopsy, right side'),
        meta: { enteredBy: 'RW', reason: 'Other side' },
      });
      expect(again.ok, JSON.stringify(again)).toBe(true);
      const offer = pageB.getByRole('button', { name: 'Show the new plan' });
      await offer.waitFor();
      expect(await label.inputValue()).toBe('Crop biopsy and swab');
      await pageB.getByRole('heading', { name: `Anaesthetic plan ${String(correctedId)}` }).waitFor();
      await pageB.screenshot({ path: path.join(shots, '92-plan-changed-elsewhere.png'), fullPage: true });
      await checkScreen(pageB, '92-plan-changed-elsewhere');
      await offer.click();
      await pageB
        .getByRole('heading', { name: `Anaesthetic plan ${String(again.value?.id ?? 0)}` })
        .waitFor();
      expect(await label.inputValue()).toBe('Crop biopsy, right side');
      expect(await pageB.evaluate(() => (window as unknown as { notReloaded?: boolean }).notReloaded)).toBe(
        true,
      );
      expect(problems).toEqual([]);
    } finally {
      await contextA.close();
      await contextB.close();
    }
  });
});
