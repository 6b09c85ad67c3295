import { z } from 'zod';
import { agentIds } from '../core/agents.js';
import { massUnits, pressureUnits, temperatureUnits } from '../core/units.js';

export const paperSizes = ['A4', 'Letter'] as const;

/** Clinic settings as the screens edit them. Messages are shown beside each field. */
export const clinicSettingsSchema = z.object({
  clinicName: z
    .string({ error: 'Clinic name must be text.' })
    .trim()
    .min(1, { error: 'Enter the clinic name; it heads every printed worksheet.' })
    .max(120, { error: 'Clinic name must be at most 120 characters.' }),
  addressLine: z
    .string({ error: 'Address must be text.' })
    .trim()
    .max(200, { error: 'Address must be at most 200 characters.' }),
  massUnit: z.enum(massUnits, { error: 'Choose g or kg for body mass.' }),
  pressureUnit: z.enum(pressureUnits, { error: 'Choose mmHg or kPa for pressures.' }),
  temperatureUnit: z.enum(temperatureUnits, { error: 'Choose C or F for temperature.' }),
  defaultAgent: z.enum(agentIds, {
    error: 'Choose isoflurane, sevoflurane or desflurane as the default agent.',
  }),
  paperSize: z.enum(paperSizes, { error: 'Choose A4 or Letter paper for worksheets.' }),
});

export type ClinicSettings = z.infer<typeof clinicSettingsSchema>;

/** Stored settings, or null before the clinic has saved any. */
export const storedSettingsSchema = z.object({
  settings: clinicSettingsSchema.nullable(),
  updatedAt: z.string().nullable(),
});

export type StoredSettings = z.infer<typeof storedSettingsSchema>;

export const defaultClinicSettings: ClinicSettings = {
  clinicName: '',
  addressLine: '',
  massUnit: 'g',
  pressureUnit: 'mmHg',
  temperatureUnit: 'C',
  defaultAgent: 'isoflurane',
  paperSize: 'A4',
};
