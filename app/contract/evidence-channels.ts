import { z } from 'zod';
import { agentIds, agentLabels, type AgentId } from '../core/agents.js';
import { routes } from '../core/delivery.js';
import { evidenceMilestoneIds } from '../core/evidence/observed.js';
import type { LoggedEntry, RecordLog } from '../core/evidence/record-log.js';
import { calendarDate, namingText } from './input-rules.js';
import type { PlanInput } from './plan.js';
import type { ProcedureEntry, ProcedureRecord } from './records.js';

/**
 * The agent a record's evidence and forecast use, with where it came from: the agent logged on
 * the record; for a record that does not name one (made before records carried an agent), the
 * linked plan's, else the clinic's default agent. The stored record is never changed by this.
 * @param record the record's current version
 * @param plan the linked plan's input, or null
 * @param defaultAgent the clinic's default agent
 */
export function recordAgentOf(
  record: ProcedureRecord,
  plan: Pick<PlanInput, 'agent'> | null,
  defaultAgent: AgentId,
): { readonly agent: AgentId; readonly basis: string } {
  const logged = record.values.agent;
  if (logged !== null) return { agent: logged, basis: `${agentLabels[logged]}, logged on the record` };
  if (plan !== null) return { agent: plan.agent, basis: `${agentLabels[plan.agent]}, from the linked plan` };
  return {
    agent: defaultAgent,
    basis: `${agentLabels[defaultAgent]}, the clinic's default agent (no plan is linked to the record)`,
  };
}

/**
 * The one reading of a stored record as the model's log, used by the back end (observed vs
 * predicted, calibration) and by the live record screen (the forecast), so both answer alike.
 * @param record the record's current version
 * @param entries its current entries (voided ones are left out here)
 * @param bird the body mass (g, or null when none is known), the species key, the linked plan's
 *   input (or null) and the clinic's default agent (the agent: `recordAgentOf`)
 */
export function recordLogOf(
  record: ProcedureRecord,
  entries: readonly ProcedureEntry[],
  bird: {
    readonly bodyMassG: number | null;
    readonly speciesKey: string;
    readonly plan: PlanInput | null;
    readonly defaultAgent: AgentId;
  },
): { ok: true; log: RecordLog } | { ok: false; missing: string } {
  const bodyMassG = bird.bodyMassG ?? bird.plan?.bodyMassG ?? null;
  if (bodyMassG === null) return { ok: false, missing: 'no body mass is known (no weight and no plan)' };
  if (bodyMassG < 5 || bodyMassG > 15000)
    return { ok: false, missing: `a body mass of ${String(bodyMassG)} g is outside the model's 5-15000 g` };
  const plan = bird.plan;
  const { agent, basis: agentBasis } = recordAgentOf(record, plan, bird.defaultAgent);
  const logged: LoggedEntry[] = entries
    .filter((entry) => !entry.voided)
    .map((entry) => ({
      atMs: Date.parse(entry.values.at),
      kind: entry.values.kind,
      vaporPct: entry.values.vaporPct,
      oxygenLpm: entry.values.oxygenLpm,
      heartRatePerMin: entry.values.heartRatePerMin,
      breathsPerMin: entry.values.breathsPerMin,
      eventType: entry.values.eventType,
    }));
  return {
    ok: true,
    log: {
      startedAtMs: Date.parse(record.values.startedAt),
      endedAtMs: record.values.endedAt === null ? null : Date.parse(record.values.endedAt),
      airway: record.values.airway,
      circuit: record.values.circuit,
      bird: {
        bodyMassG,
        speciesId: bird.speciesKey,
        agent,
        agentBasis,
        ...(plan?.macPct === undefined ? {} : { macPct: plan.macPct }),
      },
      ...(plan === null ? {} : { inductionRoute: plan.route, plannedFreshGasLpm: plan.freshGasLpm }),
      ...(plan?.chamberVolumeL === undefined ? {} : { chamberVolumeL: plan.chamberVolumeL }),
      entries: logged,
    },
  };
}

const id = z.number({ error: 'An id must be a number.' }).int().positive();

export const evidenceFilterSchema = z.object({
  speciesKey: z.string().max(60).optional(),
  agent: z.enum(agentIds, { error: 'Choose isoflurane, sevoflurane or desflurane.' }).optional(),
  route: z.enum(routes, { error: 'Choose mask, chamber, endotracheal tube or air-sac tube.' }).optional(),
  staffInitials: z.string().max(40).optional(),
  from: calendarDate('From').optional(),
  to: calendarDate('To').optional(),
  recordId: id.optional(),
});
export type EvidenceFilter = z.infer<typeof evidenceFilterSchema>;

const milestoneIdSchema = z.enum(evidenceMilestoneIds);
const positive = z.number().positive();

export const evidenceMilestoneSchema = z.object({
  id: milestoneIdSchema,
  observedMin: positive.nullable(),
  predictedMin: positive.nullable(),
  ratio: positive.nullable(),
  skipped: z.string().nullable(),
});

