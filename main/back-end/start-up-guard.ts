import fs from 'node:fs';
import path from 'node:path';
import { listBackups } from '../../db/backup.js';
import { clinicContentsOfFile, type ClinicContents } from '../../db/clinic-contents.js';
import { checkDatabaseFile, formatBytes, type DatabaseCheck } from '../../db/integrity.js';
import type { Migration } from '../../db/migrations/index.js';
import { backupFolder } from './automatic-backup.js';
import { databaseFile } from './data-directory.js';

/** Why the start-up guard stopped a start or a command. */
export type GuardProblem =
  /** No database file, while `backups/` holds a backup with records. */
  | 'missing'
  /** A database file of 0 bytes or without tables, while `backups/` holds a backup with records. */
  | 'empty'
  /** The file failed SQLite's check, is not SQLite, or could not be read. */
  | 'damaged'
  /** A SQLite database of another program. */
  | 'notTidewing'
  /** A Tidewing database that lacks tables its version promises. */
  | 'incomplete'
  /** Rows pointing at rows that do not exist. */
  | 'brokenLinks'
  /** Written by a newer Tidewing. */
  | 'tooNew'
  /** No database, or an empty one, beside the write-ahead log (`-wal`) of the one that was there. */
  | 'orphanLog'
  /** `--new-clinic` was asked for, but the data folder already holds a clinic's records. */
  | 'newClinicOverRecords';

/** A backup the guard can offer: it passed the full check and holds records. */
export type GoodBackup = {
  readonly file: string;
  /** ISO 8601: from the name of a rolling backup, else the file's modification time. */
  readonly takenAt: string;
  readonly recordCount: number;
  readonly latestRecordAt: string | null;
};

export type GuardFinding =
  | {
      readonly ok: true;
      /** `sound`: a checked Tidewing database; `absent`: none yet; `empty`: 0 bytes or no tables. */
      readonly state: 'sound' | 'absent' | 'empty';
      readonly databaseFile: string;
      /** For the log, when there is something to say (a new clinic beside old backups). */
      readonly notice: string | null;
    }
  | {
      readonly ok: false;
      readonly problem: GuardProblem;
      readonly databaseFile: string;
      /** The whole explanation for clinic staff: what was found, that nothing changed, what to do. */
      readonly message: string;
      /** The part of `message` that says what to do (the backup and the restore command). */
      readonly advice: string;
      readonly goodBackup: GoodBackup | null;
      /** `npx tidewing restore <backup> --data <dir>`; null when there is no good backup to offer. */
      readonly restoreCommand: string | null;
      /** The database check behind a `damaged`, `notTidewing`, `incomplete`, `brokenLinks` or `tooNew`. */
      readonly check: DatabaseCheck | null;
    };

export type GuardOptions = {
  readonly dataDirectory: string;
  /** `--new-clinic`: a deliberate fresh start beside backups with records. */
  readonly newClinic?: boolean;
  readonly nativeBinding?: string;
  readonly migrations?: readonly Migration[];
  /** Decides the quoting of paths in the restore command. */
  readonly platform?: NodeJS.Platform;
};

/** The start (or command) was refused by the start-up guard; nothing was written. */
export class StartRefusedError extends Error {
  readonly finding: Extract<GuardFinding, { ok: false }>;
  constructor(finding: Extract<GuardFinding, { ok: false }>) {
    super(finding.message);
    this.name = 'StartRefusedError';
    this.finding = finding;
  }
}

