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
import { createChangeSource, publishingChanges, type ChangeSource } from './change-notices.js';

export type BackEnd = {
  readonly db: TidewingDatabase;
  /** The clinic database behind the shared query layer. */
  readonly clinic: ClinicDb;
  /** The contract's dispatcher; each successful write publishes its notices to `changes`. */
  readonly dispatch: Dispatcher;
  /** Change notices of this back end's writes (and, on PostgreSQL, other workstations'). */
  readonly changes: ChangeSource;
  /** The handler table behind `dispatch`, for a host that replaces one channel with its own. */
  readonly handlers: HandlerTable;
  readonly databaseFile: string;
  /** The theme this workstation pinned in Settings, for the hosts to write into the page. */
  readonly workstationTheme: () => ThemeChoice;
  /**
   * Settles when the start-up writes are done: the shipped species reference seeded, the demo
   * clinic written when asked for, this workstation's theme read. `dispatch` awaits it before
   * the first handler runs; a host awaits it before serving pages (and gives up if it rejects).
   */
  readonly ready: Promise<void>;
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
  const { handlers, workstationTheme, loadWorkstationTheme } = createBackEndParts({
    db,
    clinic,
    appVersion: options.appVersion,
    dataDirectory: options.dataDirectory,
    host: options.host,
    now,
  });
  const ready = (async () => {
    await createSpeciesRepository(clinic).seedReference(speciesReference, now());
    if (options.demoClinic === true) {
      const written = await writeDemoClinic(clinic, now());
      options.log?.(
        written > 0
          ? `Demo clinic: ${String(written)} invented procedure records written.`
          : 'Demo clinic not written: this clinic already holds patients.',
      );
    }
    await loadWorkstationTheme();
  })();
  // A failure is answered by every dispatch and by the hosts that await `ready`; not unhandled.
  ready.catch(() => undefined);
  // The backup is made after the start-up writes, as when they were synchronous; none when they failed.
  const backupSettled =
    options.automaticBackup === true
      ? ready.then(
          async () => {
            const result = await automaticBackupOnStart({
              dataDirectory: options.dataDirectory,
              databaseFile: file,
              connection: db,
              now: now(),
            });
            options.log?.(result.message);
            return result.message;
          },
          (error: unknown) =>
            `No automatic backup: the clinic database could not be prepared (${error instanceof Error ? error.message : String(error)}).`,
        )
      : Promise.resolve('No automatic backup was asked for.');
  const changes = createChangeSource(options.log);
  return {
    db,
    clinic,
    dispatch: publishingChanges(createDispatcher(handlers, options.log, ready), changes),
    changes,
    handlers,
    databaseFile: file,
    workstationTheme,
    ready,
    backupSettled,
    close: () => {
      if (db.open) db.close();
    },
  };
}
