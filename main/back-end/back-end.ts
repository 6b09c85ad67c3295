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
import type { DatabaseChoiceSource } from '../../app/contract/database-channels.js';
import { openCheckedPostgresClinic } from '../../db/postgres-checks.js';
import type { AddressSource } from '../../db/postgres-options.js';
import { workstationIdentity } from './workstation-identity.js';
import { backEndApplicationName, listenForChanges } from '../../db/change-listener.js';
import type { EvidenceBackfill, EvidenceBackfillMode } from './evidence-backfill.js';

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
  /** The background computation of the clinic view's rows (see `BackEndOptions.evidenceBackfill`). */
  readonly evidenceBackfill: EvidenceBackfill;
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
  /**
   * 'automatic' (the hosts): once the start-up writes and the automatic backup are done, the
   * clinic view's rows of records that ended before they were kept, or whose rows went stale,
   * are computed in the background. 'manual' (the default: tests, the bench, short commands):
   * only when `evidenceBackfill.run()` is called. Either way a record's row is computed when it
   * ends or is corrected.
   */
  readonly evidenceBackfill?: EvidenceBackfillMode;
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
  const changes = createChangeSource(options.log);
  const { handlers, workstationTheme, loadWorkstationTheme, evidenceBackfill } = createBackEndParts({
    clinic,
    appVersion: options.appVersion,
    dataDirectory: options.dataDirectory,
    host: options.host,
    now,
    ...evidenceOptions(options, changes),
  });
  const ready = startUpWrites(clinic, now(), options, loadWorkstationTheme);
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
  startBackfillWhenSettled(evidenceBackfill, ready, backupSettled);
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
    evidenceBackfill,
    close: () => {
      evidenceBackfill.stop();
      if (db.open) db.close();
    },
  };
}

/** A PostgreSQL clinic database to start on, and where its address came from. */
export type DatabaseChoice = {
  readonly url: string;
  readonly source: AddressSource;
  /** A password the desktop keeps sealed by the system keychain, opened (see PasswordKeeper). */
  readonly keptPassword?: string | null;
};

export type StartOptions = BackEndOptions & {
  /** The PostgreSQL database to use; null or absent for the file in the data folder. */
  readonly database?: DatabaseChoice | null;
  /** Where pg's password look-up reads PGPASSWORD and PGPASSFILE (the process's environment by default). */
  readonly env?: NodeJS.ProcessEnv;
};

/** A started back end on either engine, as the hosts use it. */
export type StartedBackEnd = {
  readonly clinic: ClinicDb;
  readonly dispatch: Dispatcher;
  /** Change notices of this back end's writes and, on PostgreSQL, of other workstations'. */
  readonly changes: ChangeSource;
  /** Settles when the start-up writes are done (see `BackEnd.ready`). */
  readonly ready: Promise<void>;
  readonly handlers: HandlerTable;
  readonly workstationTheme: () => ThemeChoice;
  readonly backupSettled: Promise<string>;
  readonly evidenceBackfill: EvidenceBackfill;
  /** The database file, or the server address without its password. */
  readonly location: string;
  close(): Promise<void>;
};

/** Where the clinic's IT is told how to back up a PostgreSQL clinic database. */
export const serverBackupGuide = 'docs/postgresql.md ("Backups on the server")';

/**
 * Starts the back end on the database chosen at start. Without a PostgreSQL address it is
 * exactly `startBackEnd` (the file in the data folder, the start-up guard, the automatic
 * backup). With one, the address is checked and opened (`openCheckedPostgresClinic`: the
 * password never from the data folder, a superuser role and a newer schema refused), the server
 * in use is logged without its password, and the file backup is skipped: the server's own
 * backup is the clinic IT's (see docs/postgresql.md). The data folder still holds this
 * workstation's identity (workstation.json).
 */
