/**
 * Content of the printable pre-procedure worksheet, computed from a saved plan: the emergency
 * card in the clinic's own doses, the monitoring grid, the open checklist items and the ASA
 * mortality figures. Pure: plain data in, plain data out. Tidewing ships no drug and no dose;
 * every dose here is one the clinic entered with its source.
 */
import {
  formatQuantity,
  gToKg,
  roundToSignificant,
  type PressureUnit,
  type TemperatureUnit,
} from './units.js';

/** One of the clinic's emergency drugs as the clinic entered it. */
export type EmergencyDrugEntry = {
  readonly name: string;
  readonly concentrationMgPerMl: number;
  readonly doseLowMgPerKg: number;
  /** Upper dose bound, or null when the clinic gave a single dose. */
  readonly doseHighMgPerKg: number | null;
  readonly route: string;
  /** The clinic's source for the dose; printed on the card. */
  readonly doseSource: string;
  readonly notes: string;
};

/** One line of the emergency card: the clinic's dose turned into mg and mL for this bird. */
export type EmergencyCardLine = {
  readonly name: string;
  readonly route: string;
  readonly concentrationMgPerMl: number;
  readonly doseLowMgPerKg: number;
  readonly doseHighMgPerKg: number | null;
  readonly doseLowMg: number;
  readonly doseHighMg: number | null;
  readonly volumeLowMl: number;
  readonly volumeHighMl: number | null;
  /** e.g. "0.016-0.032 mL" or "0.25 mL". */
  readonly volumeText: string;
  readonly doseText: string;
  /** True when the smaller volume is under 0.1 mL: fewer than ten graduations of a 1 mL syringe. */
  readonly smallVolume: boolean;
  readonly doseSource: string;
  readonly notes: string;
};

/** Finest graduation of a 1 mL syringe, mL (common practice). */
export const syringeResolutionMl = 0.01;

/** Under ten graduations of a 1 mL syringe the volume is hard to measure; diluting helps (common practice). */
export const smallVolumeMl = 10 * syringeResolutionMl;

/** Monitoring rows are 5 min apart: vital signs recorded at least every 5 min (common practice). */
export const monitoringIntervalMin = 5;

/**
 * Volume to draw up: dose (mg/kg) x body mass (kg) / concentration (mg/mL). Plain arithmetic
 * (common practice), rounded to 3 significant figures and never finer than 0.001 mL, so that
 * small birds' volumes do not round to zero.
 * @param doseMgPerKg dose in mg/kg, above 0
 * @param bodyMassG body mass in g, above 0
 * @param concentrationMgPerMl concentration in mg/mL, above 0
 * @returns volume in mL
 */
export function drugVolumeMl(doseMgPerKg: number, bodyMassG: number, concentrationMgPerMl: number): number {
  if (!(doseMgPerKg > 0) || !(bodyMassG > 0) || !(concentrationMgPerMl > 0))
    throw new RangeError('dose, body mass and concentration must all be above 0');
  const exact = (doseMgPerKg * gToKg(bodyMassG)) / concentrationMgPerMl;
  return Math.max(0.001, Number(roundToSignificant(exact, 3).toFixed(3)));
}

/**
 * Dose in mg for this bird: dose (mg/kg) x body mass (kg), 3 significant figures.
 * @param doseMgPerKg dose in mg/kg, above 0
 * @param bodyMassG body mass in g, above 0
 */
export function drugDoseMg(doseMgPerKg: number, bodyMassG: number): number {
  return roundToSignificant(doseMgPerKg * gToKg(bodyMassG), 3);
}

function range(low: number, high: number | null, unit: string): string {
  return high === null || high === low ? `${String(low)} ${unit}` : `${String(low)}-${String(high)} ${unit}`;
}

/**
 * The emergency card for a bird: each clinic drug with both dose bounds in mg and mL.
 * @param drugs the clinic's drugs (any order; the card keeps it)
 * @param bodyMassG body mass in g, 5-15000
 */
