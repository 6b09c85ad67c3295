import { describe, expect, it } from 'vitest';
import {
  asaMortality,
  asaMortalityText,
  brainBand,
  cssStringToken,
  drugVolumeMl,
  emergencyCard,
  minutesWithRangeText,
  monitoringColumns,
  monitoringRows,
  openChecklistItems,
  plannedEndMin,
  plannedVaporPctAt,
  runningHeaderLines,
} from '../../app/core/worksheet.js';

// The drugs below are placeholders entered "by the clinic" in the test: Tidewing ships no drug and
// no dose, so the names are neutral and the numbers only exercise the arithmetic.
const drugA = {
  name: 'Drug A',
  concentrationMgPerMl: 1,
  doseLowMgPerKg: 0.5,
  doseHighMgPerKg: 1,
  route: 'IV',
  doseSource: 'Clinic protocol 2026',
  notes: '',
};

describe('emergency card', () => {
  it('turns mg/kg into mL as dose x mass / concentration for both bounds', () => {
    // common practice: volume (mL) = dose (mg/kg) x mass (kg) / concentration (mg/mL);
    // 0.5 x 0.032 / 1 = 0.016 mL and 1 x 0.032 / 1 = 0.032 mL
    const [line] = emergencyCard([drugA], 32);
    expect(line?.volumeLowMl).toBe(0.016);
    expect(line?.volumeHighMl).toBe(0.032);
    expect(line?.doseLowMg).toBe(0.016);
    expect(line?.doseHighMg).toBe(0.032);
    expect(line?.volumeText).toBe('0.016-0.032 mL');
    expect(line?.doseText).toBe('0.5-1 mg/kg = 0.016-0.032 mg');
    expect(line?.doseSource).toBe('Clinic protocol 2026');
  });

  it('gives one volume when the clinic entered a single dose', () => {
    // common practice arithmetic: 20 mg/kg x 3.0 kg / 50 mg/mL = 1.2 mL
    const [line] = emergencyCard(
      [{ ...drugA, concentrationMgPerMl: 50, doseLowMgPerKg: 20, doseHighMgPerKg: null }],
      3000,
    );
    expect(line?.volumeLowMl).toBe(1.2);
    expect(line?.volumeHighMl).toBeNull();
    expect(line?.volumeText).toBe('1.2 mL');
  });

  it('keeps three significant figures, never finer than 0.001 mL, and flags volumes under 0.1 mL', () => {
    // common practice arithmetic: 0.1 mg/kg x 0.012 kg / 1 mg/mL = 0.0012 mL; a 1 mL syringe reads 0.01 mL (common practice)
    const [line] = emergencyCard([{ ...drugA, doseLowMgPerKg: 0.1, doseHighMgPerKg: null }], 12);
    expect(line?.volumeLowMl).toBe(0.001);
    expect(line?.smallVolume).toBe(true);
    // 2 mg/kg x 0.333 kg / 3 mg/mL = 0.222 mL (common practice arithmetic)
    expect(drugVolumeMl(2, 333, 3)).toBe(0.222);
    // 20 mg/kg x 0.032 kg / 50 mg/mL = 0.0128 mL, shown as 0.013 mL (common practice arithmetic)
    expect(drugVolumeMl(20, 32, 50)).toBe(0.013);
    // 5 mg/kg x 0.5 kg / 10 mg/mL = 0.25 mL (common practice arithmetic)
    expect(
      emergencyCard(
        [{ ...drugA, concentrationMgPerMl: 10, doseLowMgPerKg: 5, doseHighMgPerKg: null }],
        500,
      )[0]?.smallVolume,
    ).toBe(false);
  });

  it('refuses a zero concentration rather than printing an infinite volume', () => {
    expect(() => drugVolumeMl(1, 30, 0)).toThrow(RangeError);
  });

  it('is empty when the clinic has entered no drugs: Tidewing ships none', () => {
    expect(emergencyCard([], 32)).toEqual([]);
  });
});

describe('monitoring grid', () => {
  const schedule = [
    { atMin: 0, vaporPct: 4 },
    { atMin: 4, vaporPct: 2 },
    { atMin: 30, vaporPct: 0 },
  ];

  it('has a row every 5 min from 0 to the vaporiser-off minute plus the recovery window', () => {
    // common practice: vital signs recorded at least every 5 min
    const rows = monitoringRows(schedule, plannedEndMin(30, 30, 60));
    expect(rows.map((row) => row.timeMin)).toEqual([0, 5, 10, 15, 20, 25, 30, 35, 40, 45, 50, 55, 60]);
    expect(rows.map((row) => row.plannedVaporPct).slice(0, 8)).toEqual([4, 2, 2, 2, 2, 2, 0, 0]);
  });

  it('covers a planned end between two rows with one more row', () => {
    expect(monitoringRows(schedule, 42).at(-1)?.timeMin).toBe(45);
  });

  it('uses the whole plan duration when the vaporiser is never turned off', () => {
    expect(plannedEndMin(null, 30, 75)).toBe(75);
    expect(plannedVaporPctAt([{ atMin: 0, vaporPct: 2.5 }], 70)).toBe(2.5);
  });

  it('has the columns the issue names, each with its unit in the clinic’s units', () => {
    expect(monitoringColumns('C', 'mmHg')).toEqual([
      'Time (min)',
      'Planned dial (%)',
      'Dial (%)',
      'O2 (L/min)',
      'HR (/min)',
      'RR (/min)',
      'Temp (°C)',
      'EtCO2 (mmHg)',
      'Notes',
    ]);
    expect(monitoringColumns('F', 'kPa').slice(6, 8)).toEqual(['Temp (°F)', 'EtCO2 (kPa)']);
  });
});

