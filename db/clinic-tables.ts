import Database from 'better-sqlite3';
import crypto from 'node:crypto';
import { sql as query, type RawBuilder } from 'kysely';
import { sqliteClinicDb, type Sql } from './clinic-db.js';
import { migrations as defaultMigrations, type Migration } from './migrations/index.js';

/**
 * The tables of a clinic database as its own schema describes them, read the same way from
 * either engine: what the JSON export, the move to PostgreSQL, its checksums and the checks
 * walk over, so that no list of tables is written down a second time.
 */
export type TableShape = {
  readonly name: string;
  /** Every column, in the order the table declares them. */
  readonly columns: readonly string[];
  /**
   * The primary key's columns in key order. An SQLite table without one is ordered by `rowid`
   * (a WITHOUT ROWID table always has a key); an SQLite full-text table lists `rowid` among its
   * columns, since the row id is what ties its rows to the rows they index.
   */
  readonly key: readonly string[];
  /** Columns of `key` holding text (ordered byte-wise on both engines, see `orderedKey`). */
  readonly textKeys: readonly string[];
  /** Tables this table's foreign keys point at, itself left out. */
  readonly parents: readonly string[];
};

export type ClinicTables = {
  /** The ordinary tables holding clinic data, by name. */
  readonly tables: readonly TableShape[];
  /**
   * Search indexes: SQLite's full-text tables (their shadow tables left out entirely), rebuilt
   * from the rows. Described here so that a move can carry the index over.
   */
  readonly searchIndexes: readonly TableShape[];
  /** Names of the derived tables an export leaves out: search indexes and, on SQLite, their shadow tables. */
  readonly derivedNames: readonly string[];
};

/** PostgreSQL's bookkeeping of the schema version (SQLite keeps it in `user_version`). */
export const postgresSchemaTable = 'tidewing_schema';

type SqliteListed = { name: string; type: string; wr: number };
type SqliteColumn = { name: string; pk: number; type: string };

async function sqliteTables(sql: Sql): Promise<ClinicTables> {
  // PRAGMA table_list names every attached schema's tables; only 'main' is the clinic.
  const listed = (
    await query<SqliteListed>`SELECT name, type, wr FROM pragma_table_list WHERE schema = 'main'`.execute(
      sql.kysely,
    )
  ).rows.filter((row) => !row.name.startsWith('sqlite_'));
  const derivedNames = listed
    .filter((row) => row.type === 'virtual' || row.type === 'shadow')
    .map((row) => row.name)
    .sort();
  const tables: TableShape[] = [];
  const searchIndexes: TableShape[] = [];
  for (const entry of listed.filter((row) => row.type === 'table' || row.type === 'virtual').sort(byName)) {
    const columns = (
      await query<SqliteColumn>`SELECT name, pk, type FROM pragma_table_info(${entry.name})`.execute(
        sql.kysely,
      )
    ).rows;
    if (entry.type === 'virtual') {
      searchIndexes.push({
        name: entry.name,
        columns: ['rowid', ...columns.map((column) => column.name)],
        key: ['rowid'],
        textKeys: [],
        parents: [],
      });
      continue;
    }
    const keyColumns = columns.filter((column) => column.pk > 0).sort((a, b) => a.pk - b.pk);
    const parents = (
      await query<{
        parent: string;
      }>`SELECT DISTINCT "table" AS parent FROM pragma_foreign_key_list(${entry.name})`.execute(sql.kysely)
    ).rows
      .map((row) => row.parent)
      .filter((parent) => parent !== entry.name)
      .sort();
    const key =
      keyColumns.length > 0
        ? keyColumns.map((column) => column.name)
        : entry.wr === 1
          ? columns.map((column) => column.name)
          : ['rowid'];
    tables.push({
      name: entry.name,
      columns: columns.map((column) => column.name),
      key,
      textKeys: columns
        .filter((column) => key.includes(column.name) && column.type.toUpperCase() === 'TEXT')
        .map((column) => column.name),
      parents,
    });
  }
  return { tables, searchIndexes, derivedNames };
}

