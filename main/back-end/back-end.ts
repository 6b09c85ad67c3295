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
  /**
   * Resolves when the demo clinic asked for with `demoClinic` is written (at once when none was
   * asked for); rejects when it could not be written. A host awaits it before serving.
   */
  readonly demoWritten: Promise<void>;
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
  const demoWritten =
    options.demoClinic === true
      ? writeDemoClinic(clinic, now()).then((written) => {
          options.log?.(
            written > 0
              ? `Demo clinic: ${String(written)} invented procedure records written.`
              : 'Demo clinic not written: this clinic already holds patients.',
          );
        })
      : Promise.resolve();
  const { handlers, workstationTheme } = createBackEndParts({
    db,
    clinic,
    appVersion: options.appVersion,
    dataDirectory: options.dataDirectory,
    host: options.host,
    now,
  });
  // The backup at start copies the clinic once the demo clinic (if asked for) is in it.
  const backUp = () =>
    automaticBackupOnStart({
      dataDirectory: options.dataDirectory,
      databaseFile: file,
      connection: db,
      now: now(),
    });
  const backupSettled =
    options.automaticBackup === true
      ? (options.demoClinic === true ? demoWritten.catch(() => undefined).then(backUp) : backUp()).then(
          (result) => {
            options.log?.(result.message);
            return result.message;
          },
        )
      : Promise.resolve('No automatic backup was asked for.');
  return {
    db,
    clinic,
    dispatch: createDispatcher(handlers, options.log),
    handlers,
    databaseFile: file,
    workstationTheme,
    backupSettled,
    demoWritten,
    close: () => {
      if (db.open) db.close();
    },
  };
}
