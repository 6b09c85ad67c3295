import Database from 'better-sqlite3';
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import type { CalibrationView } from '../../app/contract/evidence-channels.js';
import type { PlanResult } from '../../app/contract/plan.js';
import { clinicalMilestoneLines } from '../../app/core/clinical-milestones.js';
import { startBackEnd } from '../../main/back-end/back-end.js';
import { runWorksheetCommand } from '../../main/cli/worksheet-command.js';
import { localDateOf } from '../../app/contract/input-rules.js';
import {
  captured,
  clinicFolder,
  needPrinting,
  pipPlanInput as pipInput,
  root,
  scratch,
} from './print-fixture.js';

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

/** The predicted milestone figures of the detail page as printed, in page order. */
function milestoneFigures(text: string): string[] {
  return [...text.matchAll(/[\d.]+ min (?:from start|after vaporiser off) \(5-95 % range [^)]*\)/g)].map(
    (match) => match[0],
  );
}

describe('tidewing worksheet: the clinic’s calibration beside the saved figures', () => {
  it('prints the calibrated figure with its band and basis, keeps the saved figures when the calibration changes, and says when it is off', async (context) => {
    needPrinting(context);
    // The invented demo clinic (docs/evidence.md section 6): its cockatiels stand about x1.4
    // later than the population model. A plan for one of its cockatiels.
    const cockatielInput = JSON.parse(
      fs.readFileSync(path.join(root, 'examples', 'plans', 'kiwi-cockatiel-chamber-isoflurane.json'), 'utf8'),
    ) as unknown;
    const data = await clinicFolder(
      async (call) => {
        const found = (await call('patients:search', { query: '', limit: 500 })) as unknown as {
          patients: { id: number; speciesKey: string }[];
        };
        const cockatiel = found.patients.find((patient) => patient.speciesKey === 'cockatiel');
        if (cockatiel === undefined) throw new Error('the demo clinic has no cockatiel');
        const saved = await call('plans:save', {
          fields: {
            patientId: cockatiel.id,
            plannedFor: localDateOf(new Date()),
            label: 'Crop swab',
            input: cockatielInput,
            checklist: { asaGrade: 2, items: {} },
          },
          meta: { enteredBy: 'RW' },
        });
        return { planId: saved.id, result: (saved as unknown as { result: PlanResult }).result };
      },
      { demoClinic: true },
    );
    const print = async (name: string) => {
      const run = captured();
      const out = path.join(scratch(), `${name}.pdf`);
      const code = await runWorksheetCommand(
        ['--plan', String(data.planId), '--data', data.folder, '--out', out],
        run.io,
      );
      expect(code, run.stderr()).toBe(0);
      return execFileSync('pdftotext', [out, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    };
    const today = localDateOf(new Date());

    const calibrated = await print('calibrated');
    const flat = calibrated;
    // Beside standing: the calibrated minutes, the 90 % band and what it rests on, in the
    // clinic's words.
    expect(flat).toMatch(
      /Your clinic: [\d.]+ min \(90 % band [\d.]+-[\d.]+ min\); calibrated on 1\d of your cockatiel records; your cockatiels stand 1\.\dx later than the population model/,
    );
    expect(flat).toMatch(/calibrated on 1\d of your cockatiel records; your cockatiels first move/);
    // Page 1, the prep-room summary: induction and recovery calibrated in one line.
    expect(flat).toMatch(
      /Your clinic’s calibration: induction [\d.]+ min \(90 % band [\d.]+-[\d.]+ min\), recovery [\d.]+ min \(90 % band/,
    );
    expect(flat).toContain(`Your clinic’s calibration (${today}):`);
    expect(flat).toContain(
      `the calibrated figure is from your records as of ${today} and is not part of the saved plan`,
    );
    // The detail page prints the four figures the plan was saved with.
    const saved = milestoneFigures(calibrated);
    expect(saved).toEqual(
      clinicalMilestoneLines(data.result).map(
        (line) =>
          `${line.minutesText} ${line.from === 'start' ? 'from start' : 'after vaporiser off'} (5-95 % range ${String(line.rangeText)})`,
      ),
    );
    const restsOn = (text: string) =>
      /calibrated on (\d+) of your cockatiel records; your cockatiels stand/.exec(text)?.[1];

    /** Calls on the clinic through a back end of its own, closed before the next print. */
    const onClinic = async <T>(
      calls: (answer: (channel: string, payload: unknown) => Promise<unknown>) => Promise<T>,
    ) => {
      const backEnd = startBackEnd({ dataDirectory: data.folder, appVersion: '0.0.0', host: 'browser' });
      try {
        return await calls(async (channel, payload) => {
          const reply = await backEnd.dispatch(channel as 'evidence:list', payload);
          if (!reply.ok) throw new Error(reply.error.message);
          return reply.value;
        });
      } finally {
        backEnd.close();
      }
    };

    // Leave 8 cockatiel records out: the calibrated figure follows, the saved figures do not.
    const standingRecords = await onClinic(async (answer) => {
      const list = (await answer('evidence:list', { speciesKey: 'cockatiel' })) as {
        rows: { recordId: number }[];
      };
      for (const row of list.rows.slice(0, 8))
        await answer('evidence:exclude', {
          recordId: row.recordId,
          excluded: true,
          meta: { enteredBy: 'RW', reason: 'premedicated' },
        });
      const calibration = (await answer('evidence:calibration', {})) as CalibrationView;
      return calibration.milestones
        .find((milestone) => milestone.id === 'standing')
        ?.species.find((entry) => entry.speciesKey === 'cockatiel')?.speciesRecords;
    });
    const fewer = await print('fewer-records');
    expect(Number(restsOn(fewer))).toBe(standingRecords);
    expect(Number(restsOn(fewer))).toBeLessThan(Number(restsOn(calibrated)));
    expect(milestoneFigures(fewer)).toEqual(saved);

    await onClinic((answer) =>
      answer('evidence:set-calibration', { on: false, meta: { enteredBy: 'RW', reason: 'audit' } }),
    );
    const off = await print('off');
    expect(off).toContain(
      `Your clinic’s calibration (${today}): Calibration is off: the population model alone.`,
    );
    expect(off).not.toContain('Your clinic: ');
    expect(milestoneFigures(off)).toEqual(saved);
  }, 120_000);
});
