import { z } from 'zod';
import { agentIds } from '../core/agents.js';
import { dateFormats } from '../core/date-format.js';
import { massUnits, pressureUnits, temperatureUnits } from '../core/units.js';
import { namingText, textWithoutHiddenCharacters } from './input-rules.js';

export const paperSizes = ['A4', 'Letter'] as const;

/** Clinic settings as the screens edit them. Messages are shown beside each field. */
export const clinicSettingsSchema = z.object({
  clinicName: namingText('Clinic name', {
    max: 120,
    blank: 'Enter the clinic name; it heads every printed worksheet.',
  }),
  addressLine: textWithoutHiddenCharacters('Address', { max: 200 }),
  massUnit: z.enum(massUnits, { error: 'Choose g or kg for body mass.' }),
  pressureUnit: z.enum(pressureUnits, { error: 'Choose mmHg or kPa for pressures.' }),
  temperatureUnit: z.enum(temperatureUnits, { error: 'Choose C or F for temperature.' }),
  defaultAgent: z.enum(agentIds, {
    error: 'Choose isoflurane, sevoflurane or desflurane as the default agent.',
  }),
  paperSize: z.enum(paperSizes, { error: 'Choose A4 or Letter paper for worksheets.' }),
  /** One date format for every screen and sheet; absent means year-month-day. */
  dateFormat: z.enum(dateFormats, { error: 'Choose one of the date formats listed.' }).optional(),
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
