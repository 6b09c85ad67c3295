import fs from 'node:fs';
import type { Host } from '../../app/contract/channels.js';
import { speciesReference } from '../../app/core/species-reference.js';
import { sqliteClinicDb, type ClinicDb } from '../../db/clinic-db.js';
import { openDatabase, type OpenOptions, type TidewingDatabase } from '../../db/connection.js';
import { createSpeciesRepository } from '../../db/repositories/species-repository.js';
import { automaticBackupOnStart } from './automatic-backup.js';
import { writeDemoClinic } from './demo-clinic.js';
import { databaseFile } from './data-directory.js';
import { createBackEndParts, createDispatcher, type Dispatcher, type HandlerTable } from './handlers.js';
import type { ThemeChoice } from '../../app/contract/workstation.js';
import { checkBeforeStart, StartRefusedError } from './start-up-guard.js';

export type BackEnd = {
  readonly db: TidewingDatabase;
  /** The clinic database behind the shared query layer. */
  readonly clinic: ClinicDb;
  readonly dispatch: Dispatcher;
  /** The handler table behind `dispatch`, for a host that replaces one channel with its own. */
  readonly handlers: HandlerTable;
  readonly databaseFile: string;
  /** The theme this workstation pinned in Settings, for the hosts to write into the page. */
  readonly workstationTheme: () => ThemeChoice;
  /** Settles when the automatic backup made at start has finished (or was not asked for). */
  readonly backupSettled: Promise<string>;
  close(): void;
};

export type BackEndOptions = {
  readonly dataDirectory: string;
  readonly appVersion: string;
  readonly host: Host;
  readonly now?: () => Date;
  readonly openOptions?: OpenOptions;
  readonly log?: (message: string) => void;
  /** Make a rolling backup (last 10 kept) in `<data>/backups` at start. */
  readonly automaticBackup?: boolean;
  /** `--new-clinic`: start an empty clinic although `backups/` holds backups with records. */
  readonly newClinic?: boolean;
  /** `--demo`: fill an empty clinic with the invented demo clinic (a clinic with patients is left alone). */
  readonly demoClinic?: boolean;
};

/**
 * Opens the clinic database in a data folder and wires the contract's handler table to it.
 * The start-up guard runs first: a missing, emptied, damaged or foreign database is refused
 * with StartRefusedError before anything is created, migrated, written or backed up.
 */
export function startBackEnd(options: BackEndOptions): BackEnd {
  const finding = checkBeforeStart({
    dataDirectory: options.dataDirectory,
    newClinic: options.newClinic === true,
    ...(options.openOptions?.nativeBinding === undefined
      ? {}
      : { nativeBinding: options.openOptions.nativeBinding }),
    ...(options.openOptions?.migrations === undefined ? {} : { migrations: options.openOptions.migrations }),
  });
  if (!finding.ok) throw new StartRefusedError(finding);
  if (finding.notice !== null) options.log?.(finding.notice);
  fs.mkdirSync(options.dataDirectory, { recursive: true });
  const file = databaseFile(options.dataDirectory);
  const db = openDatabase(file, options.openOptions);
  const clinic = sqliteClinicDb(db);
  const now = options.now ?? (() => new Date());
  createSpeciesRepository(db).seedReference(speciesReference, now());
  // The demo clinic is written before the first request is answered and before the backup.
  const demoWritten =
    options.demoClinic === true
      ? writeDemoClinic(db, clinic, now()).then(
          (written) =>
            options.log?.(
              written > 0
                ? `Demo clinic: ${String(written)} invented procedure records written.`
                : 'Demo clinic not written: this clinic already holds patients.',
            ),
          (error: unknown) =>
            options.log?.(
              `Demo clinic not written: ${error instanceof Error ? error.message : String(error)}`,
            ),
        )
      : Promise.resolve();
  const { handlers, workstationTheme } = createBackEndParts({
    db,
    clinic,
    appVersion: options.appVersion,
    dataDirectory: options.dataDirectory,
    host: options.host,
    now,
  });
  const dispatcher = createDispatcher(handlers, options.log);
  const backupSettled =
    options.automaticBackup === true
      ? demoWritten
          .then(() =>
            automaticBackupOnStart({
              dataDirectory: options.dataDirectory,
              databaseFile: file,
              connection: db,
              now: now(),
            }),
          )
          .then((result) => {
            options.log?.(result.message);
            return result.message;
          })
      : Promise.resolve('No automatic backup was asked for.');
  return {
    db,
    clinic,
    dispatch: options.demoClinic === true ? dispatchAfter(demoWritten, dispatcher) : dispatcher,
    handlers,
    databaseFile: file,
    workstationTheme,
    backupSettled,
    close: () => {
      if (db.open) db.close();
    },
  };
}

/** A dispatcher that answers only once `ready` has settled (the demo clinic written). */
function dispatchAfter(ready: Promise<void>, dispatcher: Dispatcher): Dispatcher {
  return async (channel, payload) => {
    await ready;
    return dispatcher(channel, payload);
  };
}
