import { agentLabels, type AgentId } from '../../core/agents.js';
import type { Circuit, Route } from '../../core/delivery.js';
import { routeLabels } from '../../core/delivery.js';
import {
  cropStates,
  procedureRecordValuesSchema,
  recordAgentMessage,
  tubeTypes,
  type ProcedureRecordValues,
} from '../../contract/records.js';
import { describeIssues } from '../../contract/result.js';
import { fieldErrorsFrom, type FieldErrors } from '../common/field-errors.js';
import { fromLocalInputValue, toLocalInputValue } from './clock-time.js';
import { parseNumber } from './entry-form.js';
import { defaultPromptIntervalMin } from './monitoring.js';

/** The new-record form as typed. */
export type RecordDraft = {
  readonly procedureName: string;
  /** `datetime-local` value on the clinic's clock. */
  readonly startedAtLocal: string;
  /** 0 while not graded. */
  readonly asaGrade: 0 | 1 | 2 | 3 | 4 | 5;
  readonly emergency: boolean;
  readonly fasting: string;
  readonly cropChecked: (typeof cropStates)[number];
  readonly airway: Route | '';
  readonly tubeSizeMm: string;
  readonly tubeType: (typeof tubeTypes)[number];
  readonly circuit: Circuit | '';
  /** The anaesthetic agent given; '' only for a record made before records carried one. */
  readonly agent: AgentId | '';
  readonly staffInitials: string;
  readonly promptIntervalMin: string;
  /** The saved anaesthetic plan this procedure follows, if any. */
  readonly planId: number | null;
};

/**
 * A blank form: start now, not graded, crop not checked, reminder every 5 minutes, the clinic's
 * default agent (a linked plan's agent replaces it: `withLinkedPlan`).
 * @param startedAtLocal `datetime-local` value for the start, normally the current minute
 * @param staffInitials the initials of the person at the keyboard, possibly blank
 * @param defaultAgent the clinic's default agent
 */
export function emptyRecordDraft(
  startedAtLocal: string,
  staffInitials: string,
  defaultAgent: AgentId,
): RecordDraft {
  return {
    procedureName: '',
    startedAtLocal,
    asaGrade: 0,
    emergency: false,
    fasting: '',
    cropChecked: 'not checked',
    airway: '',
    tubeSizeMm: '',
    tubeType: '',
    circuit: '',
    agent: defaultAgent,
    staffInitials,
    promptIntervalMin: String(defaultPromptIntervalMin),
    planId: null,
  };
}

/** Whether the airway takes a tube whose size is recorded. */
export function airwayHasTube(airway: RecordDraft['airway']): boolean {
  return airway === 'endotracheal' || airway === 'airSacTube';
}

/**
 * Checks the typed form with the contract's schema and returns the values to send, or a message
 * per field. Tube size and type are kept only for an airway that has a tube. The agent must be
 * chosen, except when correcting a record that never named one (`agentMayStayUnrecorded`).
 */
export function checkRecordDraft(
  draft: RecordDraft,
  options: { readonly agentMayStayUnrecorded?: boolean } = {},
):
  | { readonly ok: true; readonly values: ProcedureRecordValues }
  | { readonly ok: false; readonly errors: FieldErrors } {
  const errors: Record<string, string> = {};
  const startedAt = fromLocalInputValue(draft.startedAtLocal);
  if (startedAt === null) errors['startedAt'] = 'Enter the start date and time.';
  const size = airwayHasTube(draft.airway) ? parseNumber(draft.tubeSizeMm) : null;
  if (size === 'invalid') errors['tubeSizeMm'] = 'Tube size must be a number in mm.';
  const interval = parseNumber(draft.promptIntervalMin);
  if (interval === 'invalid' || interval === null)
    errors['promptIntervalMin'] = 'Prompt interval must be a number of minutes, 1 to 30.';
  if (draft.agent === '' && options.agentMayStayUnrecorded !== true) errors['agent'] = recordAgentMessage;
  const candidate = {
    planId: draft.planId,
    startedAt: startedAt ?? '',
    endedAt: null,
    asaGrade: draft.asaGrade === 0 ? null : draft.asaGrade,
    emergency: draft.emergency,
    procedureName: draft.procedureName,
    fasting: draft.fasting,
    cropChecked: draft.cropChecked,
    airway: draft.airway === '' ? undefined : draft.airway,
    tubeSizeMm: size === 'invalid' ? null : size,
    tubeType: draft.airway === 'endotracheal' ? draft.tubeType : '',
    circuit: draft.circuit === '' ? undefined : draft.circuit,
    agent: draft.agent === '' ? null : draft.agent,
    staffInitials: draft.staffInitials,
    promptIntervalMin: typeof interval === 'number' ? interval : undefined,
  };
  const parsed = procedureRecordValuesSchema.safeParse(candidate);
  if (!parsed.success) {
    for (const [field, message] of Object.entries(fieldErrorsFrom(describeIssues(parsed.error.issues))))
      errors[field] ??= message;
  }
  if (!parsed.success || Object.keys(errors).length > 0) return { ok: false, errors };
  return { ok: true, values: parsed.data };
}

export const tubeTypeLabels: Readonly<Record<(typeof tubeTypes)[number], string>> = {
  '': 'not recorded',
  uncuffed: 'Uncuffed',
  'cuffed, cuff down': 'Cuffed, cuff down',
  'cuffed, cuff up': 'Cuffed, cuff up',
};

/** One line describing the airway, e.g. "Endotracheal tube 2.5 mm, uncuffed". */
export function airwayText(
  values: Pick<ProcedureRecordValues, 'airway' | 'tubeSizeMm' | 'tubeType'>,
): string {
  const size = values.tubeSizeMm === null ? '' : ` ${values.tubeSizeMm} mm`;
  const type = values.airway === 'endotracheal' && values.tubeType !== '' ? `, ${values.tubeType}` : '';
  return `${routeLabels[values.airway]}${size}${type}`;
}

/** The record's agent as the record shows it: its name, or that the record does not say. */
export function agentText(agent: AgentId | null): string {
  return agent === null ? 'agent not recorded' : agentLabels[agent];
}

/** ASA grade as written on records: 1-5 with E for emergency. */
export function asaText(values: Pick<ProcedureRecordValues, 'asaGrade' | 'emergency'>): string {
  if (values.asaGrade === null) return values.emergency ? 'not graded (E)' : 'not graded';
  return `${values.asaGrade}${values.emergency ? 'E' : ''}`;
}

/** The form for correcting a record's details, filled from its current values. */
export function recordToDraft(values: ProcedureRecordValues): RecordDraft {
  return {
    procedureName: values.procedureName,
    startedAtLocal: toLocalInputValue(new Date(values.startedAt)),
    asaGrade: (values.asaGrade ?? 0) as RecordDraft['asaGrade'],
    emergency: values.emergency,
    fasting: values.fasting,
    cropChecked: values.cropChecked,
    airway: values.airway,
    tubeSizeMm: values.tubeSizeMm === null ? '' : String(values.tubeSizeMm),
    tubeType: values.tubeType,
    circuit: values.circuit,
    agent: values.agent ?? '',
    staffInitials: values.staffInitials,
    promptIntervalMin: String(values.promptIntervalMin),
    planId: values.planId,
  };
}
