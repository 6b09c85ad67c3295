/**
 * The workstation's own settings live in the clinic database, not in the browser's storage: the
 * initials typed in the top bar and the theme pinned in Settings survive a restart on another
 * port, which is another origin with empty browser storage.
 */
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkScreen } from './accessibility.js';
import {
  callBridge,
  completeFirstRun,
  ensureScreenshotFolder,
  sharedBrowser,
  startHostProcess,
} from './host-process.js';

const session = sharedBrowser('tidewing-e2e-workstation-');

type Workstation = { id: string; name: string; theme: string; initials: string };

describe('workstation settings', () => {
  it('keeps the initials and the pinned theme across a restart on another port', async () => {
    const first = await startHostProcess(session.dataFolder);
    let firstId: string | undefined;
    const firstPage = await session.browser.newPage({ viewport: { width: 1366, height: 800 } });
    try {
      await completeFirstRun(firstPage, first.url, 'RW');
      await firstPage.goto(`${first.origin}/#/settings`);
      await firstPage.getByRole('heading', { name: 'This workstation' }).waitFor();
      await checkScreen(firstPage, 'settings-workstation');

      // Initials typed in the top bar, as a nurse would at the start of a shift.
      const topBar = firstPage.getByLabel('Your initials', { exact: true });
      await expect(topBar.inputValue()).resolves.toBe('RW');
      await topBar.fill('JS');
      // The workstation gets a name; an empty one is refused beside the field.
      const name = firstPage.getByLabel('Workstation name');
      await name.fill('   ');
      await firstPage.getByRole('button', { name: 'Save workstation' }).click();
      await firstPage.getByText('Enter a name for this workstation').waitFor();
      await expect(name.evaluate((element) => element === document.activeElement)).resolves.toBe(true);
      await name.fill('Theatre 1');
      await firstPage.getByRole('button', { name: 'Save workstation' }).click();
      await firstPage.getByText('Saved for Theatre 1.').waitFor();
      // Dim, pinned: applied at once.
      await firstPage.getByLabel('Dim, for a darkened theatre').check();
      await expect
        .poll(() => firstPage.evaluate(() => document.documentElement.dataset['theme'] ?? ''))
        .toBe('dim');
      await expect
        .poll(async () => (await callBridge<Workstation>(firstPage, 'workstation:get', {})).value)
        .toMatchObject({ name: 'Theatre 1', theme: 'dim', initials: 'JS' });
      firstId = (await callBridge<Workstation>(firstPage, 'workstation:get', {})).value?.id;
      expect(firstId).toMatch(/^[0-9a-f-]{36}$/);
      await firstPage.screenshot({
        path: path.join(ensureScreenshotFolder(), 'settings-workstation-1366.png'),
        fullPage: false,
      });
    } finally {
      await firstPage.close();
      await first.stop();
    }

    const second = await startHostProcess(session.dataFolder);
    const secondPage = await session.browser.newPage({ viewport: { width: 1366, height: 800 } });
    try {
      expect(second.origin).not.toBe(first.origin);
      const response = await secondPage.goto(second.url);
      // The page arrives with the theme already on its root: no flash of the light one.
      expect(await response?.text()).toContain('data-theme="dim"');
      await secondPage.getByRole('navigation').first().waitFor();
      const topBar = secondPage.getByLabel('Your initials', { exact: true });
      await expect(topBar.inputValue()).resolves.toBe('JS');
      await expect(secondPage.evaluate(() => window.localStorage.length)).resolves.toBe(0);
      await secondPage.goto(`${second.origin}/#/settings`);
      await secondPage.getByRole('heading', { name: 'This workstation' }).waitFor();
      await expect(secondPage.getByLabel('Workstation name').inputValue()).resolves.toBe('Theatre 1');
      await expect(secondPage.getByLabel('Dim, for a darkened theatre').isChecked()).resolves.toBe(true);
      const again = await callBridge<Workstation>(secondPage, 'workstation:get', {});
      expect(again.value?.id).toBe(firstId);
      await secondPage.screenshot({
        path: path.join(ensureScreenshotFolder(), 'settings-workstation-dim-1366.png'),
        fullPage: true,
      });
      // Back to following the system: the next page load carries no theme.
      await secondPage.getByLabel('Follow this computer’s setting').check();
      await expect
        .poll(() => secondPage.evaluate(() => document.documentElement.dataset['theme'] ?? 'none'))
        .toBe('none');
    } finally {
      await secondPage.close();
      await second.stop();
    }
  });
});
