import { localDateOf } from '../../app/contract/input-rules.js';
import type { LaterVersion } from '../../db/repositories/version-chain.js';

/**
 * Optimistic concurrency for corrections. A correction names the version it replaces
 * (`corrects_id`, UNIQUE in every record table), so when two workstations correct the same
 * version, the database keeps the first and refuses the second, on SQLite and on PostgreSQL
 * alike. The refused user is told who saved the other change, on which workstation, when and
 * why; nothing of theirs was written and nothing of the other was overwritten.
 *
 * A handler wraps its correction in `refuseConcurrentChange`, with how to find the later
 * version (usually `laterVersion(sql, table, versionId)` from db/repositories/version-chain.ts).
 */

/** A correction refused because another was saved first; the dispatcher answers it as `conflict`. */
export class ConcurrentChangeError extends Error {
  readonly code = 'conflict' as const;
  readonly field: string;
  /** The version saved first, when it could be read. */
  readonly later: LaterVersion | null;
  constructor(message: string, later: LaterVersion | null, field = 'id') {
    super(message);
    this.name = 'ConcurrentChangeError';
    this.field = field;
    this.later = later;
  }
}

/**
 * True when `error` is the database refusing a second row with the same `corrects_id`:
 * better-sqlite3's SQLITE_CONSTRAINT_UNIQUE ("UNIQUE constraint failed: weights.corrects_id")
 * or pg's unique_violation 23505 (detail "Key (corrects_id)=(7) already exists.").
 */
export function isCorrectionClash(error: unknown): boolean {
  if (!(error instanceof Error)) return false;
  const { code, detail, constraint } = error as Error & {
    code?: unknown;
    detail?: unknown;
    constraint?: unknown;
  };
  if (code === 'SQLITE_CONSTRAINT_UNIQUE') return /\.corrects_id\b/.test(error.message);
  if (code === '23505')
    return /\(corrects_id\)/.test(String(detail ?? '')) || /corrects_id/.test(String(constraint ?? ''));
  return false;
}

const pad = (value: number) => String(value).padStart(2, '0');

/** "10:42" on the workstation's clock, with the date when it was not today. */
function whenText(iso: string, now: Date): string {
  const at = new Date(iso);
  if (Number.isNaN(at.getTime())) return `at ${iso}`;
  const clock = `at ${pad(at.getHours())}:${pad(at.getMinutes())}`;
  const day = localDateOf(at);
  return day === localDateOf(now) ? clock : `${clock} on ${day}`;
}

/**
 * What the refused user reads, e.g. "Not saved: this entry was already corrected by RW on
 * Theatre 1 at 10:42 (reason: Miscounted). Your change was not applied; reload to see the
 * current entry."
 * @param noun what was being corrected, as the screen calls it ("entry", "weight", "record")
 * @param later the version saved first, or null when it could not be read
 * @param now the back end's clock, to leave out today's date
 */
export function concurrentChangeMessage(noun: string, later: LaterVersion | null, now: Date): string {
  const after = `Your change was not applied; reload to see the current ${noun}.`;
  if (later === null) return `Not saved: this ${noun} was changed on another workstation first. ${after}`;
  const what = later.voided ? 'voided' : 'corrected';
  const where = later.workstationName === null ? '' : ` on ${later.workstationName}`;
  const why = later.reason.trim() === '' ? '' : ` (reason: ${later.reason.trim()})`;
  return `Not saved: this ${noun} was already ${what} by ${later.enteredBy}${where} ${whenText(later.enteredAt, now)}${why}. ${after}`;
}

/**
 * Runs a correction; when the database refuses it because the version it names was corrected
 * or voided first, throws `ConcurrentChangeError` saying who, where, when and why.
 * @param options.noun what is corrected, for the message ("entry")
 * @param options.write the correction (its own transaction, rolled back when refused)
 * @param options.later reads the version that was saved first, after the refusal
 * @param options.now the back end's clock
 * @param options.field the request field to blame (default `id`)
 */
export async function refuseConcurrentChange<T>(options: {
  readonly noun: string;
  readonly write: () => Promise<T>;
  readonly later: () => Promise<LaterVersion | null>;
  readonly now: () => Date;
  readonly field?: string;
}): Promise<T> {
  try {
    return await options.write();
  } catch (error) {
    if (!isCorrectionClash(error)) throw error;
    const later = await options.later();
    throw new ConcurrentChangeError(
      concurrentChangeMessage(options.noun, later, options.now()),
      later,
      options.field,
    );
  }
}
