/**
 * The clinic's calibrated figure in words: the population prediction of each clinical milestone
 * beside the figure calibrated on the clinic's own records, its 90 % band and what it rests on
 * ("calibrated on 14 of your cockatiel records; your cockatiels stand 1.4x later than the
 * population model"). One source for the planning screen, the printed worksheet and the
 * worksheet command, so the screen, the paper and the terminal say the same thing. Pure.
 */
import {
  clinicalMilestoneLines,
  type ClinicalMilestoneLine,
  type MilestoneSource,
} from '../clinical-milestones.js';
import { formatQuantity } from '../units.js';
import type { EvidenceMilestoneId } from './observed.js';

/** One species' calibration of one milestone, as the `evidence:calibration` channel answers it. */
export type SpeciesCalibrationSource = {
  readonly speciesKey: string;
  readonly speciesName: string;
  readonly groupName: string;
  /** Observed / population model for the clinic's typical bird of the species (> 0). */
  readonly factor: number;
  readonly band90: { readonly low: number; readonly high: number };
  readonly speciesRecords: number;
  readonly groupRecords: number;
  readonly clinicRecords: number;
};

/** The part of the `evidence:calibration` answer these words read. */
export type CalibrationSource = {
  readonly on: boolean;
  /** Completed records still being compared with the model, not in the figures yet. */
  readonly pending?: number;
  readonly milestones: readonly {
    readonly id: EvidenceMilestoneId;
    readonly species: readonly SpeciesCalibrationSource[];
  }[];
};

/**
 * "Calibrated on the records compared so far: 3 more records are still being compared…", or
 * null when every completed record is in the figures. One sentence for the plan screen, the
 * printed worksheet and the command line.
 */
export function calibrationPendingText(pending: number | undefined): string | null {
  if (pending === undefined || pending <= 0) return null;
  return `Calibrated on the records compared so far: ${pending} more ${pending === 1 ? 'record is' : 'records are'} still being compared with the model and not in these figures yet.`;
}

/** What the clinic reads when the calibration is switched off. */
export const calibrationOffText = 'Calibration is off: the population model alone.';

/** What the calibrated figure is, in one sentence. */
export const calibratedFigureMeaning =
  'The calibrated figure is the population prediction times your clinic’s observed / predicted factor for this species, shrunk towards its group of species and the whole clinic when records are few; the band is for your typical bird of the species.';

/**
 * Why a saved plan's figures stay as they are, dated.
 * @param dateText the day the calibration was read, in the clinic's date format
 */
export function savedPlanCalibrationText(dateText: string): string {
  return `A saved plan keeps the figures it was saved with; the calibrated figure is from your records as of ${dateText} and is not part of the saved plan.`;
}

const verbs: Readonly<Record<EvidenceMilestoneId, string>> = {
  lossOfRighting: 'lose righting',
  surgicalDepth: 'reach surgical depth',
  firstMovement: 'first move',
  standing: 'stand',
};

/** Proper words that keep their capital when a species name is set in a sentence. */
const properWords = new Set(['African', 'Amazon', 'Moluccan', 'Pekin', 'Senegal', 'Timneh']);

/**
 * A species name as it reads inside a sentence, one and many: "Cockatiel" gives cockatiel and
 * cockatiels, "African grey parrot" keeps its capital, "Zebra finch" gives zebra finches,
 * "Canary" canaries.
 * @param name the clinic's common name of the species
 */
export function speciesWords(name: string): { readonly one: string; readonly many: string } {
  const trimmed = name.trim();
  const first = trimmed.split(/[\s-]/)[0] ?? '';
  const one =
    properWords.has(first) || /^[A-Z]{2}/.test(first)
      ? trimmed
      : trimmed.charAt(0).toLowerCase() + trimmed.slice(1);
  const many = /(s|x|z|ch|sh)$/i.test(one)
    ? `${one}es`
    : /[^aeiou]y$/i.test(one)
      ? `${one.slice(0, -1)}ies`
      : `${one}s`;
  return { one, many };
}

/** "1.4x later than the population model", "about when the population model says". */
function factorWords(factor: number, verb: string): string {
  if (Math.abs(factor - 1) < 0.05) return `${verb} about when the population model says`;
  return factor > 1
    ? `${verb} ${factor.toFixed(1)}x later than the population model`
    : `${verb} ${(1 / factor).toFixed(1)}x sooner than the population model`;
}

/**
 * What a species' calibrated figure rests on, in the clinic's words.
 * @param species the species' calibration of the milestone
 * @param milestone which milestone (for the verb: "stand", "first move"...)
 */
export function calibrationBasisText(
  species: SpeciesCalibrationSource,
  milestone: EvidenceMilestoneId,
): string {
  const words = speciesWords(species.speciesName);
  if (species.speciesRecords > 0)
    return `calibrated on ${species.speciesRecords} of your ${words.one} records; your ${words.many} ${factorWords(species.factor, verbs[milestone])}`;
  if (species.clinicRecords > 0)
    return `no ${words.one} records yet: follows your ${species.groupRecords} records of ${species.groupName.toLowerCase()} and ${species.clinicRecords} of the whole clinic`;
  return 'no records yet: the population model alone';
}

