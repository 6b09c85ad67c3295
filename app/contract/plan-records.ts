import { z } from 'zod';
import { circuitSchema, planInputSchema, planResultSchema, routeSchema } from './plan.js';
import { checklistStates } from './checklist.js';
import { calendarDate, freeText, namingText } from './input-rules.js';
import { patientSchema, recordStampSchema, speciesSchema } from './records.js';

export { checklistItems, checklistStates, type ChecklistKey } from './checklist.js';

const itemState = z.enum(checklistStates).default('open');

/** The checklist; `checked` false for answers, which keep what was saved before a rule existed. */
function checklist(checked: boolean) {
  return z.object({
    asaGrade: z
      .number()
      .int()
      .min(1, { error: 'ASA grade is 1 to 5.' })
      .max(5, { error: 'ASA grade is 1 to 5.' })
      .nullable()
      .default(null),
    emergency: z.boolean().default(false),
    items: z
      .object({
        fastingAndCrop: itemState,
        hydration: itemState,
        bloods: itemState,
        equipmentLeakCheck: itemState,
        oxygenSupply: itemState,
        scavenging: itemState,
        emergencyCard: itemState,
      })
      .default({
        fastingAndCrop: 'open',
        hydration: 'open',
        bloods: 'open',
        equipmentLeakCheck: 'open',
        oxygenSupply: 'open',
        scavenging: 'open',
        emergencyCard: 'open',
      }),
    notes: checked ? freeText('Checklist notes', { max: 1000, multiLine: true }) : z.string().default(''),
  });
}

export const checklistSchema = checklist(true);
export type Checklist = z.infer<typeof checklistSchema>;

export const planFieldsSchema = z.object({
  patientId: z.number().int().positive().nullable(),
  plannedFor: calendarDate('Planned date'),
  label: freeText('Label', { max: 120 }),
  input: planInputSchema,
  checklist: checklistSchema,
});
export type PlanFields = z.infer<typeof planFieldsSchema>;

export const savedPlanSchema = z.object({
  id: z.number().int(),
  patientId: z.number().int().nullable(),
  plannedFor: z.string(),
  label: z.string(),
  input: planInputSchema,
  result: planResultSchema,
  checklist: checklist(false),
  modelVersion: z.string(),
  /** For the variant of a saved comparison: the id of the plan it was compared with; else null. */
  variantOf: z.number().int().nullable().default(null),
  stamp: recordStampSchema,
});
export type SavedPlan = z.infer<typeof savedPlanSchema>;

/** One phase of a saved plan in a list line: what is set, and the flow the model recommends for it. */
export const planSummaryPhaseSchema = z.object({
  startMin: z.number(),
  gapMin: z.number(),
  route: routeSchema,
  /** The phase's breathing system, or null for a chamber. */
  circuit: circuitSchema.nullable(),
  freshGasLpm: z.number(),
  recommendedLpm: z.number(),
  minimumLpm: z.number(),
  dialSteps: z.array(z.object({ atMin: z.number(), vaporPct: z.number() })),
});
export type PlanSummaryPhase = z.infer<typeof planSummaryPhaseSchema>;

export const planSummarySchema = z.object({
  id: z.number().int(),
  patientId: z.number().int().nullable(),
  patientName: z.string().nullable(),
  plannedFor: z.string(),
  label: z.string(),
  agent: z.string(),
  route: z.string(),
  /** The plan's breathing system, or null when it names none (a chamber). */
  circuit: z.string().nullable(),
  bodyMassG: z.number(),
  liquidMl: z.number(),
  oxygenL: z.number(),
  inductionMin: z.number().nullable(),
  /** Fresh gas flow of the first phase, L/min. */
  freshGasLpm: z.number(),
  /** The vaporiser schedule: each dial setting from its minute. */
  schedule: z.array(z.object({ atMin: z.number(), vaporPct: z.number() })),
  /** Minutes after the vaporiser is off until first movement, or null when not predicted. */
  recoveryMin: z.number().nullable().default(null),
  /** The plan's phases in time order, the first from 0 min (one for a single-route plan). */
  phases: z.array(planSummaryPhaseSchema).default([]),
  openChecklistItems: z.number().int(),
  /** For the variant of a saved comparison: the id of the plan it was compared with; else null. */
  variantOf: z.number().int().nullable().default(null),
  /** In a saved comparison, whether this is the plan the clinic will use; null outside one. */
  chosen: z.boolean().nullable().default(null),
  asaGrade: z.number().int().nullable(),
  emergency: z.boolean(),
});
export type PlanSummary = z.infer<typeof planSummarySchema>;

export const planDetailSchema = z.object({
  plan: savedPlanSchema,
  patient: patientSchema.nullable(),
  species: speciesSchema.nullable(),
  weightTrendText: z.string().nullable(),
  history: z.array(z.object({ id: z.number().int(), stamp: recordStampSchema, modelVersion: z.string() })),
  /** The saved comparison this plan belongs to (newest versions, compared plan first), or null. */
  comparison: z
    .object({
      chosenId: z.number().int(),
      plans: z.array(
        z.object({ id: z.number().int(), label: z.string(), variantOf: z.number().int().nullable() }),
      ),
    })
    .nullable()
    .default(null),
});
export type PlanDetail = z.infer<typeof planDetailSchema>;

const meta = z.object({
  enteredBy: namingText('Name or initials', {
    max: 80,
    blank: 'Enter your initials at the top of the screen first; every record carries them.',
  }),
  reason: freeText('Reason', { max: 500, multiLine: true }),
});

/** Planning channels, merged into the one channel table. */
export const planChannels = {
  'plans:save': { request: z.object({ fields: planFieldsSchema, meta }), response: savedPlanSchema },
  /** A comparison: both plans saved, the variant marked as an alternative of the first, the first chosen. */
  'plans:save-comparison': {
    request: z.object({ fields: planFieldsSchema, variantFields: planFieldsSchema, meta }),
    response: z.object({ plan: savedPlanSchema, variant: savedPlanSchema }),
  },
  /**
   * A variant of a plan already saved (`of`, its newest version): a new plan marked as its
   * alternative, for the same patient and day; the saved plan is not changed and stays chosen
   * until the clinic chooses otherwise.
   */
  'plans:save-variant': {
    request: z.object({ of: z.number().int().positive(), fields: planFieldsSchema, meta }),
    response: savedPlanSchema,
  },
  /** Makes this plan the chosen one of its saved comparison. */
  'plans:choose': {
    request: z.object({ id: z.number().int().positive(), meta }),
    response: z.object({ chosenId: z.number().int() }),
  },
  'plans:correct': {
    request: z.object({ id: z.number().int().positive(), fields: planFieldsSchema, meta }),
    response: savedPlanSchema,
  },
  'plans:get': { request: z.object({ id: z.number().int().positive() }), response: planDetailSchema },
  'plans:for-patient': {
    request: z.object({ patientId: z.number().int().positive() }),
    response: z.array(planSummarySchema),
  },
  'plans:recent': {
    request: z.object({ limit: z.number().int().min(1).max(500).default(50) }),
    response: z.array(planSummarySchema),
  },
  'plans:day': {
    request: z.object({ date: calendarDate('Day') }),
    response: z.object({
      date: z.string(),
      plans: z.array(planSummarySchema),
      totals: z.object({ liquidMlByAgent: z.record(z.string(), z.number()), oxygenL: z.number() }),
    }),
  },
} as const;
