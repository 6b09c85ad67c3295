/**
 * Which clinic database this workstation uses: the embedded file in its data folder, or a
 * PostgreSQL server shared by the clinic's workstations. Settings shows the one in use, tests an
 * address, and saves one for the next start (never with a password in it).
 */
import { z } from 'zod';
import { textWithoutHiddenCharacters } from './input-rules.js';

export const databaseEngines = ['sqlite', 'postgresql'] as const;
export type DatabaseEngine = (typeof databaseEngines)[number];

export const databaseEngineLabels: Readonly<Record<DatabaseEngine, string>> = {
  sqlite: 'The file in this computer’s data folder (SQLite)',
  postgresql: 'The clinic’s database server (PostgreSQL)',
};

/** How the database in use was chosen. */
export const databaseChoiceSources = ['default', 'command line', 'environment', 'saved'] as const;
export type DatabaseChoiceSource = (typeof databaseChoiceSources)[number];

export const databaseChoiceLabels: Readonly<Record<DatabaseChoiceSource, string>> = {
  default: 'no server was named, so the file is used',
  'command line': 'named by --database when Tidewing was started',
  environment: 'named by TIDEWING_DATABASE_URL when Tidewing was started',
  saved: 'saved in Settings on this workstation',
};

const addressText = textWithoutHiddenCharacters('Server address', { max: 2000 });
const passwordText = z.string().max(1000, { error: 'The password may be at most 1000 characters.' });

export const databaseCurrentSchema = z.object({
  engine: z.enum(databaseEngines),
  /** The file path, or the server address without its password. */
  location: z.string(),
  chosenBy: z.enum(databaseChoiceSources),
  /** The address saved for the next start (without a password), or null for the file. */
  savedAddress: z.string().nullable(),
  /** Whether the desktop keeps a password for the saved address (sealed by the system keychain). */
  passwordKept: z.boolean(),
  /** Whether this host can keep a password (only the desktop window, with the system keychain). */
  canKeepPassword: z.boolean(),
});
export type DatabaseCurrent = z.infer<typeof databaseCurrentSchema>;

export const databaseTestRequestSchema = z.object({
  address: addressText.refine((text) => text.trim() !== '', { error: 'Type the server address to test.' }),
  /** Desktop only: a password typed beside the address, tried before PGPASSWORD and the password file. */
  password: passwordText.optional(),
});

export const databaseTestResultSchema = z.discriminatedUnion('reachable', [
  z.object({
    reachable: z.literal(true),
    location: z.string(),
    serverVersion: z.string(),
    schemaVersion: z.number().int().nonnegative(),
    supportedSchemaVersion: z.number().int().positive(),
  }),
  z.object({ reachable: z.literal(false), message: z.string() }),
]);
export type DatabaseTestResult = z.infer<typeof databaseTestResultSchema>;

export const databaseSaveRequestSchema = z.object({
  /** The server address for the next start, or null to go back to the file in the data folder. */
  address: addressText.nullable(),
  /** Desktop only: kept sealed by the system keychain; refused by the browser host. */
  password: passwordText.optional(),
});

export const databaseChannels = {
  'database:current': { request: z.object({}).strict(), response: databaseCurrentSchema },
  'database:test-connection': { request: databaseTestRequestSchema, response: databaseTestResultSchema },
  'database:save-address': { request: databaseSaveRequestSchema, response: databaseCurrentSchema },
} as const;
