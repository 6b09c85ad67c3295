import Database from 'better-sqlite3';
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { runWorksheetCommand } from '../../main/cli/worksheet-command.js';
import { localDateOf } from '../../app/contract/input-rules.js';
import { captured, clinicFolder, needPrinting, pipPlanInput as pipInput, scratch } from './print-fixture.js';

/** A data folder with one saved plan; cautions acknowledged and settings saved unless asked not to. */
function dataWithPlan(options: { acknowledged?: boolean } = {}): Promise<{ folder: string; planId: number }> {
  return clinicFolder(
    async (call) => {
      const checklist = { asaGrade: 2, items: {} };
      const saved = await call('plans:save', {
        fields: {
          patientId: null,
          plannedFor: localDateOf(new Date()),
          label: '',
          input: pipInput,
          checklist,
        },
        meta: { enteredBy: 'RW' },
      });
      return { planId: saved.id };
    },
    options.acknowledged === false ? { acknowledged: false } : {},
  );
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
    needPrinting(context);
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

  it('says which plan of a compared pair it printed: the chosen plan or its alternative', async (context) => {
    needPrinting(context);
    const data = await clinicFolder(async (call) => {
      const fields = {
        patientId: null,
        plannedFor: localDateOf(new Date()),
        label: 'beak trim',
        input: pipInput,
        checklist: { asaGrade: 2, items: {} },
      };
      const saved = (await call('plans:save-comparison', {
        fields,
        variantFields: { ...fields, input: { ...(pipInput as object), freshGasLpm: 0.6 } },
        meta: { enteredBy: 'RW' },
      })) as unknown as { plan: { id: number }; variant: { id: number } };
      return { planId: saved.plan.id, variantId: saved.variant.id };
    });
    const run = captured();
    const out = path.join(scratch(), 'variant.pdf');
    expect(
      await runWorksheetCommand(
        ['--plan', String(data.variantId), '--data', data.folder, '--out', out],
        run.io,
      ),
    ).toBe(0);
    // The same words as the day list (app/core/plan-choice.ts).
    expect(run.stdout()).toContain(
      `Wrote the worksheet of plan ${data.variantId} (alternative of plan ${data.planId}, not chosen) to ${out}`,
    );
    const text = execFileSync('pdftotext', ['-layout', out, '-'], { encoding: 'utf8' });
    expect(text).toMatch(
      new RegExp(
        `Plan ${data.variantId} .beak trim. for .* · alternative of plan ${data.planId}, not chosen`,
      ),
    );
  }, 60_000);
});