async function postgresTables(sql: Sql): Promise<ClinicTables> {
  const names = (
    await query<{ name: string }>`
      SELECT table_name AS name FROM information_schema.tables
      WHERE table_schema = current_schema() AND table_type = 'BASE TABLE' AND table_name <> ${postgresSchemaTable}
      ORDER BY table_name`.execute(sql.kysely)
  ).rows.map((row) => row.name);
  const columns = (
    await query<{ table_name: string; column_name: string; data_type: string }>`
      SELECT table_name, column_name, data_type FROM information_schema.columns
      WHERE table_schema = current_schema() ORDER BY table_name, ordinal_position`.execute(sql.kysely)
  ).rows;
  const keys = (
    await query<{ table_name: string; column_name: string }>`
      SELECT c.relname AS table_name, a.attname AS column_name
      FROM pg_constraint k
      JOIN pg_class c ON c.oid = k.conrelid
      JOIN LATERAL unnest(k.conkey) WITH ORDINALITY AS u(attnum, position) ON true
      JOIN pg_attribute a ON a.attrelid = k.conrelid AND a.attnum = u.attnum
      WHERE k.contype = 'p' AND c.relnamespace = current_schema()::regnamespace
      ORDER BY c.relname, u.position`.execute(sql.kysely)
  ).rows;
  const references = (
    await query<{ child: string; parent: string }>`
      SELECT DISTINCT c.relname AS child, p.relname AS parent
      FROM pg_constraint k JOIN pg_class c ON c.oid = k.conrelid JOIN pg_class p ON p.oid = k.confrelid
      WHERE k.contype = 'f' AND c.relnamespace = current_schema()::regnamespace`.execute(sql.kysely)
  ).rows;
  const described = names.map((name): TableShape => {
    const own = columns.filter((column) => column.table_name === name);
    const key = keys.filter((row) => row.table_name === name).map((row) => row.column_name);
    const ordered = key.length > 0 ? key : own.map((column) => column.column_name);
    return {
      name,
      columns: own.map((column) => column.column_name),
      key: ordered,
      textKeys: own
        .filter((column) => ordered.includes(column.column_name) && column.data_type === 'text')
        .map((column) => column.column_name),
      parents: references
        .filter((row) => row.child === name && row.parent !== name)
        .map((row) => row.parent)
        .sort(),
    };
  });
  // Which tables are search indexes is said by the migrations (SQLite's full-text tables); a
  // PostgreSQL table of the same name is the same index in that dialect.
  const derived = new Set((await schemaOfMigrations(await storedSchemaVersion(sql))).derivedNames);
  return {
    tables: described.filter((table) => !derived.has(table.name)),
    searchIndexes: described.filter((table) => derived.has(table.name)),
    derivedNames: described.filter((table) => derived.has(table.name)).map((table) => table.name),
  };
}

function byName(a: { name: string }, b: { name: string }): number {
  return a.name < b.name ? -1 : a.name > b.name ? 1 : 0;
}

/**
 * The clinic's tables as the database itself describes them (SQLite's PRAGMAs, PostgreSQL's
 * catalog), sorted by name. PostgreSQL's schema-version table is left out, as SQLite's
 * `user_version` is not a table.
 */
export async function describeClinicTables(sql: Sql): Promise<ClinicTables> {
  return sql.engine === 'sqlite' ? sqliteTables(sql) : postgresTables(sql);
}

/** What the migrations build, read from a throwaway in-memory SQLite database. */
export type SchemaOfMigrations = ClinicTables & {
  /** Tables whose triggers refuse UPDATE and DELETE (the record tables that keep versions). */
  readonly appendOnly: readonly string[];
};

/**
 * The tables a clinic at schema `version` has, built from the migrations themselves in memory:
 * the one list a PostgreSQL database is checked against (which tables are append-only, which are
 * search indexes). `version` defaults to the newest.
 */