/** A path as one shell word: left bare when safe, else quoted for the platform's shell. */
export function shellWord(text: string, platform: NodeJS.Platform = process.platform): string {
  if (/^[A-Za-z0-9_./:\\@%+=,-]+$/.test(text)) return text;
  if (platform === 'win32') return `"${text.replace(/"/g, '""')}"`;
  return `'${text.replace(/'/g, `'\\''`)}'`;
}

/** The exact command that puts `backup` in place of the database in `dataDirectory`. */
export function restoreCommand(
  backup: string,
  dataDirectory: string,
  platform: NodeJS.Platform = process.platform,
): string {
  return `npx tidewing restore ${shellWord(backup, platform)} --data ${shellWord(dataDirectory, platform)}`;
}

type Candidate = { file: string; takenAt: string; contents: ClinicContents | null };

/** Every `.db` file in `backups/` (rolling ones and copies put there by hand), with its contents. */
function backupCandidates(dataDirectory: string, binding: { nativeBinding?: string }): Candidate[] {
  const folder = backupFolder(dataDirectory);
  const rolling = new Map(listBackups(folder).map((backup) => [backup.file, backup.takenAt]));
  let names: string[];
  try {
    names = fs.readdirSync(folder);
  } catch {
    return [];
  }
  const candidates: Candidate[] = [];
  for (const name of names) {
    // Dot files are copies still being written (see temporaryNameBeside).
    if (!name.endsWith('.db') || name.startsWith('.')) continue;
    const file = path.join(folder, name);
    const stat = fs.statSync(file, { throwIfNoEntry: false });
    if (stat === undefined || !stat.isFile()) continue;
    candidates.push({
      file,
      takenAt: rolling.get(file) ?? stat.mtime.toISOString(),
      contents: clinicContentsOfFile(file, binding),
    });
  }
  return candidates;
}

/**
 * The backup to offer: of those holding records, the one whose latest record is the most
 * recent (then the most recently taken) that passes the full check restore makes.
 */
function newestGoodBackup(
  candidates: readonly Candidate[],
  checkOptions: { nativeBinding?: string; migrations?: readonly Migration[] },
): GoodBackup | null {
  const withRecords = candidates
    .filter((candidate) => (candidate.contents?.recordCount ?? 0) > 0)
    .sort((a, b) => {
      const latestA = a.contents?.latestRecordAt ?? '';
      const latestB = b.contents?.latestRecordAt ?? '';
      if (latestA !== latestB) return latestA < latestB ? 1 : -1;
      return a.takenAt < b.takenAt ? 1 : a.takenAt > b.takenAt ? -1 : 0;
    });
  for (const candidate of withRecords) {
    if (!checkDatabaseFile(candidate.file, checkOptions).ok) continue;
    return {
      file: candidate.file,
      takenAt: candidate.takenAt,
      recordCount: candidate.contents?.recordCount ?? 0,
      latestRecordAt: candidate.contents?.latestRecordAt ?? null,
    };
  }
  return null;
}

function describeBackup(backup: GoodBackup): string {
  return `${backup.file} (taken ${backup.takenAt}; ${backup.recordCount} record${backup.recordCount === 1 ? '' : 's'}${backup.latestRecordAt === null ? '' : `, the latest entered ${backup.latestRecordAt}`})`;
}

/**
 * What to do when the clinic database cannot be used: the newest good backup in `backups/`
 * (the one with the most recent records that passes restore's full check) and the exact
 * command that restores it; when asked, the `--new-clinic` way out. Reads only.
 */
export function restoreAdvice(options: GuardOptions & { readonly offerNewClinic?: boolean }): {
  goodBackup: GoodBackup | null;
  restoreCommand: string | null;
  advice: string;
} {
  const binding = options.nativeBinding === undefined ? {} : { nativeBinding: options.nativeBinding };
  const checkOptions = {
    ...binding,
    ...(options.migrations === undefined ? {} : { migrations: options.migrations }),
  };
  const goodBackup = newestGoodBackup(backupCandidates(options.dataDirectory, binding), checkOptions);
  const command =
    goodBackup === null
      ? null
      : restoreCommand(goodBackup.file, options.dataDirectory, options.platform ?? process.platform);
  const advice = [
    goodBackup === null
      ? `No backup in ${backupFolder(options.dataDirectory)} holds records and passes the check. Look for a copy elsewhere (another disk, the clinic's backup system) and check it with \`npx tidewing check FILE\`.`
      : `The newest good backup is ${describeBackup(goodBackup)}.`,
    command === null
      ? ''
      : `To put it back, close every Tidewing window and run:\n  ${command}\nThe restore checks the backup again and keeps the file it replaces beside it as tidewing.db.replaced-<time>.`,
    options.offerNewClinic === true
      ? 'To start a new, empty clinic instead, start Tidewing with --new-clinic; the backups stay where they are.'
      : '',
  ]
    .filter((line) => line !== '')
    .join('\n');
  return { goodBackup, restoreCommand: command, advice };
}

const nothingChanged =
  'Nothing was changed: the database was not opened for writing, and no backup was made or removed.';

/**
 * The start-up guard. Before Tidewing migrates or writes anything (the host, the desktop
 * window and every command that opens the clinic database), it reads the database in
 * `dataDirectory`, and the backups beside it, without changing either:
 * - no database, or one of 0 bytes or without tables, while `backups/` holds a backup with
 *   records: refused (a first start, with no such backup, passes; `--new-clinic` passes too);
 * - a file failing SQLite's quick check, not SQLite, not Tidewing's, missing a table, with rows
 *   pointing at missing rows, or from a newer Tidewing: refused (the checks restore makes);
 * - no database, or an empty one, beside a write-ahead log (`-wal`) with content: refused,
 *   even with `--new-clinic` (the log would be replayed into the new file);
 * - `--new-clinic` while the database already holds records: refused.
 * A refusal names the problem, the newest good backup and the command that restores it.
 * Never throws for a bad file. A sound database costs one quick check (about 0.5 s for 50,000
 * patients); the backups are read only when the database is refused.
 */
