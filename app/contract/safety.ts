import { z } from 'zod';

export const acknowledgeRequestSchema = z.object({
  acknowledgedBy: z
    .string({ error: 'Name or initials must be text.' })
    .trim()
    .min(1, { error: 'Enter your name or initials so the acknowledgement is attributable.' })
    .max(80, { error: 'Name or initials must be at most 80 characters.' }),
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