describe('ASA grade and checklist', () => {
  it('prints the published avian mortality by ASA grade', () => {
    // Hollwarth et al. 2022, J Exotic Pet Med 41:14-19: ASA 1 0 %, 2 0.6 %, 3 5.9 %, 4 18.8 %, 5 50 %
    expect(asaMortality.percentByGrade).toEqual({ 1: 0, 2: 0.6, 3: 5.9, 4: 18.8, 5: 50 });
    expect(asaMortalityText(3)).toBe(
      'ASA 3: 5.9 % died within 48 h in 1,820 avian isoflurane anaesthetics (Hollwarth et al. 2022, J Exotic Pet Med 41:14-19)',
    );
    expect(asaMortalityText(null)).toBe('ASA grade not set');
  });

  it('lists the open items, the missing ASA grade first', () => {
    const lines = [
      { label: 'Fasting and crop check', state: 'done' as const },
      { label: 'Scavenging connected', state: 'open' as const },
      { label: 'Bloods (if taken) reviewed', state: 'not applicable' as const },
    ];
    expect(openChecklistItems(lines, null)).toEqual(['ASA grade', 'Scavenging connected']);
    expect(openChecklistItems(lines, 2)).toEqual(['Scavenging connected']);
  });
});

describe('times for print', () => {
  it('shows a predicted time with its 5-95 % range and says when it is not reached', () => {
    expect(minutesWithRangeText(3.437, { p5: 2.91, p95: 4.12 })).toBe('3.4 min (5-95 % range 2.9-4.1 min)');
    expect(minutesWithRangeText(null, null)).toBe('not reached in the planned time');
  });
});

describe('approximate brain band for the printed chart', () => {
  const timeMin = [0, 1, 2, 3, 4, 5, 6, 7, 8];
  const brainPct = [0, 0.5, 0.9, 1.2, 1.3, 1.0, 0.6, 0.3, 0.1];

  it('collapses onto the curve when the ranges have no spread', () => {
    const band = brainBand(timeMin, brainPct, 4, { p5: 2, p50: 2, p95: 2 }, { p5: 3, p50: 3, p95: 3 });
    expect(band?.lowPct).toEqual(brainPct);
    expect(band?.highPct).toEqual(brainPct);
  });

  it('encloses the central curve and widens where the times are uncertain', () => {
    const band = brainBand(timeMin, brainPct, 4, { p5: 1.5, p50: 2, p95: 3 }, { p5: 2, p50: 3, p95: 4 });
    if (band === null) throw new Error('expected a band');
    brainPct.forEach((value, index) => {
      expect(band.lowPct[index]).toBeLessThanOrEqual(value);
      expect(band.highPct[index]).toBeGreaterThanOrEqual(value);
    });
    expect((band.highPct[1] ?? 0) - (band.lowPct[1] ?? 0)).toBeGreaterThan(0);
    expect((band.highPct[6] ?? 0) - (band.lowPct[6] ?? 0)).toBeGreaterThan(0);
    expect(band.method).toMatch(/assumption/);
  });

  it('does not let a fast induction borrow the falling curve from after the vaporiser is off', () => {
    const band = brainBand(timeMin, brainPct, 4, { p5: 0.5, p50: 2, p95: 3 }, null);
    // before the vaporiser goes off at 4 min, the band never drops below the curve's value at off
    expect(band?.highPct.slice(1, 5).every((value) => value <= 1.3)).toBe(true);
    expect(band?.highPct[3]).toBe(1.3);
    expect(band?.lowPct[3]).toBe(0.9);
  });

  it('is absent when no uncertainty run was made', () => {
    expect(brainBand(timeMin, brainPct, 4, null, null)).toBeNull();
  });
});

describe('running lines of the printed pages', () => {
  it('names the clinic, the bird with its identifier, the date and the plan version', () => {
    const lines = runningHeaderLines({
      clinicName: 'Heron Lane Bird Clinic',
      patientName: 'Pip',
      identifier: 'ring HL-24-117',
      dateText: '2026-12-02',
      planId: 3,
      planVersionId: 7,
    });
    expect(lines.who).toBe('Heron Lane Bird Clinic · Pip (ring HL-24-117)');
    expect(lines.which).toBe('2026-12-02 · plan 3 version 7');
  });

  it('says when the clinic has no name yet, and leaves out an empty identifier', () => {
    const lines = runningHeaderLines({
      clinicName: '',
      patientName: 'Quick plan 4',
      identifier: '',
      dateText: '2026-12-02',
      planId: 4,
      planVersionId: 4,
    });
    expect(lines.who).toBe('Clinic name not set · Quick plan 4');
  });

  it('turns any text into one CSS string token that cannot be ended early', () => {
    expect(cssStringToken('Pip')).toBe('"Pip"');
    expect(cssStringToken('say "hi"')).toBe('"say \\"hi\\""');
    expect(cssStringToken('a\\b')).toBe('"a\\\\b"');
    expect(cssStringToken('two\nlines')).toBe('"two lines"');
  });
});