export function checkBeforeStart(options: GuardOptions): GuardFinding {
  const file = databaseFile(options.dataDirectory);
  const binding = options.nativeBinding === undefined ? {} : { nativeBinding: options.nativeBinding };
  const checkOptions = {
    ...binding,
    ...(options.migrations === undefined ? {} : { migrations: options.migrations }),
  };
  const newClinic = options.newClinic === true;

  const refuse = (
    problem: GuardProblem,
    what: string,
    check: DatabaseCheck | null,
    offerNewClinic: boolean,
  ): GuardFinding => {
    if (problem === 'tooNew') {
      return {
        ok: false,
        problem,
        databaseFile: file,
        message: `${what} ${nothingChanged}`,
        advice: '',
        goodBackup: null,
        restoreCommand: null,
        check,
      };
    }
    const {
      goodBackup,
      restoreCommand: command,
      advice,
    } = restoreAdvice({
      ...options,
      offerNewClinic,
    });
    return {
      ok: false,
      problem,
      databaseFile: file,
      message: `${what} ${nothingChanged}\n${advice}`,
      advice,
      goodBackup,
      restoreCommand: command,
      check,
    };
  };

  const absentOrEmpty = (state: 'absent' | 'empty', what: string): GuardFinding => {
    const candidates = backupCandidates(options.dataDirectory, binding);
    const withRecords = candidates.filter((candidate) => (candidate.contents?.recordCount ?? 0) > 0);
    if (withRecords.length === 0) return { ok: true, state, databaseFile: file, notice: null };
    if (newClinic) {
      return {
        ok: true,
        state,
        databaseFile: file,
        notice: `Starting a new, empty clinic as asked (--new-clinic). The ${withRecords.length} backup${withRecords.length === 1 ? '' : 's'} with records in ${backupFolder(options.dataDirectory)} stay there; none is removed while it holds more records than the new database.`,
      };
    }
    return refuse(
      state === 'absent' ? 'missing' : 'empty',
      `${what}, but ${backupFolder(options.dataDirectory)} holds ${withRecords.length} backup${withRecords.length === 1 ? '' : 's'} with records: the database may have been moved, deleted or emptied by a failed copy.`,
      null,
      true,
    );
  };

  const stat = fs.statSync(file, { throwIfNoEntry: false });
  const logBytes = fs.statSync(`${file}-wal`, { throwIfNoEntry: false })?.size ?? 0;
  if ((stat === undefined || (stat.isFile() && stat.size === 0)) && logBytes > 0) {
    // SQLite would replay that log into the new database: a mix of two files, and the log's
    // saved changes lost from the one they belong to.
    return refuse(
      'orphanLog',
      `${stat === undefined ? `There is no clinic database at ${file}` : `The clinic database ${file} is empty (0 bytes)`}, but its write-ahead log ${file}-wal (${formatBytes(logBytes)}) is still there: it holds the latest saved changes of the database that was there. If you moved the database, put it back beside the log.`,
      null,
      false,
    );
  }
  if (stat === undefined) return absentOrEmpty('absent', `There is no clinic database at ${file}`);
  if (stat.isFile() && stat.size === 0)
    return absentOrEmpty('empty', `The clinic database ${file} is empty (0 bytes)`);

  const check = checkDatabaseFile(file, { ...checkOptions, quick: true });
  if (check.status === 'notTidewing') {
    const contents = clinicContentsOfFile(file, binding);
    if (contents !== null && contents.tableCount === 0)
      return absentOrEmpty('empty', `The clinic database ${file} is empty (it has no tables)`);
  }
  if (!check.ok) {
    const problem: GuardProblem =
      check.status === 'tooNew'
        ? 'tooNew'
        : check.status === 'notTidewing'
          ? 'notTidewing'
          : check.status === 'schemaIncomplete'
            ? 'incomplete'
            : check.status === 'foreignKeyProblems'
              ? 'brokenLinks'
              : 'damaged';
    const suffix = newClinic
      ? ` --new-clinic never replaces an existing file; to start again without it, move ${file} out of ${options.dataDirectory} first.`
      : '';
    return refuse(problem, `The clinic database failed its check: ${check.message}${suffix}`, check, false);
  }

  if (newClinic) {
    const contents = clinicContentsOfFile(file, binding);
    if (contents === null || contents.recordCount > 0) {
      return {
        ok: false,
        problem: 'newClinicOverRecords',
        databaseFile: file,
        message: `--new-clinic refused: ${file} already holds a clinic (${contents?.recordCount ?? 'some'} records). ${nothingChanged} Start Tidewing without --new-clinic to open it; to start another clinic, choose an empty folder with --data DIR.`,
        advice: 'Start Tidewing without --new-clinic to open this clinic.',
        goodBackup: null,
        restoreCommand: null,
        check,
      };
    }
  }
  return { ok: true, state: 'sound', databaseFile: file, notice: null };
}
