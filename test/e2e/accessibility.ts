import fs from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { expect } from 'vitest';
import { ensureScreenshotFolder } from './host-process.js';

const axeSource = fs.readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');

/**
 * What axe checks: WCAG 2.0 and 2.1, levels A and AA (the tags axe gives those success criteria),
 * plus the structure rules the accessibility audit of issue 15 found broken (best practice in axe,
 * kept so they stay fixed).
 */
const wcagTags = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];
const structureRules = [
  'landmark-one-main',
  'region',
  'heading-order',
  'empty-table-header',
  'page-has-heading-one',
  'landmark-unique',
  'landmark-no-duplicate-main',
];

type Violation = { readonly rule: string; readonly impact: string; readonly targets: string[] };

/** Runs axe-core in the page as it is now; one line per failing element. */
export async function axeViolations(page: Page): Promise<Violation[]> {
  const loaded = await page.evaluate(() => 'axe' in window);
  // Evaluated through the DevTools protocol, so the page's script policy does not block it.
  if (!loaded) await page.evaluate(axeSource);
  return page.evaluate(
    async ({ tags, rules }) => {
      type AxeResult = {
        violations: { id: string; impact: string | null; nodes: { target: unknown[] }[] }[];
      };
      const axe = (window as unknown as { axe: { run: (...args: unknown[]) => Promise<AxeResult> } }).axe;
      const wcag = await axe.run(document, {
        runOnly: { type: 'tag', values: tags },
        resultTypes: ['violations'],
      });
      const structure = await axe.run(document, {
        runOnly: { type: 'rule', values: rules },
        resultTypes: ['violations'],
      });
      return [...wcag.violations, ...structure.violations].map((violation) => ({
        rule: violation.id,
        impact: violation.impact ?? '',
        targets: violation.nodes.map((node) => node.target.map(String).join(' ')),
      }));
    },
    { tags: wcagTags, rules: structureRules },
  );
}

/** True when the page as a whole scrolls sideways (WCAG 1.4.10 Reflow). */
async function scrollsSideways(
  page: Page,
): Promise<{ scrollWidth: number; clientWidth: number; widest: string[] }> {
  return page.evaluate(() => {
    const element = document.scrollingElement ?? document.documentElement;
    const limit = element.clientWidth + 1;
    const name = (node: Element) =>
      `${node.tagName.toLowerCase()}${node.id === '' ? '' : `#${node.id}`}${[...node.classList].map((item) => `.${item}`).join('')}`;
    // The outermost elements reaching past the window's right edge: where a fix belongs.
    const widest = [...document.body.querySelectorAll('*')]
      .filter((node) => node.getBoundingClientRect().right > limit)
      .filter(
        (node) => node.parentElement === null || node.parentElement.getBoundingClientRect().right <= limit,
      )
      .slice(0, 5)
      .map((node) => `${node.parentElement === null ? '' : `${name(node.parentElement)} > `}${name(node)}`);
    return { scrollWidth: element.scrollWidth, clientWidth: element.clientWidth, widest };
  });
}

export type ScreenCheck = {
  /** Also check reflow at 640 x 400 CSS pixels (200 % zoom of a 1280 x 800 window). Default true. */
  readonly reflow?: boolean;
  /** Also save a screenshot in the dim theme. Default true. */
  readonly screenshot?: boolean;
};

/**
 * Checks the screen shown now, as the tests reach it: axe-core in the light and the dim theme (the
 * dim one by emulating a system set to dark, which the app follows), no sideways page scroll at
 * 200 % zoom of 1280 x 800, and a screenshot in the dim theme. Failures are soft: the test goes on
 * and fails at its end with every screen's findings listed.
 */
export async function checkScreen(page: Page, name: string, check: ScreenCheck = {}): Promise<void> {
  try {
    for (const scheme of ['light', 'dark'] as const) {
      await page.emulateMedia({ colorScheme: scheme });
      const theme = scheme === 'dark' ? 'dim' : 'light';
      const violations = await axeViolations(page);
      expect
        .soft(
          violations.map(
            (violation) => `${violation.rule} (${violation.impact}): ${violation.targets.join(', ')}`,
          ),
          `axe-core on ${name}, ${theme} theme`,
        )
        .toEqual([]);
      if (scheme === 'dark' && check.screenshot !== false) {
        await page.screenshot({
          path: path.join(ensureScreenshotFolder(), `dim-${name}.png`),
          fullPage: true,
        });
      }
    }
    if (check.reflow !== false) {
      const before = page.viewportSize();
      await page.setViewportSize({ width: 640, height: 400 });
      // Two frames, so resize observers (the charts) have redrawn at the new width.
      await page.evaluate(
        () => new Promise((resolve) => requestAnimationFrame(() => requestAnimationFrame(resolve))),
      );
      const size = await scrollsSideways(page);
      expect
        .soft(size.scrollWidth, `${name} at 640 x 400 scrolls sideways (${JSON.stringify(size)})`)
        .toBeLessThanOrEqual(size.clientWidth);
      if (before !== null) await page.setViewportSize(before);
    }
  } finally {
    await page.emulateMedia({ colorScheme: null });
  }
}
