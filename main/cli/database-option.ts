import { UsageError, type ParsedArguments } from './command-io.js';

/** The environment variable that names a PostgreSQL clinic database, as `--database` does. */
export const databaseUrlVariable = 'TIDEWING_DATABASE_URL';

/**
 * The PostgreSQL server a command works on: `--database URL`, else `TIDEWING_DATABASE_URL`, else
 * null (the SQLite file in the data folder). Only postgresql:// (or postgres://) addresses are
 * taken; the password is best kept out of the address (PGPASSWORD or a ~/.pgpass file, which
 * the pg driver reads).
 */
export function databaseUrl(
  parsed: ParsedArguments,
  environment: NodeJS.ProcessEnv = process.env,
): string | null {
  const given = parsed.values.get('--database') ?? environment[databaseUrlVariable];
  if (given === undefined || given === '') return null;
  if (!/^postgres(ql)?:\/\//i.test(given))
    throw new UsageError(
      `--database takes a PostgreSQL address such as postgresql://tidewing@db.clinic.lan:5432/tidewing${parsed.values.has('--database') ? '' : ` (from ${databaseUrlVariable})`}.`,
    );
  return given;
}
