import { z } from 'zod';
import { namingText } from './input-rules.js';

export const acknowledgeRequestSchema = z.object({
  acknowledgedBy: namingText('Name or initials', {
    max: 80,
    blank: 'Enter your name or initials so the acknowledgement is attributable.',
  }),
  accepted: z.literal(true, { error: 'Tick the box to confirm you have read the cautions.' }),
});

export const safetyStatusSchema = z.object({
  /** True when this version of the app has been acknowledged on this database. */
  acknowledged: z.boolean(),
  appVersion: z.string(),
  last: z
    .object({ acknowledgedAt: z.string(), appVersion: z.string(), acknowledgedBy: z.string() })
    .nullable(),
});

export type SafetyStatus = z.infer<typeof safetyStatusSchema>;
export type AcknowledgeRequest = z.infer<typeof acknowledgeRequestSchema>;
