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

const session = sharedHost('tidewing-e2e-charts-');
const shots = ensureScreenshotFolder();

/**
 * The screen at 1366 x 800 and the chart alone, then axe-core in light and dim. The planning
 * screen is checked at 1440 x 1000: at 800 px high its cautions panel scrolls on its own, which
 * axe reports (scrollable-region-focusable) and which belongs to that panel, not to the charts.
 */
async function shoot(page: Page, name: string, chart: string, accessibility = true) {
  await page.screenshot({ path: path.join(shots, `70-charts-${name}.png`), fullPage: true });
  // The chart alone: the planning screen's sticky cautions panel, which would cover its top while
  // scrolled, is set aside for this picture only.
  const setAside = (hidden: boolean) =>
    page.evaluate((hide) => {
      const panel = document.querySelector<HTMLElement>('.cautions-panel');
      if (panel !== null) panel.style.display = hide ? 'none' : '';
    }, hidden);
  await setAside(true);
  await page
    .locator(chart)
    .first()
    .screenshot({ path: path.join(shots, `70-charts-${name}-chart.png`) });
  await setAside(false);
  if (!accessibility) return;
  const size = page.viewportSize();
  if (name.startsWith('planning')) await page.setViewportSize({ width: 1440, height: 1000 });
  await checkScreen(page, `charts-${name}`);
  if (size !== null) await page.setViewportSize(size);
}

/** The colour the browser uses for a system colour now (CanvasText, Highlight...), as rgb(). */
function systemColour(page: Page, name: string): Promise<string> {
  return page.evaluate((colour) => {
    const probe = document.createElement('span');
    probe.style.cssText = `color:${colour};forced-color-adjust:none`;
    document.body.appendChild(probe);
    const value = getComputedStyle(probe).color;
    probe.remove();
    return value;
  }, name);
}

/** The fill of a chart's axis text and the stroke of its strip frame, as drawn. */
function axisColours(page: Page, chart: string): Promise<{ text: string; frame: string }> {
  return page.evaluate((selector) => {
    const svg = document.querySelector(`${selector} .strip-chart-svg`);
    const text = svg?.querySelector('text.strip-axis-text');
    const frame = svg?.querySelector('g.strip > rect:last-of-type');
    return {
      text: text === null || text === undefined ? 'missing' : getComputedStyle(text).fill,
      frame: frame === null || frame === undefined ? 'missing' : getComputedStyle(frame).stroke,
    };
  }, chart);
}

/** A budgerigar induced by mask, then intubated at 8 min after a minute on room air (invented demo). */
const planInput = {
  patientName: 'Juniper',
  bodyMassG: 34,
  speciesId: 'budgerigar',
  agent: 'isoflurane',
  route: 'mask',
  circuit: 'nonRebreathing',
  freshGasLpm: 1,
  schedule: [
    { atMin: 0, vaporPct: 4 },
    { atMin: 10, vaporPct: 2 },
    { atMin: 45, vaporPct: 0 },
  ],
  laterPhases: [{ startMin: 8, gapMin: 1, route: 'endotracheal', freshGasLpm: 0.5 }],
  recoveryWindowMin: 30,
};