export const evidenceRowSchema = z.object({
  recordId: z.number().int(),
  patientId: z.number().int(),
  patientName: z.string(),
  speciesKey: z.string(),
  speciesName: z.string(),
  agent: z.enum(agentIds),
  agentBasis: z.string(),
  airway: z.enum(routes),
  staffInitials: z.string(),
  procedureName: z.string(),
  startedAt: z.string(),
  endedAt: z.string(),
  bodyMassG: positive.nullable(),
  /** Why the whole record could not be compared, or null. */
  skipped: z.string().nullable(),
  milestones: z.array(evidenceMilestoneSchema),
  extubationMin: z.number().nullable(),
  notes: z.array(z.string()),
  exclusion: z.object({ reason: z.string(), enteredBy: z.string(), enteredAt: z.string() }).nullable(),
});
export type EvidenceRow = z.infer<typeof evidenceRowSchema>;

const count = z.number().int().nonnegative();

export const evidenceListSchema = z.object({
  rows: z.array(evidenceRowSchema),
  counts: z.object({
    /** Completed records matching the filter. */
    completed: count,
    /** Records compared on at least one milestone. */
    compared: count,
    /** Records skipped whole (no dial, no flow, no vaporiser off, no mass). */
    skipped: count,
    /** Per milestone: records whose event was missing or unusable. */
    skippedByMilestone: z.record(milestoneIdSchema, count),
    excluded: count,
    /** Records still running (no end), not shown. */
    inProgress: count,
    /**
     * Completed records whose row is still being computed (after an upgrade, a species edit or
     * records that ended before rows were kept): not in `rows` nor in the counts above. The whole
     * clinic's, whatever the filter (their species, agent and staff are not known before); for a
     * `recordId` filter, 1 when that record is the one waiting.
     */
    pending: count,
  }),
});
export type EvidenceList = z.infer<typeof evidenceListSchema>;

const bandSchema = z.object({ low: positive, high: positive });

export const speciesCalibrationSchema = z.object({
  speciesKey: z.string(),
  speciesName: z.string(),
  groupName: z.string(),
  factor: positive,
  band90: bandSchema,
  birdBand90: bandSchema,
  speciesRecords: count,
  groupRecords: count,
  clinicRecords: count,
});
export type SpeciesCalibrationView = z.infer<typeof speciesCalibrationSchema>;

export const calibrationSchema = z.object({
  on: z.boolean(),
  switchedBy: z.string().nullable(),
  switchedAt: z.string().nullable(),
  switchReason: z.string(),
  method: z.string(),
  priorBasis: z.string(),
  milestones: z.array(
    z.object({
      id: milestoneIdSchema,
      label: z.string(),
      records: count,
      birdSd: positive,
      clinicFactor: positive,
      clinicBand90: bandSchema,
      /** Every species of the clinic's reference (also those without records: they follow their group). */
      species: z.array(speciesCalibrationSchema),
    }),
  ),
  /** Every record that went in, with the milestones it gave. */
  recordsIn: z.array(z.object({ recordId: z.number().int(), milestones: z.array(milestoneIdSchema) })),
  /** Completed records still being compared with the model: not in these figures yet. */
  pending: count,
});
export type CalibrationView = z.infer<typeof calibrationSchema>;

const meta = z.object({
  enteredBy: namingText('Name or initials', { max: 80 }),
  reason: namingText('Reason', {
    max: 500,
    multiLine: true,
    blank: 'Say why; the reason is kept with the record.',
  }),
});

/** Channels of the clinic's own evidence; merged into the one channel table. */
export const evidenceChannels = {
  'evidence:list': { request: evidenceFilterSchema, response: evidenceListSchema },
  'evidence:export-csv': {
    request: evidenceFilterSchema,
    response: z.object({
      fileName: z.string(),
      csv: z.string(),
      rows: count,
      /** Completed records still being compared, not in the file (see `counts.pending`). */
      pending: count,
    }),
  },
  'evidence:calibration': { request: z.object({}).strict(), response: calibrationSchema },
  'evidence:exclude': {
    request: z.object({ recordId: id, excluded: z.boolean(), meta }),
    response: z.object({
      recordId: z.number().int(),
      excluded: z.boolean(),
      reason: z.string(),
      enteredAt: z.string(),
      enteredBy: z.string(),
    }),
  },
  'evidence:set-calibration': {
    request: z.object({
      on: z.boolean({ error: 'Say whether calibration is on or off.' }),
      meta: z.object({
        enteredBy: namingText('Name or initials', { max: 80 }),
        reason: z.string().max(500).default(''),
      }),
    }),
    response: z.object({
      on: z.boolean(),
      enteredAt: z.string().nullable(),
      enteredBy: z.string().nullable(),
      reason: z.string(),
    }),
  },
} as const;
