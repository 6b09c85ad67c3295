/**
 * The clinic's own emergency drugs. Tidewing ships no drug list and no dose: the clinic enters
 * each drug, its concentration, its dose range and the source it relies on for that dose.
 */
import { z } from 'zod';
import { changeMetaSchema, correctionMetaSchema, recordStampSchema } from './records.js';

const id = z.number({ error: 'An id must be a number.' }).int().positive();

function amount(what: string, unit: string, max: number) {
  const range = `${what} must be above 0 and at most ${String(max)} ${unit}.`;
  return z
    .number({
      error: (issue) =>
        issue.input === undefined || issue.input === null
          ? `Enter the ${what.toLowerCase()} in ${unit}.`
          : `${what} must be a number in ${unit}.`,
    })
    .positive({ error: range })
    .max(max, { error: range });
}

export const emergencyDrugValuesSchema = z
  .object({
    name: z
      .string({ error: 'Drug name must be text.' })
      .trim()
      .min(1, { error: 'Enter the drug name.' })
      .max(120, { error: 'Drug name must be at most 120 characters.' }),
    concentrationMgPerMl: amount('Concentration', 'mg/mL', 1000),
    doseLowMgPerKg: amount('Dose (low)', 'mg/kg', 1000),
    doseHighMgPerKg: amount('Dose (high)', 'mg/kg', 1000).nullable().default(null),
    route: z
      .string({ error: 'Route must be text.' })
      .trim()
      .min(1, { error: 'Enter the route, e.g. IV, IM, IO or intratracheal.' })
      .max(60, { error: 'Route must be at most 60 characters.' }),
    doseSource: z
      .string({ error: 'Source of the dose must be text.' })
      .trim()
      .min(1, {
        error:
          'Enter the source of the dose (formulary, paper or clinic protocol); it is printed on the emergency card.',
      })
      .max(300, { error: 'Source of the dose must be at most 300 characters.' }),
    notes: z
      .string({ error: 'Notes must be text.' })
      .trim()
      .max(500, { error: 'Notes must be at most 500 characters.' })
      .default(''),
  })
  .refine((values) => values.doseHighMgPerKg === null || values.doseHighMgPerKg >= values.doseLowMgPerKg, {
    error: 'Dose (high) must not be below dose (low).',
    path: ['doseHighMgPerKg'],
  });
export type EmergencyDrugValues = z.infer<typeof emergencyDrugValuesSchema>;

export const emergencyDrugSchema = z.object({
  id: z.number().int(),
  values: emergencyDrugValuesSchema,
  voided: z.boolean(),
  stamp: recordStampSchema,
});
export type EmergencyDrug = z.infer<typeof emergencyDrugSchema>;

/** Emergency-drug channels, merged into the one channel table. */
export const drugChannels = {
  'drugs:list': { request: z.object({}).strict(), response: z.array(emergencyDrugSchema) },
  'drugs:add': {
    request: z.object({ values: emergencyDrugValuesSchema, meta: changeMetaSchema }),
    response: emergencyDrugSchema,
  },
  'drugs:correct': {
    request: z.object({ id, values: emergencyDrugValuesSchema, meta: correctionMetaSchema }),
    response: emergencyDrugSchema,
  },
  'drugs:void': { request: z.object({ id, meta: correctionMetaSchema }), response: emergencyDrugSchema },
} as const;
