/**
 * The clinic's own emergency drugs. Tidewing ships no drug list and no dose: the clinic enters
 * each drug, its concentration, its dose range and the source it relies on for that dose.
 */
import { z } from 'zod';
import { freeText, namingText } from './input-rules.js';
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
    name: namingText('Drug name', { max: 120, blank: 'Enter the drug name.' }),
    concentrationMgPerMl: amount('Concentration', 'mg/mL', 1000),
    doseLowMgPerKg: amount('Dose (low)', 'mg/kg', 1000),
    doseHighMgPerKg: amount('Dose (high)', 'mg/kg', 1000).nullable().default(null),
    route: namingText('Route', { max: 60, blank: 'Enter the route, e.g. IV, IM, IO or intratracheal.' }),
    doseSource: namingText('Source of the dose', {
      max: 300,
      blank:
        'Enter the source of the dose (formulary, paper or clinic protocol); it is printed on the emergency card.',
    }),
    notes: freeText('Notes', { max: 500, multiLine: true }),
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
