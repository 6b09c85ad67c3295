import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { localDateOf } from '../../app/contract/input-rules.js';
import { checkScreen } from './accessibility.js';
import { bridgeValue, completeFirstRun, sharedHost } from './host-process.js';

const session = sharedHost('tidewing-e2e-plan-variant-');

type Saved = { id: number; variantOf: number | null; input: { freshGasLpm: number } };

describe('a variant of a saved plan', () => {
  it('saves the plan as edited as a new plan beside the saved one, which is not changed', async () => {
    const { browser, host } = session;
    const page = await browser.newPage({ viewport: { width: 1366, height: 800 } });
    const problems: string[] = [];
    page.on('pageerror', (error) => problems.push(error.message));
    await completeFirstRun(page, host.url);
    const input = JSON.parse(
      fs.readFileSync(
        path.join(import.meta.dirname, '../../examples/plans/pip-budgerigar-mask-isoflurane.json'),
        'utf8',
      ),
    ) as { freshGasLpm: number };
    const saved = await bridgeValue<Saved>(page, 'plans:save', {
      fields: {
        patientId: null,
        plannedFor: localDateOf(new Date()),
        label: 'beak trim',
        input,
        checklist: { asaGrade: 2 },
      },
      meta: { enteredBy: 'RW' },
    });
    await page.goto(`${host.origin}/#/plans/${saved.id}`);
    await page.getByRole('heading', { name: `Anaesthetic plan ${saved.id}` }).waitFor();
    await page.getByTestId('induction-time').waitFor();
    await page.getByLabel(/^Fresh gas flow/).fill('0.6');
    await page.getByRole('button', { name: 'Save as a variant' }).click();

    const variantId = saved.id + 1;
    await page.getByRole('heading', { name: `Anaesthetic plan ${variantId}` }).waitFor();
    await expect(page.getByLabel(/^Fresh gas flow/).inputValue()).resolves.toBe('0.6');
    const panel = page.getByRole('region', { name: 'Saved comparison' });
    await expect
      .poll(() => panel.innerText())
      .toMatch(new RegExp(`This plan \\(${variantId}\\) · beak trim · alternative of plan ${saved.id}`));
    await expect(panel.innerText()).resolves.toMatch(
      new RegExp(`Open plan ${saved.id} · beak trim · compared plan · chosen`),
    );
    await checkScreen(page, '47-plan-saved-as-variant');

    // The saved plan is as it was: one version, its own flow; the variant names it.
    const before = await bridgeValue<{ plan: Saved; history: unknown[] }>(page, 'plans:get', {
      id: saved.id,
    });
    expect(before.plan).toEqual(saved);
    expect(before.history).toHaveLength(1);
    const variant = await bridgeValue<{ plan: Saved }>(page, 'plans:get', { id: variantId });
    expect(variant.plan.variantOf).toBe(saved.id);
    expect(variant.plan.input.freshGasLpm).toBe(0.6);
    expect(problems).toEqual([]);
    await page.close();
  });
});
