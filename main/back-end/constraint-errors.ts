import type { ContractError } from '../../app/contract/result.js';

/**
 * The database's own constraints (FOREIGN KEY, CHECK, UNIQUE, NOT NULL, the triggers that keep
 * records unchanged) are the last line behind the contract's schemas and the handlers' checks.
 * When one of them fires anyway, the clinic user gets the field to look at and what to do,
 * never the database's wording (SQLite's or PostgreSQL's).
 */

/** Plain names of fields a constraint can point at; other fields are named by their path. */
const fieldLabels: Readonly<Record<string, string>> = {
  planId: 'Linked plan',
  patientId: 'Patient',
  recordId: 'Procedure record',
  id: 'Record',
  speciesKey: 'Species',
  key: 'Species',
  massG: 'Weight',
  weighedOn: 'Weighing date',
  hatchDate: 'Hatch date',
  plannedFor: 'Planned date',
  enteredBy: 'Name or initials',
  reason: 'Reason',
  name: 'Name',
  commonName: 'Common name',
  staffInitials: 'Staff initials',
  agent: 'Anaesthetic agent',
  procedureName: 'Procedure',
  startedAt: 'Start',
  endedAt: 'End',
  at: 'Time',
};

/**
 * The field a foreign key of each writing channel points from. A channel's handler checks the
 * record it names before writing, so a failure here means the row went missing in between.
 */
const foreignKeyField: Readonly<Record<string, string>> = {
  'weights:add': 'patientId',
  'procedures:create': 'values.planId',
  'procedures:correct': 'values.planId',
  'entries:add': 'recordId',
  'plans:save': 'fields.patientId',
  'plans:correct': 'fields.patientId',
  'plans:save-comparison': 'fields.patientId',
};

function camelCase(snake: string): string {
  return snake.replace(/_([a-z0-9])/g, (_match, letter: string) => letter.toUpperCase());
}

/** Dotted path of the first key called `key` in the request, searched breadth first. */
function pathOfKey(request: unknown, key: string): string | null {
  const queue: { value: unknown; path: string[] }[] = [{ value: request, path: [] }];
  while (queue.length > 0) {
    const { value, path } = queue.shift() as { value: unknown; path: string[] };
    if (typeof value !== 'object' || value === null || Array.isArray(value)) continue;
    for (const [name, inner] of Object.entries(value)) {
      if (name === key) return [...path, name].join('.');
      queue.push({ value: inner, path: [...path, name] });
    }
  }
  return null;
}

/** The first request field among `words`, column names such as `mass_g` (or `weights`), if any. */
function fieldFromWords(words: readonly string[], request: unknown): string | null {
  for (const word of words) {
    const path = pathOfKey(request, camelCase(word));
    if (path !== null) return path;
  }
  return null;
}

/** Column names in SQLite's message after its colon (`weights.mass_g`, `mass_g > 0`). */
function wordsOfSqliteMessage(message: string): string[] {
  return message.slice(message.indexOf(':') + 1).match(/[a-z][a-z0-9_]*/g) ?? [];
}

/**
 * The column a PostgreSQL CHECK is about, from its name: `weights_mass_g_check` names `mass_g`
 * (PostgreSQL names a check after its table and first column; the migrations name table checks
 * the same way, `species_heart_rate_min_per_min_with_basis_check`). Every leading run of words
 * is offered, longest first, as SQLite's message offers its columns in order.
 */
function wordsOfPostgresCheck(constraint: string, table: string): string[] {
  const inner = constraint.replace(new RegExp(`^${table}_`), '').replace(/_check\d*$/, '');
  const parts = inner.split('_');
  return parts.map((_part, index) => parts.slice(0, parts.length - index).join('_'));
}

/** The columns of a PostgreSQL unique violation's detail: `Key (species_key)=(kestrel) already exists.` */
function wordsOfPostgresKey(detail: string): string[] {
  const columns = /^Key \(([^)]*)\)=/.exec(detail)?.[1] ?? '';
  return columns.split(',').map((column) => column.trim().replace(/^"|"$/g, ''));
}

type ConstraintKind = 'foreign key' | 'unique' | 'append-only' | 'not null' | 'check' | 'other';

/** A constraint failure of either engine in one shape: its kind and the column names it gives. */
type ConstraintFailure = { readonly kind: ConstraintKind; readonly words: readonly string[] };

