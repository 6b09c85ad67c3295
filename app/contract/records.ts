import { z } from 'zod';
import { agentIds } from '../core/agents.js';
import { circuits, routes } from '../core/delivery.js';
import { eventTypes } from '../core/procedure-events.js';
import { potencyMeasures } from '../core/species-reference.js';
import {
  bodyMassG,
  calendarDate,
  calendarDateTime,
  freeText,
  namingText,
  optionalNamingText,
  textWithoutHiddenCharacters,
} from './input-rules.js';

/**
 * Two sets of field rules with one shape. Requests are checked with the input rules (calendar
 * dates, visible names, body-mass bounds); answers are checked only for their shape, so that a
 * record saved before a rule existed (a 2023-02-30 hatch date, a 5e-324 g weight) can still be
 * opened and corrected instead of locking the patient away.
 */
type Rules = {
  readonly checked: boolean;
  naming(what: string, options: { max: number; blank?: string; multiLine?: boolean }): z.ZodString;
  optionalNaming(what: string, max: number): z.ZodDefault<z.ZodString>;
  free(what: string, max: number, multiLine?: boolean): z.ZodDefault<z.ZodString>;
  date(what: string): z.ZodType<string, string>;
  dateTime(what: string): z.ZodType<string, string>;
  mass(what: string): z.ZodNumber;
};

const requestRules: Rules = {
  checked: true,
  naming: (what, options) => namingText(what, options),
  optionalNaming: (what, max) => optionalNamingText(what, { max }),
  free: (what, max, multiLine = false) => freeText(what, { max, multiLine }),
  date: calendarDate,
  dateTime: calendarDateTime,
  mass: bodyMassG,
};

const storedRules: Rules = {
  checked: false,
  naming: () => z.string(),
  optionalNaming: () => z.string().default(''),
  free: () => z.string().default(''),
  date: () => z.string(),
  dateTime: () => z.string(),
  mass: () => z.number(),
};

/** Who made a change and why; every write carries it. */
export const changeMetaSchema = z.object({
  enteredBy: namingText('Name or initials', { max: 80 }),
  reason: freeText('Reason', { max: 500, multiLine: true }),
});

export const correctionMetaSchema = z.object({
  enteredBy: namingText('Name or initials', { max: 80 }),
  reason: namingText('Reason', {
    max: 500,
    multiLine: true,
    blank: 'Say why the record is corrected; the reason is kept with the history.',
  }),
});

export const recordStampSchema = z.object({
  versionId: z.number().int(),
  enteredAt: z.string(),
  enteredBy: z.string(),
  reason: z.string(),
  correctsId: z.number().int().nullable(),
});

// Species -------------------------------------------------------------------------------------

const basisBlank =
  'Give the source; without one, end with (common practice), (unverified value) or (assumption).';

function speciesMac(rules: Rules) {
  return z.object({
    macPct: z
      .number({ error: 'MAC must be a number in vol %.' })
      .min(0.1, { error: 'MAC must be at least 0.1 %.' })
      .max(15, { error: 'MAC must be at most 15 %.' }),
    sdPct: z.number().min(0).max(5).nullable().default(null),
    measure: z.enum(potencyMeasures).default('MAC'),
    basis: rules.naming('Source of the MAC', { max: 300, blank: basisBlank }),
    note: (rules.checked ? textWithoutHiddenCharacters('MAC note', { max: 300 }) : z.string())
      .nullable()
      .default(null),
  });
}

function rateRange(rules: Rules, what: string) {
  return z
    .object({
      min: z.number().positive(),
      max: z.number().positive(),
      basis: rules.naming(`Source of the ${what}`, { max: 300, blank: basisBlank }),
    })
    .refine((range) => range.max >= range.min, {
      error: 'The upper value must not be below the lower one.',
      path: ['max'],
    });
}

function anatomyNote(rules: Rules) {
  return z.object({
    code: z.string().max(60).default(''),
    text: rules.naming('Anatomy note', { max: 500, multiLine: true }),
    basis: rules.naming('Source of the anatomy note', { max: 300, blank: basisBlank }),
  });
}

