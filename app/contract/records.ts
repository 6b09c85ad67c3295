import { z } from 'zod';
import { circuits, routes } from '../core/delivery.js';
import { eventTypes } from '../core/procedure-events.js';
import { potencyMeasures } from '../core/species-reference.js';

const isoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, { error: 'Use a date as YYYY-MM-DD.' });
const person = (what: string) =>
  z
    .string({ error: `${what} must be text.` })
    .trim()
    .min(1, { error: `Enter ${what.toLowerCase()}.` })
    .max(80, { error: `${what} must be at most 80 characters.` });
const optionalText = (max: number, what: string) =>
  z
    .string({ error: `${what} must be text.` })
    .trim()
    .max(max, { error: `${what} must be at most ${max} characters.` })
    .default('');

/** Who made a change and why; every write carries it. */
export const changeMetaSchema = z.object({
  enteredBy: person('Name or initials'),
  reason: optionalText(500, 'Reason'),
});

export const correctionMetaSchema = z.object({
  enteredBy: person('Name or initials'),
  reason: z
    .string({ error: 'Reason must be text.' })
    .trim()
    .min(1, { error: 'Say why the record is corrected; the reason is kept with the history.' })
    .max(500, { error: 'Reason must be at most 500 characters.' }),
});

export const recordStampSchema = z.object({
  versionId: z.number().int(),
  enteredAt: z.string(),
  enteredBy: z.string(),
  reason: z.string(),
  correctsId: z.number().int().nullable(),
});

// Species -------------------------------------------------------------------------------------

const basisText = z
  .string()
  .trim()
  .min(1, {
    error: 'Give the source; without one, end with (common practice), (unverified value) or (assumption).',
  })
  .max(300);

export const speciesMacSchema = z.object({
  macPct: z
    .number({ error: 'MAC must be a number in vol %.' })
    .min(0.1, { error: 'MAC must be at least 0.1 %.' })
    .max(15, { error: 'MAC must be at most 15 %.' }),
  sdPct: z.number().min(0).max(5).nullable().default(null),
  measure: z.enum(potencyMeasures).default('MAC'),
  basis: basisText,
  note: z.string().trim().max(300).nullable().default(null),
});

export const rateRangeSchema = z
  .object({ min: z.number().positive(), max: z.number().positive(), basis: basisText })
  .refine((range) => range.max >= range.min, {
    error: 'The upper value must not be below the lower one.',
    path: ['max'],
  });

export const anatomyNoteSchema = z.object({
  code: z.string().max(60).default(''),
  text: z.string().trim().min(1).max(500),
  basis: basisText,
});

export const speciesValuesSchema = z
  .object({
    commonName: z
      .string()
      .trim()
      .min(1, { error: 'Enter the common name.' })
      .max(120, { error: 'Common name must be at most 120 characters.' }),
    scientificName: optionalText(120, 'Scientific name'),
    massMinG: z
      .number({ error: 'Lower typical mass must be a number in g.' })
      .positive({ error: 'Lower typical mass must be above 0 g.' })
      .max(20000, { error: 'Lower typical mass must be at most 20000 g.' }),
    massMaxG: z
      .number({ error: 'Upper typical mass must be a number in g.' })
      .positive({ error: 'Upper typical mass must be above 0 g.' })
      .max(20000, { error: 'Upper typical mass must be at most 20000 g.' }),
    massBasis: basisText,
    heartRate: rateRangeSchema.nullable().default(null),
    breathsPerMin: rateRangeSchema.nullable().default(null),
    mac: z
      .object({
        isoflurane: speciesMacSchema.nullable().default(null),
        sevoflurane: speciesMacSchema.nullable().default(null),
        desflurane: speciesMacSchema.nullable().default(null),
      })
      .default({ isoflurane: null, sevoflurane: null, desflurane: null }),
    apnoeaMacMultiple: z
      .object({ value: z.number().positive().max(10), basis: basisText })
      .nullable()
      .default(null),
    anatomyNotes: z.array(anatomyNoteSchema).max(20).default([]),
  })
  .refine((values) => values.massMaxG >= values.massMinG, {
    error: 'The upper typical mass must not be below the lower one.',
    path: ['massMaxG'],
  });

export type SpeciesValues = z.infer<typeof speciesValuesSchema>;

export const speciesSchema = z.object({
  key: z.string(),
  origin: z.enum(['reference', 'clinic']),
  values: speciesValuesSchema,
  stamp: recordStampSchema,
});
export type Species = z.infer<typeof speciesSchema>;

// Patients ------------------------------------------------------------------------------------

