import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { pipRadiographValues, pipValues } from '../support/clinic-birds.js';
import { callBridge, completeFirstRun, sharedHost } from './host-process.js';

const session = sharedHost('tidewing-e2e-keyboard-');

/** What has focus now: its role-ish tag and its accessible text. */
function focused(page: Page): Promise<{ tag: string; text: string }> {
  return page.evaluate(() => {
    const active = document.activeElement;
    return {
      tag: active?.tagName.toLowerCase() ?? '',
      text: (active?.getAttribute('aria-label') ?? active?.textContent ?? '').replace(/\s+/g, ' ').trim(),
    };
  });
}

/** Presses Tab until focus is on an element whose text matches; fails after `limit` presses. */
async function tabTo(page: Page, text: RegExp, limit = 80): Promise<void> {
  for (let count = 0; count < limit; count += 1) {
    await page.keyboard.press('Tab');
    if (text.test((await focused(page)).text)) return;
  }
  throw new Error(`No element matching ${String(text)} within ${limit} presses of Tab`);
}

/** The window title names the screen and focus sits on its heading. */
async function expectArrivedAt(page: Page, heading: RegExp) {
  await expect
    .poll(() => page.title(), { timeout: 15_000 })
    .toMatch(new RegExp(`^${heading.source}.* - Tidewing$`));
  await expect.poll(async () => (await focused(page)).tag, { timeout: 15_000 }).toBe('h1');
  expect((await focused(page)).text).toMatch(heading);
}

describe('keyboard only', () => {
  it('plans, saves, opens the worksheet from the day list and logs a procedure row without a pointer', async () => {
    const { browser, host } = session;
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    try {
      await completeFirstRun(page, host.url);
      const meta = { enteredBy: 'RW', reason: '' };
      const patient = await callBridge<{ id: number }>(page, 'patients:create', { values: pipValues, meta });
      const patientId = patient.value?.id ?? 0;
      await callBridge(page, 'weights:add', {
        patientId,
        values: { weighedOn: '2026-12-01', massG: 38, bodyCondition: 'ideal', weighedBy: 'RW' },
        meta,
      });

      // The skip link is the first stop and lands on the main content.
      // A fresh load, so focus starts at the top of the page.
      await page.goto(`${host.origin}/#/patients/${patientId}`);
      await page.reload();
      await page.getByRole('heading', { level: 1 }).waitFor();
      await page.keyboard.press('Tab');
      expect((await focused(page)).text).toBe('Skip to main content');
      await page.keyboard.press('Enter');
      expect((await focused(page)).tag).toBe('main');

      // Patient -> new plan -> save.
      await tabTo(page, /^New plan$/);
      await page.keyboard.press('Enter');
      await page.getByRole('heading', { name: /New anaesthetic plan/ }).waitFor();
      await page.getByTestId('induction-time').waitFor();
      await tabTo(page, /^Save plan$/, 200);
      await page.keyboard.press('Enter');
      await page.getByText(/^Saved as plan \d+/).waitFor();
      const planId = Number(/plans\/(\d+)/.exec(page.url())?.[1]);
      // The plan stays on screen (its address is replaced, not navigated); the title follows its heading.
      await expect
        .poll(() => page.title(), { timeout: 15_000 })
        .toMatch(new RegExp(`^Anaesthetic plan ${planId} .* - Tidewing$`));

      // Day list -> worksheet.
      await page.keyboard.press('Alt+3');
      await expectArrivedAt(page, /Anaesthetic plans/);
      await tabTo(page, /^worksheet$/);
      await page.keyboard.press('Enter');
      await expectArrivedAt(page, /Anaesthetic worksheet: prep-room summary/);

      // A procedure row, and Escape out of the drug form back to its button.
      const record = await callBridge<{ id: number }>(page, 'procedures:create', {
        patientId,
        values: pipRadiographValues,
        meta,
      });
      await page.goto(`${host.origin}/#/records/${record.value?.id ?? 0}`);
      await page
        .getByRole('heading', { name: /Procedure record|Pip/ })
        .first()
        .waitFor();
      await expect.poll(async () => (await focused(page)).tag).toBe('input');
      await page.keyboard.type('2.5');
      await page.keyboard.press('Enter');
      await page.getByRole('button', { name: /^Correct the row at .* \(row 1\)$/ }).waitFor();
      await tabTo(page, /^Drug given…$/);
      await page.keyboard.press('Enter');
      await expect.poll(async () => (await focused(page)).tag).toBe('input');
      await page.keyboard.press('Escape');
      expect((await focused(page)).text).toBe('Drug given…');
      await expect(page.getByLabel('Dose and route as given').count()).resolves.toBe(0);

      // Correct: Enter opens the form with focus in it; Escape closes it and returns to the button.
      const correctName = /^Correct the row at .* \(row \d+\)$/;
      await tabTo(page, correctName);
      const correctButton = (await focused(page)).text;
      await page.keyboard.press('Enter');
      await expect.poll(async () => (await focused(page)).tag).toBe('input');
      await expect(page.getByRole('form', { name: /^Correct the row at/ }).count()).resolves.toBe(1);
      await page.keyboard.press('Escape');
      expect((await focused(page)).text).toBe(correctButton);
      await expect(page.getByRole('form', { name: /^Correct the row at/ }).count()).resolves.toBe(0);
      // Void: the same, focus in its reason box.
      await page.keyboard.press('Tab');
      expect((await focused(page)).text).toMatch(/^Void the row at/);
      const voidButton = (await focused(page)).text;
      await page.keyboard.press('Enter');
      await expect.poll(async () => (await focused(page)).text).toBe('');
      expect((await focused(page)).tag).toBe('input');
      await page.keyboard.press('Escape');
      expect((await focused(page)).text).toBe(voidButton);
      await expect(page.getByRole('form', { name: /^Void the row at/ }).count()).resolves.toBe(0);
      // The record-details editor: Escape closes it and returns to "Correct details".
      await page.getByRole('button', { name: 'Correct details' }).focus();
      await page.keyboard.press('Enter');
      await page.getByRole('heading', { name: 'Correct the record’s details' }).waitFor();
      await page.getByLabel('Reason for the correction').focus();
      await page.keyboard.press('Escape');
      await expect(page.getByRole('heading', { name: 'Correct the record’s details' }).count()).resolves.toBe(
        0,
      );
      expect((await focused(page)).text).toBe('Correct details');
    } finally {
      await page.close();
    }
  });
});
