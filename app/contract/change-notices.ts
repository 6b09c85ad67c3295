/**
 * Change notices: after a write succeeds, the back end tells every open screen (on this
 * workstation and, on a shared PostgreSQL database, on the others) which kind of data changed
 * and the ids that matter for refreshing. A notice carries no values: a screen that shows the
 * data asks for it again through its usual channel.
 *
 * `changeNoticesOf` below is the one table from contract channels to notices. Its type names
 * every channel, so a new channel cannot be added without saying whether it writes (and what it
 * changes) or only reads.
 */
import { z } from 'zod';
import type { ChannelName, ResponseOf } from './channels.js';

/** Which kind of data changed. */
export const changeKinds = [
  'patients',
  'weights',
  'plans',
  'procedure-records',
  'procedure-entries',
  'species',
  'settings',
  'drugs',
  'evidence',
  'workstations',
  'safety',
] as const;
export type ChangeKind = (typeof changeKinds)[number];

const positiveId = z.number().int().positive();

export const changeNoticeSchema = z
  .object({
    kind: z.enum(changeKinds),
    /** The patient whose data changed, when the change belongs to one. */
    patientId: positiveId.optional(),
    /** The procedure record whose details or log changed. */
    recordId: positiveId.optional(),
    /** The plan (a chain's first or newest row) that changed. */
    planId: positiveId.optional(),
    /** The day a changed plan is planned for (YYYY-MM-DD). */
    plannedFor: z
      .string()
      .regex(/^\d{4}-\d{2}-\d{2}$/)
      .optional(),
    /** True when another workstation made the change (it came through the shared database). */
    elsewhere: z.boolean().default(false),
  })
  .strict();
export type ChangeNotice = z.output<typeof changeNoticeSchema>;
export type ChangeNoticeInput = z.input<typeof changeNoticeSchema>;

/**
 * A channel that only reads (or writes nothing another screen shows) has no notices; a write
 * names its notices from its answer (which carries the ids: the request of a correction names
 * only the row it corrects).
 */
type NoticeRule<C extends ChannelName> =
  'read-only' | ((response: ResponseOf<C>) => readonly ChangeNoticeInput[]);

/**
 * Every channel: 'read-only', or what a successful call changed. Kept beside the channel list
 * (`channels.ts`); the mapped type refuses a channel left out.
 */
export const changeNoticesOf: { readonly [C in ChannelName]: NoticeRule<C> } = {
  'app:info': 'read-only',
  'safety:status': 'read-only',
  'safety:acknowledge': () => [{ kind: 'safety' }],
  'settings:get': 'read-only',
  'settings:save': () => [{ kind: 'settings' }],
  'database:export-json': 'read-only',
  'database:backups': 'read-only',
  'database:current': 'read-only',
  'database:test-connection': 'read-only',
  // Writes this workstation's own workstation.json (its database at the next start), not clinic data.
  'database:save-address': 'read-only',

  'species:list': 'read-only',
  'species:history': 'read-only',
  'species:add': () => [{ kind: 'species' }],
  'species:correct': () => [{ kind: 'species' }],
  'patients:search': 'read-only',
  'patients:get': 'read-only',
  'patients:create': (patient) => [{ kind: 'patients', patientId: patient.id }],
  'patients:correct': (patient) => [{ kind: 'patients', patientId: patient.id }],
  'weights:add': (weight) => [{ kind: 'weights', patientId: weight.patientId }],
  'weights:correct': (weight) => [{ kind: 'weights', patientId: weight.patientId }],
  'weights:void': (weight) => [{ kind: 'weights', patientId: weight.patientId }],
  'weights:history': 'read-only',
  'procedures:create': (record) => [
    { kind: 'procedure-records', recordId: record.id, patientId: record.patientId },
  ],
  'procedures:correct': (record) => [
    { kind: 'procedure-records', recordId: record.id, patientId: record.patientId },
  ],
  'procedures:recent': 'read-only',
  'procedures:get': 'read-only',
  'procedures:history': 'read-only',
  'procedures:export-csv': 'read-only',
  'entries:add': (entry) => [{ kind: 'procedure-entries', recordId: entry.recordId }],
  'entries:correct': (entry) => [{ kind: 'procedure-entries', recordId: entry.recordId }],
  'entries:void': (entry) => [{ kind: 'procedure-entries', recordId: entry.recordId }],
  'entries:history': 'read-only',
  'entries:voided': 'read-only',

  'plans:save': (plan) => [planNotice(plan)],
  'plans:save-comparison': ({ plan, variant }) => [planNotice(plan), planNotice(variant)],
  'plans:save-variant': (plan) => [planNotice(plan)],
  'plans:choose': ({ chosenId }) => [{ kind: 'plans', planId: chosenId }],
  'plans:correct': (plan) => [planNotice(plan)],
  'plans:get': 'read-only',
  'plans:for-patient': 'read-only',
  'plans:recent': 'read-only',
  'plans:day': 'read-only',

  'drugs:list': 'read-only',
  'drugs:add': () => [{ kind: 'drugs' }],
  'drugs:correct': () => [{ kind: 'drugs' }],
  'drugs:void': () => [{ kind: 'drugs' }],

  // Writes a PDF file where the user chose, nothing in the clinic database.
  'worksheets:save-pdf': 'read-only',

  'evidence:list': 'read-only',
  'evidence:export-csv': 'read-only',
  'evidence:calibration': 'read-only',
  'evidence:exclude': ({ recordId }) => [{ kind: 'evidence', recordId }],
  'evidence:set-calibration': () => [{ kind: 'evidence' }],

  'workstation:get': 'read-only',
  'workstation:save': () => [{ kind: 'workstations' }],

  'demo-clinic:status': 'read-only',
  // Invented patients with their weights, records and logs; the clinic's name when none was set.
  'demo-clinic:create': () => [
    { kind: 'patients' },
    { kind: 'weights' },
    { kind: 'procedure-records' },
    { kind: 'procedure-entries' },
    { kind: 'evidence' },
    { kind: 'settings' },
  ],
};

function planNotice(plan: { id: number; patientId: number | null; plannedFor: string }): ChangeNoticeInput {
  return {
    kind: 'plans',
    planId: plan.id,
    plannedFor: plan.plannedFor,
    ...(plan.patientId === null ? {} : { patientId: plan.patientId }),
  };
}

/** The notices a successful call of `channel` gives (none for a read-only channel). */
export function changeNoticesFor<C extends ChannelName>(channel: C, response: ResponseOf<C>): ChangeNotice[] {
  const rule = changeNoticesOf[channel] as NoticeRule<C>;
  if (rule === 'read-only') return [];
  return rule(response).map((notice) => changeNoticeSchema.parse(notice));
}

/** Whether a channel writes clinic data that screens show. */
export function isWriteChannel(channel: ChannelName): boolean {
  return changeNoticesOf[channel] !== 'read-only';
}

/** Path of the loopback host's change stream (Server-Sent Events; the bridge token header required). */
export const changeStreamPath = '/changes';
/** The SSE event name of a change notice. */
export const changeEventName = 'change';