export async function schemaOfMigrations(
  version?: number,
  list: readonly Migration[] = defaultMigrations,
): Promise<SchemaOfMigrations> {
  const memory = new Database(':memory:');
  const db = sqliteClinicDb(memory);
  try {
    for (const migration of list.slice(0, version ?? list.length)) memory.exec(migration.sql);
    const described = await describeClinicTables(db);
    const triggers = memory
      .prepare<[], { table: string; sql: string }>(
        "SELECT tbl_name AS 'table', sql FROM sqlite_schema WHERE type = 'trigger'",
      )
      .all();
    const refuses = (table: string, event: string) =>
      triggers.some(
        (trigger) =>
          trigger.table === table &&
          new RegExp(`BEFORE\\s+${event}\\b`, 'i').test(trigger.sql) &&
          /RAISE\s*\(\s*ABORT/i.test(trigger.sql),
      );
    return {
      ...described,
      appendOnly: described.tables
        .map((table) => table.name)
        .filter((name) => refuses(name, 'UPDATE') && refuses(name, 'DELETE')),
    };
  } finally {
    await db.close();
  }
}

/**
 * The tables in an order that inserts every parent before its children (foreign keys), ties by
 * name. A table's references to itself (corrections) are satisfied by inserting in key order.
 */
export function parentsFirst(tables: readonly TableShape[]): TableShape[] {
  const byTable = new Map(tables.map((table) => [table.name, table]));
  const ordered: TableShape[] = [];
  const placed = new Set<string>();
  const visiting = new Set<string>();
  const visit = (table: TableShape) => {
    if (placed.has(table.name)) return;
    if (visiting.has(table.name))
      throw new Error(
        `The tables' foreign keys form a cycle through ${table.name}; they cannot be copied in order.`,
      );
    visiting.add(table.name);
    for (const parent of table.parents) {
      const found = byTable.get(parent);
      if (found !== undefined) visit(found);
    }
    visiting.delete(table.name);
    placed.add(table.name);
    ordered.push(table);
  };
  [...tables].sort(byName).forEach(visit);
  return ordered;
}

/**
 * Runs `fn` inside one read-only snapshot of the database, so that every table read agrees with
 * every other even while a workstation keeps writing. On PostgreSQL a REPEATABLE READ, READ ONLY
 * transaction; on SQLite a deferred transaction on the one connection, always ended with COMMIT
 * (it writes nothing of its own, and a write on the same handle that ran meanwhile, such as a
 * file-level tool's, must not be rolled back with it). Inside a transaction already, `fn` joins it.
 */
export async function readSnapshot<T>(sql: Sql, fn: (snapshot: Sql) => Promise<T>): Promise<T> {
  if (sql.kysely.isTransaction) return fn(sql);
  if (sql.engine === 'postgresql')
    return sql.kysely
      .transaction()
      .setIsolationLevel('repeatable read')
      .setAccessMode('read only')
      .execute((trx) => fn({ engine: sql.engine, kysely: trx }));
  return sql.kysely.connection().execute(async (connection) => {
    const inner: Sql = { engine: sql.engine, kysely: connection };
    let started = true;
    try {
      await query`BEGIN DEFERRED`.execute(connection);
    } catch (error) {
      // A handle already inside a transaction (better-sqlite3's own) is read as it stands.
      if (!(error instanceof Error && /within a transaction/.test(error.message))) throw error;
      started = false;
    }
    try {
      return await fn(inner);
    } finally {
      if (started) await query`COMMIT`.execute(connection);
    }
  });
}

/** `ORDER BY` text for a table's key: text keys byte-wise on PostgreSQL, as SQLite's BINARY does. */
function orderedKey(sql: Sql, table: TableShape, column: string): RawBuilder<unknown> {
  return sql.engine === 'postgresql' && table.textKeys.includes(column)
    ? query`${query.ref(column)} COLLATE "C"`
    : query`${query.ref(column)}`;
}

/**
 * Every row of `table` in primary-key order, `batchRows` at a time (keyset pagination on a
 * single-column key, so a large table is never held whole), each row holding `columns`
 * (default: the table's own) plus its key.
 */
export async function* tableRows(
  sql: Sql,
  table: TableShape,
  options: { readonly columns?: readonly string[]; readonly batchRows?: number } = {},
): AsyncGenerator<Record<string, unknown>[]> {
  const columns = [...new Set([...(options.columns ?? table.columns), ...table.key])];
  const batchRows = options.batchRows ?? 500;
  const selected = query.join(columns.map((column) => query.ref(column)));
  const order = query.join(table.key.map((column) => orderedKey(sql, table, column)));
  const keyColumn = table.key.length === 1 ? table.key[0] : undefined;
  let after: unknown = undefined;
  for (let offset = 0; ; offset += batchRows) {
    const where =
      keyColumn === undefined || after === undefined
        ? query``
        : query`WHERE ${orderedKey(sql, table, keyColumn)} > ${after}`;
    const page = keyColumn === undefined ? query`OFFSET ${offset}` : query``;
    const rows = (
      await query<
        Record<string, unknown>
      >`SELECT ${selected} FROM ${query.table(table.name)} ${where} ORDER BY ${order} LIMIT ${batchRows} ${page}`.execute(
        sql.kysely,
      )
    ).rows;
    if (rows.length === 0) return;
    yield rows;
    if (rows.length < batchRows) return;
    if (keyColumn !== undefined) after = rows[rows.length - 1]?.[keyColumn];
  }
}

/**
 * One stored value in a form both engines give alike: SQLite's INTEGER and REAL and
 * PostgreSQL's integer and double precision all arrive as JavaScript numbers (int8 too, see
 * postgres-connection.ts), written here in JavaScript's shortest round-trip form, so 2.5, 2.50
 * and 25e-1 are one value and 0.1 is exactly 0.1 on both sides; text is tagged apart from
 * numbers ('5' is not 5), NULL apart from both.
 */
export function canonicalValue(value: unknown): string | null {
  if (value === null || value === undefined) return null;
  if (typeof value === 'number') return `n:${Object.is(value, -0) ? '-0' : String(value)}`;
  if (typeof value === 'bigint') return `n:${value.toString()}`;
  if (typeof value === 'string') return `t:${value}`;
  if (Buffer.isBuffer(value)) return `b:${value.toString('base64')}`;
  if (value instanceof Uint8Array) return `b:${Buffer.from(value).toString('base64')}`;
  throw new Error(`A stored value of an unexpected kind (${typeof value}) cannot be compared.`);
}

export type TableChecksum = { readonly rows: number; readonly sha256: string };

/**
 * Row count and SHA-256 of `table`'s rows in primary-key order, each row the JSON array of its
 * `columns`' canonical values (`canonicalValue`) on one line. The one function both sides of a
 * move are checked with: the same rows give the same checksum from SQLite and from PostgreSQL.
 * @param columns which columns, in which order (default: the table's own)
 */
export async function tableChecksum(
  sql: Sql,
  table: TableShape,
  columns: readonly string[] = table.columns,
): Promise<TableChecksum> {
  const hash = crypto.createHash('sha256');
  let rows = 0;
  for await (const batch of tableRows(sql, table, { columns })) {
    for (const row of batch) {
      hash.update(`${JSON.stringify(columns.map((column) => canonicalValue(row[column])))}\n`);
      rows += 1;
    }
  }
  return { rows, sha256: hash.digest('hex') };
}

/** Rows in `table` (a count, not a read). */
export async function rowCount(sql: Sql, table: string): Promise<number> {
  const result = await query<{
    count: number | string;
  }>`SELECT count(*) AS count FROM ${query.table(table)}`.execute(sql.kysely);
  return Number(result.rows[0]?.count ?? 0);
}

/** The schema version a clinic database says it has: SQLite's `user_version`, PostgreSQL's version row (0 without one). */
export async function storedSchemaVersion(sql: Sql): Promise<number> {
  if (sql.engine === 'sqlite') {
    const row = await query<{ user_version: number }>`PRAGMA user_version`.execute(sql.kysely);
    return row.rows[0]?.user_version ?? 0;
  }
  const table = await query<{
    found: string | null;
  }>`SELECT to_regclass(${postgresSchemaTable})::text AS found`.execute(sql.kysely);
  if ((table.rows[0]?.found ?? null) === null) return 0;
  const row = await query<{
    version: number;
  }>`SELECT version FROM ${query.table(postgresSchemaTable)}`.execute(sql.kysely);
  return row.rows[0]?.version ?? 0;
}
