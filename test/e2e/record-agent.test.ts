import fs from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import { openChecklist } from '../support/clinic-birds.js';
import { heronLaneSettings } from '../support/clinic-settings.js';
import { checkScreen } from './accessibility.js';
import { bridgeValue, completeFirstRun, ensureScreenshotFolder, sharedHost } from './host-process.js';

const session = sharedHost('tidewing-e2e-record-agent-');
const shots = ensureScreenshotFolder();

async function shoot(page: Page, name: string) {
  await page.screenshot({ path: path.join(shots, `1x-record-agent-${name}.png`), fullPage: true });
  await checkScreen(page, `1x-record-agent-${name}`);
}

/** Kiwi's plan from examples/plans: a chamber induction with isoflurane. */
const kiwiPlan = JSON.parse(
  fs.readFileSync(
    path.join(findProjectRoot(), 'examples', 'plans', 'kiwi-cockatiel-chamber-isoflurane.json'),
    'utf8',
  ),
) as { agent: string };

describe('the agent of a procedure record in headless Chromium', () => {
  it('starts a record with sevoflurane by keyboard; the record, its outcome and the evidence show it', async () => {
    const page = await session.browser.newPage({ viewport: { width: 1366, height: 800 } });
    const pageErrors: string[] = [];
    page.on('pageerror', (error) => pageErrors.push(error.message));
    try {
      await completeFirstRun(page, session.host.url);
      // The clinic's default agent is desflurane here, so each source of the agent can be told apart.
      await bridgeValue(page, 'settings:save', { ...heronLaneSettings, defaultAgent: 'desflurane' });
      const today = await page.evaluate(() => {
        const now = new Date();
        const pad = (value: number) => String(value).padStart(2, '0');
        return `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`;
      });
      const kiwi = await bridgeValue<{ id: number }>(page, 'patients:create', {
        values: { name: 'Kiwi', speciesKey: 'cockatiel', sex: 'female' },
        meta: { enteredBy: 'RW' },
      });
      await bridgeValue(page, 'weights:add', {
        patientId: kiwi.id,
        values: { weighedOn: today, massG: 92 },
        meta: { enteredBy: 'RW' },
      });
      expect(kiwiPlan.agent).toBe('isoflurane');
      const plan = await bridgeValue<{ id: number }>(page, 'plans:save', {
        fields: {
          patientId: kiwi.id,
          plannedFor: today,
          label: 'Beak trim',
          input: kiwiPlan,
          checklist: openChecklist,
        },
        meta: { enteredBy: 'RW' },
      });
      await page.reload();

      await page.evaluate((id) => (window.location.hash = `#/records/new/${id}`), kiwi.id);
      await page.getByRole('heading', { name: 'New procedure record' }).waitFor();
      const agent = page.getByLabel('Anaesthetic agent');
      // No plan linked: the clinic's default, said beside it.
      await expect(agent.inputValue()).resolves.toBe('desflurane');
      await page.getByText('The clinic’s default agent (Settings); no plan is linked.').waitFor();
      // Linking the plan takes its agent.
      await page.getByLabel('Linked plan').selectOption(String(plan.id));
      await expect.poll(() => agent.inputValue()).toBe('isoflurane');
      await page.getByText('The linked plan’s agent.').waitFor();
      // Chosen by keyboard: focus the list and type the first letters of the agent.
      await agent.focus();
      await page.keyboard.type('Sevo');
      await expect.poll(() => agent.inputValue()).toBe('sevoflurane');
      await page
        .getByText('Not the linked plan’s agent (Isoflurane); the record keeps the one chosen here.')
        .waitFor();
      // Started half an hour ago, so that the whole anaesthetic can be logged below.
      const startLocal = await page.evaluate(() => {
        const start = new Date(Date.now() - 30 * 60_000);
        const pad = (value: number) => String(value).padStart(2, '0');
        return `${start.getFullYear()}-${pad(start.getMonth() + 1)}-${pad(start.getDate())}T${pad(start.getHours())}:${pad(start.getMinutes())}`;
      });
      await page.getByLabel('Start', { exact: true }).fill(startLocal);
      // The plan gave the airway (chamber) and the procedure; the circuit and staff are filled here.
      await page.getByLabel('Non-rebreathing system').check();
      await page.getByLabel('Staff initials').fill('RW');
      await shoot(page, '01-new-sevoflurane');
      await page.getByRole('button', { name: 'Start procedure record' }).click();

      await page.getByRole('heading', { name: /Kiwi/ }).waitFor();
      const recordId = Number(/#\/records\/(\d+)$/.exec(page.url())?.[1]);
      const header = page.locator('.record-header');
      await header.getByText('Sevoflurane', { exact: true }).waitFor();
      const detail = await bridgeValue<{ record: { values: { agent: string; startedAt: string } } }>(
        page,
        'procedures:get',
        { id: recordId },
      );
      expect(detail.record.values.agent).toBe('sevoflurane');
      await shoot(page, '02-live-sevoflurane');
      // The printed record names it too.
      await page.emulateMedia({ media: 'print' });
      await expect(page.locator('.printed-record').innerText()).resolves.toMatch(/Agent\s+Sevoflurane/);
      await page.emulateMedia({ media: 'screen' });

      // The details editor shows the agent, with no "not recorded" for a record that names one.
      await page.getByRole('button', { name: 'Correct details' }).click();
      const editor = page.locator('.record-details-editor');
      await expect(editor.getByLabel('Anaesthetic agent').inputValue()).resolves.toBe('sevoflurane');
      await expect(editor.getByRole('option', { name: /not recorded/ }).count()).resolves.toBe(0);
      await shoot(page, '03-details-editor');
      await page.getByRole('button', { name: 'Close' }).click();

      // A whole anaesthetic logged, then ended: the outcome and the evidence read sevoflurane.
      const startMs = Date.parse(detail.record.values.startedAt);
      const at = (minutes: number) => new Date(startMs + minutes * 60_000).toISOString();
      const row = { etco2Mmhg: null, spo2Pct: null, eventNote: '', drugName: '', drugDose: '' };
      const vitals = (minutes: number, vaporPct: number) => ({
        ...row,
        at: at(minutes),
        kind: 'vitals',
        vaporPct,
        oxygenLpm: 1,
        heartRatePerMin: 300,
        breathsPerMin: 30,
        temperatureC: 40,
        eventType: null,
      });
      const event = (minutes: number, eventType: string) => ({
        ...row,
        at: at(minutes),
        kind: 'event',
        vaporPct: null,
        oxygenLpm: null,
        heartRatePerMin: null,
        breathsPerMin: null,
        temperatureC: null,
        eventType,
      });
      for (const values of [
        vitals(0, 6),
        event(2, 'induction'),
        vitals(5, 3.5),
        event(12, 'vaporiserOff'),
        event(15, 'firstMovement'),
        event(20, 'standing'),
      ])
        await bridgeValue(page, 'entries:add', { recordId, values, meta: { enteredBy: 'RW' } });
      await page.reload();
      await page.getByRole('heading', { name: /Kiwi/ }).waitFor();
      await page.getByRole('button', { name: 'End procedure…' }).click();
      await page.getByRole('button', { name: /End procedure at/ }).click();
      // Ended: the outcome compares what was observed with the model read with sevoflurane.
      const outcome = page.getByRole('region', { name: 'Observed beside predicted for what was given' });
      await outcome.getByText(/Agent: Sevoflurane, logged on the record\./).waitFor();
      await shoot(page, '04-outcome');

      await page.evaluate(() => (window.location.hash = '#/evidence'));
      await page.getByLabel('Agent').first().selectOption('sevoflurane');
      const kiwiRows = page.locator('.evidence-table tbody tr', { hasText: 'Kiwi (Cockatiel)' });
      await kiwiRows.first().waitFor();
      await expect(kiwiRows.count()).resolves.toBe(1);
      await expect(kiwiRows.getByText(/^Sevoflurane, chamber, RW$/).isVisible()).resolves.toBe(true);
      await shoot(page, '05-evidence-sevoflurane');
      await page.getByLabel('Agent').first().selectOption('isoflurane');
      await expect.poll(() => kiwiRows.count()).toBe(0);

      // A record that names no agent (as every record made before records carried one) says so,
      // and its correction may keep it so: "not recorded" is offered and chosen.
      const older = await bridgeValue<{ id: number }>(page, 'procedures:create', {
        patientId: kiwi.id,
        values: {
          startedAt: new Date(startMs - 24 * 3_600_000).toISOString(),
          procedureName: 'Radiographs',
          airway: 'mask',
          circuit: 'nonRebreathing',
          staffInitials: 'RW',
        },
        meta: { enteredBy: 'RW' },
      });
      await page.evaluate((id) => (window.location.hash = `#/records/${id}`), older.id);
      await page.locator('.record-header').getByText('agent not recorded', { exact: true }).waitFor();
      await page.getByRole('button', { name: 'Correct details' }).click();
      const olderAgent = page.locator('.record-details-editor').getByLabel('Anaesthetic agent');
      await expect(olderAgent.inputValue()).resolves.toBe('');
      await expect(olderAgent.locator('option:checked').innerText()).resolves.toBe('not recorded');
      await shoot(page, '06-older-record-editor');
      expect(pageErrors).toEqual([]);
    } finally {
      await page.close();
    }
  });
});
