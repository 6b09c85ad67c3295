import { execFileSync, spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { PageNotReadyError, printPageToPdf } from '../../main/cli/headless-pdf.js';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import { temporaryFolder } from '../support/temporary-folder.js';
import { chromiumPath as chromiumAt, needBuilt, needChromium } from '../support/chromium.js';

const chromiumPath = chromiumAt();
const compiled = path.join(findProjectRoot(), 'build', 'main', 'cli', 'headless-pdf.js');

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

function scratch(): string {
  const temp = temporaryFolder('tidewing-headless-pdf-');
  cleanups.push(temp.remove);
  return temp.folder;
}

function page(html: string): string {
  return `data:text/html;charset=utf-8,${encodeURIComponent(html)}`;
}

/** Processes still running with this scratch folder on their command line. */
function processesUsing(folder: string): string[] {
  const listing = execFileSync('ps', ['-eo', 'args'], { encoding: 'utf8' });
  return listing.split('\n').filter((line) => line.includes(folder));
}

/** After a job: Chromium is gone and its scratch profile removed. */
function expectCleanedUp(folder: string): void {
  expect(fs.readdirSync(folder)).toEqual([]);
  expect(processesUsing(folder)).toEqual([]);
}

describe('headless Chromium print over the DevTools pipe', () => {
  beforeEach((context) => void needChromium(context));
  it('waits for the ready mark, prints the page to PDF and leaves nothing running', async () => {
    const folder = scratch();
    const html = `<style>@page { size: A4; margin: 10mm; }</style><h1>Heron Lane test sheet</h1>
      <script>setTimeout(() => { const p = document.createElement('p'); p.className = 'drawn'; p.textContent = 'Drawn later'; document.body.append(p); }, 150);</script>`;
    const pdf = await printPageToPdf({
      executablePath: chromiumPath,
      url: page(html),
      readySelector: '.drawn',
      timeoutMs: 20_000,
      scratchDirectory: folder,
    });
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    const file = `${folder}-sheet.pdf`;
    cleanups.push(() => fs.rmSync(file, { force: true }));
    fs.writeFileSync(file, pdf);
    const text = execFileSync('pdftotext', [file, '-'], { encoding: 'utf8' });
    // The text added after the page loaded is in the PDF: the print waited for it.
    expect(text).toContain('Heron Lane test sheet');
    expect(text).toContain('Drawn later');
    // A4 from the page's own @page rule: 595 x 842 pt.
    expect(execFileSync('pdfinfo', [file], { encoding: 'utf8' })).toMatch(
      /Page size:\s+59[45](\.\d+)? x 84[12](\.\d+)? pts \(A4\)/,
    );
    expectCleanedUp(folder);
  }, 60_000);

  it('reports the page’s alerts and script errors when the ready mark never appears', async () => {
    const folder = scratch();
    const html = `<p role="alert">There is no plan 41.</p><script>setTimeout(() => { throw new Error('drawing failed'); }, 1500);</script>`;
    const failure = await printPageToPdf({
      executablePath: chromiumPath,
      url: page(html),
      readySelector: '.never',
      timeoutMs: 5000,
      scratchDirectory: folder,
    }).then(
      () => null,
      (error: unknown) => error,
    );
    expect(failure).toBeInstanceOf(PageNotReadyError);
    const notReady = failure as PageNotReadyError;
    expect(notReady.alerts).toEqual(['There is no plan 41.']);
    expect(notReady.pageErrors.join(' ')).toContain('drawing failed');
    expectCleanedUp(folder);
  }, 60_000);

  it('stops Chromium at once when the job is no longer wanted', async () => {
    const folder = scratch();
    const stop = new AbortController();
    setTimeout(() => stop.abort(new Error('the plan was not found')), 200);
    await expect(
      printPageToPdf({
        executablePath: chromiumPath,
        url: page('<p>never ready</p>'),
        readySelector: '.never',
        timeoutMs: 20_000,
        scratchDirectory: folder,
        signal: stop.signal,
      }),
      // The abort's own reason, not the 20 s timeout's message: the job stopped when it was told to.
    ).rejects.toThrow('the plan was not found');
    expectCleanedUp(folder);
  }, 60_000);
});

describe('headless print interrupted', () => {
  beforeEach((context) => {
    needChromium(context);
    needBuilt(context, compiled);
  });
  it('stops Chromium and removes its profile when the command is interrupted (Ctrl+C), then ends by that signal', async () => {
    const folder = scratch();
    const script = `const { printPageToPdf } = await import(${JSON.stringify(new URL(`file://${compiled}`).href)});
      await printPageToPdf({ executablePath: ${JSON.stringify(chromiumPath)}, url: 'data:text/html,<p>never ready</p>', readySelector: '.never', timeoutMs: 60000, scratchDirectory: ${JSON.stringify(folder)} });`;
    const child = spawn(process.execPath, ['--input-type=module', '-e', script], { stdio: 'ignore' });
    const ended = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) =>
      child.once('exit', (code, signal) => resolve({ code, signal })),
    );
    // Wait until Chromium is running with its profile in the folder, then interrupt.
    const chromiumRunning = () => processesUsing(`--user-data-dir=${folder}`).length > 0;
    const deadline = Date.now() + 20_000;
    while (!chromiumRunning() && Date.now() < deadline)
      await new Promise((resolve) => setTimeout(resolve, 50));
    expect(chromiumRunning()).toBe(true);
    expect(fs.readdirSync(folder)).toHaveLength(1);
    child.kill('SIGINT');
    const { code, signal } = await ended;
    expect(signal === 'SIGINT' || code === 130).toBe(true);
    expectCleanedUp(folder);
  }, 60_000);
});

describe('headless print with a browser that does not start', () => {
  it('rejects with the exit of the program instead of waiting', async () => {
    const folder = scratch();
    await expect(
      printPageToPdf({
        executablePath: '/bin/false',
        url: page('<p>x</p>'),
        readySelector: 'p',
        timeoutMs: 20_000,
        scratchDirectory: folder,
      }),
    ).rejects.toThrow(/Chromium stopped \(exit code 1\)/);
    expect(fs.readdirSync(folder)).toEqual([]);
  });

  it('rejects when the program does not exist', async () => {
    const folder = scratch();
    await expect(
      printPageToPdf({
        executablePath: `${folder}/no-such-browser`,
        url: page('<p>x</p>'),
        readySelector: 'p',
        timeoutMs: 20_000,
        scratchDirectory: folder,
      }),
    ).rejects.toThrow(/Chromium could not be started|Chromium stopped/);
    expect(fs.readdirSync(folder)).toEqual([]);
  });
});
