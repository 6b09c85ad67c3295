/** The evidence screens' sentences, without React: counts, observed beside predicted, the switch. */
import type { CalibrationView, EvidenceList } from '../../contract/evidence-channels.js';
import {
  evidenceMilestoneIds,
  milestoneEvents,
  type EvidenceMilestoneId,
} from '../../core/evidence/observed.js';

/** A factor of the calibration, e.g. "x1.40". */
export const factorText = (value: number): string => `x${value.toFixed(2)}`;

/** Minutes in the records table, or "—" when there are none. */
export const tableMinutesText = (value: number | null): string => (value === null ? '—' : value.toFixed(1));

/**
 * The counts line of the evidence view: what was listed, compared, skipped (whole and per
 * milestone, never filled in), left out and still running.
 */
export function evidenceCountsText(counts: EvidenceList['counts']): string {
  const perMilestone = evidenceMilestoneIds
    .map((id) => `${milestoneEvents[id].label.toLowerCase()} ${counts.skippedByMilestone[id]}`)
    .join(', ');
  return `${counts.completed} completed records; ${counts.compared} compared; ${counts.skipped} skipped whole; skipped for a missing or unusable event: ${perMilestone}; ${counts.excluded} left out of the calibration; ${counts.inProgress} still running (not shown).`;
}

/**
 * One milestone of an ended record: observed beside predicted with the ratio, or why it was skipped.
 * @param milestone the record's comparison of one milestone
 */
export function outcomeMilestoneText(milestone: {
  readonly id: EvidenceMilestoneId;
  readonly observedMin: number | null;
  readonly predictedMin: number | null;
  readonly ratio: number | null;
  readonly skipped: string | null;
}): string {
  if (milestone.ratio === null || milestone.observedMin === null || milestone.predictedMin === null)
    return `skipped: ${milestone.skipped ?? 'not compared'}`;
  return `observed ${milestone.observedMin.toFixed(1)} min, predicted ${milestone.predictedMin.toFixed(1)} min (${factorText(milestone.ratio)})`;
}

/**
 * Whether the calibration is on, who switched it when, and what that means for plans.
 * @param calibration the `evidence:calibration` answer
 */
export function calibrationSwitchText(
  calibration: Pick<CalibrationView, 'on' | 'switchedBy' | 'switchedAt'>,
): string {
  const who =
    calibration.switchedBy === null
      ? ' (the default)'
      : ` (switched by ${calibration.switchedBy} on ${calibration.switchedAt?.slice(0, 10) ?? ''})`;
  return `Calibration is ${calibration.on ? 'on' : 'off'}${who}: ${
    calibration.on
      ? 'plans show the calibrated figure beside the population model.'
      : 'plans show the population model only.'
  }`;
}

/** A milestone's heading in the calibration panel: its records and the whole clinic's factor with its band. */
export function calibrationMilestoneHeading(milestone: CalibrationView['milestones'][number]): string {
  return `${milestone.label}: ${milestone.records} records; whole clinic ${factorText(milestone.clinicFactor)} (90 % ${factorText(milestone.clinicBand90.low)} to ${factorText(milestone.clinicBand90.high)})`;
}