export const sexes = ['female', 'male', 'unknown'] as const;

export const patientValuesSchema = z.object({
  name: z
    .string({ error: 'Name or ID must be text.' })
    .trim()
    .min(1, { error: 'Enter the bird’s name or clinic ID.' })
    .max(120, { error: 'Name or ID must be at most 120 characters.' }),
  speciesKey: z.string({ error: 'Choose a species.' }).min(1, { error: 'Choose a species.' }).max(60),
  sex: z.enum(sexes, { error: 'Choose female, male or unknown.' }).default('unknown'),
  hatchDate: isoDate.nullable().default(null),
  ageText: optionalText(60, 'Age'),
  ringId: optionalText(60, 'Ring ID'),
  microchipId: optionalText(60, 'Microchip ID'),
  ownerReference: optionalText(120, 'Owner reference'),
  notes: optionalText(4000, 'Notes'),
});
export type PatientValues = z.infer<typeof patientValuesSchema>;

export const patientSchema = z.object({
  id: z.number().int(),
  values: patientValuesSchema,
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

export const weightValuesSchema = z.object({
  weighedOn: isoDate,
  massG: z
    .number({ error: 'Weight must be a number in grams.' })
    .positive({ error: 'Weight must be above 0 g.' })
    .max(20000, { error: 'Weight must be at most 20000 g (20 kg).' }),
  bodyCondition: z.enum(bodyConditions, { error: 'Choose a body condition or leave it blank.' }).default(''),
  weighedBy: optionalText(80, 'Weighed by'),
});
export type WeightValues = z.infer<typeof weightValuesSchema>;

export const weightSchema = z.object({
  id: z.number().int(),
  patientId: z.number().int(),
  values: weightValuesSchema,
  voided: z.boolean(),
  stamp: recordStampSchema,
});
export type Weight = z.infer<typeof weightSchema>;

// Procedure records -----------------------------------------------------------------------------

export const tubeTypes = ['', 'uncuffed', 'cuffed, cuff down', 'cuffed, cuff up'] as const;
export const cropStates = ['not checked', 'empty', 'not empty'] as const;

export const procedureRecordValuesSchema = z.object({
  planId: z.number().int().nullable().default(null),
  startedAt: z.string().datetime({ offset: true, error: 'Start must be a date and time.' }),
  endedAt: z
    .string()
    .datetime({ offset: true, error: 'End must be a date and time.' })
    .nullable()
    .default(null),
  asaGrade: z
    .number()
    .int()
    .min(1, { error: 'ASA grade is 1 to 5.' })
    .max(5, { error: 'ASA grade is 1 to 5.' })
    .nullable()
    .default(null),
  emergency: z.boolean().default(false),
  procedureName: z.string().trim().min(1, { error: 'Enter the procedure.' }).max(200),
  fasting: optionalText(200, 'Fasting'),
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
  staffInitials: z.string().trim().min(1, { error: 'Enter the initials of the staff monitoring.' }).max(40),
  promptIntervalMin: z
    .number()
    .min(1, { error: 'Prompt interval is 1 to 30 minutes.' })
    .max(30, { error: 'Prompt interval is 1 to 30 minutes.' })
    .default(5),
});
export type ProcedureRecordValues = z.infer<typeof procedureRecordValuesSchema>;

export const procedureRecordSchema = z.object({
  id: z.number().int(),
  patientId: z.number().int(),
  values: procedureRecordValuesSchema,
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

export const procedureEntryValuesSchema = z
  .object({
    at: z.string().datetime({ offset: true, error: 'Time must be a date and time.' }),
    kind: z.enum(['vitals', 'event']),
    vaporPct: reading(0, 10, 'Vaporiser', '%'),
    oxygenLpm: reading(0, 15, 'Oxygen flow', 'L/min'),
    heartRatePerMin: reading(0, 1200, 'Heart rate', '/min'),
    breathsPerMin: reading(0, 300, 'Breathing rate', '/min'),
    temperatureC: reading(20, 46, 'Temperature', '°C'),
    etco2Mmhg: reading(0, 150, 'EtCO2', 'mmHg'),
    spo2Pct: reading(0, 100, 'SpO2', '%'),
    eventType: z.enum(eventTypes).nullable().default(null),
    eventNote: optionalText(1000, 'Note'),
    drugName: optionalText(120, 'Drug'),
    drugDose: optionalText(120, 'Dose'),
  })
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
  values: procedureEntryValuesSchema,
  voided: z.boolean(),
  stamp: recordStampSchema,
});
export type ProcedureEntry = z.infer<typeof procedureEntrySchema>;
