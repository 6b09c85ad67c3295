import Database from 'better-sqlite3';
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { startBackEnd } from '../../main/back-end/back-end.js';
import { runWorksheetCommand } from '../../main/cli/worksheet-command.js';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import { temporaryFolder } from '../support/temporary-folder.js';
import { heronLaneSettings } from '../support/clinic-settings.js';
import { needBuilt, needChromium } from '../support/chromium.js';
import { localDateOf } from '../../app/contract/input-rules.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

const root = findProjectRoot();
const pipInput = JSON.parse(
  fs.readFileSync(path.join(root, 'examples', 'plans', 'pip-budgerigar-mask-isoflurane.json'), 'utf8'),
) as unknown;

/** Chromium and the built print page, which the command needs before it reads the plan. */
function needPrinting(context: { skip: (note?: string) => never }): void {
  needChromium(context);
  needBuilt(context, path.join(root, 'build', 'renderer', 'print.html'));
}

function captured() {
  const out: string[] = [];
  const err: string[] = [];
  return {
    io: { stdout: (text: string) => out.push(text), stderr: (text: string) => err.push(text) },
    stdout: () => out.join(''),
    stderr: () => err.join(''),
  };
}

function scratch(): string {
  const temp = temporaryFolder('tidewing-worksheet-');
  cleanups.push(temp.remove);
  return temp.folder;
}

/** A data folder with one saved plan; cautions acknowledged and settings saved unless asked not to. */
async function dataWithPlan(
  options: { acknowledged?: boolean } = {},
): Promise<{ folder: string; planId: number }> {
  const folder = scratch();
  const backEnd = startBackEnd({
    dataDirectory: folder,
    appVersion: JSON.parse(fs.readFileSync(path.join(root, 'package.json'), 'utf8')).version as string,
    host: 'browser',
  });
  try {
    const call = async (channel: string, payload: unknown) => {
      const answer = await backEnd.dispatch(channel, payload);
      if (!answer.ok) throw new Error(`${channel}: ${answer.error.message}`);
      return answer.value as { id: number };
    };
    if (options.acknowledged !== false) {
      await call('safety:acknowledge', { acknowledgedBy: 'RW', accepted: true });
      await call('settings:save', heronLaneSettings);
    }
    const checklist = { asaGrade: 2, items: {} };
    const saved = await call('plans:save', {
      fields: { patientId: null, plannedFor: localDateOf(new Date()), label: '', input: pipInput, checklist },
      meta: { enteredBy: 'RW' },
    });
    return { folder, planId: saved.id };
  } finally {
    backEnd.close();
  }
}

