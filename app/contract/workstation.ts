/**
 * Per-workstation settings, kept in the clinic database under the workstation's stable id (made
 * once in the data folder): its name, the screen theme and the initials of whoever is at its
 * keyboard. They survive restarts and a new port of the browser host, where the browser's own
 * storage (per origin) does not.
 */
import { z } from 'zod';
import { hasLetterOrDigit, namingText, textWithoutHiddenCharacters } from './input-rules.js';

/** `system` follows the computer's light or dark setting; `light` and `dim` pin one. */
export const themeChoices = ['system', 'light', 'dim'] as const;
export type ThemeChoice = (typeof themeChoices)[number];

export const themeLabels: Readonly<Record<ThemeChoice, string>> = {
  system: 'Follow this computer’s setting',
  light: 'Light',
  dim: 'Dim, for a darkened theatre',
};

/** Longest initials kept for a workstation (records allow 80 for who entered them). */
export const workstationInitialsMax = 40;

/** Initials as typed in the top bar: blank (nobody named yet) or a visible letter or digit. */
const initialsText = textWithoutHiddenCharacters('Your initials', { max: workstationInitialsMax }).refine(
  (text) => text === '' || hasLetterOrDigit(text),
  { error: 'Your initials must contain at least one letter or digit.' },
);

export const workstationSchema = z.object({
  id: z.string(),
  name: z.string(),
  theme: z.enum(themeChoices),
  initials: z.string(),
  /** When the settings were last saved; null before the first save (defaults shown). */
  updatedAt: z.string().nullable(),
});
export type Workstation = z.infer<typeof workstationSchema>;

/** What a save may change; each field left out keeps its stored value. */
export const workstationChangeSchema = z
  .object({
    name: namingText('Workstation name', {
      max: 80,
      blank:
        'Enter a name for this workstation, e.g. Theatre 1; it tells the clinic which computer wrote what.',
    }).optional(),
    theme: z
      .enum(themeChoices, { error: 'Choose follow the system, light or dim for the theme.' })
      .optional(),
    initials: initialsText.optional(),
  })
  .strict()
  .refine(
    (change) => change.name !== undefined || change.theme !== undefined || change.initials !== undefined,
    {
      error: 'Say what to change: the workstation name, theme or initials.',
    },
  );
export type WorkstationChange = z.input<typeof workstationChangeSchema>;

export const workstationChannels = {
  'workstation:get': { request: z.object({}).strict(), response: workstationSchema },
  'workstation:save': { request: workstationChangeSchema, response: workstationSchema },
} as const;