describe('charts of our own, in headless Chromium', () => {
  it('planning: depth first, the gas view on a toggle, a keyboard cursor read aloud, a table, forced colours', async () => {
    const page = await session.browser.newPage({ viewport: { width: 1366, height: 800 } });
    const problems: string[] = [];
    page.on('pageerror', (error) => problems.push(error.message));
    try {
      await completeFirstRun(page, session.host.url);
      const juniper = await bridge<{ id: number }>(page, 'patients:create', {
        values: { name: 'Juniper', speciesKey: 'budgerigar', sex: 'female' },
        meta: { enteredBy: 'RW' },
      });
      const today = await page.evaluate(() => {
        const now = new Date();
        return `${now.getFullYear()}-${String(now.getMonth() + 1).padStart(2, '0')}-${String(now.getDate()).padStart(2, '0')}`;
      });
      const saved = await bridge<{ id: number }>(page, 'plans:save', {
        fields: {
          patientId: juniper.id,
          plannedFor: today,
          label: 'Crop biopsy',
          input: planInput,
          checklist: { asaGrade: 2, items: {} },
        },
        meta: { enteredBy: 'RW' },
      });
      await page.goto(`${session.host.origin}/#/plans/${saved.id}`);
      const chart = page.getByRole('group', { name: 'Predicted depth over time' });
      await chart.waitFor();
      const figure = page.locator('.plan-chart .strip-chart');
      // Depth first: the brain in multiples of MAC, the planned depth and waking zone shaded,
      // the milestone levels named, the dial as steps on its own strip.
      await expect(figure.locator('[data-band="planned-depth"]').count()).resolves.toBe(1);
      await expect(figure.locator('[data-band="waking"]').count()).resolves.toBe(1);
      await expect(figure.locator('[data-strip="dial"] [data-line="dial"] polyline').count()).resolves.toBe(
        1,
      );
      await expect(figure.locator('.strip-legend').innerText()).resolves.toContain('Brain');
      // Legends show nothing until there is a cursor, never a placeholder.
      await expect(figure.locator('.strip-legend').innerText()).resolves.not.toMatch(/--/);
      await expect(page.locator('.plan-results .u-legend').count()).resolves.toBe(0);
      await chart.scrollIntoViewIfNeeded();
      await shoot(page, 'planning-depth', '.plan-chart');

      // The keyboard: focus, Right, and the values under the cursor are announced.
      const readout = figure.locator('.strip-readout[aria-live="polite"]');
      await expect(readout.innerText()).resolves.toBe('');
      await chart.focus();
      await page.keyboard.press('ArrowRight');
      await expect.poll(() => readout.innerText()).toMatch(/^0 min: Brain 0 × MAC; Vaporiser dial 4 %/);
      await page.keyboard.press('ArrowRight');
      const second = await readout.innerText();
      expect(second).toMatch(/^1 min: Brain [\d.]+ × MAC; Vaporiser dial 4 %/);
      await page.keyboard.press('PageDown');
      await expect.poll(() => readout.innerText()).toMatch(/^11 min: Brain [\d.]+ × MAC; Vaporiser dial 2 %/);
      // The legend shows the same values as text, not only on hover.
      await expect(
        figure.locator('.strip-legend [data-line="dial"] .strip-legend-value').innerText(),
      ).resolves.toBe('2 %');
      await page.keyboard.press('End');
      await expect.poll(() => readout.innerText()).toMatch(/^75 min: .*Vaporiser dial 0 %/);
      await shoot(page, 'planning-cursor', '.plan-chart', false);

      // The same data as a table, units in the headers.
      await figure.getByRole('button', { name: 'Show as table' }).click();
      const table = figure.getByRole('table', { name: 'Predicted depth over time' });
      await expect(table.locator('thead th').allInnerTexts()).resolves.toEqual([
        'Time (min)',
        'Brain (× MAC)',
        'Vaporiser dial (%)',
      ]);
      await expect(table.locator('tbody tr').first().innerText()).resolves.toMatch(/^0\s+0\s+4$/);
      await shoot(page, 'planning-table', '.plan-chart');
      await figure.getByRole('button', { name: 'Hide the table' }).click();

      // The second view, named in our words.
      await page.getByLabel('Gas in the airways and air sacs').check();
      const gas = page.getByRole('group', { name: 'Predicted gas in the airways and air sacs over time' });
      await gas.waitFor();
      await expect(figure.locator('.strip-legend').innerText()).resolves.toContain('Posterior air sacs');
      await shoot(page, 'planning-gas', '.plan-chart');
      await page.getByRole('radio', { name: 'Depth (× MAC)' }).check();

      // Forced colours: the axis text and the frames are drawn in the system's own colours.
      await page.emulateMedia({ forcedColors: 'active' });
      await expect
        .poll(() => axisColours(page, '.plan-chart'))
        .toEqual({
          text: await systemColour(page, 'CanvasText'),
          frame: await systemColour(page, 'CanvasText'),
        });
      await shoot(page, 'planning-forced-colours', '.plan-chart', false);
      await page.emulateMedia({ forcedColors: 'none' });

      // The worksheet draws the same depth chart, in black and greys, with the saved plan's phases.
      await page.goto(`${session.host.origin}/#/worksheets/${saved.id}`);
      await page.locator('.worksheet[data-ready="true"]').waitFor();
      const sheetChart = page.locator('.worksheet-chart');
      await expect(sheetChart.locator('[data-band="planned-depth"]').count()).resolves.toBe(1);
      await expect(sheetChart.locator('.strip-phase').count()).resolves.toBe(2);
      // The mask phase is too short on the axis for its name: its short mark, named in the key.
      await expect(sheetChart.locator('.strip-phase text').allTextContents()).resolves.toEqual([
        'P1',
        'Endotracheal tube',
      ]);
      await expect(sheetChart.locator('.strip-marker-key').innerText()).resolves.toContain(
        'Phase 1 from the start: Face mask',
      );
      await expect(sheetChart.locator('[tabindex]').count()).resolves.toBe(0);
      await sheetChart.screenshot({ path: path.join(shots, '70-charts-worksheet-chart.png') });
      await page.emulateMedia({ media: 'print' });
      await sheetChart.screenshot({ path: path.join(shots, '70-charts-worksheet-chart-print.png') });
      await page.emulateMedia({ media: null });
      expect(problems).toEqual([]);
    } finally {
      await page.close();
    }
  });

  it('record: small stacked strips with fixed ranges, the dial as steps, keyboard and forced colours', async () => {
    const page = await session.browser.newPage({ viewport: { width: 1366, height: 800 } });
    try {
      await completeFirstRun(page, await session.host.nextUrl());
      const { recordId, startMs } = await startRecordFor(
        page,
        { name: 'Wren', speciesKey: 'cockatiel', sex: 'male' },
        { minutesAgo: 20, procedureName: 'Wing radiograph' },
      );
      const record = { id: recordId };
      const empty = {
        vaporPct: null,
        oxygenLpm: null,
        heartRatePerMin: null,
        breathsPerMin: null,
        temperatureC: null,
        etco2Mmhg: null,
        spo2Pct: null,
        eventType: null,
        eventNote: '',
        drugName: '',
        drugDose: '',
      };
      // Invented readings: a half-degree drift must stay small on the fixed temperature axis.
      const rows = [
        { minute: 1, kind: 'event', eventType: 'induction' },
        { minute: 2, vaporPct: 4, oxygenLpm: 1, heartRatePerMin: 380, breathsPerMin: 36, temperatureC: 40.6 },
        {
          minute: 7,
          vaporPct: 2.5,
          heartRatePerMin: 350,
          breathsPerMin: 30,
          temperatureC: 40.3,
          etco2Mmhg: 38,
        },
        {
          minute: 12,
          vaporPct: 2,
          heartRatePerMin: 340,
          breathsPerMin: 28,
          temperatureC: 40.1,
          etco2Mmhg: 42,
        },
      ];
      for (const row of rows) {
        const { minute, ...values } = row;
        await bridge(page, 'entries:add', {
          recordId: record.id,
          values: {
            ...empty,
            kind: 'vitals',
            ...values,
            at: new Date(startMs + minute * 60_000).toISOString(),
          },
          meta: { enteredBy: 'RW' },
        });
      }
      await page.goto(`${session.host.origin}/#/records/${record.id}`);
      const chart = page.getByRole('group', { name: 'The log over time' });
      await chart.waitFor();
      const figure = page.locator('.record-chart-panel .strip-chart').first();
      await expect(figure.locator('g.strip').count()).resolves.toBe(5);
      // Fixed ranges, shared with the printed record (strip-ranges.ts): temperature 34-44 °C.
      const temperatureTicks = await figure
        .locator('[data-strip="temperatureC"] text.strip-axis-text')
        .allTextContents();
      expect(temperatureTicks).toEqual(['34', '39', '44']);
      await expect(figure.locator('[data-strip="vaporPct"] polyline').count()).resolves.toBe(1);
      await chart.scrollIntoViewIfNeeded();
      await shoot(page, 'record', '.record-chart-panel .strip-chart');

      const readout = figure.locator('.strip-readout');
      await chart.focus();
      await page.keyboard.press('ArrowRight');
      await expect
        .poll(() => readout.innerText())
        .toBe('2 min: Dial 4 %; HR 380 /min; RR 36 /min; Temp 40.6 °C. Induction at 1 min');
      await page.keyboard.press('ArrowRight');
      await expect
        .poll(() => readout.innerText())
        .toBe('7 min: Dial 2.5 %; HR 350 /min; RR 30 /min; Temp 40.3 °C; EtCO2 38 mmHg');
      await figure.getByRole('button', { name: 'Show as table' }).click();
      await expect(figure.getByRole('table').locator('tbody tr').count()).resolves.toBe(3);

      await page.emulateMedia({ forcedColors: 'active' });
      await expect
        .poll(() => axisColours(page, '.record-chart-panel'))
        .toEqual({
          text: await systemColour(page, 'CanvasText'),
          frame: await systemColour(page, 'CanvasText'),
        });
      await shoot(page, 'record-forced-colours', '.record-chart-panel .strip-chart', false);
      await page.emulateMedia({ forcedColors: 'none' });
    } finally {
      await page.close();
    }
  });
});
