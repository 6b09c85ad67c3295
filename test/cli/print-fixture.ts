/**
 * What the `tidewing record` and `tidewing worksheet` tests share: captured output, scratch
 * folders removed after each test, the guard for Chromium and the built print page, and a clinic
 * (cautions acknowledged, Heron Lane's settings) set up through the one dispatcher.
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterEach } from 'vitest';
import { startBackEnd } from '../../main/back-end/back-end.js';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import { needBuilt, needChromium } from '../support/chromium.js';
import { heronLaneSettings } from '../support/clinic-settings.js';
import { temporaryFolder } from '../support/temporary-folder.js';

export const root = findProjectRoot();

/** Pip's plan input from the examples (a budgerigar, mask, isoflurane). */
export const pipPlanInput = JSON.parse(
  fs.readFileSync(path.join(root, 'examples', 'plans', 'pip-budgerigar-mask-isoflurane.json'), 'utf8'),
) as unknown;

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

/** A missing Chromium or build fails the print tests under CI and skips them otherwise. */
export function needPrinting(context: { skip: (note?: string) => never }): void {
  needChromium(context);
  needBuilt(context, path.join(root, 'build', 'renderer', 'print.html'));
}

/** A command's standard output and error, captured. */
export function captured() {
  const out: string[] = [];
  const err: string[] = [];
  return {
    io: { stdout: (text: string) => out.push(text), stderr: (text: string) => err.push(text) },
    stdout: () => out.join(''),
    stderr: () => err.join(''),
  };
}

/** A new empty folder, removed after the test. */
export function scratch(prefix = 'tidewing-print-'): string {
  const temp = temporaryFolder(prefix);
  cleanups.push(temp.remove);
  return temp.folder;
}

export type Call = (channel: string, payload: unknown) => Promise<{ id: number }>;

/**
 * A data folder filled through the dispatcher by `fill`: the cautions acknowledged and the
 * clinic's settings saved first unless `acknowledged` is false. `now` is the clinic's clock;
 * `demoClinic` fills it with the invented demo clinic first (60 completed records).
 */
export async function clinicFolder<T>(
  fill: (call: Call) => Promise<T>,
  options: { readonly acknowledged?: boolean; readonly now?: () => Date; readonly demoClinic?: boolean } = {},
): Promise<{ folder: string } & T> {
  const folder = scratch();
  const backEnd = startBackEnd({
    dataDirectory: folder,
    appVersion: JSON.parse(fs.readFileSync(path.join(root, 'package.json'), 'utf8')).version as string,
    host: 'browser',
    ...(options.now === undefined ? {} : { now: options.now }),
    ...(options.demoClinic === true ? { demoClinic: true } : {}),
  });
  try {
    const call: Call = async (channel, payload) => {
      const answer = await backEnd.dispatch(channel, payload);
      if (!answer.ok) throw new Error(`${channel}: ${answer.error.message}`);
      return answer.value as { id: number };
    };
    if (options.acknowledged !== false) {
      await call('safety:acknowledge', { acknowledgedBy: 'RW', accepted: true });
      await call('settings:save', heronLaneSettings);
    }
    return { folder, ...(await fill(call)) };
  } finally {
    backEnd.close();
  }
}
