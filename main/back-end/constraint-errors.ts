import type { ContractError } from '../../app/contract/result.js';

/**
 * The database's own constraints (FOREIGN KEY, CHECK, UNIQUE, NOT NULL, the triggers that keep
 * records unchanged) are the last line behind the contract's schemas and the handlers' checks.
 * When one of them fires anyway, the clinic user gets the field to look at and what to do,
 * never SQLite's wording.
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

/** The request field a constraint message's column names (`weights.mass_g`, `mass_g > 0`), if any. */
function fieldFromMessage(message: string, request: unknown): string | null {
  const afterColon = message.slice(message.indexOf(':') + 1);
  for (const word of afterColon.match(/[a-z][a-z0-9_]*/g) ?? []) {
    const path = pathOfKey(request, camelCase(word));
    if (path !== null) return path;
  }
  return null;
}

function labelOf(field: string): string {
  const last = field.split('.').at(-1) ?? field;
  return fieldLabels[last] ?? field;
}

/**
 * A contract error for a database constraint failure, or null when `error` is not one.
 * @param channel the channel whose handler failed
 * @param error what the handler threw (better-sqlite3's SqliteError carries `code`)
 * @param request the parsed request, searched for the field a column belongs to
 */
export function constraintError(channel: string, error: unknown, request: unknown): ContractError | null {
  if (!(error instanceof Error)) return null;
  const code = (error as Error & { code?: unknown }).code;
  if (typeof code !== 'string' || !code.startsWith('SQLITE_CONSTRAINT')) return null;
  const message = error.message;

  if (code === 'SQLITE_CONSTRAINT_FOREIGNKEY') {
    const field = foreignKeyField[channel] ?? pathOfKey(request, 'id') ?? '(request)';
    return {
      code: 'invalid-request',
      message: `${labelOf(field)} refers to a record that is not in the clinic database (it may have been opened from an old link); choose it again.`,
      field,
    };
  }
  if (code === 'SQLITE_CONSTRAINT_UNIQUE' || code === 'SQLITE_CONSTRAINT_PRIMARYKEY') {
    const field = /corrects_id/.test(message)
      ? (pathOfKey(request, 'id') ?? 'id')
      : (fieldFromMessage(message, request) ?? '(request)');
    return {
      code: 'conflict',
      message: /corrects_id/.test(message)
        ? 'This record was corrected by someone else since you opened it; open its newest version and correct that.'
        : `${labelOf(field)} is already used by another record; choose another.`,
      field,
    };
  }
  if (code === 'SQLITE_CONSTRAINT_TRIGGER') {
    return {
      code: 'conflict',
      message:
        'Saved records are never changed or deleted in place; save a correction with a reason instead.',
      field: pathOfKey(request, 'id') ?? '(request)',
    };
  }
  // CHECK, NOT NULL and any other constraint: point at the column's field when it can be found.
  const field = fieldFromMessage(message, request) ?? '(request)';
  return {
    code: 'invalid-request',
    message:
      code === 'SQLITE_CONSTRAINT_NOTNULL'
        ? `${labelOf(field)} is required; fill it in and save again.`
        : `${labelOf(field)} has a value the clinic database does not accept; check it and save again.`,
    field,
  };
}