export async function startBackEndOn(options: StartOptions): Promise<StartedBackEnd> {
  const choice = options.database ?? null;
  if (choice === null) {
    const started = startBackEnd(options);
    return {
      clinic: started.clinic,
      dispatch: started.dispatch,
      changes: started.changes,
      ready: started.ready,
      handlers: started.handlers,
      workstationTheme: started.workstationTheme,
      backupSettled: started.backupSettled,
      evidenceBackfill: started.evidenceBackfill,
      location: started.databaseFile,
      close: async () => {
        started.close();
        return Promise.resolve();
      },
    };
  }
  fs.mkdirSync(options.dataDirectory, { recursive: true });
  workstationIdentity(options.dataDirectory);
  const applicationName = backEndApplicationName();
  const opened = await openCheckedPostgresClinic(choice.url, {
    applicationName,
    source: choice.source,
    ...(options.env === undefined ? {} : { env: options.env }),
    ...(choice.keptPassword === undefined ? {} : { keptPassword: choice.keptPassword }),
    ...(options.openOptions?.migrations === undefined ? {} : { migrations: options.openOptions.migrations }),
  });
  for (const warning of opened.warnings) options.log?.(`Warning: ${warning}`);
  options.log?.(
    `Clinic database: PostgreSQL ${opened.serverVersion} at ${opened.location} (${describeSource(choice.source)}).`,
  );
  const clinic = opened.clinic;
  const now = options.now ?? (() => new Date());
  const changes = createChangeSource(options.log);
  const { handlers, workstationTheme, loadWorkstationTheme, evidenceBackfill } = createBackEndParts({
    clinic,
    appVersion: options.appVersion,
    dataDirectory: options.dataDirectory,
    host: options.host,
    now,
    databaseChoice: choice.source,
    ...evidenceOptions(options, changes),
  });
  // As on SQLite (several workstations may start together; the seeding skips what another wrote first).
  const ready = startUpWrites(clinic, now(), options, loadWorkstationTheme);
  ready.catch(() => undefined);
  startBackfillWhenSettled(evidenceBackfill, ready, Promise.resolve(''));
  // Other workstations' writes reach this one's screens through LISTEN/NOTIFY (migration 11).
  const listening = listenForChanges(opened.config, changes.publish, {
    ownApplicationName: applicationName,
    ...(options.log === undefined ? {} : { log: options.log }),
  });
  const skipped = `No file backup at start: the clinic database is on the server ${opened.location}; its backups are made on the server, see ${serverBackupGuide}.`;
  if (options.automaticBackup === true) options.log?.(skipped);
  return {
    clinic,
    dispatch: publishingChanges(createDispatcher(handlers, options.log, ready), changes),
    changes,
    ready,
    handlers,
    workstationTheme,
    backupSettled: Promise.resolve(skipped),
    evidenceBackfill,
    location: opened.location,
    close: async () => {
      evidenceBackfill.stop();
      await evidenceBackfill.idle();
      await listening.close();
      await clinic.close();
    },
  };
}

/** The back-fill's mode, where it tells the screens, and where it logs, from the start options. */
function evidenceOptions(options: BackEndOptions, changes: ChangeSource) {
  return {
    evidenceBackfill: options.evidenceBackfill ?? 'manual',
    publishChange: changes.publish,
    ...(options.log === undefined ? {} : { log: options.log }),
  } as const;
}

/**
 * Starts the back-fill of the clinic view's rows once the start-up writes (and the backup made
 * at start) are done; never when they failed. It only ever writes the evidence cache table.
 */
function startBackfillWhenSettled(
  backfill: EvidenceBackfill,
  ready: Promise<void>,
  backupSettled: Promise<string>,
): void {
  void Promise.all([ready, backupSettled]).then(
    () => backfill.start(),
    () => undefined,
  );
}

function describeSource(source: DatabaseChoiceSource): string {
  switch (source) {
    case 'command line':
      return 'named by --database';
    case 'environment':
      return 'named by TIDEWING_DATABASE_URL';
    case 'saved':
      return 'saved in Settings on this workstation';
    case 'default':
      return 'the default';
  }
}

/**
 * The writes a back end makes once its database has passed its checks, on either engine: the
 * shipped species reference seeded, the demo clinic written into an empty clinic when asked for,
 * this workstation's theme read. The dispatcher and the hosts await the promise.
 */
async function startUpWrites(
  clinic: ClinicDb,
  at: Date,
  options: { readonly demoClinic?: boolean; readonly log?: (message: string) => void },
  loadWorkstationTheme: () => Promise<void>,
): Promise<void> {
  await createSpeciesRepository(clinic).seedReference(speciesReference, at);
  if (options.demoClinic === true) {
    const written = await writeDemoClinic(clinic, at);
    options.log?.(
      written > 0
        ? `Demo clinic: ${String(written)} invented procedure records written.`
        : 'Demo clinic not written: this clinic already holds patients.',
    );
  }
  await loadWorkstationTheme();
}
