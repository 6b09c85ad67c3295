/**
 * The demo clinic as a first-start choice: whether this clinic holds any patient (the choice is
 * offered only while it holds none) and any of the demo's invented birds (the header then says
 * so), and the one write that fills an empty clinic with the invented demo clinic.
 */
import { z } from 'zod';
import { databaseEngines } from './database-channels.js';
import { storedSettingsSchema } from './settings.js';

const count = z.number().int().nonnegative();

export const demoClinicStatusSchema = z.object({
  /** Every patient of the clinic, invented or not. */
  patientCount: count,
  /** Patients the demo clinic wrote: invented birds. */
  demoPatientCount: count,
  /** Where the clinic is kept, for saying how to start a real clinic beside the demo. */
  engine: z.enum(databaseEngines),
  dataDirectory: z.string(),
  /** What the demo clinic holds, for the screens to describe it before it is written. */
  demo: z.object({
    name: z.string(),
    birds: count,
    species: count,
    records: count,
    /** Its records fall within this many days before the day it is written. */
    days: count,
  }),
});
export type DemoClinicStatus = z.infer<typeof demoClinicStatusSchema>;

export const demoClinicWrittenSchema = z.object({
  recordsWritten: count.refine((records) => records > 0, { error: 'The demo clinic wrote no record.' }),
  status: demoClinicStatusSchema,
  /** The clinic's settings afterwards: named as the invented demo clinic when no name was set. */
  settings: storedSettingsSchema,
});
export type DemoClinicWritten = z.infer<typeof demoClinicWrittenSchema>;

export const demoClinicChannels = {
  'demo-clinic:status': { request: z.object({}).strict(), response: demoClinicStatusSchema },
  /** Refused (conflict) when the clinic already holds a patient: invented birds are never mixed in. */
  'demo-clinic:create': { request: z.object({}).strict(), response: demoClinicWrittenSchema },
} as const;
