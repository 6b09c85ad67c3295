import pg from 'pg';
import { sql } from 'kysely';
import { migrations as allMigrations, type Migration } from './migrations/index.js';
import { postgresClinicDb, type ClinicDb } from './clinic-db.js';

// PostgreSQL's bigint (count(*), sums) arrives as a string by default; every integer Tidewing
// stores fits a double exactly, so it is read as a number.
pg.types.setTypeParser(pg.types.builtins.INT8, (text: string) => Number(text));

/** The server's database was migrated by a newer Tidewing; it is left exactly as found. */
export class PostgresSchemaTooNewError extends Error {
  constructor(location: string, found: number, supported: number) {
    super(
      `The database ${location} was written by a newer version of Tidewing (schema ${String(found)}; this version understands up to ${String(supported)}). ` +
        'Install the newer version of Tidewing on this workstation. The database has not been changed.',
    );
    this.name = 'PostgresSchemaTooNewError';
  }
}

export type PostgresOpenOptions = {
  /** Migrations to apply; tests pass their own lists. */
  readonly migrations?: readonly Migration[];
  /** Extra pg pool settings (TLS, timeouts, password from the environment or a password file). */
  readonly pool?: pg.PoolConfig;
};

/** `url` with any password replaced, for messages and logs. */
export function redactedUrl(url: string): string {
  try {
    const parsed = new URL(url);
    if (parsed.password !== '') parsed.password = '***';
    return parsed.toString();
  } catch {
    return 'postgresql://(unreadable address)';
  }
}

// Any constant shared by every Tidewing: the key of the advisory lock that serialises migrations
// when several workstations start against one server at the same moment.
const migrationLockKey = 7_305_117;

/**
 * Opens a clinic database on a PostgreSQL server and brings its schema up to date, each
 * migration in its own transaction under an advisory lock (two workstations starting together
 * do not both migrate). Refuses, without writing, a schema newer than this code.
 */
export async function openPostgresClinic(url: string, options: PostgresOpenOptions = {}): Promise<ClinicDb> {
  const pool = new pg.Pool({ connectionString: url, max: 10, ...options.pool });
  const db = postgresClinicDb(pool, redactedUrl(url));
  try {
    await migratePostgres(db, options.migrations ?? allMigrations);
    return db;
  } catch (error) {
    await db.close();
    throw error;
  }
}

/** Schema version of a PostgreSQL clinic database (0 when it holds no Tidewing schema yet). */
export async function postgresSchemaVersion(db: ClinicDb): Promise<number> {
  const table = await sql<{
    found: string | null;
  }>`SELECT to_regclass('tidewing_schema')::text AS found`.execute(db.kysely);
  if (table.rows[0]?.found === null || table.rows[0] === undefined) return 0;
  const row = await sql<{ version: number }>`SELECT version FROM tidewing_schema`.execute(db.kysely);
  return row.rows[0]?.version ?? 0;
}

/** Applies every migration above the database's version, each in one transaction. */
export async function migratePostgres(db: ClinicDb, list: readonly Migration[]): Promise<number> {
  list.forEach((migration, index) => {
    if (migration.version !== index + 1)
      throw new Error(
        `Migration ${migration.name} is numbered ${String(migration.version)}, expected ${String(index + 1)}`,
      );
  });
  const found = await postgresSchemaVersion(db);
  if (found > list.length) throw new PostgresSchemaTooNewError(db.location, found, list.length);
  if (found === list.length) return found;
  await db.kysely.transaction().execute(async (trx) => {
    await sql`SELECT pg_advisory_xact_lock(${migrationLockKey})`.execute(trx);
    await sql`CREATE TABLE IF NOT EXISTS tidewing_schema (
      only_row boolean PRIMARY KEY DEFAULT true CHECK (only_row),
      version integer NOT NULL CHECK (version >= 0)
    )`.execute(trx);
    await sql`INSERT INTO tidewing_schema (version) VALUES (0) ON CONFLICT DO NOTHING`.execute(trx);
  });
  for (const migration of list) {
    await db.kysely.transaction().execute(async (trx) => {
      await sql`SELECT pg_advisory_xact_lock(${migrationLockKey})`.execute(trx);
      const now = await sql<{ version: number }>`SELECT version FROM tidewing_schema FOR UPDATE`.execute(trx);
      const current = now.rows[0]?.version ?? 0;
      if (current > list.length) throw new PostgresSchemaTooNewError(db.location, current, list.length);
      if (current >= migration.version) return;
      await sql.raw(migration.postgresql).execute(trx);
      await sql`UPDATE tidewing_schema SET version = ${migration.version}`.execute(trx);
    });
  }
  return postgresSchemaVersion(db);
}
