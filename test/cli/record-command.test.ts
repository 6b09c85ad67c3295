import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { runRecordCommand } from '../../main/cli/record-command.js';
import {
  captured,
  clinicFolder,
  needPrinting as needRenderer,
  pipPlanInput,
  scratch,
} from './print-fixture.js';

const start = Date.parse('2026-12-02T09:00:00Z');
const at = (minute: number) => new Date(start + minute * 60_000).toISOString();

/** A data folder with Pip, a plan, and a finished record with a correction, a void and a drug given. */
function dataWithRecord(): Promise<{ folder: string; recordId: number }> {
  // The clinic's clock on the day of the procedure, so the dates below stay valid on any day.
  return clinicFolder(
    async (call) => {
      const meta = { enteredBy: 'RW' };
      const patient = await call('patients:create', {
        values: { name: 'Pip', speciesKey: 'budgerigar', sex: 'male', ringId: 'HL-24-117' },
        meta,
      });
      const plan = await call('plans:save', {
        fields: {
          patientId: patient.id,
          plannedFor: '2026-12-02',
          label: '',
          input: pipPlanInput,
          checklist: { asaGrade: 2, items: {} },
        },
        meta,
      });
      const record = await call('procedures:create', {
        patientId: patient.id,
        values: {
          planId: plan.id,
          startedAt: at(0),
          endedAt: at(40),
          asaGrade: 2,
          procedureName: 'Beak trim',
          airway: 'mask',
          circuit: 'nonRebreathing',
          staffInitials: 'RW',
        },
        meta,
      });
      const add = (values: unknown) => call('entries:add', { recordId: record.id, values, meta });
      const vitals = (minute: number, heartRatePerMin: number) => ({
        at: at(minute),
        kind: 'vitals',
        vaporPct: minute < 30 ? 2 : 0,
        oxygenLpm: 1,
        heartRatePerMin,
        breathsPerMin: 28,
        temperatureC: 40.1,
      });
      await add({ at: at(0), kind: 'event', eventType: 'induction', eventNote: 'mask' });
      await add(vitals(5, 380));
      const misread = await add(vitals(10, 360));
      await add({
        at: at(12),
        kind: 'event',
        eventType: 'drugGiven',
        drugName: 'Clinic drug B',
        drugDose: '0.013 mL',
      });
      await add({ at: at(30), kind: 'event', eventType: 'vaporiserOff' });
      await add({ at: at(33), kind: 'event', eventType: 'firstMovement' });
      await call('entries:correct', {
        id: misread.id,
        values: vitals(10, 312),
        meta: { enteredBy: 'JM', reason: 'Misread the monitor' },
      });
      const wrong = await add(vitals(20, 40));
      await call('entries:void', {
        id: wrong.id,
        meta: { enteredBy: 'JM', reason: 'Probe slipped off the toe' },
      });
      return { recordId: record.id };
    },
    { now: () => new Date(start + 3 * 3_600_000) },
  );
}

describe('tidewing record', () => {
  it('exits 2 with the usage for missing, malformed or unknown arguments', async () => {
    for (const args of [
      [],
      ['--id', '1'],
      ['--out', 'a.pdf'],
      ['--id', 'x', '--out', 'a.pdf'],
      ['--id', '0', '--out', 'a.pdf'],
      ['--id', '1', '--out', 'a.txt'],
      ['--id', '1', '--out', 'a.pdf', '--colour'],
    ]) {
      const run = captured();
      expect(await runRecordCommand(args, run.io), args.join(' ')).toBe(2);
      expect(run.stderr()).toContain('Usage: tidewing record');
    }
  });

  it('exits 1 when the data folder has no database, and writes nothing', async () => {
    const run = captured();
    const out = path.join(scratch(), 'record.pdf');
    expect(await runRecordCommand(['--id', '1', '--data', scratch(), '--out', out], run.io)).toBe(1);
    expect(run.stderr()).toMatch(/there is no Tidewing database/);
    expect(fs.existsSync(out)).toBe(false);
  });

  it('exits 1 and names the record when it is not in the database', async (context) => {
    needRenderer(context);
    const data = await dataWithRecord();
    const run = captured();
    const out = path.join(scratch(), 'record.pdf');
    expect(
      await runRecordCommand(
        ['--id', String(data.recordId + 9), '--data', data.folder, '--out', out],
        run.io,
      ),
    ).toBe(1);
    expect(run.stderr()).toContain(`there is no procedure record ${data.recordId + 9}`);
    expect(fs.existsSync(out)).toBe(false);
  }, 60_000);

  it('writes the record for the patient file: every page numbered and named, corrections shown as corrections, the plan beside the log', async (context) => {
    needRenderer(context);
    const data = await dataWithRecord();
    const run = captured();
    const out = path.join(scratch(), 'record.pdf');
    expect(
      await runRecordCommand(['--id', String(data.recordId), '--data', data.folder, '--out', out], run.io),
    ).toBe(0);
    expect(run.stdout()).toContain(`Wrote procedure record ${data.recordId} to ${out}`);
    const pages = Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', [out], { encoding: 'utf8' }))?.[1]);
    expect(pages).toBeGreaterThanOrEqual(1);
    for (let page = 1; page <= pages; page += 1) {
      const text = execFileSync('pdftotext', ['-f', String(page), '-l', String(page), out, '-'], {
        encoding: 'utf8',
      }).replace(/\s+/g, ' ');
      expect(text).toContain(`page ${page} of ${pages}`);
      expect(text).toContain('Pip (ring HL-24-117)');
    }
    const text = execFileSync('pdftotext', [out, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    for (const expected of [
      'Heron Lane Bird Clinic',
      'Anaesthetic record',
      'Beak trim',
      'Drug given: Clinic drug B, 0.013 mL',
      'Vaporiser off',
      // The correction: the struck value, the new one, who and why.
      'Corrected by JM',
      'HR (/min) 360 → 312',
      'Reason: “Misread the monitor”',
      'First entered by RW',
      'predicted beside logged',
      'First movement: 3 min',
      // The plan's dial in the one wording of dial steps (app/core/plan-phases.ts).
      'Isoflurane, planned dial 4 % from 0 min, 2 % from 4 min, off at 30 min.',
      // The voided row stays in its place with who voided it and why.
      'Voided by JM',
      '“Probe slipped off the toe”. First entered by RW.',
    ])
      expect(text, expected).toContain(expected);
    // Who voided the row and when, in the clinic's date format (the reason's cell wraps beside the
    // initials column, so the reason is checked on its own above).
    expect(text).toMatch(/Voided by JM at \d{4}-\d{2}-\d{2} \d{2}:\d{2}\. Reason:/);
    expect(text).not.toContain('drugGiven');
  }, 60_000);
});
