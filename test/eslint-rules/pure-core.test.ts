import { Linter, RuleTester } from 'eslint';
import globals from 'globals';
import tseslint from 'typescript-eslint';
import { describe, expect, it } from 'vitest';
import { pureCore } from '../../eslint-rules/pure-core.js';

RuleTester.describe = describe;
RuleTester.it = it;
RuleTester.itOnly = it.only;

const file = 'app/core/model/example.ts';
// The rule must not depend on the configured globals: app/core gets ES globals only in
// eslint.config.js, but a Node global configured by mistake is still reported.
const tester = new RuleTester({
  languageOptions: { parser: tseslint.parser, globals: { ...globals.node, ...globals.browser } },
});

describe('pure-core keeps app/core to plain ECMAScript', () => {
  tester.run('pure-core', pureCore, {
    valid: [
      { filename: file, code: 'export const longest = Math.max(1, 2) * Math.PI;' },
      { filename: file, code: 'export const when = (epochMs: number) => new Date(epochMs).toISOString();' },
      { filename: file, code: "export const parsed = Date.parse('2026-01-01T00:00:00Z');" },
      { filename: file, code: 'export const stamp = (at: Date) => new Date(at.getTime());' },
      {
        filename: file,
        code: 'export const values = new Map<string, number>(); export const list: ReadonlyArray<number> = [1, Number.NaN, Infinity];',
      },
      { filename: file, code: 'export function f(x?: number): boolean { return x === undefined; }' },
      { filename: file, code: 'export const text = JSON.stringify({ a: 1 }) + String(Symbol.iterator);' },
      {
        // A local named like a global is the caller's, not the host's.
        filename: file,
        code: 'export function elapsed(clock: { now(): number }, process: { id: number }) { const Date = clock; return Date.now() + process.id; }',
      },
      { filename: file, code: 'export function draw(random: () => number) { return random(); }' },
      // Types run nothing: a lib type in a type position is fine.
      { filename: file, code: 'export type Stamp = { readonly at: Record<string, Date> };' },
    ],
    invalid: [
      { filename: file, code: 'export const t = Date.now();', errors: [{ messageId: 'clock' }] },
      { filename: file, code: 'export const now = Date.now;', errors: [{ messageId: 'clock' }] },
      { filename: file, code: "export const t = Date['now']();", errors: [{ messageId: 'clock' }] },
      { filename: file, code: 'export const d = new Date();', errors: [{ messageId: 'clock' }] },
      { filename: file, code: 'export const d = new Date;', errors: [{ messageId: 'clock' }] },
      { filename: file, code: 'export const d = Date();', errors: [{ messageId: 'clock' }] },
      { filename: file, code: 'export const r = Math.random();', errors: [{ messageId: 'random' }] },
      {
        filename: file,
        code: 'export const pick = [1, 2].map(Math.random);',
        errors: [{ messageId: 'random' }],
      },
      {
        filename: file,
        code: "export const home = process.env['HOME'];",
        errors: [{ messageId: 'hostGlobal', data: { name: 'process' } }],
      },
      {
        filename: file,
        code: "export const bytes = Buffer.from('x');",
        errors: [{ messageId: 'hostGlobal', data: { name: 'Buffer' } }],
      },
      {
        filename: file,
        code: 'export const width = window.innerWidth;',
        errors: [{ messageId: 'hostGlobal', data: { name: 'window' } }],
      },
      {
        filename: file,
        code: 'export const title = () => document.title;',
        errors: [{ messageId: 'hostGlobal', data: { name: 'document' } }],
      },
      {
        filename: file,
        code: "export function say() { console.log('x'); }",
        errors: [{ messageId: 'hostGlobal', data: { name: 'console' } }],
      },
      {
        filename: file,
        code: 'export const t = performance.now();',
        errors: [{ messageId: 'hostGlobal', data: { name: 'performance' } }],
      },
      {
        filename: file,
        code: 'export const id = crypto.randomUUID();',
        errors: [{ messageId: 'hostGlobal', data: { name: 'crypto' } }],
      },
      {
        filename: file,
        code: 'export const later = (run: () => void) => setTimeout(run, 10);',
        errors: [{ messageId: 'hostGlobal', data: { name: 'setTimeout' } }],
      },
      {
        filename: file,
        code: "export const env = (globalThis as { process?: unknown })['process'];",
        errors: [{ messageId: 'hostGlobal', data: { name: 'globalThis' } }],
      },
      {
        filename: file,
        code: 'export const kind = typeof navigator;',
        errors: [{ messageId: 'hostGlobal', data: { name: 'navigator' } }],
      },
      {
        // A name nothing declares is reported too, as no-undef would.
        filename: file,
        code: 'export const x = someUndeclaredThing + 1;',
        errors: [{ messageId: 'hostGlobal', data: { name: 'someUndeclaredThing' } }],
      },
    ],
  });
});

describe('pure-core messages', () => {
  it('name the rule, so `npm run lint` says which rule refused the line', () => {
    const linter = new Linter();
    const messages = linter.verify(
      'export const t = Date.now();',
      {
        files: ['**/*.ts'],
        languageOptions: { parser: tseslint.parser },
        plugins: { tidewing: { rules: { 'pure-core': pureCore } } },
        rules: { 'tidewing/pure-core': 'error' },
      },
      file,
    );
    expect(messages).toHaveLength(1);
    expect(messages[0]?.ruleId).toBe('tidewing/pure-core');
    expect(messages[0]?.message).toMatch(/^tidewing\/pure-core: Date\.now\(\) reads the clock;/);
  });
});