/** A figure in minutes, rounded as the population figures are (two significant figures). */
function minutes(value: number): string {
  return formatQuantity(value, 'min', 2).text;
}

/** The number alone, rounded alike. */
function number(value: number): string {
  return String(formatQuantity(value, 'min', 2).value);
}

/**
 * The calibrated minutes with their 90 % band, e.g. "14 min (90 % band 11-18 min)".
 * @param populationMin the population prediction, min (> 0)
 * @param factor the species' factor
 * @param band90 the factor's 90 % band
 */
export function calibratedMinutesText(
  populationMin: number,
  factor: number,
  band90: { readonly low: number; readonly high: number },
): string {
  return `${minutes(populationMin * factor)} (90 % band ${number(populationMin * band90.low)}-${minutes(populationMin * band90.high)})`;
}

export type CalibratedLine = {
  readonly id: EvidenceMilestoneId;
  /** The population prediction's line (the plan's own figures). */
  readonly population: ClinicalMilestoneLine;
  /** Calibrated minutes and band, or null when there is no figure (no prediction, no records). */
  readonly calibrated: { readonly minutes: number; readonly low: number; readonly high: number } | null;
  /** The calibrated figure in words, or "—" when there is none. */
  readonly calibratedText: string;
  /** What it rests on, in the clinic's words. */
  readonly basis: string;
};

export type CalibratedFigures =
  | { readonly state: 'off'; readonly text: string }
  | { readonly state: 'no-records'; readonly text: string }
  | { readonly state: 'on'; readonly lines: readonly CalibratedLine[] };

/**
 * Each clinical milestone of a plan's prediction beside the clinic's calibrated figure.
 * @param result the plan result whose population figures are calibrated (a saved plan's own
 *   snapshot for a saved plan: its figures are never replaced)
 * @param speciesKey the plan's species, or undefined/null when the plan names none
 * @param calibration the clinic's calibration as read now
 * @returns 'off' when switched off, 'no-records' when the clinic has no completed record the
 *   calibration could use, else one line per milestone
 */
export function calibratedFigures(
  result: MilestoneSource,
  speciesKey: string | null | undefined,
  calibration: CalibrationSource,
): CalibratedFigures {
  if (!calibration.on) return { state: 'off', text: calibrationOffText };
  const clinicRecords = Math.max(
    0,
    ...calibration.milestones.flatMap((milestone) => milestone.species.map((entry) => entry.clinicRecords)),
  );
  if (clinicRecords === 0)
    return {
      state: 'no-records',
      text:
        calibration.pending !== undefined && calibration.pending > 0
          ? `Calibration is on; ${calibration.pending} completed ${calibration.pending === 1 ? 'record is' : 'records are'} still being compared with the model: until then, the population model alone.`
          : 'Calibration is on, but your clinic has no completed records it can use yet: the population model alone.',
    };
  const lines = clinicalMilestoneLines(result).map((population): CalibratedLine => {
    const species =
      speciesKey === null || speciesKey === undefined
        ? undefined
        : calibration.milestones
            .find((milestone) => milestone.id === population.id)
            ?.species.find((entry) => entry.speciesKey === speciesKey);
    if (species === undefined)
      return {
        id: population.id,
        population,
        calibrated: null,
        calibratedText: '—',
        basis:
          speciesKey === null || speciesKey === undefined
            ? 'no species given: the population model alone'
            : 'this species is not in your clinic’s species list: the population model alone',
      };
    const basis = calibrationBasisText(species, population.id);
    if (population.minutes === null || species.clinicRecords === 0)
      return { id: population.id, population, calibrated: null, calibratedText: '—', basis };
    return {
      id: population.id,
      population,
      calibrated: {
        minutes: population.minutes * species.factor,
        low: population.minutes * species.band90.low,
        high: population.minutes * species.band90.high,
      },
      calibratedText: calibratedMinutesText(population.minutes, species.factor, species.band90),
      basis,
    };
  });
  return { state: 'on', lines };
}

/**
 * A few calibrated figures in one line, for a summary that names them its own way, e.g.
 * "induction 2 min (90 % band 1.6-2.6 min), recovery 8.5 min (90 % band 7.5-9.7 min)".
 * @param parts each figure's name and its calibrated line (left out when it has no figure)
 * @returns the line, or null when none has a figure
 */
export function calibratedSummaryText(
  parts: readonly { readonly name: string; readonly line: CalibratedLine | undefined }[],
): string | null {
  const shown = parts.flatMap(({ name, line }) =>
    line === undefined || line.calibrated === null ? [] : [`${name} ${line.calibratedText}`],
  );
  return shown.length === 0 ? null : shown.join(', ');
}
