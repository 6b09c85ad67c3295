import { z } from 'zod';
import { clinicSettingsSchema, storedSettingsSchema } from './settings.js';
import { acknowledgeRequestSchema, safetyStatusSchema } from './safety.js';
import { recordChannels } from './record-channels.js';
import { planChannels } from './plan-records.js';
import { drugChannels } from './drug-channels.js';
import { worksheetChannels } from './worksheet-channels.js';
import { evidenceChannels } from './evidence-channels.js';
import { workstationChannels } from './workstation.js';
import { databaseChannels } from './database-channels.js';
import { demoClinicChannels } from './demo-clinic-channels.js';

const empty = z.object({}).strict();

/** Where the screens run: the Electron window or a browser on the loopback host. */
export const hosts = ['desktop', 'browser'] as const;
export type Host = (typeof hosts)[number];

export const appInfoSchema = z.object({
  appVersion: z.string(),
  schemaVersion: z.number().int(),
  dataDirectory: z.string(),
  host: z.enum(hosts),
});

/**
 * The one table of channels between the screens and the back end.
 * Names are `domain:verb`; every request and response has a schema, and both hosts
 * (Electron IPC and the loopback browser host) validate against it.
 */
export const channels = {
  'app:info': { request: empty, response: appInfoSchema },
  'safety:status': { request: empty, response: safetyStatusSchema },
  'safety:acknowledge': { request: acknowledgeRequestSchema, response: safetyStatusSchema },
  'settings:get': { request: empty, response: storedSettingsSchema },
  'settings:save': { request: clinicSettingsSchema, response: storedSettingsSchema },
  'database:export-json': { request: empty, response: z.object({ fileName: z.string(), json: z.string() }) },
  'database:backups': {
    request: empty,
    response: z.object({
      folder: z.string(),
      backups: z.array(z.object({ file: z.string(), takenAt: z.string(), sizeBytes: z.number() })),
    }),
  },
  ...recordChannels,
  ...planChannels,
  ...drugChannels,
  ...worksheetChannels,
  ...evidenceChannels,
  ...workstationChannels,
  ...databaseChannels,
  ...demoClinicChannels,
} as const;

export type Channels = typeof channels;
export type ChannelName = keyof Channels;
export type RequestOf<C extends ChannelName> = z.input<Channels[C]['request']>;
export type ParsedRequestOf<C extends ChannelName> = z.output<Channels[C]['request']>;
export type ResponseOf<C extends ChannelName> = z.output<Channels[C]['response']>;

export const channelNames = Object.keys(channels) as ChannelName[];

/** Narrows an untrusted string to a known channel name. */
export function isChannelName(value: unknown): value is ChannelName {
  return typeof value === 'string' && Object.prototype.hasOwnProperty.call(channels, value);
}
