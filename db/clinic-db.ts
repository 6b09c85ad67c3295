import {
  CompiledQuery,
  Kysely,
  PostgresDialect,
  SqliteAdapter,
  SqliteDriver,
  SqliteIntrospector,
  SqliteQueryCompiler,
  type DatabaseConnection,
  type Dialect,
  type Driver,
} from 'kysely';
import type { TidewingDatabase } from './connection.js';

/** The two database engines one repository layer speaks to. */
export type Engine = 'sqlite' | 'postgresql';

/**
 * The schema type a bare connection starts with. Each repository adds the tables it reads and
 * writes with `kysely.withTables<...>()`, so the row types live beside the SQL that uses them.
 */
// eslint-disable-next-line @typescript-eslint/no-empty-object-type
export type NoTables = {};

/**
 * What a repository needs: the query builder (a connection or an open transaction) and which
 * engine is behind it, for the few statements whose dialects differ (full-text search).
 */
export type Sql = {
  readonly engine: Engine;
  readonly kysely: Kysely<NoTables>;
};

/** An open clinic database on either engine. */
export type ClinicDb = Sql & {
  /** The better-sqlite3 handle behind an SQLite clinic (file-level backup and checks); null on PostgreSQL. */
  readonly sqlite: TidewingDatabase | null;
  /** The file path, or the server URL without its password, for messages. */
  readonly location: string;
  /** Closes the connection (or the pool); safe to call twice. */
  close(): Promise<void>;
};

/**
 * Runs `fn` as one write transaction and returns its result; `fn` gets the transaction as an
 * `Sql` to build repositories on. Inside a transaction already, `fn` joins it. On SQLite the
 * transaction begins with BEGIN IMMEDIATE (see `sqliteDialect`), so a writer waits for another
 * process's lock instead of failing when its read lock cannot be upgraded. Rolled back if `fn`
 * throws.
 */
export async function writeTransaction<T>(sql: Sql, fn: (tx: Sql) => Promise<T>): Promise<T> {
  if (sql.kysely.isTransaction) return fn(sql);
  return sql.kysely.transaction().execute((trx) => fn({ engine: sql.engine, kysely: trx }));
}

/** SQLite's driver with transactions begun IMMEDIATE: the write lock is taken before the first read. */
class ImmediateSqliteDriver extends SqliteDriver {
  override async beginTransaction(connection: DatabaseConnection): Promise<void> {
    await connection.executeQuery(CompiledQuery.raw('begin immediate'));
  }
}

function sqliteDialect(database: TidewingDatabase): Dialect {
  const config = { database };
  return {
    createAdapter: () => new SqliteAdapter(),
    createDriver: (): Driver => new ImmediateSqliteDriver(config),
    createIntrospector: (db) => new SqliteIntrospector(db),
    createQueryCompiler: () => new SqliteQueryCompiler(),
  };
}

/** Wraps an open better-sqlite3 clinic database (see `openDatabase`) in the shared query layer. */
export function sqliteClinicDb(database: TidewingDatabase): ClinicDb {
  const kysely = new Kysely<NoTables>({ dialect: sqliteDialect(database) });
  let closed = false;
  return {
    engine: 'sqlite',
    kysely,
    sqlite: database,
    location: database.name,
    close: async () => {
      if (closed) return;
      closed = true;
      // Kysely's SQLite driver closes the better-sqlite3 handle when it is destroyed.
      await kysely.destroy();
    },
  };
}

/** The shape of `PostgresDialect`'s pool option, without importing pg's types here. */
export type PostgresPool = ConstructorParameters<typeof PostgresDialect>[0]['pool'];

/** Wraps a pg pool in the shared query layer. The pool is ended by `close`. */
export function postgresClinicDb(pool: PostgresPool, location: string): ClinicDb {
  const kysely = new Kysely<NoTables>({ dialect: new PostgresDialect({ pool }) });
  let closed = false;
  return {
    engine: 'postgresql',
    kysely,
    sqlite: null,
    location,
    close: async () => {
      if (closed) return;
      closed = true;
      await kysely.destroy();
    },
  };
}
