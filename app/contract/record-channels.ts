import { z } from 'zod';
import { cautionSeverities } from '../core/cautions.js';
import {
  changeMetaSchema,
  correctionMetaSchema,
  patientSchema,
  patientSummarySchema,
  patientValuesSchema,
  procedureEntrySchema,
  procedureEntryValuesSchema,
  procedureRecordSchema,
  procedureRecordValuesSchema,
  speciesSchema,
  speciesValuesSchema,
  weightSchema,
  weightValuesSchema,
} from './records.js';

const id = z.number({ error: 'An id must be a number.' }).int().positive();

export const weightFlagSchema = z.object({
  code: z.string(),
  severity: z.enum(cautionSeverities),
  message: z.string(),
  reason: z.string(),
});
const weightChangeSchema = z
  .object({ grams: z.number(), percent: z.number(), lossBand: z.string() })
  .nullable();
export const weightTrendSchema = z.object({
  latest: z.object({ weighedOn: z.string(), massG: z.number() }).nullable(),
  sinceLast: weightChangeSchema,
  sinceFirst: weightChangeSchema,
  flags: z.array(weightFlagSchema),
});

export const patientDetailSchema = z.object({
  patient: patientSchema,
  history: z.array(patientSchema),
  species: speciesSchema.nullable(),
  weights: z.array(weightSchema),
  trend: weightTrendSchema,
  procedures: z.array(procedureRecordSchema),
});
export type PatientDetail = z.infer<typeof patientDetailSchema>;

export const procedureEntryWithFlagSchema = procedureEntrySchema.extend({ corrected: z.boolean() });

export const procedureDetailSchema = z.object({
  record: procedureRecordSchema,
  patient: patientSchema,
  species: speciesSchema.nullable(),
  latestMassG: z.number().nullable(),
  entries: z.array(procedureEntryWithFlagSchema),
});
export type ProcedureDetail = z.infer<typeof procedureDetailSchema>;

/** Channels for the clinic's records; merged into the one channel table. */
export const recordChannels = {
  'species:list': { request: z.object({}).strict(), response: z.array(speciesSchema) },
  'species:history': { request: z.object({ key: z.string().min(1) }), response: z.array(speciesSchema) },
  'species:add': {
    request: z.object({ values: speciesValuesSchema, meta: changeMetaSchema }),
    response: speciesSchema,
  },
  'species:correct': {
    request: z.object({
      key: z.string().min(1),
      /**
       * The version of the species the correction replaces (the `stamp.versionId` the user saw).
       * Refused with `conflict` when someone saved another correction first; without it the
       * current version is corrected.
       */
      versionId: id.optional(),
      values: speciesValuesSchema,
      meta: correctionMetaSchema,
    }),
    response: speciesSchema,
  },

  'patients:search': {
    request: z.object({
      query: z.string().max(200).default(''),
      limit: z.number().int().min(1).max(500).default(50),
    }),
    response: z.object({ patients: z.array(patientSummarySchema), total: z.number().int() }),
  },
  'patients:get': { request: z.object({ id }), response: patientDetailSchema },
  'patients:create': {
    request: z.object({ values: patientValuesSchema, meta: changeMetaSchema }),
    response: patientSchema,
  },
  'patients:correct': {
    request: z.object({
      id,
      /**
       * The version of the details the correction replaces (the `stamp.versionId` the user saw).
       * Refused with `conflict` when someone saved another correction first; without it the
       * current version is corrected.
       */
      versionId: id.optional(),
      values: patientValuesSchema,
      meta: correctionMetaSchema,
    }),
    response: patientSchema,
  },

  'weights:add': {
    request: z.object({ patientId: id, values: weightValuesSchema, meta: changeMetaSchema }),
    response: weightSchema,
  },
  'weights:correct': {
    request: z.object({ id, values: weightValuesSchema, meta: correctionMetaSchema }),
    response: weightSchema,
  },
  'weights:void': { request: z.object({ id, meta: correctionMetaSchema }), response: weightSchema },
  'weights:history': { request: z.object({ id }), response: z.array(weightSchema) },

  'procedures:create': {
    request: z.object({ patientId: id, values: procedureRecordValuesSchema, meta: changeMetaSchema }),
    response: procedureRecordSchema,
  },
  'procedures:correct': {
    request: z.object({
      id,
      /**
       * The version of the details the correction replaces (the `stamp.versionId` the user saw).
       * Refused with `conflict` when someone saved another correction of it first; without it the
       * current version is corrected.
       */
      versionId: id.optional(),
      values: procedureRecordValuesSchema,
      meta: correctionMetaSchema,
    }),
    response: procedureRecordSchema,
  },
  'procedures:recent': {
    request: z.object({ limit: z.number().int().min(1).max(500).default(50) }),
    response: z.array(
      z.object({
        record: procedureRecordSchema,
        patientName: z.string(),
        speciesName: z.string().nullable(),
      }),
    ),
  },
  'procedures:get': { request: z.object({ id }), response: procedureDetailSchema },
  'procedures:history': { request: z.object({ id }), response: z.array(procedureRecordSchema) },
  'procedures:export-csv': {
    request: z.object({ id }),
    response: z.object({ fileName: z.string(), csv: z.string() }),
  },

  'entries:add': {
    request: z.object({ recordId: id, values: procedureEntryValuesSchema, meta: changeMetaSchema }),
    response: procedureEntrySchema,
  },
  'entries:correct': {
    request: z.object({ id, values: procedureEntryValuesSchema, meta: correctionMetaSchema }),
    response: procedureEntrySchema,
  },
  'entries:void': { request: z.object({ id, meta: correctionMetaSchema }), response: procedureEntrySchema },
  'entries:history': { request: z.object({ id }), response: z.array(procedureEntrySchema) },
  /** A record's voided rows (each the row that voided it, with who, when and why), in time order. */
  'entries:voided': { request: z.object({ recordId: id }), response: z.array(procedureEntrySchema) },
} as const;
