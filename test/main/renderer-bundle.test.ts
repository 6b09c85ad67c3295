import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import { needBuilt } from '../support/chromium.js';

const renderer = path.join(findProjectRoot(), 'build', 'renderer');

/** The scripts index.html loads before anything is opened: its entry and the chunks it preloads. */
function firstScreenScripts(html: string): string[] {
  return [...html.matchAll(/(?:src|href)="\.\/(assets\/[^"]+\.js)"/g)].map((match) => match[1] as string);
}

describe('the built renderer', () => {
  it('carries no JSON Schema generation (the renderer never makes a schema; npm run schema runs in Node)', (context) => {
    needBuilt(context, path.join(renderer, 'index.html'));
    const scripts = fs.readdirSync(path.join(renderer, 'assets')).filter((name) => name.endsWith('.js'));
    expect(scripts.length).toBeGreaterThan(0);
    for (const name of scripts) {
      const text = fs.readFileSync(path.join(renderer, 'assets', name), 'utf8');
      // Strings only zod's JSON Schema converters hold.
      expect(text, name).not.toContain('json-schema.org/draft');
      expect(text, name).not.toContain('Non-representable type encountered');
    }
  });

  it('loads the first screen without the other areas or the charting library', (context) => {
    needBuilt(context, path.join(renderer, 'index.html'));
    const scripts = firstScreenScripts(fs.readFileSync(path.join(renderer, 'index.html'), 'utf8'));
    expect(scripts.some((name) => /^assets\/index-/.test(name))).toBe(true);
    for (const name of scripts) {
      expect(name).not.toMatch(/(plans|records|species|worksheets)-area|patient-detail|vendor/);
      const text = fs.readFileSync(path.join(renderer, name), 'utf8');
      // uPlot's own class names: the chart library is in none of them.
      expect(text, name).not.toContain('u-cursor-x');
    }
  });
});