export function emergencyCard(drugs: readonly EmergencyDrugEntry[], bodyMassG: number): EmergencyCardLine[] {
  return drugs.map((drug) => {
    const high =
      drug.doseHighMgPerKg !== null && drug.doseHighMgPerKg !== drug.doseLowMgPerKg
        ? drug.doseHighMgPerKg
        : null;
    const volumeLowMl = drugVolumeMl(drug.doseLowMgPerKg, bodyMassG, drug.concentrationMgPerMl);
    const volumeHighMl = high === null ? null : drugVolumeMl(high, bodyMassG, drug.concentrationMgPerMl);
    const doseLowMg = drugDoseMg(drug.doseLowMgPerKg, bodyMassG);
    const doseHighMg = high === null ? null : drugDoseMg(high, bodyMassG);
    return {
      name: drug.name,
      route: drug.route,
      concentrationMgPerMl: drug.concentrationMgPerMl,
      doseLowMgPerKg: drug.doseLowMgPerKg,
      doseHighMgPerKg: high,
      doseLowMg,
      doseHighMg,
      volumeLowMl,
      volumeHighMl,
      volumeText: range(volumeLowMl, volumeHighMl, 'mL'),
      doseText: `${range(drug.doseLowMgPerKg, high, 'mg/kg')} = ${range(doseLowMg, doseHighMg, 'mg')}`,
      smallVolume: volumeLowMl < smallVolumeMl,
      doseSource: drug.doseSource,
      notes: drug.notes,
    };
  });
}

export type MonitoringRow = {
  readonly timeMin: number;
  /** The dial setting the plan has at this minute, % (blank column beside it for what was set). */
  readonly plannedVaporPct: number;
};

/**
 * Headings of the monitoring grid, each with its unit in the clinic's preferred units.
 * @param temperatureUnit 'C' or 'F'
 * @param pressureUnit 'mmHg' or 'kPa' (EtCO2)
 */
export function monitoringColumns(temperatureUnit: TemperatureUnit, pressureUnit: PressureUnit): string[] {
  return [
    'Time (min)',
    'Planned dial (%)',
    'Dial (%)',
    'O2 (L/min)',
    'HR (/min)',
    'RR (/min)',
    `Temp (°${temperatureUnit})`,
    `EtCO2 (${pressureUnit})`,
    'Notes',
  ];
}

/** Dial setting in force at a minute: the last step at or before it. */
export function plannedVaporPctAt(
  schedule: readonly { readonly atMin: number; readonly vaporPct: number }[],
  timeMin: number,
): number {
  let current = 0;
  for (const step of schedule) if (step.atMin <= timeMin) current = step.vaporPct;
  return current;
}

/**
 * The planned end of the procedure for the monitoring grid: the vaporiser-off minute plus the
 * recovery window, or the plan's whole simulated duration when the vaporiser is never turned off.
 * @param vaporiserOffMin minute the vaporiser goes to 0 for good, or null
 * @param recoveryWindowMin minutes watched after that, 5-240
 * @param durationMin the plan's simulated duration, min
 */
export function plannedEndMin(
  vaporiserOffMin: number | null,
  recoveryWindowMin: number,
  durationMin: number,
): number {
  return vaporiserOffMin === null ? durationMin : vaporiserOffMin + recoveryWindowMin;
}

/**
 * A row every 5 min from 0 to the planned end (the last row at or after the end, so the whole
 * procedure is covered).
 * @param schedule the plan's vaporiser steps
 * @param endMin planned end, min, 0-1440
 */
export function monitoringRows(
  schedule: readonly { readonly atMin: number; readonly vaporPct: number }[],
  endMin: number,
): MonitoringRow[] {
  const rows: MonitoringRow[] = [];
  const last = Math.ceil(Math.max(0, endMin) / monitoringIntervalMin) * monitoringIntervalMin;
  for (let timeMin = 0; timeMin <= last; timeMin += monitoringIntervalMin)
    rows.push({ timeMin, plannedVaporPct: plannedVaporPctAt(schedule, timeMin) });
  return rows;
}