function speciesValues(rules: Rules) {
  return z
    .object({
      commonName: rules.naming('Common name', { max: 120, blank: 'Enter the common name.' }),
      scientificName: rules.optionalNaming('Scientific name', 120),
      massMinG: z
        .number({ error: 'Lower typical mass must be a number in g.' })
        .positive({ error: 'Lower typical mass must be above 0 g.' })
        .max(20000, { error: 'Lower typical mass must be at most 20000 g.' }),
      massMaxG: z
        .number({ error: 'Upper typical mass must be a number in g.' })
        .positive({ error: 'Upper typical mass must be above 0 g.' })
        .max(20000, { error: 'Upper typical mass must be at most 20000 g.' }),
      massBasis: rules.naming('Source of the typical mass', { max: 300, blank: basisBlank }),
      heartRate: rateRange(rules, 'heart rate').nullable().default(null),
      breathsPerMin: rateRange(rules, 'breathing rate').nullable().default(null),
      mac: z
        .object({
          isoflurane: speciesMac(rules).nullable().default(null),
          sevoflurane: speciesMac(rules).nullable().default(null),
          desflurane: speciesMac(rules).nullable().default(null),
        })
        .default({ isoflurane: null, sevoflurane: null, desflurane: null }),
      apnoeaMacMultiple: z
        .object({
          value: z.number().positive().max(10),
          basis: rules.naming('Source of the apnoea multiple', { max: 300, blank: basisBlank }),
        })
        .nullable()
        .default(null),
      anatomyNotes: z.array(anatomyNote(rules)).max(20).default([]),
    })
    .refine((values) => values.massMaxG >= values.massMinG, {
      error: 'The upper typical mass must not be below the lower one.',
      path: ['massMaxG'],
    });
}

export const speciesMacSchema = speciesMac(requestRules);
export const rateRangeSchema = rateRange(requestRules, 'range');
export const anatomyNoteSchema = anatomyNote(requestRules);
export const speciesValuesSchema = speciesValues(requestRules);

export type SpeciesValues = z.infer<typeof speciesValuesSchema>;

export const speciesSchema = z.object({
  key: z.string(),
  origin: z.enum(['reference', 'clinic']),
  values: speciesValues(storedRules),
  stamp: recordStampSchema,
});
export type Species = z.infer<typeof speciesSchema>;

// Patients ------------------------------------------------------------------------------------

export const sexes = ['female', 'male', 'unknown'] as const;

function patientValues(rules: Rules) {
  return z.object({
    name: rules.naming('Name or ID', { max: 120, blank: 'Enter the bird’s name or clinic ID.' }),
    speciesKey: z.string({ error: 'Choose a species.' }).min(1, { error: 'Choose a species.' }).max(60),
    sex: z.enum(sexes, { error: 'Choose female, male or unknown.' }).default('unknown'),
    hatchDate: rules.date('Hatch date').nullable().default(null),
    ageText: rules.free('Age', 60),
    ringId: rules.optionalNaming('Ring ID', 60),
    microchipId: rules.optionalNaming('Microchip ID', 60),
    ownerReference: rules.optionalNaming('Owner reference', 120),
    notes: rules.free('Notes', 4000, true),
  });
}

export const patientValuesSchema = patientValues(requestRules);
export type PatientValues = z.infer<typeof patientValuesSchema>;

export const patientSchema = z.object({
  id: z.number().int(),
  values: patientValues(storedRules),
  stamp: recordStampSchema,
  createdAt: z.string(),
});
export type Patient = z.infer<typeof patientSchema>;

export const patientSummarySchema = z.object({
  id: z.number().int(),
  name: z.string(),
  speciesKey: z.string(),
  speciesName: z.string().nullable(),
  ringId: z.string(),
  microchipId: z.string(),
  ownerReference: z.string(),
  latestMassG: z.number().nullable(),
  latestWeighedOn: z.string().nullable(),
});
export type PatientSummary = z.infer<typeof patientSummarySchema>;

// Weights -------------------------------------------------------------------------------------

export const bodyConditions = ['', 'emaciated', 'thin', 'ideal', 'overweight', 'obese'] as const;

function weightValues(rules: Rules) {
  return z.object({
    weighedOn: rules.date('Weighing date'),
    massG: rules.mass('Weight'),
    bodyCondition: z
      .enum(bodyConditions, { error: 'Choose a body condition or leave it blank.' })
      .default(''),
    weighedBy: rules.optionalNaming('Weighed by', 80),
  });
}

export const weightValuesSchema = weightValues(requestRules);
export type WeightValues = z.infer<typeof weightValuesSchema>;

export const weightSchema = z.object({
  id: z.number().int(),
  patientId: z.number().int(),
  values: weightValues(storedRules),
  voided: z.boolean(),
  stamp: recordStampSchema,
});
export type Weight = z.infer<typeof weightSchema>;

// Procedure records -----------------------------------------------------------------------------

export const tubeTypes = ['', 'uncuffed', 'cuffed, cuff down', 'cuffed, cuff up'] as const;
export const cropStates = ['not checked', 'empty', 'not empty'] as const;

/** What the record form and the contract say when the agent is missing or not one of the list. */
export const recordAgentMessage =
  'Choose the anaesthetic agent given: isoflurane, sevoflurane or desflurane.';