describe('tidewing worksheet', () => {
  it('exits 2 with the usage for missing, malformed or unknown arguments', async () => {
    for (const args of [
      [],
      ['--plan', '1'],
      ['--out', 'a.pdf'],
      ['--plan', 'x', '--out', 'a.pdf'],
      ['--plan', '0', '--out', 'a.pdf'],
      ['--plan', '1', '--out', 'a.txt'],
      ['--plan', '1', '--out', 'a.pdf', '--colour'],
    ]) {
      const run = captured();
      expect(await runWorksheetCommand(args, run.io), args.join(' ')).toBe(2);
      expect(run.stderr()).toContain('Usage: tidewing worksheet');
    }
  });

  it('exits 1 when the data folder has no database', async () => {
    const run = captured();
    const out = path.join(scratch(), 'sheet.pdf');
    expect(await runWorksheetCommand(['--plan', '1', '--data', scratch(), '--out', out], run.io)).toBe(1);
    expect(run.stderr()).toMatch(/there is no Tidewing database/);
    expect(fs.existsSync(out)).toBe(false);
  });

  it('exits 1 and leaves a database from a newer Tidewing untouched', async (context) => {
    // The command checks for Chromium and the built page before it opens the database.
    needPrinting(context);
    const folder = scratch();
    const file = path.join(folder, 'tidewing.db');
    const newer = new Database(file);
    newer.pragma('user_version = 999');
    newer.close();
    const before = fs.readFileSync(file);
    const run = captured();
    expect(
      await runWorksheetCommand(
        ['--plan', '1', '--data', folder, '--out', path.join(scratch(), 'sheet.pdf')],
        run.io,
      ),
    ).toBe(1);
    expect(run.stderr()).toMatch(/written by a newer version of Tidewing/);
    expect(fs.readFileSync(file).equals(before)).toBe(true);
  });

  it('exits 1 and names the plan when it is not in the database', async (context) => {
    // The command checks for Chromium and the built page before it opens the database.
    needPrinting(context);
    const data = await dataWithPlan();
    const run = captured();
    const out = path.join(scratch(), 'sheet.pdf');
    expect(
      await runWorksheetCommand(
        ['--plan', String(data.planId + 40), '--data', data.folder, '--out', out],
        run.io,
      ),
    ).toBe(1);
    expect(run.stderr()).toContain(`there is no plan ${data.planId + 40}`);
    expect(fs.existsSync(out)).toBe(false);
  });

  it('exits 1 and says to open the app first when the cautions are not acknowledged', async (context) => {
    // The command checks for Chromium and the built page before it opens the database.
    needPrinting(context);
    const data = await dataWithPlan({ acknowledged: false });
    const run = captured();
    const out = path.join(scratch(), 'sheet.pdf');
    expect(
      await runWorksheetCommand(['--plan', String(data.planId), '--data', data.folder, '--out', out], run.io),
    ).toBe(1);
    expect(run.stderr()).toMatch(/have not been acknowledged in this database yet\. Open the app/);
    expect(fs.existsSync(out)).toBe(false);
  });

  it('exits 1 with the install hint when Chromium is not where it is looked for', async () => {
    const data = await dataWithPlan();
    const run = captured();
    const out = path.join(scratch(), 'sheet.pdf');
    const code = await runWorksheetCommand(
      ['--plan', String(data.planId), '--data', data.folder, '--out', out],
      run.io,
      { env: { CHROMIUM_PATH: path.join(scratch(), 'no-chromium') } },
    );
    expect(code).toBe(1);
    expect(run.stderr()).toMatch(/no Chromium found at .*apt-get install chromium.*CHROMIUM_PATH/);
    expect(fs.existsSync(out)).toBe(false);
  });

  it('writes a PDF of the worksheet with the patient, the clinic and the predicted times', async (context) => {
    needChromium(context);
    needBuilt(context, path.join(root, 'build', 'renderer', 'print.html'));
    const data = await dataWithPlan();
    const run = captured();
    const out = path.join(scratch(), 'pip.pdf');
    expect(
      await runWorksheetCommand(['--plan', String(data.planId), '--data', data.folder, '--out', out], run.io),
    ).toBe(0);
    expect(run.stdout()).toContain(`Wrote the worksheet of plan ${data.planId} to ${out}`);
    expect(fs.readFileSync(out).subarray(0, 5).toString()).toBe('%PDF-');
    const text = execFileSync('pdftotext', ['-layout', out, '-'], { encoding: 'utf8' });
    expect(text).toContain('Heron Lane Bird Clinic');
    expect(text).toContain('Pip');
    expect(text).toContain('32 g');
    // The four clinical milestones, with their definitions as footnotes (model thresholds).
    expect(text).toMatch(/Planned surgical/);
    expect(text).toMatch(/Loss of righting: brain reaches 0\.6 x MAC \(assumption\)/);
    expect(text).toMatch(
      /Standing or perching: brain below 0\.2 x MAC after the vaporiser is off \(assumption\)/,
    );
    expect(text).toMatch(/NIOSH 1977/);
    expect(fs.readdirSync(path.dirname(out))).toEqual(['pip.pdf']);
  }, 60_000);
});