/** Death within 48 h by ASA grade in 1,820 avian isoflurane anaesthetics. */
export const asaMortality = {
  source: 'Hollwarth et al. 2022, J Exotic Pet Med 41:14-19',
  percentByGrade: { 1: 0, 2: 0.6, 3: 5.9, 4: 18.8, 5: 50 } as const,
} as const;

export type AsaGrade = 1 | 2 | 3 | 4 | 5;

/**
 * The published mortality line for an ASA grade, or a prompt when no grade is set.
 * @param grade ASA grade 1-5, or null
 */
export function asaMortalityText(grade: number | null): string {
  if (grade === null) return 'ASA grade not set';
  const percent = asaMortality.percentByGrade[grade as AsaGrade] as number | undefined;
  if (percent === undefined) return `ASA grade ${String(grade)} is not 1 to 5`;
  return `ASA ${String(grade)}: ${String(percent)} % died within 48 h in 1,820 avian isoflurane anaesthetics (${asaMortality.source})`;
}

export type ChecklistLine = { readonly label: string; readonly state: 'open' | 'done' | 'not applicable' };

/**
 * The checklist items still open, in checklist order, with the ASA grade first when unset.
 * @param lines each item's label and state
 * @param asaGrade the grade, or null when not yet assessed
 */
export function openChecklistItems(lines: readonly ChecklistLine[], asaGrade: number | null): string[] {
  return [
    ...(asaGrade === null ? ['ASA grade'] : []),
    ...lines.filter((line) => line.state === 'open').map((line) => line.label),
  ];
}

/**
 * A minute figure for print, e.g. 3.4 min; a dash with the reason when not reached.
 * @param valueMin minutes, or null when not reached in the planned time
 */
export function minutesText(valueMin: number | null): string {
  return valueMin === null ? 'not reached in the planned time' : formatQuantity(valueMin, 'min', 2).text;
}

/**
 * A predicted time with its 5-95 % range, e.g. "3.4 min (range 2.9-4.1 min)".
 * @param valueMin central prediction, min, or null
 * @param spread 5th and 95th percentiles, min, or null when no uncertainty run
 */
export function minutesWithRangeText(
  valueMin: number | null,
  spread: { readonly p5: number; readonly p95: number } | null,
): string {
  const central = minutesText(valueMin);
  if (valueMin === null || spread === null) return central;
  return `${central} (5-95 % range ${String(formatQuantity(spread.p5, '', 2).value)}-${formatQuantity(spread.p95, 'min', 2).text})`;
}

function valueAt(timeMin: readonly number[], values: readonly number[], atMin: number): number {
  const last = timeMin.length - 1;
  if (last < 0) return Number.NaN;
  if (atMin <= (timeMin[0] ?? 0)) return values[0] ?? Number.NaN;
  if (atMin >= (timeMin[last] ?? 0)) return values[last] ?? Number.NaN;
  let low = 0;
  let high = last;
  while (high - low > 1) {
    const middle = (low + high) >> 1;
    if ((timeMin[middle] ?? 0) <= atMin) low = middle;
    else high = middle;
  }
  const t0 = timeMin[low] ?? 0;
  const t1 = timeMin[high] ?? 0;
  const v0 = values[low] ?? Number.NaN;
  const v1 = values[high] ?? Number.NaN;
  return t1 === t0 ? v0 : v0 + ((v1 - v0) * (atMin - t0)) / (t1 - t0);
}

export type BrainBand = { readonly lowPct: number[]; readonly highPct: number[]; readonly method: string };

