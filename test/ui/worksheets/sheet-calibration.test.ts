import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CalibrationView } from '../../../app/contract/evidence-channels.js';
import type { PlanDetail } from '../../../app/contract/plan-records.js';
import { defaultClinicSettings } from '../../../app/contract/settings.js';
import { calibratedFigures } from '../../../app/core/evidence/calibrated-figure.js';
import { clinicalMilestoneLines } from '../../../app/core/clinical-milestones.js';
import { Sheet } from '../../../app/ui/worksheets/sheet.js';
import { writeDemoClinic } from '../../../main/back-end/demo-clinic.js';
import { openChannelHarness, type ChannelHarness } from '../../support/channel-harness.js';
import { enteredByRw } from '../../support/clinic-birds.js';

/** The sheet's text, entities decoded; `withoutCalibration` leaves out the calibration's lines. */
function sheetText(
  detail: PlanDetail,
  calibration: CalibrationView | null,
  printedAt: Date,
  withoutCalibration = false,
): string {
  const markup = renderToStaticMarkup(
    createElement(Sheet, {
      detail,
      drugs: [],
      appVersion: '9.8.7',
      settings: { ...defaultClinicSettings, clinicName: 'Harbour Bird Clinic' },
      printedAt,
      calibration,
    }),
  );
  return (
    withoutCalibration
      ? markup
          .replace(/<span class="[^"]*ws-calibrated[^"]*"[^>]*>.*?<\/span>/g, '')
          .replace(/<p class="[^"]*ws-calibrat[^"]*"[^>]*>.*?<\/p>/g, '')
      : markup
  )
    .replace(/<[^>]*>/g, ' ')
    .replace(/&amp;/g, '&')
    .replace(/&#x27;|&#39;/g, "'")
    .replace(/&quot;/g, '"')
    .replace(/\s+/g, ' ');
}

describe('the worksheet beside the clinic’s calibration', () => {
  let api: ChannelHarness;
  let detail: PlanDetail;
  let calibration: CalibrationView;

  beforeAll(async () => {
    // The invented demo clinic (docs/evidence.md section 6) and a plan for one of its cockatiels.
    api = openChannelHarness();
    await api.backEnd.ready;
    await writeDemoClinic(api.backEnd.clinic, api.clock.now);
    // Its rows are compared with the model in the background; here, now.
    expect(await api.backEnd.evidenceBackfill.run()).toBe(60);
    const found = await api.answer('patients:search', { query: '', limit: 500 });
    const cockatiel = found.patients.find((patient) => patient.speciesKey === 'cockatiel');
    if (cockatiel === undefined) throw new Error('the demo clinic has no cockatiel');
    const saved = await api.answer('plans:save', {
      fields: {
        patientId: cockatiel.id,
        plannedFor: api.clock.now.toISOString().slice(0, 10),
        label: 'Crop swab',
        input: {
          bodyMassG: 95,
          speciesId: 'cockatiel',
          agent: 'isoflurane',
          route: 'chamber',
          freshGasLpm: 2,
          chamberVolumeL: 3,
          schedule: [
            { atMin: 0, vaporPct: 5 },
            { atMin: 10, vaporPct: 0 },
          ],
          uncertainty: { samples: 20, seed: 1 },
        },
        checklist: { asaGrade: 2, items: {} },
      },
      meta: enteredByRw,
    });
    detail = await api.answer('plans:get', { id: saved.id });
    calibration = await api.answer('evidence:calibration', {});
  }, 60_000);
  afterAll(() => api.close());

  const printedAt = new Date('2026-12-02T08:00:00Z');

  it('prints each calibrated figure with its band and basis beside the saved figure, dated', () => {
    const text = sheetText(detail, calibration, printedAt);
    const figures = calibratedFigures(detail.plan.result, 'cockatiel', calibration);
    if (figures.state !== 'on') throw new Error(`expected calibrated figures, got ${figures.state}`);
    for (const line of figures.lines) {
      expect(line.calibrated).not.toBeNull();
      // The same words as the plan screen: one implementation.
      expect(text).toContain(`Your clinic: ${line.calibratedText} ; ${line.basis}`);
      expect(text).toContain(line.population.minutesText);
    }
    expect(text).toMatch(
      /calibrated on 1\d of your cockatiel records; your cockatiels stand 1\.\dx later than the population model/,
    );
    // Page 1's summary: induction (planned surgical depth) and recovery (first movement) in one line.
    const lineOf = (id: string) => figures.lines.find((line) => line.id === id)?.calibratedText;
    expect(text).toContain(
      `Your clinic’s calibration: induction ${String(lineOf('surgicalDepth'))}, recovery ${String(lineOf('firstMovement'))}; what each rests on is with the predicted course.`,
    );
    expect(text).toContain('Your clinic’s calibration (2026-12-02):');
    expect(text).toContain(
      'A saved plan keeps the figures it was saved with; the calibrated figure is from your records as of 2026-12-02 and is not part of the saved plan.',
    );
  });

  it('keeps the saved figures whatever the calibration, and says when it is off or could not be read', () => {
    const savedFigures = clinicalMilestoneLines(detail.plan.result).map(
      (line) => `${line.minutesText} ${line.from === 'start' ? 'from start' : 'after vaporiser off'}`,
    );
    const on = sheetText(detail, calibration, printedAt);
    const off = sheetText(detail, { ...calibration, on: false }, printedAt);
    const unread = sheetText(detail, null, printedAt);
    for (const text of [on, off, unread]) for (const figure of savedFigures) expect(text).toContain(figure);
    expect(off).toContain(
      'Your clinic’s calibration (2026-12-02): Calibration is off: the population model alone.',
    );
    expect(off).not.toContain('Your clinic:');
    expect(unread).toContain('could not be read when this sheet was drawn: the population model alone.');
    // Without the calibration's lines, the sheet is the saved plan's own, whatever the calibration.
    expect(sheetText(detail, calibration, printedAt, true)).toBe(
      sheetText(detail, { ...calibration, on: false }, printedAt, true),
    );
    expect(sheetText(detail, calibration, printedAt, true)).toBe(sheetText(detail, null, printedAt, true));
    expect(sheetText(detail, calibration, printedAt, true)).not.toContain('Your clinic');
  });

  it('says the clinic has no records yet when the calibration has none to use', () => {
    const empty: CalibrationView = {
      ...calibration,
      milestones: calibration.milestones.map((milestone) => ({
        ...milestone,
        records: 0,
        species: milestone.species.map((entry) => ({
          ...entry,
          speciesRecords: 0,
          groupRecords: 0,
          clinicRecords: 0,
        })),
      })),
      recordsIn: [],
    };
    const text = sheetText(detail, empty, printedAt);
    expect(text).toContain(
      'your clinic has no completed records it can use yet: the population model alone.',
    );
    expect(text).not.toContain('Your clinic:');
    // Records that ended but are still being compared are counted, never taken as none.
    const waiting = sheetText(detail, { ...empty, pending: 60 }, printedAt);
    expect(waiting).toContain(
      'Calibration is on; 60 completed records are still being compared with the model: until then, the population model alone.',
    );
  });

  it('says how many records are still being compared when the calibration rests on part of them', () => {
    const text = sheetText(detail, { ...calibration, pending: 3 }, printedAt);
    expect(text).toContain(
      'Calibrated on the records compared so far: 3 more records are still being compared with the model and not in these figures yet.',
    );
    expect(sheetText(detail, calibration, printedAt)).not.toContain('still being compared');
  });
});
