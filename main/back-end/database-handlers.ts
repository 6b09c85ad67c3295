import type { DatabaseChoiceSource, DatabaseCurrent } from '../../app/contract/database-channels.js';
import type { Host } from '../../app/contract/channels.js';
import type { ClinicDb } from '../../db/clinic-db.js';
import { checkPostgresConnection, PostgresConnectionError } from '../../db/postgres-checks.js';
import { PostgresAddressError, postgresGuide } from '../../db/postgres-options.js';
import type { HandlerTable } from './handlers.js';
import { HandlerError } from './handlers.js';
import { readSavedDatabase, saveDatabaseChoice } from './saved-database.js';

type DatabaseHandlers = Pick<
  HandlerTable,
  'database:current' | 'database:test-connection' | 'database:save-address'
>;

/**
 * Seals and opens a password with the operating system's keychain (the desktop's safeStorage);
 * only the desktop window has one.
 */
export type PasswordKeeper = {
  seal(password: string): string;
  open(sealed: string): string;
};

export type DatabaseHandlerContext = {
  readonly clinic: ClinicDb;
  readonly dataDirectory: string;
  readonly host: Host;
  readonly chosenBy: DatabaseChoiceSource;
  readonly env?: NodeJS.ProcessEnv;
  /** The desktop's keychain; absent in the browser host, which then refuses a password. */
  readonly keeper?: PasswordKeeper;
};

export const browserHostPasswordMessage = `This window cannot keep a password safely. Put it in a password file (PGPASSFILE or ~/.pgpass, readable only by you) or in PGPASSWORD on this computer; see ${postgresGuide}.`;

/** Settings' "Clinic database" section: the database in use, a connection test, the address for the next start. */
export function createDatabaseHandlers(context: DatabaseHandlerContext): DatabaseHandlers {
  const current = (): DatabaseCurrent => {
    const saved = readSavedDatabase(context.dataDirectory);
    return {
      engine: context.clinic.engine,
      location: context.clinic.location,
      chosenBy: context.chosenBy,
      savedAddress: saved.address,
      passwordKept: saved.sealedPassword !== null,
      canKeepPassword: context.keeper !== undefined,
    };
  };
  const refusePasswordWithoutKeeper = (password: string | undefined) => {
    if (password !== undefined && password !== '' && context.keeper === undefined)
      throw new HandlerError('unavailable', browserHostPasswordMessage, 'password');
  };
  return {
    'database:current': current,
    'database:test-connection': async (request) => {
      refusePasswordWithoutKeeper(request.password);
      let keptPassword: string | null = null;
      if (request.password !== undefined && request.password !== '') keptPassword = request.password;
      else if (context.keeper !== undefined) {
        const saved = readSavedDatabase(context.dataDirectory);
        if (saved.sealedPassword !== null && saved.address === request.address.trim())
          keptPassword = context.keeper.open(saved.sealedPassword);
      }
      try {
        const facts = await checkPostgresConnection(request.address, {
          // A typed test is held to the same rule as a saved address: no password in it.
          source: 'saved',
          env: context.env ?? process.env,
          keptPassword,
        });
        return { reachable: true as const, ...facts };
      } catch (error) {
        if (error instanceof PostgresConnectionError)
          return { reachable: false as const, message: error.message };
        throw error;
      }
    },
    'database:save-address': (request) => {
      refusePasswordWithoutKeeper(request.password);
      const address = request.address === null || request.address.trim() === '' ? null : request.address;
      const previous = readSavedDatabase(context.dataDirectory);
      let sealedPassword: string | null = null;
      if (address !== null && context.keeper !== undefined) {
        if (request.password !== undefined && request.password !== '')
          sealedPassword = context.keeper.seal(request.password);
        else if (previous.address === address.trim()) sealedPassword = previous.sealedPassword;
      }
      try {
        saveDatabaseChoice(context.dataDirectory, { address, sealedPassword });
      } catch (error) {
        if (error instanceof PostgresAddressError)
          throw new HandlerError('invalid-request', error.message, 'address');
        throw error;
      }
      return current();
    },
  };
}