/**
 * An approximate band around the predicted brain curve for the printed chart. The model reports
 * the 5-95 % range of the induction and recovery times, not of the whole curve, so the band is
 * the central curve stretched in time by those ranges: before the vaporiser is off, by
 * p5/p50 and p95/p50 of the induction time; after it, by those of the recovery time. An
 * assumption of ours, said so on the worksheet.
 * @param timeMin sample times, min, ascending
 * @param brainPct predicted brain partial pressure, vol %, same length
 * @param offMin vaporiser-off minute, or null when never off
 * @param induction p5/p50/p95 of the induction time, min, or null
 * @param recovery p5/p50/p95 of the recovery time after vaporiser off, min, or null
 * @returns null when neither range is known
 */
export function brainBand(
  timeMin: readonly number[],
  brainPct: readonly number[],
  offMin: number | null,
  induction: { readonly p5: number; readonly p50: number; readonly p95: number } | null,
  recovery: { readonly p5: number; readonly p50: number; readonly p95: number } | null,
): BrainBand | null {
  if (induction === null && recovery === null) return null;
  const ratios = (
    spread: { readonly p5: number; readonly p50: number; readonly p95: number } | null,
  ): [number, number] =>
    spread === null || !(spread.p5 > 0) || !(spread.p50 > 0)
      ? [1, 1]
      : [spread.p50 / spread.p5, spread.p50 / spread.p95];
  const [fastIn, slowIn] = ratios(induction);
  const [fastOut, slowOut] = ratios(recovery);
  const lowPct: number[] = [];
  const highPct: number[] = [];
  timeMin.forEach((time, index) => {
    const nominal = brainPct[index] ?? Number.NaN;
    let candidates: number[];
    if (offMin === null || time <= offMin) {
      // A faster induction must not borrow values from after the vaporiser is off.
      const limit = offMin ?? Number.POSITIVE_INFINITY;
      candidates = [
        valueAt(timeMin, brainPct, Math.min(limit, time * fastIn)),
        valueAt(timeMin, brainPct, Math.min(limit, time * slowIn)),
      ];
    } else {
      const since = time - offMin;
      candidates = [
        valueAt(timeMin, brainPct, offMin + since * fastOut),
        valueAt(timeMin, brainPct, offMin + since * slowOut),
      ];
    }
    lowPct.push(Math.min(nominal, ...candidates));
    highPct.push(Math.max(nominal, ...candidates));
  });
  return {
    lowPct,
    highPct,
    method:
      'Approximate band: the brain curve stretched in time by the 5-95 % range of the predicted induction and recovery times (assumption)',
  };
}

/**
 * A text as a CSS string token, for the running header of the printed pages (`content:` of an
 * `@page` margin box takes only strings and counters). Backslashes and quotes are escaped and
 * line breaks become spaces, so no text can end the token early.
 * @param text any text
 */
export function cssStringToken(text: string): string {
  return `"${text
    .replace(/\\/g, '\\\\')
    .replace(/"/g, '\\"')
    .replace(/[\r\n\f]+/g, ' ')}"`;
}

/** What identifies the bird on every printed page. */
export type SheetIdentity = {
  readonly clinicName: string;
  readonly patientName: string;
  /** Ring, microchip or record number; empty when there is none. */
  readonly identifier: string;
  /** Date of the procedure, as printed. */
  readonly dateText: string;
  readonly planId: number;
  readonly planVersionId: number;
};

/**
 * The two running lines printed in the top margin of every page: who (clinic, bird, identifier)
 * and which (date, plan and its version). Page numbers are added by the page counters.
 */
export function runningHeaderLines(identity: SheetIdentity): {
  readonly who: string;
  readonly which: string;
} {
  const clinic = identity.clinicName === '' ? 'Clinic name not set' : identity.clinicName;
  const bird =
    identity.identifier === '' ? identity.patientName : `${identity.patientName} (${identity.identifier})`;
  return {
    who: `${clinic} · ${bird}`,
    which: `${identity.dateText} · plan ${String(identity.planId)} version ${String(identity.planVersionId)}`,
  };
}