function procedureRecordValues(rules: Rules) {
  return z.object({
    planId: z.number().int().positive().nullable().default(null),
    startedAt: rules.dateTime('Start'),
    endedAt: rules.dateTime('End').nullable().default(null),
    asaGrade: z
      .number()
      .int()
      .min(1, { error: 'ASA grade is 1 to 5.' })
      .max(5, { error: 'ASA grade is 1 to 5.' })
      .nullable()
      .default(null),
    emergency: z.boolean().default(false),
    procedureName: rules.naming('Procedure', { max: 200, blank: 'Enter the procedure.' }),
    fasting: rules.free('Fasting', 200),
    cropChecked: z.enum(cropStates).default('not checked'),
    airway: z.enum(routes, { error: 'Choose mask, chamber, endotracheal tube or air-sac tube.' }),
    tubeSizeMm: z
      .number()
      .min(1, { error: 'Tube size is 1 to 15 mm.' })
      .max(15, { error: 'Tube size is 1 to 15 mm.' })
      .nullable()
      .default(null),
    tubeType: z.enum(tubeTypes).default(''),
    circuit: z.enum(circuits, { error: 'Choose non-rebreathing system or circle.' }),
    /**
     * The inhalant given. Null: not recorded on the record (every record made before records
     * carried an agent); the evidence then reads the linked plan's agent or the clinic's default
     * and says so. Never filled in by guess.
     */
    agent: z.enum(agentIds, { error: recordAgentMessage }).nullable().default(null),
    staffInitials: rules.naming('Staff initials', {
      max: 40,
      blank: 'Enter the initials of the staff monitoring.',
    }),
    promptIntervalMin: z
      .number()
      .min(1, { error: 'Prompt interval is 1 to 30 minutes.' })
      .max(30, { error: 'Prompt interval is 1 to 30 minutes.' })
      .default(5),
  });
}

export const procedureRecordValuesSchema = procedureRecordValues(requestRules).refine(
  (values) => values.endedAt === null || Date.parse(values.endedAt) > Date.parse(values.startedAt),
  {
    error: 'End must be after the start; check the date and time of both.',
    path: ['endedAt'],
  },
);
export type ProcedureRecordValues = z.infer<typeof procedureRecordValuesSchema>;

export const procedureRecordSchema = z.object({
  id: z.number().int(),
  patientId: z.number().int(),
  values: procedureRecordValues(storedRules),
  stamp: recordStampSchema,
});
export type ProcedureRecord = z.infer<typeof procedureRecordSchema>;

const reading = (min: number, max: number, what: string, unit: string) =>
  z
    .number({ error: `${what} must be a number in ${unit}.` })
    .min(min, { error: `${what} must be ${min} to ${max} ${unit}.` })
    .max(max, { error: `${what} must be ${min} to ${max} ${unit}.` })
    .nullable()
    .default(null);

function procedureEntryValues(rules: Rules) {
  return z.object({
    at: rules.dateTime('Time'),
    kind: z.enum(['vitals', 'event']),
    vaporPct: reading(0, 10, 'Vaporiser', '%'),
    oxygenLpm: reading(0, 15, 'Oxygen flow', 'L/min'),
    heartRatePerMin: reading(0, 1200, 'Heart rate', '/min'),
    breathsPerMin: reading(0, 300, 'Breathing rate', '/min'),
    temperatureC: reading(20, 46, 'Temperature', '°C'),
    etco2Mmhg: reading(0, 150, 'EtCO2', 'mmHg'),
    spo2Pct: reading(0, 100, 'SpO2', '%'),
    eventType: z.enum(eventTypes).nullable().default(null),
    eventNote: rules.free('Note', 1000, true),
    drugName: rules.optionalNaming('Drug', 120),
    drugDose: rules.free('Dose', 120),
  });
}

export const procedureEntryValuesSchema = procedureEntryValues(requestRules)
  .refine((entry) => (entry.kind === 'event') === (entry.eventType !== null), {
    error: 'An event needs an event type; a vitals row has none.',
    path: ['eventType'],
  })
  .refine(
    (entry) =>
      entry.kind === 'event' ||
      [
        entry.vaporPct,
        entry.oxygenLpm,
        entry.heartRatePerMin,
        entry.breathsPerMin,
        entry.temperatureC,
        entry.etco2Mmhg,
        entry.spo2Pct,
      ].some((value) => value !== null),
    { error: 'Enter at least one reading in the row.', path: ['heartRatePerMin'] },
  )
  .refine((entry) => entry.eventType !== 'drugGiven' || entry.drugName !== '', {
    error: 'Name the drug given.',
    path: ['drugName'],
  });
export type ProcedureEntryValues = z.infer<typeof procedureEntryValuesSchema>;

export const procedureEntrySchema = z.object({
  id: z.number().int(),
  recordId: z.number().int(),
  values: procedureEntryValues(storedRules),
  voided: z.boolean(),
  stamp: recordStampSchema,
  /** The current name of the workstation that wrote this version; null when unknown (older rows). */
  workstationName: z.string().nullable(),
});
export type ProcedureEntry = z.infer<typeof procedureEntrySchema>;
