/**
 * What happened beside what the model predicted for what was given. The observed milestones come
 * from the record's events; each is paired with the model milestone its definition describes
 * (the same mapping as the validation, docs/validation.md): induction with loss of righting,
 * intubation with the planned surgical depth, first movement and standing with theirs, timed
 * from the vaporiser off. A milestone whose event is missing is skipped with its reason, never
 * filled in.
 */
import { computePlanCourse, type PlanCourse, type PlanTables } from '../model/compute-plan.js';
import type { MilestoneId } from '../model/plan-types.js';
import type { EventType } from '../procedure-events.js';
import { firstEventMs, planInputFromLog, type LogPlan, type RecordLog } from './record-log.js';

export const evidenceMilestoneIds = ['lossOfRighting', 'surgicalDepth', 'firstMovement', 'standing'] as const;
export type EvidenceMilestoneId = (typeof evidenceMilestoneIds)[number] & MilestoneId;

/** Each model milestone with the event that shows it and the moment it is timed from. */
export const milestoneEvents: Readonly<
  Record<
    EvidenceMilestoneId,
    { readonly event: EventType; readonly from: 'gasOn' | 'vaporiserOff'; readonly label: string }
  >
> = {
  lossOfRighting: { event: 'induction', from: 'gasOn', label: 'Induction (loss of righting)' },
  surgicalDepth: { event: 'intubation', from: 'gasOn', label: 'Intubation (surgical depth)' },
  firstMovement: { event: 'firstMovement', from: 'vaporiserOff', label: 'First movement' },
  standing: { event: 'standing', from: 'vaporiserOff', label: 'Standing / perching' },
};

export type MilestoneComparison =
  | {
      readonly id: EvidenceMilestoneId;
      readonly observedMin: number;
      readonly predictedMin: number;
      /** observed / predicted, > 0. */
      readonly ratio: number;
    }
  | { readonly id: EvidenceMilestoneId; readonly skipped: string };

export type RecordEvidence =
  | {
      readonly ok: true;
      readonly gasOnMs: number;
      readonly vaporiserOffMs: number | null;
      /** Extubation, minutes after the vaporiser off (observed only; the model has no such milestone). */
      readonly extubationMin: number | null;
      readonly milestones: readonly MilestoneComparison[];
      readonly notes: readonly string[];
      readonly modelMac: number;
    }
  | { readonly ok: false; readonly skipped: string };

const minute = 60_000;
const round2 = (value: number) => Math.round(value * 100) / 100;

function predictedOf(result: PlanCourse, id: EvidenceMilestoneId): number | null {
  switch (id) {
    case 'lossOfRighting':
      return result.milestones.lossOfRightingMin;
    case 'surgicalDepth':
      return result.milestones.surgicalDepthMin;
    case 'firstMovement':
      return result.milestones.firstMovementMin;
    case 'standing':
      return result.milestones.standingMin;
  }
}

/**
 * Observed beside predicted for one record, from its log and the model's answer for that log.
 * @param log the record's log and the bird
 * @param plan planInputFromLog(log) (passed in so a caller that already built it need not again)
 * @param result computePlanCourse(plan.input) (or the whole computePlan answer: the same values)
 */
export function compareWithLog(
  log: RecordLog,
  plan: Extract<LogPlan, { ok: true }>,
  result: PlanCourse,
): Extract<RecordEvidence, { ok: true }> {
  const offMs = firstEventMs(log.entries, 'vaporiserOff');
  const milestones = evidenceMilestoneIds.map((id): MilestoneComparison => {
    const rule = milestoneEvents[id];
    const eventMs = firstEventMs(log.entries, rule.event);
    if (eventMs === null) return { id, skipped: `no ${rule.label.toLowerCase()} event logged` };
    const fromMs = rule.from === 'gasOn' ? plan.gasOnMs : offMs;
    if (fromMs === null) return { id, skipped: 'no vaporiser-off event logged' };
    const observedMin = round2((eventMs - fromMs) / minute);
    if (observedMin <= 0)
      return {
        id,
        skipped:
          rule.from === 'gasOn'
            ? 'logged before the first vaporiser setting above 0 %'
            : 'logged before the vaporiser-off event',
      };
    const predictedMin = predictedOf(result, id);
    if (predictedMin === null || predictedMin <= 0)
      return { id, skipped: 'the model does not reach it within its window for this log' };
    return { id, observedMin, predictedMin: round2(predictedMin), ratio: observedMin / predictedMin };
  });
  const extubationMs = firstEventMs(log.entries, 'extubation');
  return {
    ok: true,
    gasOnMs: plan.gasOnMs,
    vaporiserOffMs: offMs,
    extubationMin: extubationMs === null || offMs === null ? null : round2((extubationMs - offMs) / minute),
    milestones,
    notes: plan.notes,
    modelMac: result.mac.valuePct,
  };
}

/**
 * The whole comparison for a completed record: the log read as a plan, the model run once
 * (point estimate, no uncertainty samples), observed beside predicted per milestone.
 * @param log the record's log and the bird
 * @param tables the species reference the model reads
 */
export function recordEvidence(log: RecordLog, tables: PlanTables): RecordEvidence {
  const plan = planInputFromLog(log);
  if (!plan.ok) return { ok: false, skipped: plan.missing };
  if (plan.offMs === null) return { ok: false, skipped: 'no vaporiser-off event logged' };
  const result = computePlanCourse(plan.input, tables);
  return compareWithLog(log, plan, result);
}
