import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { chromium } from 'playwright-core';
import { startBackEnd } from '../../main/back-end/back-end.js';
import { chromiumArguments } from '../../main/cli/headless-pdf.js';
import { runWorksheetCommand } from '../../main/cli/worksheet-command.js';
import { startLoopbackHost } from '../../main/host/loopback-host.js';
import { findProjectRoot, readAppVersion, rendererDirectory } from '../../main/back-end/project-paths.js';
import { chromiumOrReason } from '../support/chromium.js';
import { median, type Figure } from './figures.js';
import { benchClinicSettings } from '../support/clinic-settings.js';
import { localDateOf } from '../../app/contract/input-rules.js';

const runs = 5;
const quiet = { stdout: () => undefined, stderr: () => undefined };

/** A data folder with the cautions acknowledged, settings saved, two clinic drugs and one plan. */
async function preparedData(root: string): Promise<{ folder: string; planId: number }> {
  const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'tidewing-bench-worksheet-'));
  const backEnd = startBackEnd({ dataDirectory: folder, appVersion: readAppVersion(root), host: 'browser' });
  try {
    const call = async (channel: string, payload: unknown): Promise<{ id: number }> => {
      const answer = await backEnd.dispatch(channel, payload);
      if (!answer.ok) throw new Error(`${channel}: ${answer.error.message}`);
      return answer.value as { id: number };
    };
    await call('safety:acknowledge', { acknowledgedBy: 'BE', accepted: true });
    await call('settings:save', benchClinicSettings);
    // Neutral placeholders: Tidewing ships no drug and no dose.
    for (const name of ['Bench drug A', 'Bench drug B']) {
      await call('drugs:add', {
        values: {
          name,
          concentrationMgPerMl: 1,
          doseLowMgPerKg: 1,
          doseHighMgPerKg: 2,
          route: 'IV',
          doseSource: 'bench placeholder',
        },
        meta: { enteredBy: 'BE' },
      });
    }
    const input = JSON.parse(
      fs.readFileSync(path.join(root, 'examples', 'plans', 'pip-budgerigar-mask-isoflurane.json'), 'utf8'),
    ) as unknown;
    const saved = await call('plans:save', {
      fields: {
        patientId: null,
        plannedFor: localDateOf(new Date()),
        label: '',
        input,
        checklist: { asaGrade: 2 },
      },
      meta: { enteredBy: 'BE' },
    });
    return { folder, planId: saved.id };
  } finally {
    backEnd.close();
  }
}

/**
 * Worksheet PDF time: the `tidewing worksheet` command as a new process (what a user waits for),
 * the same command run in this process, and the page-to-PDF part alone with Chromium already
 * running. Median of 5; target under 2 s.
 */
export async function benchWorksheet(): Promise<Figure[]> {
  const root = findProjectRoot();
  // Under CI a missing Chromium fails the run; elsewhere the figure says what is missing.
  const found = chromiumOrReason();
  if ('missing' in found)
    return [{ name: 'worksheet PDF', value: Number.NaN, unit: 'ms', note: found.missing }];
  const { executablePath } = found;
  const data = await preparedData(root);
  const out = path.join(data.folder, 'bench.pdf');
  try {
    const args = ['worksheet', '--plan', String(data.planId), '--data', data.folder, '--out', out];
    const cold: number[] = [];
    for (let index = 0; index < runs; index += 1) {
      // As a user runs it: a new Node process, Chromium started from nothing, exit when done.
      const started = performance.now();
      const run = spawnSync(process.execPath, [path.join(root, 'bin', 'tidewing.js'), ...args], {
        encoding: 'utf8',
      });
      if (run.status !== 0)
        throw new Error(`tidewing worksheet exited with ${String(run.status)}: ${run.stderr}`);
      cold.push(performance.now() - started);
    }
    const whole: number[] = [];
    for (let index = 0; index < runs; index += 1) {
      const started = performance.now();
      const code = await runWorksheetCommand(args.slice(1), quiet);
      if (code !== 0) throw new Error(`tidewing worksheet exited with ${code}`);
      whole.push(performance.now() - started);
    }

    const backEnd = startBackEnd({
      dataDirectory: data.folder,
      appVersion: readAppVersion(root),
      host: 'browser',
    });
    const host = await startLoopbackHost({
      port: 0,
      rendererDirectory: rendererDirectory(root),
      dispatch: backEnd.dispatch,
    });
    const browser = await chromium.launch({ executablePath, headless: true, args: [...chromiumArguments] });
    const warm: number[] = [];
    try {
      for (let index = 0; index < runs; index += 1) {
        const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
        const started = performance.now();
        // Each start address works once: a fresh one per page.
        const address = new URL(index === 0 ? host.url : host.newStartUrl());
        address.pathname = '/print.html';
        address.hash = `#/worksheets/${data.planId}`;
        await page.goto(address.href);
        await page.locator('.worksheet[data-ready="true"]').waitFor({ timeout: 20_000 });
        await page.pdf({ path: out, preferCSSPageSize: true, printBackground: true });
        warm.push(performance.now() - started);
        await page.close();
      }
    } finally {
      await browser.close();
      await host.close();
      backEnd.close();
    }
    return [
      {
        name: 'worksheet PDF, cold `tidewing worksheet` process',
        value: median(cold),
        unit: 'ms',
        note: `median of ${runs}, target < 2000 ms; from starting Node to its exit, Chromium started from nothing`,
      },
      {
        name: 'worksheet PDF, whole command in process',
        value: median(whole),
        unit: 'ms',
        note: `median of ${runs}, target < 2000 ms; database, host, Chromium start, page, PDF, Chromium stop`,
      },
      {
        name: 'worksheet PDF, page to PDF (Chromium running)',
        value: median(warm),
        unit: 'ms',
        note: `median of ${runs}, target < 2000 ms`,
      },
    ];
  } finally {
    fs.rmSync(data.folder, { recursive: true, force: true });
  }
}
