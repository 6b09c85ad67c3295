import { z } from 'zod';
import {
  channels,
  isChannelName,
  type ChannelName,
  type Host,
  type ParsedRequestOf,
  type ResponseOf,
} from '../../app/contract/channels.js';
import { describeIssues, type ContractError, type Result } from '../../app/contract/result.js';
import { worksheetPdfUnavailableMessage } from '../../app/contract/worksheet-channels.js';
import type { ThemeChoice } from '../../app/contract/workstation.js';
import type { ClinicDb } from '../../db/clinic-db.js';
import { schemaVersion } from '../../db/connection.js';
import { createSettingsRepository } from '../../db/repositories/settings-repository.js';
import { createSafetyAcknowledgementRepository } from '../../db/repositories/safety-acknowledgement-repository.js';
import { listBackups } from '../../db/backup.js';
import { exportDatabaseJson } from '../../db/export.js';
import { backupFolder } from './automatic-backup.js';
import { createPlanHandlers } from './plan-handlers.js';
import { createDrugHandlers } from './drug-handlers.js';
import { createEvidenceHandlers, createEvidenceRows } from './evidence-handlers.js';
import {
  createEvidenceBackfill,
  keepingEvidenceRows,
  type EvidenceBackfill,
  type EvidenceBackfillMode,
} from './evidence-backfill.js';
import type { ChangeNoticeInput } from '../../app/contract/change-notices.js';
import { createRecordHandlers, RecordError } from './record-handlers.js';
import { constraintError } from './constraint-errors.js';
import { createWorkstationHandlers } from './workstation-handlers.js';
import { workstationIdOf } from './workstation-identity.js';
import { ConcurrentChangeError } from './concurrent-change.js';
import { createDatabaseHandlers } from './database-handlers.js';
import { createDemoClinicHandlers } from './demo-clinic-handlers.js';
import { postgresSchemaVersion } from '../../db/postgres-connection.js';
import type { DatabaseChoiceSource } from '../../app/contract/database-channels.js';

export type HandlerContext = {
  /** The clinic database behind the shared query layer (SQLite or PostgreSQL). */
  readonly clinic: ClinicDb;
  /** How the database in use was chosen (Settings shows it); 'default' when not given. */
  readonly databaseChoice?: DatabaseChoiceSource;
  readonly appVersion: string;
  readonly dataDirectory: string;
  readonly host: Host;
  /** Injected so tests control time. */
  readonly now: () => Date;
  /**
   * Whether the clinic view's rows of older or stale records are computed in the background after
   * start ('automatic', what the hosts use) or only when `evidenceBackfill.run()` is called
   * ('manual', the default: tests, the bench and short commands). Rows of records that end or are
   * corrected are computed at once either way.
   */
  readonly evidenceBackfill?: EvidenceBackfillMode;
  /** Where the back-fill tells the open screens that more rows are ready (the back end's change notices). */
  readonly publishChange?: (notice: ChangeNoticeInput) => void;
  readonly log?: (message: string) => void;
};

/** Every channel's handler; a host may replace one with its own implementation (see electron-main). */
export type HandlerTable = {
  [C in ChannelName]: (request: ParsedRequestOf<C>) => ResponseOf<C> | Promise<ResponseOf<C>>;
};

/** A failure a handler reports on purpose, with the field to blame when there is one. */
export class HandlerError extends Error {
  readonly code: ContractError['code'];
  readonly field: string | undefined;
  constructor(code: ContractError['code'], message: string, field?: string) {
    super(message);
    this.code = code;
    this.field = field;
  }
}

/** The one handler table for the contract; both hosts dispatch into it. */
export function createHandlers(context: HandlerContext): HandlerTable {
  return createBackEndParts(context).handlers;
}

/**
 * The handler table and what the hosts read beside it: the theme this workstation pinned, which
 * they write into the page before it is shown (`data-theme`), so a pinned theme never flashes.
 */