const sqliteKinds: Readonly<Record<string, ConstraintKind>> = {
  SQLITE_CONSTRAINT_FOREIGNKEY: 'foreign key',
  SQLITE_CONSTRAINT_UNIQUE: 'unique',
  SQLITE_CONSTRAINT_PRIMARYKEY: 'unique',
  SQLITE_CONSTRAINT_TRIGGER: 'append-only',
  SQLITE_CONSTRAINT_NOTNULL: 'not null',
  SQLITE_CONSTRAINT_CHECK: 'check',
};

/** The append-only triggers' wording, the same on both engines (see db/migrations). */
const appendOnlyMessage = /^[a-z_]+ rows are never (changed in place|deleted);/;

/** Reads a string field of a driver's error object. */
function textField(error: Error, name: string): string {
  const value = (error as Error & Record<string, unknown>)[name];
  return typeof value === 'string' ? value : '';
}

/**
 * better-sqlite3's SqliteError carries `code` SQLITE_CONSTRAINT_*; node-postgres's DatabaseError
 * carries the SQLSTATE in `code` (class 23, or P0001 raised by the append-only triggers with
 * their message) and `table`, `column`, `constraint`, `detail` fields.
 */
function constraintFailure(error: Error): ConstraintFailure | null {
  const code = textField(error, 'code');
  if (code.startsWith('SQLITE_CONSTRAINT'))
    return { kind: sqliteKinds[code] ?? 'other', words: wordsOfSqliteMessage(error.message) };
  if (textField(error, 'severity') === '') return null;
  const table = textField(error, 'table');
  const constraint = textField(error, 'constraint');
  if (code === 'P0001' && appendOnlyMessage.test(error.message)) return { kind: 'append-only', words: [] };
  if (code === '23503') return { kind: 'foreign key', words: [] };
  if (code === '23505')
    return { kind: 'unique', words: [...wordsOfPostgresKey(textField(error, 'detail')), constraint] };
  if (code === '23502') return { kind: 'not null', words: [textField(error, 'column')] };
  if (code === '23514') return { kind: 'check', words: wordsOfPostgresCheck(constraint, table) };
  if (code.startsWith('23')) return { kind: 'other', words: [constraint] };
  return null;
}

function labelOf(field: string): string {
  const last = field.split('.').at(-1) ?? field;
  return fieldLabels[last] ?? field;
}

/**
 * A contract error for a database constraint failure, or null when `error` is not one.
 * @param channel the channel whose handler failed
 * @param error what the handler threw (better-sqlite3's SqliteError or node-postgres's
 *   DatabaseError, both with `code`)
 * @param request the parsed request, searched for the field a column belongs to
 */
export function constraintError(channel: string, error: unknown, request: unknown): ContractError | null {
  if (!(error instanceof Error)) return null;
  const failure = constraintFailure(error);
  if (failure === null) return null;

  if (failure.kind === 'foreign key') {
    const field = foreignKeyField[channel] ?? pathOfKey(request, 'id') ?? '(request)';
    return {
      code: 'invalid-request',
      message: `${labelOf(field)} refers to a record that is not in the clinic database (it may have been opened from an old link); choose it again.`,
      field,
    };
  }
  if (failure.kind === 'unique') {
    const correction = failure.words.some((word) => /corrects_id/.test(word));
    const field = correction
      ? (pathOfKey(request, 'id') ?? 'id')
      : (fieldFromWords(failure.words, request) ?? '(request)');
    return {
      code: 'conflict',
      message: correction
        ? 'This record was corrected by someone else since you opened it; open its newest version and correct that.'
        : `${labelOf(field)} is already used by another record; choose another.`,
      field,
    };
  }
  if (failure.kind === 'append-only') {
    return {
      code: 'conflict',
      message:
        'Saved records are never changed or deleted in place; save a correction with a reason instead.',
      field: pathOfKey(request, 'id') ?? '(request)',
    };
  }
  // CHECK, NOT NULL and any other constraint: point at the column's field when it can be found.
  const field = fieldFromWords(failure.words, request) ?? '(request)';
  return {
    code: 'invalid-request',
    message:
      failure.kind === 'not null'
        ? `${labelOf(field)} is required; fill it in and save again.`
        : `${labelOf(field)} has a value the clinic database does not accept; check it and save again.`,
    field,
  };
}