export function createBackEndParts(given: HandlerContext): {
  readonly handlers: HandlerTable;
  readonly workstationTheme: () => ThemeChoice;
  /** Reads the pinned theme into `workstationTheme`; the back end awaits it before the first dispatch. */
  readonly loadWorkstationTheme: () => Promise<void>;
  /** The background computation of the clinic view's rows (started by the back end once it is ready). */
  readonly evidenceBackfill: EvidenceBackfill;
} {
  const context = given;
  const settings = createSettingsRepository(context.clinic);
  const acknowledgements = createSafetyAcknowledgementRepository(context.clinic);
  const safetyStatus = async () => ({
    acknowledged: await acknowledgements.isAcknowledged(context.appVersion),
    appVersion: context.appVersion,
    last: await acknowledgements.latest(),
  });

  const {
    theme: workstationTheme,
    loadTheme: loadWorkstationTheme,
    ...workstationHandlers
  } = createWorkstationHandlers(context.clinic, context.dataDirectory, context.now);

  const evidenceRows = createEvidenceRows(context.now, context.clinic);
  const evidenceBackfill = createEvidenceBackfill(evidenceRows, {
    mode: context.evidenceBackfill ?? 'manual',
    publish: context.publishChange ?? (() => undefined),
    ...(context.log === undefined ? {} : { log: context.log }),
  });
  const handlers: HandlerTable = {
    'app:info': async () => ({
      appVersion: context.appVersion,
      schemaVersion:
        context.clinic.engine === 'postgresql'
          ? await postgresSchemaVersion(context.clinic)
          : context.clinic.sqlite === null
            ? 0
            : schemaVersion(context.clinic.sqlite),
      dataDirectory: context.dataDirectory,
      host: context.host,
    }),
    'safety:status': safetyStatus,
    'safety:acknowledge': async (request) => {
      await acknowledgements.record(context.appVersion, request.acknowledgedBy, context.now());
      return safetyStatus();
    },
    'settings:get': () => settings.get(),
    'settings:save': (request) => settings.save(request, context.now()),
    'database:export-json': async () => {
      const at = context.now();
      const exported = await exportDatabaseJson(context.clinic, {
        appVersion: context.appVersion,
        exportedAt: at,
      });
      return {
        fileName: `tidewing-database-${at.toISOString().slice(0, 19).replace(/[:T]/g, '-')}.json`,
        json: JSON.stringify(exported, null, 2),
      };
    },
    'database:backups': () => {
      const folder = backupFolder(context.dataDirectory);
      return {
        folder,
        backups: listBackups(folder).map((backup) => ({
          file: backup.file,
          takenAt: backup.takenAt,
          sizeBytes: backup.sizeBytes,
        })),
      };
    },
    // The desktop registers its own implementation (printToPDF of its window); every other host
    // has no window of its own to print, so it says what to do instead.
    'worksheets:save-pdf': () => {
      throw new HandlerError('unavailable', worksheetPdfUnavailableMessage);
    },
    ...createRecordHandlers(context.now, context.clinic, workstationIdOf(context.dataDirectory)),
    ...createPlanHandlers(context.now, context.clinic),
    ...createDrugHandlers(context.now, context.clinic),
    ...createEvidenceHandlers(context.now, context.clinic, {
      rows: evidenceRows,
      pendingSeen: () => evidenceBackfill.start(),
    }),
    ...workstationHandlers,
    ...createDatabaseHandlers({
      clinic: context.clinic,
      dataDirectory: context.dataDirectory,
      host: context.host,
      chosenBy: context.databaseChoice ?? 'default',
    }),
    ...createDemoClinicHandlers(context.now, context.clinic, context.dataDirectory),
  };
  return {
    handlers: keepingEvidenceRows(handlers, evidenceRows, evidenceBackfill, context.log),
    workstationTheme,
    loadWorkstationTheme,
    evidenceBackfill,
  };
}

export type Dispatcher = (channel: unknown, payload: unknown) => Promise<Result<unknown>>;

/**
 * Validates the channel and payload, runs the handler and validates its answer.
 * Never throws: every failure becomes `{ ok: false, error }`. No handler runs before `ready`
 * (the back end's start-up writes, such as the species seeding) has settled; if it failed, every
 * request answers with its error.
 */
export function createDispatcher(
  handlers: HandlerTable,
  log: (message: string) => void = () => undefined,
  ready: Promise<unknown> = Promise.resolve(),
): Dispatcher {
  return async (channel, payload) => {
    if (!isChannelName(channel)) {
      return {
        ok: false,
        error: { code: 'unknown-channel', message: `There is no channel called ${String(channel)}.` },
      };
    }
    const spec = channels[channel];
    const parsed = spec.request.safeParse(payload ?? {});
    if (!parsed.success) {
      const issues = describeIssues(parsed.error.issues);
      const first = issues[0];
      return {
        ok: false,
        error: {
          code: 'invalid-request',
          message: first === undefined ? 'The request was not valid.' : first.message,
          ...(first === undefined ? {} : { field: first.field }),
          issues,
        },
      };
    }
    try {
      await ready;
      const handler = handlers[channel] as (request: unknown) => unknown;
      const value = await handler(parsed.data);
      const checked = (spec.response as z.ZodType).safeParse(value);
      if (!checked.success) {
        log(`Response of ${channel} failed its schema: ${checked.error.message}`);
        return {
          ok: false,
          error: {
            code: 'internal',
            message: 'Tidewing produced an answer it could not vouch for; nothing was changed by showing it.',
          },
        };
      }
      return { ok: true, value: checked.data };
    } catch (error) {
      if (
        error instanceof HandlerError ||
        error instanceof RecordError ||
        error instanceof ConcurrentChangeError
      ) {
        return {
          ok: false,
          error: {
            code: error.code,
            message: error.message,
            ...(error.field === undefined ? {} : { field: error.field }),
          },
        };
      }
      const message = error instanceof Error ? error.message : String(error);
      log(`Handler ${channel} failed: ${message}`);
      const constraint = constraintError(channel, error, parsed.data);
      if (constraint !== null) return { ok: false, error: constraint };
      const isDatabase = error instanceof Error && (error.name === 'SqliteError' || /SQLITE/.test(message));
      return {
        ok: false,
        error: isDatabase
          ? { code: 'database', message: `The database refused the change: ${message}` }
          : { code: 'internal', message: `Something went wrong: ${message}` },
      };
    }
  };
}
